/**
 * CSV tables of a curve set, made to travel to spreadsheets and back into `build`.
 *
 * Layout "members" (`export --format csv`): one row per flow per member, columns
 *   diameter [in], flow [gpm], head [ft], efficiency [%], power [hp], npshr [ft]
 * Layout "curve table" (`export --format curve-table`): one row per flow, one column per
 * quantity and member, e.g. `head 13 in [ft]`.
 *
 * Flows: one even grid shared by every member, starting at zero — `flowStep` in the table's
 * flow unit, or at most `points` flows with the smallest round step (1, 1.5, 2, 2.5, 3, 4, 5, 6
 * or 8 × 10^k) that reaches the end of the widest curve.
 *
 * Empty cells (documented in the header block): the flow lies outside the range that curve
 * was fitted on — a table never carries an extrapolated value — or the member has no such curve.
 *
 * Header block: lines starting with "#" before the table give the pump, speed, liquid, density,
 * source, units and the meaning of an empty cell; a blank line separates them from the table.
 * `build` reads them back; spreadsheets show them as a few rows above the table.
 *
 * `delimiter` ',' ';' or tab and `decimal` '.' or ',' suit decimal-comma locales.
 */
import { UserError } from '../model/errors.ts';
import type { CurveSet, Member, Quantity } from '../model/curveset.ts';
import { evaluate } from '../fit/polynomial.ts';
import { fromSI, roundSignificant, toSI, type Unit } from '../units/index.ts';
import { cell, exportUnits, unitOf, type ExportUnits } from './unitView.ts';

const COLUMNS: Quantity[] = ['head', 'efficiency', 'power', 'npshr'];

export class ExportInputError extends UserError {
  override name = 'ExportInputError';
}

export interface CsvOptions {
  /** 'si', 'us', or undefined for the set's own display units. */
  system?: string;
  /** Number of flows of the shared grid (2 … 10000, default 21). */
  points?: number;
  /** Step of the shared flow grid, in the table's flow unit; overrides `points`. */
  flowStep?: number;
  delimiter?: ',' | ';' | '\t';
  decimal?: '.' | ',';
  /** Write the "#" header block (default true). */
  meta?: boolean;
}

/** The text written in place of a missing cell's reason, documented once in the header block. */
export const EMPTY_CELL_REASON = 'an empty cell means the flow lies outside the range that curve was fitted on (values are never extrapolated), or the member has no such curve';

function memberDomain(m: Member): [number, number] | undefined {
  const all = COLUMNS.flatMap((q) => (m.curves[q]?.fit ? [m.curves[q]!.fit!.domain] : []));
  if (!all.length) return undefined;
  return [Math.min(...all.map((d) => d[0])), Math.max(...all.map((d) => d[1]))];
}

/** The smallest round step (1, 1.5, 2, 2.5, 3, 4, 5, 6 or 8 × 10^k) with `intervals` steps reaching `end`. */
export function roundStep(end: number, intervals: number): number {
  const raw = end / intervals;
  if (!(raw > 0)) return 1;
  const power = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10]) {
    const step = roundSignificant(m * power, 12);
    if (step * intervals >= end * (1 - 1e-12)) return step;
  }
  return 10 * power;
}

/** The shared flow grid in the table's flow unit: k·step for k = 0 … n−1. */
export function flowGrid(set: CurveSet, flowUnit: Unit, options: Pick<CsvOptions, 'points' | 'flowStep'>): number[] {
  const ends = set.members.flatMap((m) => {
    const d = memberDomain(m);
    return d ? [fromSI(d[1], flowUnit)] : [];
  });
  if (!ends.length) throw new ExportInputError('This curve set has no fitted curve to tabulate.');
  const end = Math.max(...ends);
  if (options.flowStep !== undefined) {
    if (!(options.flowStep > 0) || !Number.isFinite(options.flowStep)) throw new ExportInputError(`The flow step must be a positive number, not ${options.flowStep}.`);
    const count = Math.floor(end / options.flowStep + 1e-9) + 1;
    if (count > 10000) throw new ExportInputError(`A flow step of ${options.flowStep} ${flowUnit.token} gives ${count} rows per curve, over the limit of 10000; choose a larger step.`);
    return Array.from({ length: count }, (_, k) => roundSignificant(k * options.flowStep!, 12));
  }
  const n = options.points ?? 21;
  if (!Number.isInteger(n) || n < 2 || n > 10000) throw new ExportInputError(`The number of points per curve must be a whole number from 2 to 10000, not ${options.points}.`);
  const step = roundStep(end, n - 1);
  const count = Math.min(n, Math.ceil(end / step - 1e-9) + 1); // a round step may reach the end in fewer flows
  return Array.from({ length: count }, (_, k) => roundSignificant(k * step, 12));
}

function checkFormat(options: CsvOptions): { sep: string; dec: string } {
  const sep = options.delimiter ?? ',';
  const dec = options.decimal ?? '.';
  if (![',', ';', '\t'].includes(sep)) throw new ExportInputError(`The delimiter must be ",", ";" or "tab", not "${sep}".`);
  if (!['.', ','].includes(dec)) throw new ExportInputError(`The decimal mark must be "." or ",", not "${dec}".`);
  if (sep === dec) throw new ExportInputError('The delimiter and the decimal mark are both ","; use --delimiter ";" (or tab) with --decimal ",".');
  return { sep, dec };
}

