/**
 * NIST Statistical Reference Datasets, linear regression, Wampler1–5 (source NIST StRD; the
 * data and certified values are copied from REFERENCES.md). x = 0, 1, …, 20; degree-5 polynomial.
 */
import { Matrix, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitPolynomial, monomialCoefficients, monomialStandardErrors } from '../../src/fit/polyfit.ts';

const x = Array.from({ length: 21 }, (_, i) => i);
// Wampler1: y = 1 + x + x² + x³ + x⁴ + x⁵; integers, exact in double precision.
const wampler1 = x.map((v) => 1 + v + v ** 2 + v ** 3 + v ** 4 + v ** 5);
// Wampler2: y = 1 + 0.1x + … + 1e-5 x⁵. The integer numerator is exact, so one division
// gives the correctly rounded double of the exact decimal value NIST lists.
const wampler2 = x.map((v) => (100000 + 10000 * v + 1000 * v ** 2 + 100 * v ** 3 + 10 * v ** 4 + v ** 5) / 100000);
// Wampler3 adds e to Wampler1; Wampler4 adds 100·e, Wampler5 10000·e (from REFERENCES.md).
const e = [759, -2048, 2048, -2048, 2523, -2048, 2048, -2048, 1838, -2048, 2048, -2048, 1838, -2048, 2048, -2048, 2523, -2048, 2048, -2048, 759];
const withNoise = (factor: number) => wampler1.map((y, i) => y + factor * (e[i] as number));

const ones = [1, 1, 1, 1, 1, 1];
// Certified values, source NIST StRD (via REFERENCES.md).
const wampler2Certified = [1, 0.1, 0.01, 0.001, 1e-4, 1e-5];
const wampler3CertifiedSd = [2152.32624678170, 2363.55173469681, 779.343524331583, 101.475507550350, 5.64566512170752, 0.112324854679312];
const wampler3CertifiedResidualSd = 2360.14502379268;

function maxRelativeError(actual: readonly number[], expected: readonly number[]): number {
  return Math.max(...actual.map((a, i) => Math.abs(a - (expected[i] as number)) / Math.abs(expected[i] as number)));
}

/** Asserts agreement to `digits` significant digits: relative error below 0.5·10^(1−digits). */
function expectSignificantDigits(actual: number, expected: number, digits: number): void {
  expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(0.5 * 10 ** (1 - digits));
}

describe('degree-5 least squares against NIST StRD Wampler1–5', () => {
  it('recovers the Wampler1 coefficients (all 1) to 1e-8 relative or better, with residual SD near 0', () => {
    const fit = fitPolynomial(x, wampler1, 5);
    // Tolerance 1e-8 relative; certified values 1 (source NIST StRD).
    expect(maxRelativeError(monomialCoefficients(fit), ones)).toBeLessThan(1e-8);
    // Certified residual SD is 0; 1e-6 absolute against y values up to 3.4e6 (source NIST StRD).
    expect(fit.residual_sd).toBeLessThan(1e-6);
  });

  it('recovers the Wampler2 coefficients 1, 0.1, …, 1e-5 to 1e-8 relative or better', () => {
    const fit = fitPolynomial(x, wampler2, 5);
    // Tolerance 1e-8 relative per coefficient (source NIST StRD).
    expect(maxRelativeError(monomialCoefficients(fit), wampler2Certified)).toBeLessThan(1e-8);
    expect(fit.residual_sd).toBeLessThan(1e-12);
  });

  it('gives the Wampler3 coefficient SDs and residual SD to 6 significant digits, and coefficients of 1', () => {
    const fit = fitPolynomial(x, withNoise(1), 5);
    // 6 significant digits (source NIST StRD).
    monomialStandardErrors(fit).forEach((sd, i) => expectSignificantDigits(sd, wampler3CertifiedSd[i] as number, 6));
    expectSignificantDigits(fit.residual_sd, wampler3CertifiedResidualSd, 6);
    // Certified coefficients are 1 (source NIST StRD); 1e-8 relative.
    expect(maxRelativeError(monomialCoefficients(fit), ones)).toBeLessThan(1e-8);
  });

  it('fits e alone to zero coefficients, so adding k·e to Wampler1 keeps the coefficients at 1 and scales every SD by k', () => {
    // This is the scaling argument behind the Wampler4/5 certified values in REFERENCES.md:
    // least squares is linear in y, so fit(W1 + k·e) = fit(W1) + k·fit(e) = 1 + k·0, and the
    // residuals, hence s and the SDs, are k times those of e alone.
    const ofE = fitPolynomial(x, e, 5);
    const sdE = monomialStandardErrors(ofE);
    // Each coefficient of fit(e) is zero within 1e-9 of its own standard deviation.
    monomialCoefficients(ofE).forEach((c, i) => expect(Math.abs(c)).toBeLessThan(1e-9 * (sdE[i] as number)));
    // The SDs of fit(e) are the Wampler3 SDs (W1 itself has zero residual), 6 digits.
    sdE.forEach((sd, i) => expectSignificantDigits(sd, wampler3CertifiedSd[i] as number, 6));
    for (const k of [100, 10000]) {
      const scaled = monomialStandardErrors(fitPolynomial(x, e.map((v) => k * v), 5));
      // SDs scale by exactly k up to rounding: 1e-12 relative.
      scaled.forEach((sd, i) => expect(Math.abs(sd / (k * (sdE[i] as number)) - 1)).toBeLessThan(1e-12));
    }
  });

  it.each([
    ['Wampler4', 100, 1e-6],
    ['Wampler5', 10000, 1e-4],
  ])('gives the %s SDs and residual SD to 6 significant digits (Wampler3 figures × %d, from REFERENCES.md)', (_name, k, coefficientTolerance) => {
    const fit = fitPolynomial(x, withNoise(k), 5);
    monomialStandardErrors(fit).forEach((sd, i) => expectSignificantDigits(sd, k * (wampler3CertifiedSd[i] as number), 6));
    expectSignificantDigits(fit.residual_sd, k * wampler3CertifiedResidualSd, 6);
    // Certified coefficients 1 (source NIST StRD). The reachable accuracy shrinks with the
    // residual size (the κ²·‖r‖ term of least-squares sensitivity): 1e-6 relative for
    // Wampler4, 1e-4 for Wampler5; both are below 1e-9 of the coefficients' own SDs.
    expect(maxRelativeError(monomialCoefficients(fit), ones)).toBeLessThan(coefficientTolerance);
  });

  it('is far more accurate on Wampler1 than the normal equations solved on raw x', () => {
    // The normal equations XᵀX c = Xᵀy on the raw Vandermonde matrix, solved by LU.
    const raw = new Matrix(x.map((v) => [0, 1, 2, 3, 4, 5].map((k) => v ** k)));
    const naive = solve(raw.transpose().mmul(raw), raw.transpose().mmul(Matrix.columnVector(wampler1))).to1DArray();
    const naiveError = maxRelativeError(naive, ones);
    const qrError = maxRelativeError(monomialCoefficients(fitPolynomial(x, wampler1, 5)), ones);
    // The naive route misses the 1e-8 target that NIST StRD sets for double precision…
    expect(naiveError).toBeGreaterThan(1e-8);
    // …and scaled QR is at least a thousand times closer to the certified values.
    expect(qrError * 1000).toBeLessThan(naiveError);
  });
});
