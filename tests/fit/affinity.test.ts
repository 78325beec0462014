import { describe, expect, it } from 'vitest';
import { memberAtDiameter, scaleCurveSetToSpeed, scaleFit, scaleMemberToSpeed, trimByParabola } from '../../src/fit/affinity.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import type { Member, PolynomialFit } from '../../src/model/curveset.ts';

/** An invented head curve H = 50 − 4000·Q² [m, m³/s] at 0.25 m, exact as a polynomial. */
function headFit(d: number, d0 = 0.25): PolynomialFit {
  const r = d / d0;
  // H(Q) = r²·(50 − 4000·(Q/r)²) = 50r² − 4000·Q² ; in t = Q/s with s = 0.1·r
  const s = 0.1 * r;
  return { kind: 'polynomial', flow_scale: s, coefficients: [50 * r * r, 0, -4000 * s * s], domain: [0, 0.1 * r], degree: 2, through_origin: false, rms: 0, max_residual: 0, condition: 1, reason: 'invented' };
}
const member = (d: number): Member => ({ diameter_m: d, speed_rpm: 1450, curves: { head: { points: [], fit: headFit(d) } }, derived: {} });

describe('affinity scaling (Karassik, Pump Handbook: Q ∝ n, H ∝ n², P ∝ n³)', () => {
  it('scaling a head fit by speed ratio r maps (Q, H) to (rQ, r²H) exactly (tolerance 1e-12 relative)', () => {
    const f = headFit(0.25);
    const g = scaleFit(f, 1.2, 'head');
    for (const q of [0, 0.02, 0.05, 0.09]) expect(evaluateUnchecked(g, 1.2 * q)).toBeCloseTo(1.44 * evaluateUnchecked(f, q), 10);
    expect(g.domain).toEqual([0, 0.1 * 1.2]);
  });
  it('power scales with the cube and efficiency not at all', () => {
    const f: PolynomialFit = { ...headFit(0.25), coefficients: [1000, 200, -50] };
    expect(evaluateUnchecked(scaleFit(f, 0.5, 'power'), 0.01)).toBeCloseTo(0.125 * evaluateUnchecked(f, 0.02), 9);
    expect(evaluateUnchecked(scaleFit(f, 0.5, 'efficiency'), 0.01)).toBeCloseTo(evaluateUnchecked(f, 0.02), 12);
  });
  it('a whole set converted from 1780 to 1480 rpm (60 Hz to 50 Hz) scales every member and its BEP', () => {
    const m: Member = { ...member(0.25), speed_rpm: 1780, derived: { bep: { flow_m3s: 0.06, head_m: 35, efficiency: 0.8 } } };
    const set = {
      format: 'pumpscribe.curveset' as const, version: 2 as const, pump: { name: 'Invented' }, speed_rpm: 1780, family: 'diameter' as const,
      fluid: { name: 'water', density_kg_m3: 998, specific_gravity: 1 }, provenance: { tool: { name: 't', version: '0' }, created: '2026-01-01T00:00:00Z' },
      display_units: { flow: 'm3/h', head: 'm', npsh: 'm', power: 'kW', diameter: 'mm' }, members: [m], findings: [],
    };
    const out = scaleCurveSetToSpeed(set, 1480);
    const r = 1480 / 1780;
    expect(out.speed_rpm).toBe(1480);
    expect(out.members[0]?.derived.bep?.flow_m3s).toBeCloseTo(0.06 * r, 12);
    expect(out.members[0]?.derived.bep?.head_m).toBeCloseTo(35 * r * r, 10);
    expect(scaleMemberToSpeed(m, 1480).speed_rpm).toBe(1480);
  });
});

describe('trimmed impellers between captured diameters', () => {
  const set = { members: [member(0.25), member(0.2)] };
  it('equals a captured curve at its own diameter', () => {
    const m = memberAtDiameter(set, 0.2);
    expect(evaluateUnchecked(m.curves.head!.fit!, 0.05)).toBeCloseTo(evaluateUnchecked(headFit(0.2), 0.05), 10);
  });
  it('reproduces an exact affinity family at an intermediate diameter (tolerance 1e-9 m)', () => {
    const m = memberAtDiameter(set, 0.23);
    for (const q of [0.01, 0.04, 0.07]) expect(evaluateUnchecked(m.curves.head!.fit!, q)).toBeCloseTo(evaluateUnchecked(headFit(0.23), q), 9);
    expect(m.extrapolated).toBe(false);
  });
  it('flags a trim below the smallest captured diameter as extrapolated', () => {
    expect(memberAtDiameter(set, 0.18).extrapolated).toBe(true);
  });
  it('blends both neighbours when they disagree, weighting the nearer one more', () => {
    const skewed = { members: [member(0.25), { ...member(0.2), curves: { head: { points: [], fit: { ...headFit(0.2), coefficients: headFit(0.2).coefficients.map((c, i) => (i === 0 ? c + 2 : c)) } } } }] };
    const near = evaluateUnchecked(memberAtDiameter(skewed, 0.24).curves.head!.fit!, 0.03);
    const exact = evaluateUnchecked(headFit(0.24), 0.03);
    // The lower neighbour is 2 m high at its own diameter; scaled to 0.24 m (×1.44) and weighted 0.2.
    expect(near - exact).toBeCloseTo(0.2 * 2 * (0.24 / 0.2) ** 2, 9);
  });
});

describe('required trim by the affinity parabola (common practice)', () => {
  it('finds the exact diameter for a duty on an exact affinity family (tolerance 1e-9 relative)', () => {
    // Duty on the 0.22 m curve of the invented family: H = 50·(0.22/0.25)² − 4000·Q²
    const q = 0.05;
    const h = 50 * (0.22 / 0.25) ** 2 - 4000 * q * q;
    const trim = trimByParabola(headFit(0.25), 0.25, q, h);
    expect(trim?.diameter_m).toBeCloseTo(0.22, 9);
  });
  it('returns undefined when the duty lies above the full-diameter curve', () => {
    expect(trimByParabola(headFit(0.25), 0.25, 0.05, 80)).toBeUndefined();
  });
});
