/**
 * A duty between two drawn speeds of the invented four-speed family: the speed comes from the
 * bracketing drawn curves by the speed affinity law (Q ∝ n, H ∝ n²; Karassik, Pump Handbook;
 * Lobanoff & Ross) and must agree with the exact family's speed within 0.5 %.
 */
import { describe, expect, it } from 'vitest';
import { inventedSpeedFamily, speedFamilyPointsText } from '../../src/demo/inventedSpeedFamily.ts';
import { speedToDutyInFamily, belowMinFlow } from '../../src/duty/speed.ts';
import { systemCurveThroughDuty, systemHead } from '../../src/duty/systemCurve.ts';
import { dutyCheck } from '../../src/duty/dutyCheck.ts';
import { meetDuty } from '../../src/duty/meetDuty.ts';
import { npsh3ForSpeed } from '../../src/fit/speedFamily.ts';
import { minFlowAt, minFlowLimit } from '../../src/fit/speedFamilyLimits.ts';
import { buildSpeedSetFromText } from './buildSpeedSet.ts';

const fam = inventedSpeedFamily();
const set = buildSpeedSetFromText(speedFamilyPointsText(fam, { seed: 7 }));

/** The exact speed: r²·H0(Q/r) = H_sys(Q) on the invented family, by bisection to 1e-12. */
function exactSpeed(system: ReturnType<typeof systemCurveThroughDuty>, q: number): number {
  const g = (n: number) => fam.head(q, n) - systemHead(system, q);
  let lo = 600;
  let hi = 1800;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (g(mid) < 0) lo = mid; else hi = mid;
  }
  return 0.5 * (lo + hi);
}

describe('duty at any speed of a speed family', () => {
  it.each([1220, 1075, 1380])('finds the speed of a duty drawn at %i rpm within 0.5 % of the exact family, from both neighbours', (n) => {
    const q = 0.025;
    const system = systemCurveThroughDuty(5, q, fam.head(q, n));
    const exact = exactSpeed(system, q);
    expect(Math.abs(exact / n - 1)).toBeLessThan(1e-9);
    const r = speedToDutyInFamily(set, system, q);
    expect(r.status).toBe('ok');
    if (r.status !== 'ok') return;
    expect(Math.abs(r.speed_rpm / exact - 1)).toBeLessThan(0.005);
    expect(r.from_below && r.from_above).toBeTruthy();
    expect(r.from_below!.drawn_rpm).toBeLessThan(n);
    expect(r.from_above!.drawn_rpm).toBeGreaterThan(n);
    expect(r.neighbour_disagreement).toBeLessThan(0.01);
    expect(r.extrapolated).toBe(false);
    // Head at the duty within 0.5 % of the system head; efficiency within 1 point of the exact family.
    expect(Math.abs(r.point.head_m / systemHead(system, q) - 1)).toBeLessThan(0.005);
    expect(Math.abs((r.point.efficiency ?? 0) - fam.efficiency(q, exact))).toBeLessThan(0.01);
    // NPSH3 from the drawn curve at or above, scaled by n², always with a caution.
    expect(r.npsh3?.from_speed_rpm).toBe(r.from_above!.drawn_rpm);
    expect(r.npsh3?.scaled).toBe(true);
    expect(r.warnings.join(' ')).toMatch(/NPSH3 at \d+ rpm is the \d+ rpm curve scaled/);
    expect(Math.abs((r.point.npshr_m ?? 0) / fam.npshr(q, exact) - 1)).toBeLessThan(0.02);
  });

  it('warns when the two neighbouring curves disagree by more than 1 % of speed (one curve mislabelled)', () => {
    const bad = buildSpeedSetFromText(speedFamilyPointsText(fam, { seed: 7, relabel: { 1: 1250 } }));
    const q = 0.025;
    const system = systemCurveThroughDuty(5, q, fam.head(q, 1220));
    const r = speedToDutyInFamily(bad, system, q);
    expect(r.status).toBe('ok');
    if (r.status !== 'ok') return;
    expect(r.neighbour_disagreement).toBeGreaterThan(0.01);
    expect(r.warnings.join(' ')).toMatch(/do not follow the speed law between them/);
  });

  it('uses the family speed in meetDuty and the duty check, with the NPSH3 caution among the warnings', () => {
    const q = 0.025;
    const h = fam.head(q, 1220);
    const m = meetDuty(set, { flow_m3s: q, head_m: h, static_head_m: 5 });
    expect(m.status).toBe('meets');
    expect(Math.abs((m.speed_rpm ?? 0) / 1220 - 1)).toBeLessThan(0.005);
    const report = dutyCheck(set, { flow_m3s: q, head_m: h, static_head_m: 5, variable_speed: true });
    expect(report.speed?.status).toBe('ok');
    expect(report.warnings.join(' ')).toMatch(/NPSH3 at \d+ rpm/);
  });

  it('reads NPSH3 unscaled at a drawn speed and flags a speed above every drawn one', () => {
    expect(npsh3ForSpeed(set, 1300)?.scaled).toBe(false);
    expect(npsh3ForSpeed(set, 1300)?.caution).toBe('');
    const up = npsh3ForSpeed(set, 1600);
    expect(up?.extrapolated).toBe(true);
    expect(up?.caution).toMatch(/extrapolation/);
  });
});

describe('minimum continuous flow', () => {
  it('keeps a vertical traced line as one flow and a sloping line as a line', () => {
    expect(minFlowLimit(undefined, [[0.0060, 20], [0.0061, 10]])?.min_flow?.flow_m3s).toBeCloseTo(0.0061, 6);
    const sloping = minFlowLimit(undefined, [[0.006, 20], [0.004, 9]]);
    expect(sloping?.min_flow?.line).toHaveLength(2);
    // Halfway up the line (head 14.5 m) the limit is halfway in flow: 0.005 m³/s (linear, exact).
    expect(minFlowAt(sloping, 14.5)?.flow_m3s).toBeCloseTo(0.005, 12);
    expect(minFlowAt(sloping, 25)?.beyond_line).toBe(true);
    expect(minFlowLimit(undefined, undefined)).toBeUndefined();
  });

  it('warns in the duty check when the duty lies below the minimum flow, and not above it', () => {
    const limited = { ...set, limits: { min_flow: { flow_m3s: 0.03, basis: 'minimum continuous flow stated with the sheet' } } };
    const q = 0.025;
    const h = fam.head(q, 1220);
    const below = dutyCheck(limited, { flow_m3s: q, head_m: h, static_head_m: 5 });
    expect(below.warnings.join(' ')).toMatch(/83 % of its minimum continuous flow/);
    const above = dutyCheck({ ...limited, limits: { min_flow: { flow_m3s: 0.02, basis: 'stated' } } }, { flow_m3s: q, head_m: h, static_head_m: 5 });
    expect(above.warnings.join(' ')).not.toMatch(/minimum continuous flow/);
    expect(belowMinFlow(set, { flow_m3s: q, head_m: h })).toBeUndefined();
  });
});
