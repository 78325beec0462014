import { inv, multiply, transpose } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { FitError, solveLeastSquares } from '../../src/fit/leastSquares.ts';

describe('solveLeastSquares', () => {
  it('fits a straight line with the textbook intercept, slope and standard errors', () => {
    // Points (0,1), (1,2), (2,2), (3,4). Closed-form simple regression (any statistics text):
    // slope = Sxy/Sxx = 4.5/5 = 0.9, intercept = ȳ − slope·x̄ = 2.25 − 1.35 = 0.9,
    // SSR = 0.7, s = √(0.7/2), se(slope) = s/√Sxx, se(intercept) = s·√(1/n + x̄²/Sxx).
    const result = solveLeastSquares([[1, 0], [1, 1], [1, 2], [1, 3]], [1, 2, 2, 4]);
    const s = Math.sqrt(0.7 / 2);
    // Tolerance 1e-12 absolute on exactly representable arithmetic.
    expect(result.solution[0]).toBeCloseTo(0.9, 12);
    expect(result.solution[1]).toBeCloseTo(0.9, 12);
    expect(result.ssr).toBeCloseTo(0.7, 12);
    expect(result.residualSd).toBeCloseTo(s, 12);
    expect(result.standardErrors[1]).toBeCloseTo(s / Math.sqrt(5), 12);
    expect(result.standardErrors[0]).toBeCloseTo(s * Math.sqrt(1 / 4 + 1.5 ** 2 / 5), 12);
    expect(result.residuals.map((r) => Number(r.toFixed(12)))).toEqual([0.1, 0.2, -0.7, 0.4]);
    expect(result.degreesOfFreedom).toBe(2);
    expect(result.rank).toBe(2);
  });

  it('gives the covariance s²(AᵀA)⁻¹ that mathjs computes directly on a well-conditioned matrix', () => {
    const a = [[1, 0.2, 0.5], [1, 0.9, -0.3], [1, -0.4, 0.8], [1, 0.1, 0.1], [1, 0.7, 0.6], [1, -0.8, -0.2]];
    const b = [1.3, 0.2, 2.1, 0.9, 1.7, 0.4];
    const result = solveLeastSquares(a, b);
    // Reference: mathjs inv(AᵀA) (acceptable for κ(A) of order 1, never used in src/).
    const covariance = inv(multiply(transpose(a), a) as number[][]) as number[][];
    const coefficients = multiply(covariance, multiply(transpose(a), b) as number[]) as number[];
    result.solution.forEach((x, i) => expect(x).toBeCloseTo(coefficients[i] as number, 12));
    result.standardErrors.forEach((se, i) => {
      const expected = result.residualSd * Math.sqrt((covariance[i] as number[])[i] as number);
      // 1e-12 relative.
      expect(Math.abs(se / expected - 1)).toBeLessThan(1e-12);
    });
  });

  it('reports the 2-norm condition number σ_max/σ_min of the design matrix', () => {
    // Columns orthogonal with norms 2 and 0.002: singular values 2 and 0.002, condition 1000.
    const result = solveLeastSquares([[1, 0.001], [1, -0.001], [1, 0.001], [1, -0.001]], [1, 2, 3, 4]);
    // 1e-9 relative.
    expect(Math.abs(result.condition / 1000 - 1)).toBeLessThan(1e-9);
    expect(result.singularValues[0]).toBeCloseTo(2, 12);
  });

  it('returns NaN for the residual SD and standard errors when rows equal columns', () => {
    const result = solveLeastSquares([[1, 0], [1, 1]], [3, 5]);
    expect(result.solution[0]).toBeCloseTo(3, 12);
    expect(result.solution[1]).toBeCloseTo(2, 12);
    expect(result.residualSd).toBeNaN();
    expect(result.standardErrors.every(Number.isNaN)).toBe(true);
  });

  it('refuses a rank-deficient design matrix with a sentence', () => {
    const duplicateColumns = [[1, 2], [2, 4], [3, 6]];
    expect(() => solveLeastSquares(duplicateColumns, [1, 2, 3])).toThrow(FitError);
    expect(() => solveLeastSquares(duplicateColumns, [1, 2, 3])).toThrow(
      'The 2 columns of the design matrix are not independent (numerical rank 1); use fewer terms or points with more distinct abscissae.',
    );
    // Independent only in the last bit (σ_min ≈ 2e-16 · σ_max): still refused as numerically dependent.
    expect(() => solveLeastSquares([[1, 1], [1, 1 + Number.EPSILON], [1, 1]], [1, 2, 3])).toThrow(FitError);
  });

  it('refuses fewer rows than columns, ragged rows and non-finite numbers', () => {
    expect(() => solveLeastSquares([[1, 2, 3]], [1])).toThrow('There are 1 observations for 3 unknowns; at least 3 are needed.');
    expect(() => solveLeastSquares([[1, 2], [1]], [1, 2])).toThrow('Row 2 of the design matrix has 1 entries instead of 2; every row needs the same number.');
    expect(() => solveLeastSquares([[1, 2], [1, 3]], [1, Number.NaN])).toThrow('Observation 2 is NaN, not a finite number; correct or remove it.');
    expect(() => solveLeastSquares([[1, Infinity], [1, 3]], [1, 2])).toThrow(FitError);
    expect(() => solveLeastSquares([[1, 2], [1, 3]], [1])).toThrow(FitError);
    expect(() => solveLeastSquares([], [])).toThrow('The design matrix is empty; give at least one row and one column.');
  });
});
