import { gamma } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { fDistributionTail, logGamma, nestedFTest, regularizedIncompleteBeta } from '../../src/fit/significance.ts';

describe('F-test for one more polynomial term', () => {
  it('logGamma agrees with mathjs gamma', () => {
    // Reference library: mathjs gamma. Tolerance 1e-13 relative on Γ.
    for (const x of [0.5, 1, 1.5, 2.5, 3, 7.25, 12, 30.5]) {
      expect(Math.abs(Math.exp(logGamma(x)) / (gamma(x) as number) - 1)).toBeLessThan(1e-13);
    }
  });

  it('regularized incomplete beta has the closed forms of small integer parameters', () => {
    // I_x(1, 1) = x;  I_x(a, 1) = x^a;  I_x(1, b) = 1 − (1 − x)^b (from the definition). 1e-13.
    for (const x of [0.05, 0.3, 0.5, 0.77, 0.99]) {
      expect(regularizedIncompleteBeta(x, 1, 1)).toBeCloseTo(x, 13);
      expect(regularizedIncompleteBeta(x, 3.5, 1)).toBeCloseTo(x ** 3.5, 13);
      expect(regularizedIncompleteBeta(x, 1, 4)).toBeCloseTo(1 - (1 - x) ** 4, 13);
    }
    expect(regularizedIncompleteBeta(0, 2, 3)).toBe(0);
    expect(regularizedIncompleteBeta(1, 2, 3)).toBe(1);
  });

  it('F tail matches the exact forms for one and two degrees of freedom', () => {
    // F(1, ν) = t²(ν). ν = 1 is the Cauchy law: P(|t| > s) = 1 − (2/π)·atan(s).
    // ν = 2: P(|t| > s) = 1 − s/√(2 + s²). F(2, ν): P(F > f) = (1 + 2f/ν)^(−ν/2).
    // All three follow from the densities (any statistics text). Tolerance 1e-12 absolute.
    for (const s of [0.3, 1, 2.5, 8]) {
      expect(fDistributionTail(s * s, 1, 1)).toBeCloseTo(1 - (2 / Math.PI) * Math.atan(s), 12);
      expect(fDistributionTail(s * s, 1, 2)).toBeCloseTo(1 - s / Math.sqrt(2 + s * s), 12);
      for (const nu of [3, 10, 40]) expect(fDistributionTail(s, 2, nu)).toBeCloseTo((1 + (2 * s) / nu) ** (-nu / 2), 12);
    }
  });

  it('puts the 95 % point of F(1, 10) at the tabulated 4.96', () => {
    // 4.96 is the usual table value of F(0.95; 1, 10) (from memory); 3 digits given, so ±0.002 in p.
    expect(Math.abs(fDistributionTail(4.9646, 1, 10) - 0.05)).toBeLessThan(0.002);
  });

  it('calls a large drop in SSR significant and a small one not', () => {
    expect(nestedFTest(100, 10, 1, 12).pValue).toBeLessThan(0.001);
    expect(nestedFTest(10, 9.8, 1, 12).pValue).toBeGreaterThan(0.5);
    expect(nestedFTest(10, 10, 1, 12)).toEqual({ f: 0, pValue: 1 });
    expect(nestedFTest(10, 0, 1, 12)).toEqual({ f: Infinity, pValue: 0 });
  });
});
