/**
 * The points table: a CSV of captured points with the header
 *   quantity,diameter,flow,value
 * quantity ∈ head | efficiency | power | npshr; efficiency in %; the other columns in the
 * units the caller names. Parsing is pure text → rows; units are applied by the caller.
 */
import { UserError } from './errors.ts';
import { QUANTITIES, type Quantity } from './curveset.ts';
import { MAX_TABLE_ROWS, tooManyRows } from './limits.ts';

export class PointsTableError extends UserError {
  override name = 'PointsTableInputError';
}

export interface PointsRow {
  line: number;
  quantity: Quantity;
  diameter: number;
  flow: number;
  value: number;
}

export const POINTS_HEADER = ['quantity', 'diameter', 'flow', 'value'] as const;

function splitLine(line: string): string[] {
  return line.split(',').map((c) => c.trim().replace(/^"(.*)"$/, '$1').trim());
}

function numberCell(text: string, column: string, line: number): number {
  const v = text === '' ? NaN : Number(text);
  if (!Number.isFinite(v)) throw new PointsTableError(`Line ${line}: the ${column} "${text}" is not a number.`);
  return v;
}

export function parsePointsTable(text: string, source = 'The points file'): PointsRow[] {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  const firstIndex = lines.findIndex((l) => l.trim() !== '' && !l.trim().startsWith('#'));
  if (firstIndex < 0) throw new PointsTableError(`${source} is empty; it needs the header "${POINTS_HEADER.join(',')}" and one row per point.`);
  const header = splitLine(lines[firstIndex] as string).map((h) => h.toLowerCase());
  if (header.length !== 4 || POINTS_HEADER.some((h, i) => header[i] !== h)) {
    throw new PointsTableError(`${source} has the header "${(lines[firstIndex] as string).trim()}"; expected "${POINTS_HEADER.join(',')}".`);
  }
  const rows: PointsRow[] = [];
  for (let i = firstIndex + 1; i < lines.length; i++) {
    const raw = (lines[i] as string).trim();
    if (raw === '' || raw.startsWith('#')) continue;
    if (rows.length >= MAX_TABLE_ROWS) throw tooManyRows(source); // limits.ts: far beyond any sheet
    const line = i + 1;
    const cells = splitLine(raw);
    if (cells.length !== 4) throw new PointsTableError(`Line ${line} has ${cells.length} cells; each row needs quantity, diameter, flow and value.`);
    const quantity = (cells[0] as string).toLowerCase();
    if (!(QUANTITIES as readonly string[]).includes(quantity)) {
      throw new PointsTableError(`Line ${line}: unknown quantity "${cells[0]}"; use one of ${QUANTITIES.join(', ')}.`);
    }
    const diameter = numberCell(cells[1] as string, 'diameter', line);
    const flow = numberCell(cells[2] as string, 'flow', line);
    const value = numberCell(cells[3] as string, 'value', line);
    if (!(diameter > 0)) throw new PointsTableError(`Line ${line}: the diameter must be positive, not ${diameter}.`);
    if (flow < 0) throw new PointsTableError(`Line ${line}: the flow ${flow} is negative; flows start at zero.`);
    rows.push({ line, quantity: quantity as Quantity, diameter, flow, value });
  }
  if (rows.length === 0) throw new PointsTableError(`${source} has a header but no points.`);
  return rows;
}
