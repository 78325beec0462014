import { describe, expect, it } from 'vitest';
import { figuresAt, operatingPoint } from '../../src/duty/operatingPoint.ts';
import { systemCurveThroughDuty } from '../../src/duty/systemCurve.ts';
import type { PumpCurve } from '../../src/duty/pumpCurve.ts';
import { inventedCurveAt, D_FULL } from './inventedFamily.ts';

describe('operatingPoint', () => {
  const pump = inventedCurveAt(D_FULL); // invented: H = 50 − 12000 Q²

  it('finds the crossing of H = 50 − 12000 Q² with H = 20 + 8000 Q² at Q = √(30/20000) within 1e-9 m³/s', () => {
    const system = { static_head_m: 20, k: 8000, exponent: 2, basis: 'test' };
    const r = operatingPoint(pump, system);
    expect(r.status).toBe('ok');
    if (r.status !== 'ok') return;
    expect(Math.abs(r.point.flow_m3s - Math.sqrt(30 / 20000))).toBeLessThan(1e-9);
    expect(Math.abs(r.point.head_m - (20 + 8000 * (30 / 20000)))).toBeLessThan(1e-6);
    expect(r.crossings).toBe(1);
    expect(r.point.por_position).toBe('within');
    expect(r.point.extrapolated).toEqual([]);
  });

  it('says the system is above the pump when the static head exceeds the shutoff head', () => {
    const r = operatingPoint(pump, { static_head_m: 60, k: 1000, exponent: 2, basis: 'test' });
    expect(r.status).toBe('system-above-pump');
  });

  it('says the pump runs beyond its curve when the system is too flat', () => {
    const r = operatingPoint(pump, { static_head_m: 0, k: 100, exponent: 2, basis: 'test' });
    expect(r.status).toBe('beyond-end-of-curve');
  });

  it('reports the largest-flow crossing and counts both on a drooping curve', () => {
    // invented drooping curve: rises from 40 m to a peak, then falls
    const droop: PumpCurve = { label: 'invented drooping', speed_rpm: 1450, domain: [0, 0.05], head: (q) => 40 + 400 * q - 20000 * q * q };
    const r = operatingPoint(droop, { static_head_m: 41, k: 0, exponent: 2, basis: 'flat' });
    expect(r.status).toBe('ok');
    if (r.status !== 'ok') return;
    expect(r.crossings).toBe(2);
    expect(r.point.flow_m3s).toBeGreaterThan(0.01);
  });

  it('places the duty against the POR and flags NPSH3 read below its captured range', () => {
    const f = figuresAt(pump, 0.005);
    expect(f.por_position).toBe('below');
    expect(f.extrapolated).toContain('npshr');
    expect(figuresAt(pump, 0.045).por_position).toBe('above');
    expect(Math.abs((f.flow_to_bep ?? 0) - 0.005 / 0.035)).toBeLessThan(1e-12);
  });

  it('works with a system curve built through a duty point', () => {
    const system = systemCurveThroughDuty(10, 0.03, 50 - 12000 * 0.0009);
    const r = operatingPoint(pump, system);
    expect(r.status === 'ok' && Math.abs(r.point.flow_m3s - 0.03)).toBeLessThan(1e-9);
  });
});