/** Quotes a text cell when it holds the delimiter, a quote or a line break. */
function textCell(text: string, sep: string): string {
  return text.includes(sep) || /["\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function numberCell(value: number | undefined, dec: string): string {
  const text = cell(value);
  return dec === ',' ? text.replace('.', ',') : text;
}

function metaBlock(set: CurveSet, u: ExportUnits, grid: number[], sep: string, dec: string): string[] {
  const source = set.provenance.source?.file ?? set.provenance.points_file ?? set.provenance.takeoff;
  const line = (key: string, value: string) => `# ${key}: ${value}`;
  const lines = [
    line('pump', set.pump.name),
    ...(set.pump.maker ? [line('maker', set.pump.maker)] : []),
    ...(set.pump.model ? [line('model', set.pump.model)] : []),
    line('speed [rpm]', numberCell(set.speed_rpm, dec)),
    ...(set.limits?.min_flow?.flow_m3s !== undefined ? [line(`minimum flow [${u.flow.token}]`, numberCell(fromSI(set.limits.min_flow.flow_m3s, u.flow), dec))] : []),
    line('liquid', set.fluid.name),
    line('density [kg/m3]', numberCell(set.fluid.density_kg_m3, dec)),
    line('specific gravity', numberCell(set.fluid.specific_gravity, dec)),
    ...(source ? [line('source', source)] : []),
    line('written by', `${set.provenance.tool.name} ${set.provenance.tool.version}`),
    line('flow grid', `${numberCell(grid[0], dec)} to ${numberCell(grid[grid.length - 1], dec)} ${u.flow.token} in steps of ${numberCell((grid[1] ?? 0) - (grid[0] ?? 0), dec)}`),
    line('empty cells', EMPTY_CELL_REASON),
    line('caution', 'preliminary engineering; verify against certified data and local codes'),
  ];
  // Spreadsheets would split a line at the delimiter; none of these lines is meant to be split.
  return [...lines.map((l) => textCell(l, sep)), ''];
}

function sortedMembers(set: CurveSet): Member[] {
  return [...set.members].sort((a, b) => (b.diameter_m ?? 0) - (a.diameter_m ?? 0) || b.speed_rpm - a.speed_rpm);
}

function valueAt(m: Member, quantity: Quantity, q: number, u: ExportUnits): number | undefined {
  const fit = m.curves[quantity]?.fit;
  if (!fit) return undefined;
  const e = evaluate(fit, q);
  return e.extrapolated ? undefined : fromSI(e.value, unitOf(u, quantity));
}

/** Layout "members": one row per flow of the shared grid per member. */
export function curveSetToCsv(set: CurveSet, options: CsvOptions = {}): string {
  const { sep, dec } = checkFormat(options);
  const u = exportUnits(set, options.system);
  const grid = flowGrid(set, u.flow, options);
  const bySpeed = set.family === 'speed';
  const first = bySpeed ? 'speed [rpm]' : `diameter [${u.diameter.token}]`;
  const header = [first, `flow [${u.flow.token}]`, ...COLUMNS.map((q) => `${q} [${unitOf(u, q).token}]`)].map((h) => textCell(h, sep)).join(sep);
  const rows = options.meta === false ? [] : metaBlock(set, u, grid, sep, dec);
  rows.push(header);
  for (const m of sortedMembers(set)) {
    if (!memberDomain(m)) continue;
    const key = bySpeed || m.diameter_m === undefined ? numberCell(m.speed_rpm, dec) : numberCell(fromSI(m.diameter_m, u.diameter), dec);
    for (const flow of grid) {
      const q = toSI(flow, u.flow);
      rows.push([key, numberCell(flow, dec), ...COLUMNS.map((quantity) => numberCell(valueAt(m, quantity, q, u), dec))].join(sep));
    }
  }
  return `${rows.join('\n')}\n`;
}

/** Layout "curve table": one row per flow, one column per quantity and member. */
export function curveSetToCurveTable(set: CurveSet, options: CsvOptions = {}): string {
  const { sep, dec } = checkFormat(options);
  const u = exportUnits(set, options.system);
  const grid = flowGrid(set, u.flow, options);
  const members = sortedMembers(set).filter((m) => memberDomain(m));
  const label = (m: Member) => (set.family === 'speed' || m.diameter_m === undefined ? `${cell(m.speed_rpm)} rpm` : `${cell(fromSI(m.diameter_m, u.diameter))} ${u.diameter.token}`);
  const columns: Array<{ m: Member; q: Quantity }> = [];
  for (const q of COLUMNS) for (const m of members) if (m.curves[q]?.fit) columns.push({ m, q });
  const header = [`flow [${u.flow.token}]`, ...columns.map(({ m, q }) => `${q} ${label(m)} [${unitOf(u, q).token}]`)].map((h) => textCell(h, sep)).join(sep);
  const rows = options.meta === false ? [] : metaBlock(set, u, grid, sep, dec);
  rows.push(header);
  for (const flow of grid) {
    const q = toSI(flow, u.flow);
    rows.push([numberCell(flow, dec), ...columns.map(({ m, q: quantity }) => numberCell(valueAt(m, quantity, q, u), dec))].join(sep));
  }
  return `${rows.join('\n')}\n`;
}
