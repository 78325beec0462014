/**
 * Small root and extremum finders on a closed interval for the smooth functions of the duty
 * engine (pump minus system head, power along a curve). Sampling first, so that every sign
 * change is seen, then bisection to machine precision.
 */

/** All roots of f on [a, b] where f changes sign between `samples` even steps, in ascending order. */
export function rootsOn(f: (x: number) => number, a: number, b: number, samples = 200): number[] {
  const out: number[] = [];
  if (!(b > a)) return out;
  let x0 = a;
  let f0 = f(a);
  if (f0 === 0) out.push(a);
  for (let i = 1; i <= samples; i++) {
    const x1 = a + ((b - a) * i) / samples;
    const f1 = f(x1);
    if (f1 === 0) out.push(x1);
    else if (f0 !== 0 && Number.isFinite(f0) && Number.isFinite(f1) && f0 * f1 < 0) out.push(bisect(f, x0, x1, f0));
    x0 = x1;
    f0 = f1;
  }
  return out;
}

/**
 * The largest root `rootsOn(f, a, b, samples)` finds, or undefined when it finds none: the same
 * value to the last bit (the same sample flows and the same bisection), found by walking the
 * samples down from b, so that the samples below the last root are never evaluated.
 */
export function lastRootOn(f: (x: number) => number, a: number, b: number, samples = 200): number | undefined {
  if (!(b > a)) return undefined;
  if (!(samples >= 1)) return f(a) === 0 ? a : undefined;
  let x1 = a + ((b - a) * samples) / samples;
  let f1 = f(x1);
  for (let i = samples; i >= 1; i--) {
    if (f1 === 0) return x1;
    const x0 = i === 1 ? a : a + ((b - a) * (i - 1)) / samples;
    const f0 = f(x0);
    if (f0 !== 0 && Number.isFinite(f0) && Number.isFinite(f1) && f0 * f1 < 0) return bisect(f, x0, x1, f0);
    x1 = x0;
    f1 = f0;
  }
  return f1 === 0 ? a : undefined;
}

/** Bisection on [lo, hi] where f(lo) and f(hi) differ in sign; `flo` saves one evaluation. */
export function bisect(f: (x: number) => number, lo: number, hi: number, flo = f(lo)): number {
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    const fm = f(mid);
    if (fm === 0) return mid;
    if (flo * fm < 0) hi = mid;
    else {
      lo = mid;
      flo = fm;
    }
  }
  return 0.5 * (lo + hi);
}

/**
 * Largest value of f on [a, b]: dense sampling, then golden-section refinement around the best
 * sample. Non-finite samples are skipped. Returns null when no sample is finite.
 */
export function maximumOn(f: (x: number) => number, a: number, b: number, samples = 200): { x: number; value: number } | null {
  let bestX = Number.NaN;
  let bestY = -Infinity;
  const step = (b - a) / samples;
  for (let i = 0; i <= samples; i++) {
    const x = a + step * i;
    const y = f(x);
    if (Number.isFinite(y) && y > bestY) {
      bestY = y;
      bestX = x;
    }
  }
  if (!Number.isFinite(bestY)) return null;
  let lo = Math.max(a, bestX - step);
  let hi = Math.min(b, bestX + step);
  const ratio = (Math.sqrt(5) - 1) / 2;
  for (let k = 0; k < 60 && hi - lo > 1e-12 * Math.max(1, Math.abs(hi)); k++) {
    const x1 = hi - ratio * (hi - lo);
    const x2 = lo + ratio * (hi - lo);
    const y1 = f(x1);
    const y2 = f(x2);
    if (!(Number.isFinite(y1) && Number.isFinite(y2))) break;
    if (y1 >= y2) hi = x2;
    else lo = x1;
  }
  const x = 0.5 * (lo + hi);
  const y = f(x);
  return Number.isFinite(y) && y > bestY ? { x, value: y } : { x: bestX, value: bestY };
}
