/**
 * Comparing two curve sets the way acceptance asks: every fitted curve of one lies within a
 * fraction of its own span of the other's, over their common flow range.
 */
import { evaluateUnchecked, linspace } from '../../src/fit/polynomial.ts';
import type { CurveSet, Quantity } from '../../src/model/curveset.ts';

export interface CurveGap {
  member: string;
  quantity: Quantity;
  /** Largest difference in % of the curve's span of values. */
  percentOfSpan: number;
  /** Difference of the fitted ranges' ends in % of the flow span. */
  domainPercent: number;
}

export function compareCurveSets(a: CurveSet, b: CurveSet): CurveGap[] {
  const gaps: CurveGap[] = [];
  const quantities: Quantity[] = ['head', 'efficiency', 'power', 'npshr'];
  if (a.members.length !== b.members.length) throw new Error(`The curve sets have ${a.members.length} and ${b.members.length} members.`);
  for (const ma of a.members) {
    const mb = b.members.find((m) => Math.abs((m.diameter_m ?? 0) - (ma.diameter_m ?? 0)) <= 1e-9);
    if (!mb) throw new Error(`No member of diameter ${ma.diameter_m} m in the second curve set.`);
    for (const q of quantities) {
      const fa = ma.curves[q]?.fit;
      const fb = mb.curves[q]?.fit;
      if (!fa && !fb) continue;
      if (!fa || !fb) throw new Error(`Only one curve set has a ${q} curve for ${ma.diameter_m} m.`);
      const lo = Math.max(fa.domain[0], fb.domain[0]);
      const hi = Math.min(fa.domain[1], fb.domain[1]);
      const flows = linspace(lo, hi, 201);
      const ya = flows.map((f) => evaluateUnchecked(fa, f));
      const yb = flows.map((f) => evaluateUnchecked(fb, f));
      const span = Math.max(...ya) - Math.min(...ya) || Math.max(...ya.map(Math.abs));
      const worst = Math.max(...ya.map((y, i) => Math.abs(y - (yb[i] as number))));
      const flowSpan = Math.max(fa.domain[1], fb.domain[1]) - Math.min(fa.domain[0], fb.domain[0]);
      const domainPercent = (100 * Math.max(Math.abs(fa.domain[0] - fb.domain[0]), Math.abs(fa.domain[1] - fb.domain[1]))) / flowSpan;
      gaps.push({ member: `${ma.diameter_m} m`, quantity: q, percentOfSpan: (100 * worst) / span, domainPercent });
    }
  }
  return gaps;
}
