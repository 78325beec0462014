import { PolynomialRegression } from 'ml-regression-polynomial';
import { describe, expect, it } from 'vitest';
import { FitError, fitPolynomial, fittedValues, monomialCoefficients } from '../../src/fit/polyfit.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import { seededNormal } from '../helpers/random.ts';

// Invented pump-like data: head in m against flow in m³/s.
const flowsM3s = [0, 0.005, 0.01, 0.015, 0.02, 0.025, 0.03, 0.035, 0.04];
const headM = flowsM3s.map((q) => 48 + 150 * q - 12000 * q * q);

describe('fitPolynomial', () => {
  it('stores the fit in the scaled variable t = x / max|x| and spans the domain of the points', () => {
    const fit = fitPolynomial(flowsM3s, headM, 2);
    expect(fit.flow_scale).toBe(0.04);
    expect(fit.domain).toEqual([0, 0.04]);
    expect(fit.kind).toBe('polynomial');
    // Exact data: c = (48, 150·0.04, −12000·0.04²) = (48, 6, −19.2), tolerance 1e-10 absolute.
    [48, 6, -19.2].forEach((c, i) => expect(fit.coefficients[i]).toBeCloseTo(c, 10));
    expect(fit.rms).toBeLessThan(1e-12);
  });

  it('gives the same scaled coefficients and condition whatever the flow unit', () => {
    const perHour = flowsM3s.map((q) => q * 3600);
    const inSI = fitPolynomial(flowsM3s, headM, 2);
    const inM3h = fitPolynomial(perHour, headM, 2);
    // 1e-10 relative: only the rounding of the unit conversion differs.
    inSI.coefficients.forEach((c, i) => expect(Math.abs((inM3h.coefficients[i] as number) - c)).toBeLessThan(1e-10 * Math.abs(c)));
    expect(Math.abs(inM3h.condition / inSI.condition - 1)).toBeLessThan(1e-10);
  });

  it('turns scaled coefficients into plain-power coefficients c_i / s^i', () => {
    const fit = fitPolynomial(flowsM3s, headM, 2);
    const plain = monomialCoefficients(fit);
    // 1e-8 relative against the generating polynomial.
    [48, 150, -12000].forEach((a, i) => expect(Math.abs((plain[i] as number) / a - 1)).toBeLessThan(1e-8));
    expect(monomialCoefficients({ coefficients: [1, 2, 3], flow_scale: 10 })).toEqual([1, 0.2, 0.03]);
  });

  it('computes rms as √(SSR/n) and max_residual as the largest |y − fit|', () => {
    const normal = seededNormal(7);
    const noisy = headM.map((h) => h + 0.2 * normal());
    const fit = fitPolynomial(flowsM3s, noisy, 2);
    const residuals = noisy.map((y, i) => y - (fittedValues(fit, flowsM3s)[i] as number));
    // 1e-12 absolute.
    expect(fit.rms).toBeCloseTo(Math.sqrt(residuals.reduce((s, r) => s + r * r, 0) / residuals.length), 12);
    expect(fit.max_residual).toBeCloseTo(Math.max(...residuals.map(Math.abs)), 12);
    expect(fit.residual_sd).toBeCloseTo(Math.sqrt(residuals.reduce((s, r) => s + r * r, 0) / (9 - 3)), 12);
    expect(fit.parameters).toBe(3);
    expect(fit.points).toBe(9);
  });

  it('holds the constant at zero through the origin and agrees with ml-regression-polynomial there', () => {
    // Invented efficiency curve, fraction against m³/s, with seeded noise.
    const normal = seededNormal(11);
    const qs = [0.004, 0.008, 0.012, 0.016, 0.02, 0.024, 0.028, 0.032, 0.036, 0.04];
    const eta = qs.map((q) => 55 * q - 900 * q * q + normal() * 0.004);
    const fit = fitPolynomial(qs, eta, 2, { throughOrigin: true });
    expect(fit.coefficients[0]).toBe(0);
    expect(fit.standard_errors[0]).toBe(0);
    expect(fit.through_origin).toBe(true);
    expect(fit.parameters).toBe(2);
    expect(evaluateUnchecked(fit, 0)).toBe(0);
    // Reference library: ml-regression-polynomial with interceptAtZero (normal equations,
    // adequate at degree 2 on the scaled abscissa). Tolerance 1e-9 relative.
    const reference = new PolynomialRegression(qs.map((q) => q / fit.flow_scale), eta, 2, { interceptAtZero: true });
    [1, 2].forEach((power, k) => {
      const expected = reference.coefficients[k] as number;
      expect(reference.powers[k]).toBe(power);
      expect(Math.abs((fit.coefficients[power] as number) / expected - 1)).toBeLessThan(1e-9);
    });
  });

  it('refuses bad input with one sentence naming what is needed', () => {
    expect(() => fitPolynomial([1, 2, 3], [1, 2], 1)).toThrow('There are 3 abscissae but 2 values; give one value per abscissa.');
    expect(() => fitPolynomial([1, Number.NaN, 3], [1, 2, 3], 1)).toThrow('Point 2 has an abscissa of NaN, not a finite number; correct or remove that point.');
    expect(() => fitPolynomial([1, 2, 3], [1, 2, Infinity], 1)).toThrow('Point 3 has a value of Infinity, not a finite number; correct or remove that point.');
    expect(() => fitPolynomial([1, 2, 3], [1, 2, 3], 3)).toThrow('A degree-3 fit needs at least 4 points; got 3.');
    expect(() => fitPolynomial([1, 2], [1, 2], 3, { throughOrigin: true })).toThrow('A degree-3 fit through the origin needs at least 3 points; got 2.');
    expect(() => fitPolynomial([1, 1, 2, 2, 2], [1, 2, 3, 4, 5], 2)).toThrow('A degree-2 fit needs at least 3 distinct abscissae; the 5 points have only 2.');
    expect(() => fitPolynomial([0, 0, 1, 2], [0, 0, 1, 2], 3, { throughOrigin: true })).toThrow(
      'A degree-3 fit through the origin needs at least 3 distinct non-zero abscissae; the 4 points have only 2.',
    );
    expect(() => fitPolynomial([1, 2, 3], [1, 2, 3], 1.5)).toThrow('The degree must be a whole number of at least 0; got 1.5.');
    expect(() => fitPolynomial([1, 2, 3], [1, 2, 3], 0, { throughOrigin: true })).toThrow(FitError);
  });

  it('fits a constant when all abscissae are zero and the degree is 0', () => {
    const fit = fitPolynomial([0, 0, 0], [2, 4, 6], 0);
    expect(fit.flow_scale).toBe(1);
    expect(fit.coefficients[0]).toBeCloseTo(4, 12);
  });
});
