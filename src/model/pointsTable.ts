/**
 * The points table: captured points as CSV, in either of two layouts.
 *
 * Long layout, one point a row:
 *   quantity,diameter,flow,value
 * quantity ∈ head | efficiency | power | npshr; efficiency in %.
 *
 * Wide layout, as `export --format csv` writes it, one flow a row with a column per quantity:
 *   diameter [in],flow [gpm],head [ft],efficiency [%],power [hp],npshr [ft]
 * (any of the quantity columns; an empty cell is no point).
 *
 * In both, a column may carry its unit in brackets (`flow [gpm]`); units of the values of a
 * long table come from the caller. The delimiter is found from the header: tab, ';' or ','.
 * With ';' or tab, a decimal comma is read too ("12,5"). Lines starting with '#' (also when
 * a spreadsheet quoted them) are comments; "# key: value" lines before the table are kept as
 * `meta` (pump, speed [rpm], density [kg/m3], specific gravity, …).
 *
 * A speed family (one impeller drawn at several speeds) writes `speed` (rpm) in place of
 * `diameter`: `quantity,speed,flow,value`, or `speed [rpm],flow [gpm],head [ft],…`. A table holds
 * one family or the other; its rows then carry `speed` and no `diameter`.
 *
 * Parsing is pure text → rows; units are applied by the caller.
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
  /** Impeller diameter in the table's diameter unit (a diameter family). */
  diameter?: number;
  /** Speed [rpm] (a speed family: the table's `family` is 'speed'). */
  speed?: number;
  flow: number;
  value: number;
}

export type PointsColumn = 'diameter' | 'speed' | 'flow' | Quantity;

export interface PointsTable {
  layout: 'long' | 'wide';
  /** What labels the members: impeller diameters, or speeds (rpm). */
  family: 'diameter' | 'speed';
  rows: PointsRow[];
  /** Unit tokens written in the header, by column (as written; the caller parses them). */
  units: Partial<Record<PointsColumn, string>>;
  /** "# key: value" lines, keys in lower case (e.g. "speed [rpm]" → "1780"). */
  meta: Record<string, string>;
  delimiter: ',' | ';' | '\t';
}

export const POINTS_HEADER = ['quantity', 'diameter', 'flow', 'value'] as const;
/** The long header of a speed family. */
export const SPEED_POINTS_HEADER = ['quantity', 'speed', 'flow', 'value'] as const;

function splitLine(line: string, sep: string): string[] {
  const cells: string[] = [];
  let current = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i] as string;
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        current += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else current += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === sep) {
      cells.push(current.trim());
      current = '';
    } else current += ch;
  }
  cells.push(current.trim());
  return cells;
}

/** "flow [gpm]" → { name: 'flow', unit: 'gpm' }; "flow" → { name: 'flow' }. */
function headerCell(text: string): { name: string; unit?: string } {
  const m = /^(.*?)\s*[[(]\s*([^\])]*?)\s*[\])]\s*$/.exec(text);
  if (m) return { name: (m[1] as string).trim().toLowerCase(), unit: m[2] as string };
  return { name: text.trim().toLowerCase() };
}

function isComment(raw: string): boolean {
  return raw.startsWith('#') || raw.startsWith('"#');
}

function delimiterOf(header: string): PointsTable['delimiter'] {
  if (header.includes('\t')) return '\t';
  if (header.includes(';')) return ';';
  return ',';
}

