import { describe, expect, it } from 'vitest';
import { pumpCurveOfMember } from '../../src/duty/pumpCurve.ts';
import { DutyError } from '../../src/duty/errors.ts';
import { STANDARD_GRAVITY } from '../../src/units/constants.ts';
import { D_FULL, RHO, inventedCurveAt, inventedMember } from './inventedFamily.ts';

describe('pumpCurveOfMember', () => {
  it('evaluates the member’s fits like the invented functions they encode, within 1e-9 relative', () => {
    const fromFits = pumpCurveOfMember(inventedMember(0.23), RHO);
    const exact = inventedCurveAt(0.23);
    for (const q of [0.005, 0.02, 0.035, 0.05]) {
      expect(Math.abs(fromFits.head(q) / exact.head(q) - 1)).toBeLessThan(1e-9);
      expect(Math.abs((fromFits.efficiency?.(q) ?? 0) / (exact.efficiency?.(q) ?? 1) - 1)).toBeLessThan(1e-9);
      expect(Math.abs((fromFits.npshr?.(q) ?? 0) / (exact.npshr?.(q) ?? 1) - 1)).toBeLessThan(1e-9);
    }
  });

  it('computes power as ρ·g·Q·H/η when the member has no power curve, with a finite limit at shutoff', () => {
    const c = pumpCurveOfMember(inventedMember(D_FULL), RHO);
    expect(c.power_basis).toBe('head-efficiency');
    const q = 0.03;
    const expected = (RHO * STANDARD_GRAVITY * q * c.head(q)) / (c.efficiency?.(q) ?? 1);
    expect(Math.abs((c.power?.(q) ?? 0) / expected - 1)).toBeLessThan(1e-12);
    expect(Math.abs((c.power?.(0) ?? 0) / (inventedCurveAt(D_FULL).power?.(0) ?? 1) - 1)).toBeLessThan(1e-9);
  });

  it('uses a captured power curve, scaled by the ratio of duty to sheet density', () => {
    const c = pumpCurveOfMember(inventedMember(D_FULL, true), 850, 1000);
    expect(c.power_basis).toBe('curve');
    expect(Math.abs((c.power?.(0.02) ?? 0) - 0.85 * (10000 + 200000 * 0.02))).toBeLessThan(1e-9);
  });

  it('carries the POR and BEP of the member', () => {
    const c = pumpCurveOfMember(inventedMember(D_FULL), RHO);
    expect(c.por?.min_m3s).toBeCloseTo(0.0245, 12);
    expect(c.bep_flow_m3s).toBeCloseTo(0.035, 12);
  });

  it('refuses a member without a fitted head curve with a DutyError', () => {
    const m = inventedMember(D_FULL);
    delete m.curves.head;
    expect(() => pumpCurveOfMember(m, RHO)).toThrow(DutyError);
  });
});
