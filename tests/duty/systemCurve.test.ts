import { describe, expect, it } from 'vitest';
import { fitSystemCurve, systemCurveThroughDuty, systemHead } from '../../src/duty/systemCurve.ts';
import { DutyError } from '../../src/duty/errors.ts';

describe('systemCurveThroughDuty', () => {
  it('passes through the static head at zero flow and through the duty point', () => {
    const s = systemCurveThroughDuty(12, 0.03, 30);
    expect(systemHead(s, 0)).toBe(12);
    expect(Math.abs(systemHead(s, 0.03) - 30)).toBeLessThan(1e-12);
    expect(Math.abs(s.k - 18 / 0.0009)).toBeLessThan(1e-6); // k = (H_d − Hs)/Q_d², exact arithmetic
  });

  it('uses the exponent it is given', () => {
    const s = systemCurveThroughDuty(0, 0.02, 10, 1.852);
    expect(Math.abs(systemHead(s, 0.04) - 10 * 2 ** 1.852)).toBeLessThan(1e-9);
  });

  it('refuses a duty head below the static head with a DutyError', () => {
    expect(() => systemCurveThroughDuty(40, 0.03, 30)).toThrow(DutyError);
    expect(() => systemCurveThroughDuty(0, 0, 30)).toThrow(/positive/);
  });
});

describe('fitSystemCurve', () => {
  const truth = { hs: 8, k: 15000, n: 1.85 };
  const table = [0, 0.01, 0.02, 0.03, 0.04, 0.05].map((q) => [q, truth.hs + truth.k * q ** truth.n] as [number, number]);

  it('recovers Hs, k and n from exact points within 1e-6 relative', () => {
    const s = fitSystemCurve(table);
    expect(Math.abs(s.static_head_m - truth.hs)).toBeLessThan(1e-5);
    expect(Math.abs(s.exponent - truth.n)).toBeLessThan(1e-6);
    expect(Math.abs(s.k / truth.k - 1)).toBeLessThan(1e-5);
    expect(s.fit?.rms_m).toBeLessThan(1e-6);
  });

  it('holds the static head when asked, and fits k alone when n is held too', () => {
    const s = fitSystemCurve(table.slice(1, 3), { static_head_m: 8, exponent: 1.85 });
    expect(Math.abs(s.k / truth.k - 1)).toBeLessThan(1e-12);
    expect(s.static_head_m).toBe(8);
  });

  it('reports the residuals of noisy points', () => {
    const noisy = table.map(([q, h], i) => [q, h + (i % 2 === 0 ? 0.2 : -0.2)] as [number, number]);
    const s = fitSystemCurve(noisy, { exponent: 1.85 });
    expect(s.fit?.rms_m).toBeGreaterThan(0.05);
    expect(s.fit?.max_residual_m).toBeLessThan(0.4); // noise is ±0.2 m
  });

  it('needs three distinct flows when Hs and n are both free', () => {
    expect(() => fitSystemCurve(table.slice(0, 2))).toThrow(/at least 3 points/);
  });

  it('refuses a table whose head falls with flow', () => {
    expect(() => fitSystemCurve([[0, 30], [0.01, 25], [0.02, 20]], { exponent: 2 })).toThrow(/fall as flow rises/);
  });
});
