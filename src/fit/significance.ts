/**
 * Is one more polynomial term worth it? The partial F-test for nested least-squares models:
 *
 *   F = ((SSR_small − SSR_large) / q) / (SSR_large / ν),
 *
 * where the larger model adds q free coefficients and keeps ν = n − p_large degrees of
 * freedom. Under the null hypothesis (the added terms are zero, normal errors) F follows the
 * F(q, ν) distribution, whose upper tail is the regularized incomplete beta function:
 *
 *   P(F(q, ν) > f) = I_x(ν/2, q/2),   x = ν / (ν + q f).
 *
 * Sources: the F-test for nested linear models and the beta form of the F tail are standard
 * (e.g. Abramowitz & Stegun 26.6.2); the continued fraction for I_x is A&S 26.5.8, evaluated
 * with the modified Lentz method.
 */

/** ln Γ(x) for x > 0 (Lanczos approximation, g = 7, 9 terms; about 15 significant digits). */
export function logGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  const g = 7;
  const c = [
    0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
    12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
  ];
  const z = x - 1;
  let sum = c[0] as number;
  for (let i = 1; i < c.length; i++) sum += (c[i] as number) / (z + i);
  const t = z + g + 0.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

/** Regularized incomplete beta function I_x(a, b), 0 ≤ x ≤ 1, a, b > 0. */
export function regularizedIncompleteBeta(x: number, a: number, b: number): number {
  if (!(x >= 0 && x <= 1) || !(a > 0) || !(b > 0)) return Number.NaN;
  if (x === 0 || x === 1) return x;
  const logFront = a * Math.log(x) + b * Math.log(1 - x) - (logGamma(a) + logGamma(b) - logGamma(a + b));
  // The continued fraction converges fast for x < (a + 1)/(a + b + 2); use symmetry otherwise.
  if (x < (a + 1) / (a + b + 2)) return (Math.exp(logFront) * betaContinuedFraction(x, a, b)) / a;
  return 1 - (Math.exp(logFront) * betaContinuedFraction(1 - x, b, a)) / b;
}

function betaContinuedFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  let c = 1;
  let d = 1 - ((a + b) * x) / (a + 1);
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 300; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + m2 + 1));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const step = d * c;
    h *= step;
    if (Math.abs(step - 1) < 1e-15) break;
  }
  return h;
}

/** Upper tail P(F(d1, d2) > f) of the F distribution. */
export function fDistributionTail(f: number, d1: number, d2: number): number {
  if (f <= 0) return 1;
  if (!Number.isFinite(f)) return 0;
  return regularizedIncompleteBeta(d2 / (d2 + d1 * f), d2 / 2, d1 / 2);
}

export interface NestedFTest {
  f: number;
  /** Probability of an improvement at least this large by chance alone. */
  pValue: number;
}

/**
 * Partial F-test of a larger nested model against a smaller one.
 * @param ssrSmall sum of squared residuals of the smaller model
 * @param ssrLarge sum of squared residuals of the larger model
 * @param addedParameters q, the number of coefficients the larger model adds (≥ 1)
 * @param degreesOfFreedom ν = n − p of the larger model (≥ 1)
 */
export function nestedFTest(ssrSmall: number, ssrLarge: number, addedParameters: number, degreesOfFreedom: number): NestedFTest {
  const gain = Math.max(0, ssrSmall - ssrLarge);
  if (gain === 0) return { f: 0, pValue: 1 };
  if (ssrLarge <= 0) return { f: Infinity, pValue: 0 };
  const f = gain / addedParameters / (ssrLarge / degreesOfFreedom);
  return { f, pValue: fDistributionTail(f, addedParameters, degreesOfFreedom) };
}
