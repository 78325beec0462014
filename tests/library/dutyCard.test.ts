/**
 * The duty card lets the search run the duty engine on a few sets only; these tests hold it to the
 * engine itself:
 * 1. on seeded random invented families, some with curves bent away from the exact trim law, the
 *    card never rejects a set the library's matcher accepts, never bounds the efficiency below
 *    (or the power above) what the matcher finds;
 * 2. on a seeded random library, the search's ranking is exactly the ranking of the matcher run on
 *    every set (brute force), by efficiency and by energy cost, sound sets before failing ones,
 *    while the engine runs on only a few sets per query.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { LibraryStore } from '../../src/library/store.ts';
import { searchByDuty, type DutyAnswer } from '../../src/library/dutySearch.ts';
import { libraryMatcher } from '../../src/library/matcher.ts';
import { cardBound, cardHeadAt, decodeDutyCard, dutyCardOf, encodeDutyCard } from '../../src/library/dutyCard.ts';
import { curveAtDiameter } from '../../src/duty/meetDuty.ts';
import { seededRandom } from '../../src/demo/random.ts';
import type { CurveSet } from '../../src/model/curveset.ts';
import { inventedCurveSet, type InventedFamily } from './fixtures.ts';
import { tempDir } from '../server/helpers.ts';

function randomFamily(random: () => number, i: number): InventedFamily {
  return {
    name: `Invented card test ${String(i).padStart(4, '0')}`,
    model: `ICT-${i}`,
    fullDiameterM: 0.15 + 0.3 * random(),
    ratios: random() < 0.5 ? [1, 0.92, 0.84] : random() < 0.5 ? [1, 0.95, 0.9, 0.85, 0.8] : [1, 0.9],
    shutoffHeadM: 15 + 80 * random(),
    bepFlowM3s: (20 + 400 * random()) / 3600,
    bepHeadRatio: 0.7 + 0.15 * random(),
    peakEfficiency: 0.55 + 0.35 * random(),
  };
}

/** The family's set with each member's fits bent by a random cubic term (still falling head, a plausible hump). */
function bent(set: CurveSet, random: () => number): CurveSet {
  const copy = structuredClone(set);
  for (const m of copy.members) {
    for (const key of ['head', 'efficiency', 'power'] as const) {
      const fit = m.curves[key]?.fit;
      if (!fit) continue;
      const scale = Math.abs(fit.coefficients[0] as number) + Math.abs(fit.coefficients[1] ?? 0) + Math.abs(fit.coefficients[2] ?? 0);
      const c = [...fit.coefficients, 0, 0].slice(0, 4);
      c[3] = (c[3] as number) + (random() - 0.5) * (key === 'head' ? 0.04 : 0.1) * scale;
      fit.coefficients = c;
      fit.degree = 3;
    }
    // Some members without an efficiency or power curve.
    if (random() < 0.1) delete m.curves.efficiency;
    if (random() < 0.1) delete m.curves.power;
  }
  return copy;
}

function randomDuty(random: () => number, families: InventedFamily[]) {
  if (random() < 0.3) return { flow_m3s: (10 + 500 * random()) / 3600, head_m: 5 + 90 * random() };
  const f = families[Math.floor(random() * families.length)] as InventedFamily;
  const r = 0.78 + 0.24 * random();
  const q = (0.3 + 1.1 * random()) * r * f.bepFlowM3s;
  const a = (f.shutoffHeadM * (1 - (f.bepHeadRatio ?? 0.8))) / f.bepFlowM3s ** 2;
  return { flow_m3s: q, head_m: Math.max(1, r * r * f.shutoffHeadM - a * q * q) };
}

describe('duty card bounds', () => {
  it('are stored as float64 numbers that read back exactly, and a damaged card reads as none', () => {
    const random = seededRandom(3);
    for (let i = 0; i < 10; i++) {
      const card = dutyCardOf(bent(inventedCurveSet(randomFamily(random, i)), random))!;
      const bytes = encodeDutyCard(card);
      expect(decodeDutyCard(bytes)).toEqual(card);
      expect(decodeDutyCard(bytes.slice(0, bytes.length - 8))).toBeNull();
      expect(decodeDutyCard(bytes.slice(0, 13))).toBeNull();
    }
    expect(decodeDutyCard(null)).toBeNull();
  });

  it('compute the trimmed head curve as the duty engine does', () => {
    const random = seededRandom(11);
    for (let i = 0; i < 20; i++) {
      const set = bent(inventedCurveSet(randomFamily(random, i)), random);
      const card = dutyCardOf(set)!;
      const full = card.m[0]![0];
      for (const ratio of [1, 0.97, 0.9, 0.85, 0.81, 0.75]) {
        const d = full * ratio;
        const curve = curveAtDiameter(set, d);
        const q = curve.domain[1] * random();
        // Same formula, other rounding: agreement to 1e-12 of the head.
        expect(cardHeadAt(card, d, q)).toBeCloseTo(curve.head(q), 9);
      }
    }
  });

  it('never reject a set the matcher accepts, and bound its efficiency from above and its power from below', () => {
    const random = seededRandom(2026);
    const families = Array.from({ length: 150 }, (_, i) => randomFamily(random, i));
    const sets = families.map((f, i) => (i % 2 ? bent(inventedCurveSet(f), random) : inventedCurveSet(f)));
    let accepted = 0;
    let rejected = 0;
    let tight = 0;
    for (let k = 0; k < 60; k++) {
      const duty = randomDuty(random, families);
      for (const set of sets) {
        const card = dutyCardOf(set)!;
        const bound = cardBound(card, duty.flow_m3s, duty.head_m);
        const match: DutyAnswer | null = libraryMatcher(set, duty);
        if (bound.reject) rejected += 1;
        if (!match) continue;
        accepted += 1;
        expect(bound.reject).toBe(false);
        expect(bound.efficiencyBound).toBeGreaterThanOrEqual(match.efficiency ?? -1);
        if (match.power_W !== undefined) expect(bound.powerBound).toBeLessThanOrEqual(match.power_W);
        if (match.efficiency !== undefined && bound.efficiencyBound - match.efficiency < 1e-4) tight += 1;
      }
    }
    // The test means something: many matches, many sure rejections, and bounds that are tight.
    expect(accepted).toBeGreaterThan(300);
    expect(rejected).toBeGreaterThan(1000);
    expect(tight / accepted).toBeGreaterThan(0.9);
  });
});

