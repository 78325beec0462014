/**
 * A member whose efficiency the iso-lines give at one or two flows takes the shape of the nearest
 * fitted efficiency curve by the affinity law (Q ∝ D for a trim, Q ∝ n for a speed, efficiency of
 * the same shape: Karassik et al., Pump Handbook; Lobanoff & Ross, Centrifugal Pumps), times one
 * factor fitted to its own crossings. Invented family: η(Q) = η_b · x(2 − x), x = Q / (r·Q_b),
 * r = D / D_full, with a trimmed impeller's best efficiency a few points lower.
 */
import { describe, expect, it } from 'vitest';
import { buildCurveSet, type MemberInput } from '../../src/fit/build.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import type { CurvePoint, CurveSet } from '../../src/model/curveset.ts';

const QB = 0.05; // m³/s at the full impeller's best efficiency (invented)
const eta = (d: number, q: number, best: number) => {
  const x = q / ((d / 0.3) * QB);
  return best * x * (2 - x);
};
const head = (d: number, q: number) => (d / 0.3) ** 2 * 50 * (1 - 0.3 * (q / ((d / 0.3) * QB)) ** 2);

/** Members by diameter (m): head from 0 to 1.3 Q_b scaled, and efficiency from iso-line crossings at the given flows (shares of the scaled Q_b). */
function member(d: number, best: number, etaAt: readonly number[], drawnAs: 'iso-lines' | 'curve' = 'iso-lines'): MemberInput {
  const r = d / 0.3;
  const flows = Array.from({ length: 14 }, (_, i) => (i / 10) * r * QB);
  return {
    diameter_m: d,
    points: {
      head: flows.map((q) => [q, head(d, q)] as CurvePoint),
      efficiency: etaAt.map((x) => [x * r * QB, eta(d, x * r * QB, best)] as CurvePoint),
    },
    drawnAs: { head: 'curve', efficiency: drawnAs },
  };
}

function build(members: MemberInput[], family: 'diameter' | 'speed' = 'diameter'): CurveSet {
  return buildCurveSet({
    pump: { name: 'Invented test pump' },
    speed_rpm: 1450,
    family,
    fluid: { name: 'water', density_kg_m3: 998.2, specific_gravity: 1 },
    display_units: { flow: 'm3/h', head: 'm', npsh: 'm', power: 'kW', diameter: 'mm' },
    members,
  });
}

const codes = (set: CurveSet, code: string) => set.findings.filter((f) => f.code === code);

describe('an efficiency the iso-lines give at too few flows', () => {
  it('takes the nearest fitted curve by the trim law, times one factor that meets its crossings, and warns', () => {
    // Full 300 mm: six crossings; 270 mm: the 76 % level once each side of its peak (two flows), 2 points lower.
    const set = build([member(0.3, 0.82, [0.45, 0.6, 0.75, 1.25, 1.4, 1.55]), member(0.27, 0.8, [0.6, 1.4])]);
    const small = set.members.find((m) => m.diameter_m === 0.27)!;
    const fit = small.curves.efficiency!.fit!;
    expect(fit).toBeDefined();
    // The invented family keeps the trim law exactly, so the borrowed curve is the exact one.
    for (let x = 0.2; x <= 1.3; x += 0.05) expect(Math.abs(evaluateUnchecked(fit, x * 0.9 * QB) - eta(0.27, x * 0.9 * QB, 0.8))).toBeLessThan(1e-6);
    const warned = codes(set, 'fit.efficiency-from-family');
    expect(warned.map((f) => [f.severity, f.subject.diameter_m])).toEqual([['warn', 0.27]]);
    expect(warned[0]!.figures.factor).toBeCloseTo(0.8 / 0.82, 6);
    expect(codes(set, 'fit.too-few-points')).toEqual([]);
  });

  it('takes it from one crossing too, and by the speed law in a speed family', () => {
    const one = build([member(0.3, 0.82, [0.45, 0.6, 0.75, 1.25, 1.4]), member(0.27, 0.8, [0.7])]);
    expect(one.members.find((m) => m.diameter_m === 0.27)!.curves.efficiency!.fit).toBeDefined();
    expect(codes(one, 'fit.efficiency-from-family')[0]!.message).toMatch(/meets the iso-lines at one flow only, .* which meets that crossing\./);
    // Speed family: a 1305 rpm member with two crossings borrows from 1450 rpm, flow ∝ speed.
    const fast = member(0.3, 0.82, [0.45, 0.6, 0.75, 1.25, 1.4]);
    const slow = member(0.27, 0.82, [0.6, 1.4]); // the same pump at 0.9 × speed: Q scales as D did above
    const set = build(
      [
        { ...fast, diameter_m: undefined, speed_rpm: 1450 },
        { ...slow, diameter_m: undefined, speed_rpm: 1305 },
      ],
      'speed',
    );
    const warned = codes(set, 'fit.efficiency-from-family');
    expect(warned.map((f) => f.subject.speed_rpm)).toEqual([1305]);
    expect(warned[0]!.message).toMatch(/flow in proportion to speed/);
    expect(warned[0]!.figures.factor).toBeCloseTo(1, 6);
  });

  it('leaves the fit failure standing where the law cannot be trusted or the crossings disagree', () => {
    const full = member(0.3, 0.82, [0.45, 0.6, 0.75, 1.25, 1.4, 1.55]);
    // A trim below 70 % of the only fitted curve.
    const deep = build([full, member(0.2, 0.78, [0.6, 1.4])]);
    expect(codes(deep, 'fit.efficiency-from-family')).toEqual([]);
    expect(codes(deep, 'fit.too-few-points').map((f) => f.severity)).toEqual(['fail']);
    // Two crossings the borrowed shape cannot meet within 2 points with one factor (a slip: the
    // second crossing read 10 points high).
    const slip = member(0.27, 0.8, [0.6, 1.4]);
    const [a, b] = slip.points.efficiency as [CurvePoint, CurvePoint];
    slip.points.efficiency = [a, [b[0], b[1] + 0.1]];
    const off = build([full, slip]);
    expect(codes(off, 'fit.efficiency-from-family')).toEqual([]);
    expect(codes(off, 'fit.too-few-points').map((f) => f.severity)).toEqual(['fail']);
    // A traced efficiency curve with two points is the user's to capture, not borrowed.
    const traced = build([full, member(0.27, 0.8, [0.6, 1.4], 'curve')]);
    expect(codes(traced, 'fit.efficiency-from-family')).toEqual([]);
    expect(codes(traced, 'fit.too-few-points')).toHaveLength(1);
  });
});
