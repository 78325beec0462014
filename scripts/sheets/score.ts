/**
 * Scores a curve set read from a generated sheet against the sheet's exact truth: for every
 * drawn curve, the fitted curve of the same diameter and quantity is compared with the truth
 * over 15–95 % of the drawn flow range; efficiency read from iso-lines is compared over the
 * part of that range its fit covers. Errors are in % of the axis span, efficiency in points.
 */
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import type { CurveSet } from '../../src/model/curveset.ts';
import { fromSI, parseUnit, toSI } from '../../src/units/index.ts';
import { endFlow, efficiency } from './family.ts';
import { trueValue, type Truth } from './truth.ts';

export interface ScoreRow {
  id: string;
  quantity: 'head' | 'efficiency' | 'power' | 'npshr';
  diameter: number;
  /** Where the efficiency came from: its own panel's curve, or iso-lines crossing the head curves. */
  source: 'curve' | 'iso';
  /** Worst error: % of axis span, or points of efficiency. */
  worst: number;
  /** Acceptance limit for this row (0.5 % of span; 1.5 points from curves, 2 from iso-lines). */
  limit: number;
}

export function scoreCurveSet(truth: Truth, set: CurveSet): ScoreRow[] {
  const u = truth.family.units;
  const flowUnit = parseUnit('flow', u.flow);
  const dUnit = parseUnit('diameter', u.diameter);
  const valueUnit = {
    head: parseUnit('head', u.head),
    npshr: parseUnit('head', u.npsh),
    power: parseUnit('power', u.power),
    efficiency: parseUnit('efficiency', '%'),
  };
  const member = (d: number) => set.members.find((m) => m.diameter_m !== undefined && Math.abs(m.diameter_m - toSI(d, dUnit)) < 1e-9);
  const rows: ScoreRow[] = [];
  const worstOver = (fit: NonNullable<CurveSet['members'][number]['curves']['head']>['fit'], q0: number, q1: number, quantity: ScoreRow['quantity'], truthAt: (q: number) => number, span: number) => {
    if (!fit) return Number.POSITIVE_INFINITY;
    let worst = 0;
    for (let i = 0; i <= 200; i++) {
      const q = q0 + ((q1 - q0) * i) / 200;
      const read = fromSI(evaluateUnchecked(fit, toSI(q, flowUnit)), valueUnit[quantity]);
      worst = Math.max(worst, (Math.abs(read - truthAt(q)) / span) * 100);
    }
    return worst;
  };
  for (const curve of truth.curves) {
    const panel = truth.panels.find((p) => p.id === curve.panel);
    const fit = member(curve.diameter)?.curves[curve.quantity]?.fit;
    if (!panel) continue;
    const [a, b] = curve.flow_range;
    const span = curve.quantity === 'efficiency' ? 100 : panel.y.max - panel.y.min;
    const worst = worstOver(fit, a + 0.15 * (b - a), a + 0.95 * (b - a), curve.quantity, (q) => trueValue(truth, curve, q), span);
    rows.push({ id: curve.id, quantity: curve.quantity, diameter: curve.diameter, source: 'curve', worst, limit: curve.quantity === 'efficiency' ? 1.5 : 0.5 });
  }
  if (truth.isos.length > 0) {
    const drawn = new Map(truth.curves.filter((c) => c.quantity === 'head').map((c) => [c.diameter, c.drawn_diameter]));
    for (const [announced, d] of drawn) {
      const fit = member(announced)?.curves.efficiency?.fit;
      if (!fit) continue;
      // The efficiency fit spans the iso crossings found on this head curve.
      const lo = Math.max(fromSI(fit.domain[0], flowUnit), 0.15 * endFlow(truth.family, d));
      const hi = Math.min(fromSI(fit.domain[1], flowUnit), 0.95 * endFlow(truth.family, d));
      if (!(hi > lo)) continue;
      const worst = worstOver(fit, lo, hi, 'efficiency', (q) => efficiency(truth.family, d, q), 100);
      rows.push({ id: `efficiency-${announced} (iso)`, quantity: 'efficiency', diameter: announced, source: 'iso', worst, limit: 2 });
    }
  }
  return rows;
}
