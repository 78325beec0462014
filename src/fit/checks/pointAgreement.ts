/**
 * Do the stored fits still describe the stored points? A curve set is a file that can be
 * edited, merged or produced by another program; `check` recomputes each fit's residuals at
 * its own points instead of trusting the RMS written beside it.
 *
 * `points.fit-disagrees` (fail) when the recomputed RMS exceeds the stated RMS by more than
 * one reading accuracy, or the recomputed largest residual exceeds the stated one by more
 * than two. The reading accuracy is the build's default (0.4 % of the family's largest value
 * of the quantity, 0.5 point of efficiency; common practice), the loosest one a fit is made
 * for, so rounding in a file written by another program never trips it, while a fit scaled,
 * shifted or copied from another curve does (halving an NPSHr fit misses by about 100 times).
 */
import type { CurveSet, Finding, Quantity } from '../../model/curveset.ts';
import { QUANTITIES, QUANTITY_WORDS } from '../../model/curveset.ts';
import type { Display } from './display.ts';
import { makeFinding } from './finding.ts';
import { valueText } from './fitEvidence.ts';
import { residualsOf } from './pointEvidence.ts';

const NAMES = QUANTITY_WORDS;

/** The build's default reading accuracy for a quantity of this family (SI). */
export function defaultReadingAccuracy(set: Pick<CurveSet, 'members'>, quantity: Quantity): number {
  if (quantity === 'efficiency') return 0.005;
  let largest = 0;
  for (const m of set.members) for (const p of m.curves[quantity]?.points ?? []) largest = Math.max(largest, Math.abs(p[1]));
  return largest > 0 ? 0.004 * largest : 1e-9;
}

export function pointAgreementFindings(set: Pick<CurveSet, 'members'>, show: Display): Finding[] {
  const out: Finding[] = [];
  for (const quantity of QUANTITIES) {
    const tolerance = defaultReadingAccuracy(set, quantity);
    for (const m of set.members) {
      const curve = m.curves[quantity];
      const fit = curve?.fit;
      if (!curve || !fit || curve.points.length === 0) continue;
      const residuals = residualsOf(fit, curve.points);
      let ss = 0;
      let worst = 0;
      let worstAt = 0;
      residuals.forEach((r, i) => {
        ss += r * r;
        if (!(Math.abs(r) <= Math.abs(worst))) {
          worst = r;
          worstAt = i;
        }
      });
      const rms = Math.sqrt(ss / residuals.length);
      if (!Number.isFinite(rms)) {
        out.push(
          makeFinding({
            code: 'points.fit-disagrees',
            severity: 'fail',
            member: m,
            quantity,
            message: `The ${show.member(m)} ${NAMES[quantity]} fit gives no finite value at some of its own ${curve.points.length} points (its coefficients overflow there); build the set again from its points or take-off.`,
            method: 'Residuals of the stored fit recomputed at the stored points',
            figures: { points: curve.points.length },
          }),
        );
        continue;
      }
      if (rms <= fit.rms + tolerance && Math.abs(worst) <= fit.max_residual + 2 * tolerance) continue;
      const [q, y] = curve.points[worstAt] as [number, number];
      const diff = (v: number) => (quantity === 'efficiency' ? `${show.efficiency(Math.abs(v)).replace(' %', '')} points` : valueText(show, quantity, Math.abs(v)));
      out.push(
        makeFinding({
          code: 'points.fit-disagrees',
          severity: 'fail',
          member: m,
          quantity,
          message:
            `The ${show.member(m)} ${NAMES[quantity]} fit does not describe its own ${curve.points.length} points: it misses them by ${diff(rms)} RMS where the file states ${diff(fit.rms)}, ` +
            `worst at ${show.flow(q)} (point ${valueText(show, quantity, y)}, fit ${valueText(show, quantity, y - worst)}). The fit or the points were changed after the build; build the set again from its points or take-off.`,
          method: 'Residuals of the stored fit recomputed at the stored points, against the stated RMS and largest residual plus the reading accuracy (0.4 % of the largest value, 0.5 point of efficiency; common practice)',
          figures: { rms_recomputed: rms, rms_stated: fit.rms, max_residual_recomputed: Math.abs(worst), max_residual_stated: fit.max_residual, reading_accuracy: tolerance },
        }),
      );
    }
  }
  return out;
}