describe('ranking with duty cards', () => {
  const random = seededRandom(90210);
  const families = Array.from({ length: 200 }, (_, i) => randomFamily(random, i));
  // A few sets are kept with failing checks (efficiency above what a pump can reach): ranked last, marked.
  const failingAt = new Set([3, 17, 40, 41, 99, 150]);
  const stored: Array<{ id: string; set: CurveSet; failing: boolean }> = [];
  let tmp: ReturnType<typeof tempDir>;
  let store: LibraryStore;
  beforeAll(() => {
    tmp = tempDir('pumpscribe-card-');
    store = LibraryStore.open(join(tmp.dir, 'library.sqlite'));
    families.forEach((f, i) => {
      const set = inventedCurveSet(failingAt.has(i) ? { ...f, peakEfficiency: 0.99 } : f);
      const id = store.create(set, { acceptFailing: true }).id;
      stored.push({ id, set, failing: store.info(id).findings.fail_count > 0 });
    });
  }, 120_000);
  afterAll(() => {
    store.close();
    tmp.remove();
  });

  it('equals the matcher run on every set, by efficiency and by energy cost, for 80 duties', () => {
    expect(stored.filter((s) => s.failing).length).toBeGreaterThan(0);
    let evaluated = 0;
    let matchedAll = 0;
    for (let k = 0; k < 80; k++) {
      const duty = randomDuty(random, families);
      const brute = stored
        .map((s) => ({ ...s, match: libraryMatcher(s.set, duty) }))
        .filter((x) => x.match !== null)
        .map((x) => ({ id: x.id, failing: x.failing, name: x.set.pump.name, efficiency: x.match!.efficiency ?? -1, power: x.match!.power_W ?? Infinity, match: x.match! }));
        const byEfficiency = [...brute].sort((a, b) => Number(a.failing) - Number(b.failing) || b.efficiency - a.efficiency || a.name.localeCompare(b.name) || a.id.localeCompare(b.id));
      const byCost = [...brute].sort((a, b) => Number(a.failing) - Number(b.failing) || a.power - b.power || b.efficiency - a.efficiency || a.name.localeCompare(b.name));
      matchedAll += brute.length;
      for (const limit of [1, 5, 10]) {
        const top = searchByDuty(store, duty, libraryMatcher, { limit });
        evaluated += limit === 10 ? top.evaluated : 0;
        expect(top.candidates.map((c) => c.id)).toEqual(byEfficiency.slice(0, limit).map((b) => b.id));
        // The figures are the engine's own, unchanged.
        top.candidates.forEach((c, i) => {
          const b = byEfficiency[i]!;
          expect(c.efficiency).toBe(b.match.efficiency);
          expect(c.diameter_m).toBe(b.match.diameter_m);
          expect(c.failing).toBe(b.failing);
        });
        const cost = searchByDuty(store, duty, libraryMatcher, { limit, hoursPerYear: 6000, tariffPerKWh: 0.12 });
        expect(cost.candidates.map((c) => c.id)).toEqual(byCost.slice(0, limit).map((b) => b.id));
      }
    }
    // Many pumps meet these duties, yet the engine ran on few sets per query.
    expect(matchedAll / 80).toBeGreaterThan(8);
    expect(evaluated / 80).toBeLessThan(14);
  });
});

describe('a duty card that does not match its set', () => {
  it('is named by verify, since a search trusts the card to decide what to evaluate', () => {
    const tmp = tempDir('pumpscribe-card-verify-');
    try {
      const store = LibraryStore.open(join(tmp.dir, 'library.sqlite'));
      const random = seededRandom(5);
      const a = store.create(inventedCurveSet(randomFamily(random, 1))).id;
      const b = store.create(inventedCurveSet(randomFamily(random, 2))).id;
      expect(store.verify().damaged).toEqual([]);
      // Entry a given b's card, by hand (the copy beside the index follows through its trigger).
      store.db.prepare('UPDATE entries SET duty_card = (SELECT duty_card FROM entries WHERE id = ?) WHERE id = ?').run(b, a);
      expect(store.verify().damaged).toEqual([{ kind: 'entry', id: a, revision: 1, problem: expect.stringMatching(/duty card does not match/) }]);
      store.close();
    } finally {
      tmp.remove();
    }
  });
});