export function readPointsTable(text: string, source = 'The points file'): PointsTable {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  const meta: Record<string, string> = {};
  let firstIndex = -1;
  for (let i = 0; i < lines.length; i++) {
    const raw = (lines[i] as string).trim();
    if (raw === '') continue;
    if (isComment(raw)) {
      const body = raw.replace(/^"?#\s*/, '').replace(/"$/, '').replace(/""/g, '"');
      const colon = body.indexOf(':');
      if (colon > 0) meta[body.slice(0, colon).trim().toLowerCase()] = body.slice(colon + 1).trim();
      continue;
    }
    firstIndex = i;
    break;
  }
  const expected = `"${POINTS_HEADER.join(',')}" (or the columns export writes, e.g. "diameter [in],flow [gpm],head [ft]")`;
  if (firstIndex < 0) throw new PointsTableError(`${source} is empty; it needs the header ${expected} and one row per point.`);
  const headerLine = (lines[firstIndex] as string).replace(/^ +| +$/g, '');
  const delimiter = delimiterOf(headerLine);
  const header = splitLine(headerLine, delimiter).map(headerCell);
  const names = header.map((h) => h.name);
  const units: PointsTable['units'] = {};

  if (names.includes('diameter') && names.includes('speed')) {
    throw new PointsTableError(`${source} has both a diameter and a speed column; a table holds one family, so keep the diameter column (impellers at one speed) or the speed column (one impeller at several speeds).`);
  }
  const isLong = names.length === 4 && (POINTS_HEADER.every((h, i) => names[i] === h) || SPEED_POINTS_HEADER.every((h, i) => names[i] === h));
  const quantityColumns = names.flatMap((n, i) => ((QUANTITIES as readonly string[]).includes(n) ? [i] : []));
  const isWide = !isLong && (names[0] === 'diameter' || names[0] === 'speed') && names[1] === 'flow' && quantityColumns.length >= 1 && quantityColumns.length === names.length - 2;
  const family: PointsTable['family'] = names[isLong ? 1 : 0] === 'speed' ? 'speed' : 'diameter';
  if (!isLong && !isWide) {
    throw new PointsTableError(`${source} has the header "${headerLine.trim()}"; expected ${expected}.`);
  }
  header.forEach((h, i) => {
    if (!h.unit) return;
    if (isLong && (i === 0 || i === 3)) throw new PointsTableError(`${source}: the "${names[i]}" column cannot carry a unit in a long table; give units of the values with --units or --head/--power/--npsh.`);
    if (h.name === 'speed' && !/^(rpm|r\/min|min-1|1\/min)$/i.test(h.unit.trim())) throw new PointsTableError(`${source}: the speed column is in "${h.unit}"; give speeds in rpm.`);
    units[h.name as PointsColumn] = h.unit;
  });

  const decimalComma = delimiter !== ',';
  const numberCell = (textCell: string, column: string, line: number): number => {
    const normal = decimalComma ? textCell.replace(',', '.') : textCell;
    const v = normal === '' ? NaN : Number(normal);
    if (!Number.isFinite(v)) throw new PointsTableError(`Line ${line}: the ${column} "${textCell}" is not a number.`);
    return v;
  };

  const rows: PointsRow[] = [];
  for (let i = firstIndex + 1; i < lines.length; i++) {
    // Spaces around the row go, but not tabs: with a tab delimiter they are empty cells.
    const raw = (lines[i] as string).replace(/^ +| +$/g, '');
    if (raw.trim() === '' || isComment(raw)) continue;
    if (rows.length >= MAX_TABLE_ROWS) throw tooManyRows(source); // limits.ts: far beyond any sheet
    const line = i + 1;
    const cells = splitLine(raw, delimiter);
    // Spreadsheets often drop empty cells at the end of a row of a wide table.
    if (!isLong && cells.length >= 2 && cells.length < names.length) cells.push(...Array<string>(names.length - cells.length).fill(''));
    if (cells.length !== names.length) {
      const what = isLong ? `quantity, ${family}, flow and value` : `the ${names.length} columns of the header`;
      throw new PointsTableError(`Line ${line} has ${cells.length} cells; each row needs ${what}.`);
    }
    const diameterCell = isLong ? (cells[1] as string) : (cells[0] as string);
    const flowCell = isLong ? (cells[2] as string) : (cells[1] as string);
    const diameter = numberCell(diameterCell, family, line);
    const flow = numberCell(flowCell, 'flow', line);
    if (!(diameter > 0)) throw new PointsTableError(`Line ${line}: the ${family} must be positive, not ${diameter}.`);
    const label = family === 'speed' ? { speed: diameter } : { diameter };
    if (flow < 0) throw new PointsTableError(`Line ${line}: the flow ${flow} is negative; flows start at zero.`);
    if (isLong) {
      const quantity = (cells[0] as string).toLowerCase();
      if (!(QUANTITIES as readonly string[]).includes(quantity)) {
        throw new PointsTableError(`Line ${line}: unknown quantity "${cells[0]}"; use one of ${QUANTITIES.join(', ')}.`);
      }
      rows.push({ line, quantity: quantity as Quantity, ...label, flow, value: numberCell(cells[3] as string, 'value', line) });
    } else {
      for (const c of quantityColumns) {
        const textCell = cells[c] as string;
        if (textCell === '') continue; // outside that curve's range, or no such curve
        rows.push({ line, quantity: names[c] as Quantity, ...label, flow, value: numberCell(textCell, names[c] as string, line) });
      }
    }
  }
  if (rows.length === 0) throw new PointsTableError(`${source} has a header but no points.`);
  return { layout: isLong ? 'long' : 'wide', family, rows, units, meta, delimiter };
}

/** The rows alone (long or wide layout). */
export function parsePointsTable(text: string, source = 'The points file'): PointsRow[] {
  return readPointsTable(text, source).rows;
}
