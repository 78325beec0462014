/**
 * Evaluating a fitted polynomial curve y(Q) = Σ c_i (Q/s)^i (see model/curveset.ts).
 * Evaluation never hides extrapolation: `evaluate` returns a flag, `evaluateWithin`
 * refuses, and only `evaluateUnchecked` (for plotting beyond the domain on purpose) is silent.
 */
import { UserError } from '../model/errors.ts';
import type { PolynomialFit } from '../model/curveset.ts';

export interface Evaluation {
  value: number;
  /** True when Q lies outside the fitted domain (beyond a relative slack of 1e-9). */
  extrapolated: boolean;
}

/** Thrown when a caller insists on the fitted domain and Q lies outside it. */
export class ExtrapolationError extends UserError {
  override name = 'ExtrapolationError';
}

/** Horner evaluation in the scaled variable t = Q / s. */
export function evaluateUnchecked(fit: Pick<PolynomialFit, 'coefficients' | 'flow_scale'>, q: number): number {
  const t = q / fit.flow_scale;
  const c = fit.coefficients;
  let y = 0;
  for (let i = c.length - 1; i >= 0; i--) y = y * t + (c[i] as number);
  return y;
}

/** dy/dQ. */
export function derivative(fit: Pick<PolynomialFit, 'coefficients' | 'flow_scale'>, q: number): number {
  const t = q / fit.flow_scale;
  const c = fit.coefficients;
  let y = 0;
  for (let i = c.length - 1; i >= 1; i--) y = y * t + i * (c[i] as number);
  return y / fit.flow_scale;
}

export function inDomain(fit: Pick<PolynomialFit, 'domain'>, q: number): boolean {
  const [lo, hi] = fit.domain;
  const slack = 1e-9 * Math.max(Math.abs(hi), 1e-12);
  return q >= lo - slack && q <= hi + slack;
}

export function evaluate(fit: PolynomialFit, q: number): Evaluation {
  return { value: evaluateUnchecked(fit, q), extrapolated: !inDomain(fit, q) };
}

/** Evaluates inside the domain; throws ExtrapolationError outside it. */
export function evaluateWithin(fit: PolynomialFit, q: number, what = 'curve'): number {
  if (!inDomain(fit, q)) {
    const [lo, hi] = fit.domain;
    throw new ExtrapolationError(
      `The ${what} is fitted for flows ${lo.toPrecision(4)}…${hi.toPrecision(4)} m³/s; ${q.toPrecision(4)} m³/s lies outside it.`,
    );
  }
  return evaluateUnchecked(fit, q);
}

/** n evenly spaced flows over [a, b], ends included. */
export function linspace(a: number, b: number, n: number): number[] {
  if (n < 2) return [a];
  return Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));
}

/**
 * Flows inside [a, b] where dy/dQ changes sign (local extrema), found by sampling
 * `samples` intervals and bisecting each sign change.
 */
export function stationaryPoints(fit: Pick<PolynomialFit, 'coefficients' | 'flow_scale'>, a: number, b: number, samples = 400): number[] {
  const out: number[] = [];
  const qs = linspace(a, b, samples + 1);
  for (let i = 0; i < samples; i++) {
    let lo = qs[i] as number;
    let hi = qs[i + 1] as number;
    let dlo = derivative(fit, lo);
    const dhi = derivative(fit, hi);
    if (dlo === 0) {
      // Stationary exactly on a sample: an extremum only if the slope changes sign across it.
      // At the start of the range it is an end point, not an interior one.
      if (i > 0 && derivative(fit, qs[i - 1] as number) * dhi < 0) out.push(lo);
      continue;
    }
    if (dlo * dhi > 0) continue;
    if (dhi === 0) continue; // picked up as dlo === 0 of the next interval, or at the end
    for (let k = 0; k < 60; k++) {
      const mid = 0.5 * (lo + hi);
      const dm = derivative(fit, mid);
      if (dm === 0) { lo = hi = mid; break; }
      if (dlo * dm < 0) hi = mid; else { lo = mid; dlo = dm; }
    }
    const q = 0.5 * (lo + hi);
    if (q > a && q < b) out.push(q);
  }
  return out;
}

/** Flow of the largest value of y on [a, b] (ends included). */
export function argMax(fit: Pick<PolynomialFit, 'coefficients' | 'flow_scale'>, a: number, b: number): number {
  const candidates = [a, b, ...stationaryPoints(fit, a, b)];
  let best = a;
  let bestY = -Infinity;
  for (const q of candidates) {
    const y = evaluateUnchecked(fit, q);
    if (y > bestY) { bestY = y; best = q; }
  }
  return best;
}

/** Flows in [a, b] where y(Q) = target, by sampling and bisection. */
export function solveFor(fit: Pick<PolynomialFit, 'coefficients' | 'flow_scale'>, target: number, a: number, b: number, samples = 400): number[] {
  const f = (q: number) => evaluateUnchecked(fit, q) - target;
  const out: number[] = [];
  const qs = linspace(a, b, samples + 1);
  for (let i = 0; i < samples; i++) {
    let lo = qs[i] as number;
    let hi = qs[i + 1] as number;
    let flo = f(lo);
    const fhi = f(hi);
    if (flo === 0) { out.push(lo); continue; }
    if (i === samples - 1 && fhi === 0) { out.push(hi); continue; }
    if (flo * fhi > 0) continue;
    for (let k = 0; k < 80; k++) {
      const mid = 0.5 * (lo + hi);
      const fm = f(mid);
      if (flo * fm <= 0) hi = mid; else { lo = mid; flo = fm; }
    }
    out.push(0.5 * (lo + hi));
  }
  return out;
}
