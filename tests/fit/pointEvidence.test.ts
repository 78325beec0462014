/**
 * A fit answers to its points: the deletion-residual test names the points a curve misses
 * by far, and says nothing on the consistent invented families.
 */
import { describe, expect, it } from 'vitest';
import { inventedSiFamily, inventedUsFamily } from '../../src/demo/inventedFamily.ts';
import { samplePoints } from '../../src/demo/sampling.ts';
import { buildCurveSet, type MemberInput } from '../../src/fit/build.ts';
import { fitCurve } from '../../src/fit/chooseDegree.ts';
import { fitMissesAccuracy, OFF_CURVE_FACTOR, pointsOffTheirCurve, robustScale } from '../../src/fit/checks/pointEvidence.ts';
import type { CurvePoint, Quantity } from '../../src/model/curveset.ts';
import { parseUnit, presetNamed, toSI } from '../../src/units/index.ts';

/** A smooth head curve, 20 m at shutoff falling to 12 m at 0.05 m³/s, with 15 points. */
const headPoints = (): CurvePoint[] => Array.from({ length: 15 }, (_, i) => {
  const q = (0.05 * i) / 14;
  return [q, 20 - 3200 * q * q] as CurvePoint;
});

describe('robustScale', () => {
  it('is 1.4826 × the median absolute deviation, unmoved by one wild value', () => {
    // residuals −2, −1, 0, 1, 2: median 0, MAD 1 → 1.4826 (exact arithmetic)
    expect(robustScale([-2, -1, 0, 1, 2])).toBeCloseTo(1.4826, 12);
    expect(robustScale([-2, -1, 0, 1, 2000])).toBeCloseTo(1.4826, 12);
  });
});

describe('pointsOffTheirCurve', () => {
  const tolerance = 0.08; // 0.4 % of 20 m

  it('names nothing on a clean curve', () => {
    const points = headPoints();
    expect(pointsOffTheirCurve(points, fitCurve(points, 'head', { tolerance }), 'head', tolerance)).toEqual([]);
  });

  it('names a point with flow and head swapped, and the curve through the others at its flow', () => {
    const points = headPoints();
    const [q, h] = points[9] as CurvePoint;
    points[9] = [h / 1000, q * 1000]; // a swap in awkward units still lands inside the range
    const sorted = [...points].sort((a, b) => a[0] - b[0]);
    const off = pointsOffTheirCurve(sorted, fitCurve(sorted, 'head', { tolerance }), 'head', tolerance);
    expect(off).toHaveLength(1);
    const miss = off[0]!;
    expect(miss.value).toBeCloseTo(q * 1000, 12);
    // The curve through the other 14 exact points recovers the true head within 1 mm.
    expect(miss.expected).toBeCloseTo(20 - 3200 * miss.flow ** 2, 3);
    expect(Math.abs(miss.miss) / miss.scale).toBeGreaterThan(OFF_CURVE_FACTOR);
  });

  it('names two bad points among 15, worst first', () => {
    const points = headPoints();
    points[4] = [points[4]![0], points[4]![1] + 3];
    points[11] = [points[11]![0], points[11]![1] - 1.5];
    const off = pointsOffTheirCurve(points, fitCurve(points, 'head', { tolerance }), 'head', tolerance);
    expect(off.map((o) => o.index)).toEqual([4]); // at most a tenth of 15 points, i.e. one, is named
    const more = [...headPoints(), ...headPoints().map(([q, h]) => [q + 0.0017, h - 3200 * (0.0034 * q + 0.0017 ** 2)] as CurvePoint)].sort((a, b) => a[0] - b[0]);
    more[8] = [more[8]![0], more[8]![1] + 3];
    more[22] = [more[22]![0], more[22]![1] - 1.5];
    const two = pointsOffTheirCurve(more, fitCurve(more, 'head', { tolerance }), 'head', tolerance);
    expect(two.map((o) => o.index)).toEqual([8, 22]);
  });
});

describe('fitMissesAccuracy', () => {
  it('warns beyond twice and fails beyond five times the reading accuracy', () => {
    expect(fitMissesAccuracy({ rms: 0.19 }, 0.1)).toBeUndefined();
    expect(fitMissesAccuracy({ rms: 0.21 }, 0.1)).toBe('warn');
    expect(fitMissesAccuracy({ rms: 0.51 }, 0.1)).toBe('fail');
  });
});

function membersFrom(system: 'us' | 'si', seed: number, noise: number): MemberInput[] {
  const fam = system === 'us' ? inventedUsFamily() : inventedSiFamily();
  const p = presetNamed(system);
  const units: Record<Quantity, ReturnType<typeof parseUnit>> = { head: parseUnit('head', p.head), npshr: parseUnit('head', p.npsh), power: parseUnit('power', p.power), efficiency: parseUnit('efficiency', '%') };
  const by = new Map<number, MemberInput>();
  for (const r of samplePoints(fam, { system, seed, noise })) {
    const m = by.get(r.diameter) ?? { diameter_m: toSI(r.diameter, parseUnit('diameter', p.diameter)), points: {} };
    by.set(r.diameter, m);
    (m.points[r.quantity] ??= []).push([toSI(r.flow, parseUnit('flow', p.flow)), toSI(r.value, units[r.quantity])]);
  }
  return [...by.values()];
}

describe('the consistent invented families', () => {
  // The margin of OFF_CURVE_FACTOR was measured on these (worst 5.7 σ at the end of a power curve).
  it.each([
    ['us', 1, 0.003],
    ['us', 7, 0],
    ['si', 3, 0.003],
    ['si', 5, 0.001],
  ] as const)('%s seed %d noise %d gives no fit finding and no warn or fail', (system, seed, noise) => {
    const p = presetNamed(system);
    const set = buildCurveSet({
      pump: { name: 'Invented test pump (not a real product)' },
      speed_rpm: system === 'us' ? 1780 : 2900,
      family: 'diameter',
      fluid: { name: 'water', density_kg_m3: 998.2, specific_gravity: 1 },
      display_units: { flow: p.flow, head: p.head, npsh: p.npsh, power: p.power, diameter: p.diameter },
      members: membersFrom(system, seed, noise),
    });
    expect(set.findings.filter((f) => f.severity !== 'note').map((f) => f.message)).toEqual([]);
  });
});
