import { describe, expect, it } from 'vitest';
import { speedToDuty } from '../../src/duty/speed.ts';
import { systemCurveThroughDuty } from '../../src/duty/systemCurve.ts';
import { pumpCurveAtSpeed } from '../../src/duty/pumpCurve.ts';
import { A, D_FULL, ETA_B, H0, Q_B, SPEED, inventedCurveAt } from './inventedFamily.ts';

describe('speedToDuty', () => {
  const pump = inventedCurveAt(D_FULL); // invented: H = 50 − 12000 Q² at 2900 rpm

  it('finds the speed whose affinity-scaled curve meets the duty: 50 r² − 12000 Q² = H_sys(Q), within 1e-9 relative', () => {
    const system = systemCurveThroughDuty(15, 0.03, 32);
    const r = speedToDuty(pump, system, 0.03);
    expect(r.status).toBe('ok');
    if (r.status !== 'ok') return;
    const exact = Math.sqrt((32 + A * 0.0009) / H0);
    expect(Math.abs(r.ratio / exact - 1)).toBeLessThan(1e-9);
    expect(Math.abs(r.speed_rpm - SPEED * exact)).toBeLessThan(1e-5);
    expect(Math.abs(r.point.head_m - 32)).toBeLessThan(1e-8);
    // efficiency follows the flow ratio Q/(r Q_b) (speed affinity: η unchanged at corresponding points)
    const x = 0.03 / (exact * Q_B);
    expect(Math.abs((r.point.efficiency ?? 0) - ETA_B * (2 * x - x * x))).toBeLessThan(1e-9);
    expect(r.outside_affinity_band).toBe(false);
  });

  it('flags a speed outside ±20 % of rated, where the affinity law is less exact', () => {
    const r = speedToDuty(pump, systemCurveThroughDuty(0, 0.02, 15), 0.02);
    expect(r.status === 'ok' && r.outside_affinity_band).toBe(true);
  });

  it('says when no speed up to 150 % reaches the duty', () => {
    expect(speedToDuty(pump, systemCurveThroughDuty(0, 0.03, 200), 0.03).status).toBe('not-reachable');
  });
});

describe('pumpCurveAtSpeed', () => {
  it('scales flow by r, head and NPSH3 by r², power by r³ and keeps efficiency at corresponding points', () => {
    const base = inventedCurveAt(D_FULL);
    const fast = pumpCurveAtSpeed(base, SPEED * 1.1);
    const q = 0.03;
    expect(Math.abs(fast.head(q * 1.1) - 1.21 * base.head(q))).toBeLessThan(1e-12);
    expect(Math.abs((fast.power?.(q * 1.1) ?? 0) - 1.331 * (base.power?.(q) ?? 0))).toBeLessThan(1e-6);
    expect(Math.abs((fast.efficiency?.(q * 1.1) ?? 0) - (base.efficiency?.(q) ?? 0))).toBeLessThan(1e-12);
    expect(Math.abs((fast.npshr?.(q * 1.1) ?? 0) - 1.21 * (base.npshr?.(q) ?? 0))).toBeLessThan(1e-12);
    expect(Math.abs((fast.bep_flow_m3s ?? 0) - 1.1 * Q_B)).toBeLessThan(1e-15);
  });
});
