import { describe, expect, it } from 'vitest';
import { parallelOperation } from '../../src/duty/parallel.ts';
import { parallelPumps } from '../../src/duty/pumpCurve.ts';
import { D_FULL, inventedCurveAt } from './inventedFamily.ts';
import { DutyError } from '../../src/duty/errors.ts';

describe('parallelOperation', () => {
  const pump = inventedCurveAt(D_FULL); // invented: H = 50 − 12000 Q²
  const system = { static_head_m: 20, k: 3000, exponent: 2, basis: 'test' };

  it('two pumps: 50 − 3000 Q² = 20 + 3000 Q² gives Q = √(30/6000), 0.5 Q each, within 1e-9 m³/s', () => {
    const r = parallelOperation(pump, 2, system);
    expect(r.combined.status).toBe('ok');
    if (r.combined.status !== 'ok') return;
    const q = Math.sqrt(30 / 6000);
    expect(Math.abs(r.combined.point.flow_m3s - q)).toBeLessThan(1e-9);
    expect(Math.abs((r.per_pump?.flow_m3s ?? 0) - q / 2)).toBeLessThan(1e-9);
    // each pump at 0.0354 m³/s lies inside its POR 0.0245…0.042 m³/s
    expect(r.per_pump?.por_position).toBe('within');
    // combined power is twice one pump's
    expect(Math.abs((r.combined.point.power_W ?? 0) - 2 * (r.per_pump?.power_W ?? 0))).toBeLessThan(1e-6);
  });

  it('reports one pump alone running further out: 50 − 12000 Q² = 20 + 3000 Q² gives Q = √(30/15000)', () => {
    const r = parallelOperation(pump, 2, system);
    expect(r.single.status === 'ok' && Math.abs(r.single.point.flow_m3s - Math.sqrt(30 / 15000))).toBeLessThan(1e-9);
  });

  it('three pumps: each pump flow is a third of the total', () => {
    const r = parallelOperation(pump, 3, { static_head_m: 20, k: 1000, exponent: 2, basis: 'test' });
    expect(r.combined.status === 'ok' && Math.abs((r.per_pump?.flow_m3s ?? 0) * 3 - r.combined.point.flow_m3s)).toBeLessThan(1e-12);
  });

  it('refuses a count that is not a whole number of at least one', () => {
    expect(() => parallelPumps(pump, 0)).toThrow(DutyError);
    expect(() => parallelPumps(pump, 1.5)).toThrow(/whole number/);
  });
});
