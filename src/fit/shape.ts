/**
 * Shape tests for a fitted pump curve: the fit may follow the points within the reading
 * accuracy and still wiggle between them. These tests say, in words, what is wrong with a
 * shape; an empty list means the shape is plausible for the quantity.
 *
 * Rules (common practice for reading pump curves):
 * - head: no minimum inside the domain; at most one maximum, and only where the captured
 *   points themselves rise to it from shutoff (a drooping curve); a maximum that stays
 *   within the resolution of the lowest-flow reading counts as level;
 * - efficiency: never negative on the domain; no minimum inside it; at most one maximum (the BEP);
 * - power and NPSHr: at most one extremum inside the domain (power may peak, NPSHr often has a
 *   minimum);
 * - every quantity: at most one inflection (a sign change of d²y/dQ²); two or more mean the
 *   fit oscillates.
 * A stationary point whose rise or dip is within what the points can resolve — the larger of
 * the reading accuracy and the fit's own RMS residual — is treated as level ground: the points
 * can neither confirm nor refute it (a flat shutoff otherwise gets a hump at every degree, and a
 * coarse fit would lose to a straight line over a hump far smaller than its own misfit).
 * Oscillations too small to make an extremum count are still caught by the inflection rule.
 */
import type { PolynomialFit, Quantity } from '../model/curveset.ts';
import { evaluateUnchecked, linspace, stationaryPoints } from './polynomial.ts';

type Poly = Pick<PolynomialFit, 'coefficients' | 'flow_scale'>;

export interface Extremum {
  flow: number;
  kind: 'maximum' | 'minimum';
  value: number;
  /** Smaller of the rise or fall to the neighbouring stationary points or domain ends. */
  prominence: number;
}

/** d²y/dQ². */
export function secondDerivative(fit: Poly, q: number): number {
  const t = q / fit.flow_scale;
  const c = fit.coefficients;
  let y = 0;
  for (let i = c.length - 1; i >= 2; i--) y = y * t + i * (i - 1) * (c[i] as number);
  return y / (fit.flow_scale * fit.flow_scale);
}

/** Local extrema strictly inside (a, b), in order of flow. */
export function interiorExtrema(fit: Poly, a: number, b: number): Extremum[] {
  const flows = stationaryPoints(fit, a, b);
  const values = flows.map((q) => evaluateUnchecked(fit, q));
  const ends = [evaluateUnchecked(fit, a), ...values, evaluateUnchecked(fit, b)];
  return flows.map((q, i) => {
    const value = values[i] as number;
    const left = ends[i] as number;
    const right = ends[i + 2] as number;
    // Between two stationary points the curve is monotone, so the neighbours tell the kind.
    const kind = value >= Math.max(left, right) || (value > Math.min(left, right) && secondDerivative(fit, q) < 0) ? 'maximum' : 'minimum';
    return { flow: q, kind, value, prominence: Math.min(Math.abs(value - left), Math.abs(value - right)) };
  });
}

/** Flows inside (a, b) where d²y/dQ² changes sign, located to within one sample interval. */
export function inflections(fit: Poly, a: number, b: number, samples = 400): number[] {
  const qs = linspace(a, b, samples + 1);
  const out: number[] = [];
  let previousSign = 0;
  let previousQ = a;
  for (const q of qs) {
    const sign = Math.sign(secondDerivative(fit, q));
    if (sign === 0) continue;
    if (previousSign !== 0 && sign !== previousSign) out.push(0.5 * (previousQ + q));
    previousSign = sign;
    previousQ = q;
  }
  return out;
}

/** Smallest value of the fit on [a, b] (ends and interior minima). */
export function lowestValue(fit: Poly, a: number, b: number): { flow: number; value: number } {
  const candidates = [a, b, ...stationaryPoints(fit, a, b)];
  let best = { flow: a, value: Infinity };
  for (const q of candidates) {
    const value = evaluateUnchecked(fit, q);
    if (value < best.value) best = { flow: q, value };
  }
  return best;
}

export interface ShapeContext {
  /** Captured points [flow m³/s, value SI], any order. */
  points: readonly (readonly [number, number])[];
  /** Reading accuracy in the SI unit of the quantity. */
  tolerance: number;
  /** Formats a value of the quantity with its unit, for the sentences. */
  formatValue: (v: number) => string;
  /** Formats a flow with its unit. */
  formatFlow: (q: number) => string;
}

/** What is implausible about the shape of `fit` on its domain; empty when nothing is. */
export function shapeProblems(
  fit: Pick<PolynomialFit, 'coefficients' | 'flow_scale' | 'domain'> & { rms?: number },
  quantity: Quantity,
  context: ShapeContext,
): string[] {
  const [a, b] = fit.domain;
  const flat = Math.max(context.tolerance, fit.rms ?? 0);
  const all = interiorExtrema(fit, a, b);
  const extrema = all.filter((e) => e.prominence > flat);
  const maxima = extrema.filter((e) => e.kind === 'maximum');
  const minima = extrema.filter((e) => e.kind === 'minimum');
  const at = (list: Extremum[]) => list.map((e) => context.formatFlow(e.flow)).join(', ');
  const problems: string[] = [];

  if (quantity === 'head' || quantity === 'efficiency') {
    if (minima.length > 0) problems.push(`${minima.length === 1 ? 'a minimum' : `${minima.length} minima`} at ${at(minima)}`);
    if (maxima.length > 1) problems.push(`${maxima.length} maxima at ${at(maxima)}`);
  }
  if (quantity === 'head' && maxima.length <= 1) {
    // A hump is judged against the reading at the lowest flow, not against the fit there: a
    // coarse fit often sits below its first point. It matters when the fit rises above that
    // reading by more than the resolution, and it is real (a drooping curve) only when the
    // points themselves rise to it — the peak stands no more than the resolution above the
    // highest point — with at least two of them before the peak. (Asking the points to rise by
    // more than the resolution as well refused a real droop of about the resolution: a drawn
    // head curve rising 0.011 m to its peak against 0.011 m fell back to a straight line.)
    const peak = all
      .filter((e) => e.kind === 'maximum')
      .reduce<Extremum | undefined>((best, e) => (best === undefined || e.value > best.value ? e : best), undefined);
    const first = [...context.points].sort((p, r) => p[0] - r[0])[0];
    if (peak && first && peak.value - first[1] > flat) {
      const before = context.points.filter(([q]) => q < peak.flow).length;
      const overshoot = peak.value - Math.max(...context.points.map(([, y]) => y));
      if (before < 2 || overshoot > flat) problems.push(`a maximum at ${context.formatFlow(peak.flow)} that the points do not rise to from shutoff`);
    }
  }
  if (quantity === 'efficiency') {
    const lowest = lowestValue(fit, a, b);
    if (lowest.value < 0) problems.push(`negative efficiency, ${context.formatValue(lowest.value)} at ${context.formatFlow(lowest.flow)}`);
  }
  if ((quantity === 'power' || quantity === 'npshr') && extrema.length > 1) {
    problems.push(`${extrema.length} extrema at ${at(extrema)}`);
  }
  const bends = inflections(fit, a, b);
  if (bends.length > 1) problems.push(`an oscillation with ${bends.length} inflections at ${bends.map(context.formatFlow).join(', ')}`);
  return problems;
}
