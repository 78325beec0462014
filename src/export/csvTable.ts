/**
 * The CSV table: one row per flow per member, N evenly spaced flows over each member's
 * head-curve domain. A cell is empty where that quantity has no curve, or where the flow
 * lies outside that curve's fitted range — a table never carries a silent extrapolation.
 */
import { UserError } from '../model/errors.ts';
import type { CurveSet, Member, Quantity } from '../model/curveset.ts';
import { evaluate, linspace } from '../fit/polynomial.ts';
import { fromSI } from '../units/index.ts';
import { cell, exportUnits, unitOf } from './unitView.ts';

const COLUMNS: Quantity[] = ['head', 'efficiency', 'power', 'npshr'];

export class ExportInputError extends UserError {
  override name = 'ExportInputError';
}

function memberDomain(m: Member): [number, number] | undefined {
  const own = m.curves.head?.fit?.domain;
  if (own) return own;
  const all = COLUMNS.flatMap((q) => (m.curves[q]?.fit ? [m.curves[q]!.fit!.domain] : []));
  if (!all.length) return undefined;
  return [Math.min(...all.map((d) => d[0])), Math.max(...all.map((d) => d[1]))];
}

export function curveSetToCsv(set: CurveSet, options: { system?: string; points?: number } = {}): string {
  const n = options.points ?? 21;
  if (!Number.isInteger(n) || n < 2 || n > 10000) throw new ExportInputError(`The number of points per curve must be a whole number from 2 to 10000, not ${options.points}.`);
  const u = exportUnits(set, options.system);
  const bySpeed = set.family === 'speed';
  const first = bySpeed ? 'speed [rpm]' : `diameter [${u.diameter.token}]`;
  const header = [first, `flow [${u.flow.token}]`, ...COLUMNS.map((q) => `${q} [${unitOf(u, q).token}]`)].join(',');
  const rows = [header];
  const members = [...set.members].sort((a, b) => (b.diameter_m ?? 0) - (a.diameter_m ?? 0) || b.speed_rpm - a.speed_rpm);
  for (const m of members) {
    const domain = memberDomain(m);
    if (!domain) continue;
    const key = bySpeed || m.diameter_m === undefined ? cell(m.speed_rpm) : cell(fromSI(m.diameter_m, u.diameter));
    for (const q of linspace(domain[0], domain[1], n)) {
      const values = COLUMNS.map((quantity) => {
        const fit = m.curves[quantity]?.fit;
        if (!fit) return '';
        const e = evaluate(fit, q);
        return e.extrapolated ? '' : cell(fromSI(e.value, unitOf(u, quantity)));
      });
      rows.push([key, cell(fromSI(q, u.flow)), ...values].join(','));
    }
  }
  return `${rows.join('\n')}\n`;
}
