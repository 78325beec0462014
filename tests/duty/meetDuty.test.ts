import { describe, expect, it } from 'vitest';
import { curveAtDiameter, meetDuty } from '../../src/duty/meetDuty.ts';
import { DutyError } from '../../src/duty/errors.ts';
import { A, D_FULL, ETA_B, H0, Q_B, SPEED, inventedCurveSet, inventedMember } from './inventedFamily.ts';
import type { CurveSet } from '../../src/model/curveset.ts';

/** Exact diameter for the invented affinity family (see inventedFamily.ts). */
const exact = (q: number, h: number) => D_FULL * Math.sqrt((h + A * q * q) / H0);

describe('meetDuty on an invented curve set (250, 230, 210 mm, obeying the affinity law)', () => {
  const set = inventedCurveSet();

  it.each([
    [0.03, 33, 'between 250 and 230 mm'],
    [0.025, 28, 'between 230 and 210 mm'],
    [0.02, 24, 'just below 210 mm'],
    [0.028, 40.592, 'at 250 mm'],
  ])('returns the exact trim for %s m³/s at %s m (%s) within 0.01 %%', (q, h) => {
    const m = meetDuty(set, { flow_m3s: q, head_m: h });
    expect(m.status).toBe('meets');
    expect(Math.abs((m.diameter_m ?? 0) / exact(q, h) - 1)).toBeLessThan(1e-4);
    expect(Math.abs((m.point?.head_m ?? 0) - h)).toBeLessThan(1e-6);
  });

  it('gives efficiency, power, NPSH3 and POR position at the duty', () => {
    const m = meetDuty(set, { flow_m3s: 0.03, head_m: 33 });
    const r = exact(0.03, 33) / D_FULL;
    const x = 0.03 / (r * Q_B);
    expect(Math.abs((m.point?.efficiency ?? 0) - ETA_B * (2 * x - x * x))).toBeLessThan(1e-6);
    const power = (998.2 * 9.80665 * 0.03 * 33) / (ETA_B * (2 * x - x * x));
    expect(Math.abs((m.point?.power_W ?? 0) / power - 1)).toBeLessThan(1e-6);
    // NPSH3 of a trim: the drawn curve of the nearest equal or larger captured diameter at the
    // same flow, never scaled down (common practice).
    const drawn = [0.21, 0.23, 0.25].find((d) => d >= r * D_FULL) as number;
    const rd = drawn / D_FULL;
    expect(Math.abs((m.point?.npshr_m ?? 0) - (1.5 * rd * rd + 1500 * 0.0009))).toBeLessThan(1e-6);
    expect(m.point?.por_position).toBe('within');
    expect(m.below_trim_limit).toBe(false);
    expect(m.trim_extrapolated).toBe(false);
  });

  it('flags a trim below the smallest captured diameter and below the 80 % limit', () => {
    const m = meetDuty(set, { flow_m3s: 0.015, head_m: 23 }); // r = √(25.7/50) ≈ 0.717
    expect(m.status).toBe('meets');
    expect(m.trim_extrapolated).toBe(true);
    expect(m.below_trim_limit).toBe(true);
    expect(m.message).toMatch(/deeper than the usual 80 % limit/);
  });

  it('says the duty is above range when the full diameter cannot reach it', () => {
    expect(meetDuty(set, { flow_m3s: 0.03, head_m: 45 }).status).toBe('above-range');
  });

  it('says the pump is too large when the duty needs less than 70 % of full diameter', () => {
    expect(meetDuty(set, { flow_m3s: 0.01, head_m: 8 }).status).toBe('below-range');
  });

  it('returns unusable, not an exception, for a curve set without head fits', () => {
    const broken: CurveSet = { ...set, members: set.members.map((m) => ({ ...m, curves: {} })) };
    const m = meetDuty(broken, { flow_m3s: 0.03, head_m: 33 });
    expect(m.status).toBe('unusable');
    expect(m.message).toMatch(/no fitted head curve/);
  });

  it('throws DutyError for a duty that is not a positive flow and head', () => {
    expect(() => meetDuty(set, { flow_m3s: -1, head_m: 33 })).toThrow(DutyError);
  });

  it('reads the captured curves exactly at a captured diameter', () => {
    const c = curveAtDiameter(set, 0.23);
    expect(Math.abs(c.head(0.02) - (H0 * (0.23 / D_FULL) ** 2 - A * 0.0004))).toBeLessThan(1e-9);
  });
});

describe('meetDuty on an invented variable-speed curve set', () => {
  const member = inventedMember(D_FULL);
  const set: CurveSet = { ...inventedCurveSet([D_FULL]), family: 'speed', members: [member] };

  it('returns the speed whose curve meets the duty on the system through it: 50 r² − 12000 Q² = H_d', () => {
    const m = meetDuty(set, { flow_m3s: 0.03, head_m: 30, static_head_m: 10 });
    expect(m.method).toBe('speed');
    expect(m.status).toBe('meets');
    const r = Math.sqrt((30 + A * 0.0009) / H0);
    expect(Math.abs((m.speed_rpm ?? 0) / (SPEED * r) - 1)).toBeLessThan(1e-9);
  });
});

describe('meetDuty beyond the end of the curve', () => {
  it('says so when the duty flow lies past the end of the trimmed curve', () => {
    // invented set ends at 0.06·r m³/s; at 0.058 m³/s and 5 m the trim is r = √((5 + 40.37)/50) ≈ 0.95, ending at 0.057 m³/s
    const m = meetDuty(inventedCurveSet(), { flow_m3s: 0.058, head_m: 5 });
    expect(m.status).toBe('meets');
    expect(m.point?.extrapolated).toContain('head');
    expect(m.message).toMatch(/beyond the trimmed curve/);
  });
});
