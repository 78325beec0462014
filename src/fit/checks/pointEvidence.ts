/**
 * A fit answers to its points: which captured points does a curve miss by far more than
 * the reading accuracy?
 *
 * A least-squares fit is pulled toward a wrong point (a mistyped row, a guide that caught a
 * label), so the residual of the full fit can hide it (masking) or blame its neighbours.
 * Each suspect point is therefore judged against the curve fitted WITHOUT it (deletion
 * residual, as in the externally studentized residual of regression diagnostics; Belsley,
 * Kuh & Welsch, "Regression Diagnostics", 1980), on the same degree rule as the build.
 *
 * Its miss is measured against a robust scale of the other points' residuals:
 *   σ = max(1.4826 · MAD, reading accuracy)
 * 1.4826 · MAD estimates the standard deviation of normal scatter and ignores a minority of
 * wild points (Hampel 1974; Rousseeuw & Croux, JASA 88, 1993). The floor at the reading
 * accuracy keeps exact vector geometry (MAD near zero) from turning rounding into findings.
 *
 * A point is off its curve when its deletion miss exceeds OFF_CURVE_FACTOR · σ. The factor 10
 * sits far beyond the 3.5 of the modified z-score rule (Iglewicz & Hoaglin, "How to Detect
 * and Handle Outliers", 1993): reading scatter at the stated accuracy essentially never
 * reaches 10 σ (normal tail about 1e-23; a uniform reading error of ± accuracy·√3 never).
 * The margin is for the end points, judged by extrapolating the curve through the others
 * one point spacing further: on the invented demo families (24 seeds, 3 noise levels) that
 * reaches 5.7 σ at worst, on the committed sample sheets 1.7 σ (tests/fit/pointEvidence.test.ts).
 * A mistyped row is usually tens to thousands of σ off.
 */
import type { CurvePoint, PolynomialFit, Quantity } from '../../model/curveset.ts';
import { fitCurve } from '../chooseDegree.ts';
import { evaluateUnchecked } from '../polynomial.ts';

export const OFF_CURVE_FACTOR = 10;
/** Scale factor from the median absolute deviation to σ for normal scatter (1/Φ⁻¹(3/4)). */
export const MAD_TO_SIGMA = 1.4826;
/**
 * The deletion test runs only when the fit as built misses some point by more than this many
 * reading accuracies; below it no point is "far" off, and the refits would be wasted.
 */
const SUSPECT_FACTOR = 3;
/** Up to this many points are tested one by one; above it only the worst residuals are. */
const FULL_SCAN = 60;
const WORST_TESTED = 12;

export interface PointMiss {
  /** Index into the points as given. */
  index: number;
  flow: number;
  value: number;
  /** The curve fitted without this point, at its flow (extrapolated when it lies outside). */
  expected: number;
  /** value − expected, SI. */
  miss: number;
  /** The robust scale σ of the other points' residuals, SI. */
  scale: number;
}

export function median(values: readonly number[]): number {
  if (values.length === 0) return NaN;
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? (s[m] as number) : 0.5 * ((s[m - 1] as number) + (s[m] as number));
}

/** 1.4826 · median |r − median r|: σ of normal scatter, unmoved by a minority of wild values. */
export function robustScale(residuals: readonly number[]): number {
  const mid = median(residuals);
  return MAD_TO_SIGMA * median(residuals.map((r) => Math.abs(r - mid)));
}

export function residualsOf(fit: Pick<PolynomialFit, 'coefficients' | 'flow_scale'>, points: readonly CurvePoint[]): number[] {
  return points.map(([q, y]) => y - evaluateUnchecked(fit, q));
}

/** The fit chosen by the build's degree rule, or undefined when these points cannot be fitted. */
function refit(points: readonly CurvePoint[], quantity: Quantity, tolerance: number): PolynomialFit | undefined {
  try {
    return fitCurve(points, quantity, { tolerance });
  } catch (error) {
    if (error instanceof Error && error.name === 'FitError') return undefined;
    throw error;
  }
}

/**
 * The points the curve misses by far more than the reading accuracy, worst first. `fit` is
 * the curve as built from all `points`; `tolerance` is the reading accuracy (SI). At most a
 * tenth of the points (at least one) can be named: a curve that misses more of its points
 * than that is a bad fit, not a few bad points (see `fitMissesAccuracy`).
 */
export function pointsOffTheirCurve(points: readonly CurvePoint[], fit: PolynomialFit, quantity: Quantity, tolerance: number): PointMiss[] {
  if (points.length < 5 || !(tolerance > 0)) return [];
  const full = residualsOf(fit, points);
  if (!full.some((r) => Math.abs(r) > SUSPECT_FACTOR * tolerance)) return [];

  const found: PointMiss[] = [];
  const kept = points.map((_, i) => i);
  let current = full;
  const most = Math.max(1, Math.floor(points.length / 10));
  while (found.length < most && kept.length >= 5) {
    const order = kept.map((i, k) => ({ i, r: Math.abs(current[k] as number) })).sort((a, b) => b.r - a.r);
    const tested = kept.length <= FULL_SCAN ? order : order.slice(0, WORST_TESTED);
    let worst: (PointMiss & { ratio: number; fit: PolynomialFit }) | undefined;
    for (const { i } of tested) {
      const others = kept.filter((k) => k !== i);
      const without = refit(others.map((k) => points[k] as CurvePoint), quantity, tolerance);
      if (!without) continue;
      const rest = residualsOf(without, others.map((k) => points[k] as CurvePoint));
      const scale = Math.max(robustScale(rest), tolerance);
      const [flow, value] = points[i] as CurvePoint;
      const expected = evaluateUnchecked(without, flow);
      const miss = value - expected;
      const ratio = Math.abs(miss) / scale;
      if (Number.isFinite(ratio) && (!worst || ratio > worst.ratio)) worst = { index: i, flow, value, expected, miss, scale, ratio, fit: without };
    }
    if (!worst || worst.ratio <= OFF_CURVE_FACTOR) break;
    const { ratio: _ratio, fit: without, ...miss } = worst;
    found.push(miss);
    kept.splice(kept.indexOf(worst.index), 1);
    current = residualsOf(without, kept.map((k) => points[k] as CurvePoint));
  }
  return found;
}

/**
 * A fit misses its own stated accuracy when its RMS residual is more than this many reading
 * accuracies: warn beyond 2 (the reading error claimed for the sheet is not what its points
 * show; on the committed samples and invented families the RMS stays within 1.0 reading
 * accuracies), fail beyond 5 (the curve no longer describes its points; a mistyped row or a
 * trace that jumped to another line). Common practice for acceptance of a curve reading.
 */
export const MISS_WARN = 2;
export const MISS_FAIL = 5;

export function fitMissesAccuracy(fit: Pick<PolynomialFit, 'rms'>, tolerance: number): 'warn' | 'fail' | undefined {
  if (!(tolerance > 0)) return undefined;
  const ratio = fit.rms / tolerance;
  return ratio > MISS_FAIL ? 'fail' : ratio > MISS_WARN ? 'warn' : undefined;
}
