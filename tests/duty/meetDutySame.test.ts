/**
 * meetDuty was made cheaper for the library's duty search (issue #13) without changing any
 * result: the same numbers to the last bit, the same messages, the same statuses and refusals.
 * The reference is a frozen copy of meetDuty and of the trim search as they were before
 * (tests/duty/meetDutySame/frozen/), run on the same invented curve sets and random duties.
 */
import { describe, expect, it } from 'vitest';
import { curveAtDiameter, meetDuty, type DutyRequest } from '../../src/duty/meetDuty.ts';
import { memberAtDiameter, trimmedHeadAt, membersByDiameter } from '../../src/fit/affinity.ts';
import { seededRandom } from '../../src/demo/random.ts';
import { lastRootOn, rootsOn } from '../../src/duty/solve.ts';
import { meetDuty as frozenMeetDuty } from './meetDutySame/frozen/meetDuty.ts';
import { memberAtDiameter as frozenMemberAtDiameter } from './meetDutySame/frozen/affinity.ts';
import { curveSetCases, randomDuties } from './meetDutySame/cases.ts';

/** The first difference between two values (numbers compared bit for bit with Object.is), or undefined. */
function firstDifference(a: unknown, b: unknown, path = '$'): string | undefined {
  if (typeof a === 'number' && typeof b === 'number') return Object.is(a, b) ? undefined : `${path}: ${a} ≠ ${b}`;
  if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') return a === b ? undefined : `${path}: ${String(a)} ≠ ${String(b)}`;
  if (Array.isArray(a) !== Array.isArray(b)) return `${path}: array against object`;
  const keysA = Object.keys(a).sort();
  const keysB = Object.keys(b).sort();
  if (keysA.join() !== keysB.join()) return `${path}: keys ${keysA.join()} ≠ ${keysB.join()}`;
  for (const k of keysA) {
    const d = firstDifference((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`);
    if (d) return d;
  }
  return undefined;
}

/** The result, or the thrown error as its name and message. */
function outcome(f: () => unknown): unknown {
  try {
    return f();
  } catch (error) {
    return { thrown: error instanceof Error ? `${error.name}: ${error.message}` : String(error) };
  }
}

const cases = curveSetCases(10);

describe('the comparison itself', () => {
  it('tells numbers one unit in the last place apart, and messages one letter apart', () => {
    expect(firstDifference({ x: [1, 0.1 + 0.2] }, { x: [1, 0.3] })).toMatch(/\$\.x\.1/);
    expect(firstDifference({ m: 'meets' }, { m: 'meet' })).toBeDefined();
    expect(firstDifference({ a: 0 }, { a: -0 })).toBeDefined();
    expect(firstDifference({ a: 1, b: undefined }, { a: 1 })).toBeDefined();
    expect(firstDifference({ a: [1, { b: 'x' }] }, { a: [1, { b: 'x' }] })).toBeUndefined();
  });
});

describe('meetDuty gives the same answers as before it was made faster', () => {
  it.each(cases.map((c, k) => [c.name, k] as const))('%s: 300 random duties, every field the same to the last bit', (_name, k) => {
    const c = cases[k]!;
    const duties = randomDuties(c, 300, 1000 + k);
    for (const duty of duties) {
      const now = outcome(() => meetDuty(c.set, duty));
      const before = outcome(() => frozenMeetDuty(c.set, duty));
      const diff = firstDifference(now, before);
      if (diff) throw new Error(`${c.name}, duty ${JSON.stringify(duty)}: ${diff}`);
    }
  });

  it('covers every outcome over all the sets: meets, above and below the range, unusable', () => {
    const seen = new Set<string>();
    cases.forEach((c, k) => {
      for (const duty of randomDuties(c, 300, 1000 + k)) seen.add(meetDuty(c.set, duty).status);
    });
    expect([...seen].sort()).toEqual(['above-range', 'below-range', 'meets', 'unusable']);
  });

  it('refuses a duty that is not a positive flow and head with the same error as before', () => {
    const set = cases[0]!.set;
    const bad: DutyRequest[] = [
      { flow_m3s: -0.01, head_m: 20 },
      { flow_m3s: 0, head_m: 20 },
      { flow_m3s: Number.NaN, head_m: 20 },
      { flow_m3s: 0.01, head_m: Number.POSITIVE_INFINITY },
      { flow_m3s: 0.01, head_m: 0 },
    ];
    for (const duty of bad) {
      const now = outcome(() => meetDuty(set, duty));
      expect(now).toHaveProperty('thrown');
      expect(firstDifference(now, outcome(() => frozenMeetDuty(set, duty)))).toBeUndefined();
    }
  });

  it('gives the same answers for a duty density that is not positive and for a static head above the duty head', () => {
    for (const c of cases) {
      for (const duty of [
        { flow_m3s: c.flow_m3s, head_m: c.head_m, density_kg_m3: 0 },
        { flow_m3s: c.flow_m3s, head_m: c.head_m, density_kg_m3: -5 },
        { flow_m3s: c.flow_m3s, head_m: c.head_m, static_head_m: 2 * c.head_m },
      ]) {
        const diff = firstDifference(outcome(() => meetDuty(c.set, duty)), outcome(() => frozenMeetDuty(c.set, duty)));
        if (diff) throw new Error(`${c.name}, duty ${JSON.stringify(duty)}: ${diff}`);
      }
    }
  });
});

describe('the trimmed member', () => {
  it('is the same as before (fits, points, derived figures), at and between the captured diameters and beyond them', () => {
    const random = seededRandom(9);
    let compared = 0;
    for (const c of cases) {
      const sorted = membersByDiameter(c.set);
      if (sorted.length === 0) continue;
      const dFull = sorted[0]!.diameter_m!;
      for (const d of [...sorted.map((m) => m.diameter_m!), ...Array.from({ length: 100 }, () => dFull * (0.5 + 0.6 * random())), 0, -1]) {
        const diff = firstDifference(outcome(() => memberAtDiameter(c.set, d)), outcome(() => frozenMemberAtDiameter(c.set, d)));
        if (diff) throw new Error(`${c.name}, d = ${d}: ${diff}`);
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(1000);
  });
});

describe('the trim head shortcut', () => {
  it('equals the head of the curve built at the diameter, to the last bit, at and between the captured diameters and beyond them', () => {
    const random = seededRandom(5);
    let compared = 0;
    for (const c of cases) {
      const sorted = membersByDiameter(c.set);
      if (sorted.length === 0) continue;
      const headAt = trimmedHeadAt(c.set);
      const dFull = sorted[0]!.diameter_m!;
      const diameters = [...sorted.map((m) => m.diameter_m!), ...Array.from({ length: 200 }, () => dFull * (0.5 + 0.6 * random()))];
      for (const d of diameters) {
        const fast = headAt(d, 0);
        for (const q of [0, c.flow_m3s * 0.3, c.flow_m3s, c.flow_m3s * 1.4]) {
          const now = headAt(d, q);
          const built = outcome(() => curveAtDiameter(c.set, d).head(q));
          if (now === undefined) {
            expect(fast).toBeUndefined();
            continue;
          }
          if (!Object.is(now, built)) throw new Error(`${c.name}, d = ${d}, q = ${q}: ${now} ≠ ${String(built)}`);
          compared++;
        }
      }
    }
    expect(compared).toBeGreaterThan(10_000);
  });

  it('says it cannot answer where the member is not a blend of two head fits, and for a diameter that is not positive', () => {
    // Between the full diameter and a member without a head curve the full one is scaled alone:
    // the shortcut leaves that to the built member.
    const middle = cases.find((c) => c.name.includes('middle member without a head curve'))!;
    const sorted = membersByDiameter(middle.set);
    const between = 0.5 * (sorted[0]!.diameter_m! + sorted[1]!.diameter_m!);
    expect(trimmedHeadAt(middle.set)(between, 0.01)).toBeUndefined();
    expect(Number.isFinite(curveAtDiameter(middle.set, between).head(0.01))).toBe(true);
    // Without a head curve at the full diameter every duty is refused as unusable, as before.
    const full = cases.find((c) => c.name.includes('full diameter without a head curve'))!;
    expect(trimmedHeadAt(full.set)(sorted[0]!.diameter_m!, 0.01)).toBeUndefined();
    expect(meetDuty(full.set, { flow_m3s: full.flow_m3s, head_m: full.head_m })).toMatchObject({ status: 'unusable', message: expect.stringMatching(/no fitted head curve/) });
    const headAt = trimmedHeadAt(cases[0]!.set);
    expect(headAt(0, 0.01)).toBeUndefined();
    expect(headAt(-0.2, 0.01)).toBeUndefined();
    expect(headAt(Number.NaN, 0.01)).toBeUndefined();
  });
});

describe('the last root', () => {
  it('is the last of rootsOn to the last bit, or undefined when rootsOn finds none', () => {
    const random = seededRandom(21);
    let found = 0;
    for (let k = 0; k < 2000; k++) {
      // Cubics with up to three roots in [0, 1], some roots on a sample exactly, some functions with NaN.
      const roots = Array.from({ length: 3 }, () => (random() < 0.2 ? Math.round(random() * 40) / 40 : 1.4 * random() - 0.2));
      const scale = random() < 0.5 ? 1 : -1;
      const f = k % 50 === 7 ? (x: number) => (x > 0.5 ? Number.NaN : x - 0.3) : (x: number) => scale * (x - roots[0]!) * (x - roots[1]!) * (x - roots[2]!);
      for (const samples of [0, 1, 40, 400]) {
        const all = rootsOn(f, 0, 1, samples);
        const last = lastRootOn(f, 0, 1, samples);
        if (!Object.is(last, all[all.length - 1])) throw new Error(`roots ${roots.join(', ')}, ${samples} samples: ${last} ≠ ${all[all.length - 1]}`);
        if (last !== undefined) found++;
      }
    }
    expect(found).toBeGreaterThan(3000);
    expect(lastRootOn((x) => x, 1, 1)).toBeUndefined();
    expect(lastRootOn((x) => x, 0, 1)).toBe(0);
  });
});
