/**
 * The duty index never loses a pump: a search through the index finds exactly the pumps the duty
 * engine's matcher accepts when it is run on every set in the library (brute force), and ranks the
 * best ones the same way, while reading only a part of the library.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { LibraryStore } from '../../src/library/store.ts';
import { searchByDuty } from '../../src/library/dutySearch.ts';
import { libraryMatcher } from '../../src/library/matcher.ts';
import { dutySlices } from '../../src/library/dutyIndex.ts';
import { summarize } from '../../src/library/summary.ts';
import { seededRandom } from '../../src/demo/random.ts';
import { inventedCurveSet, type InventedFamily } from './fixtures.ts';
import { tempDir } from '../server/helpers.ts';
import type { CurveSet } from '../../src/model/curveset.ts';

const random = seededRandom(4242);
const families: InventedFamily[] = Array.from({ length: 120 }, (_, i) => ({
  name: `Invented index test ${i}`,
  model: `IIT-${i}`,
  fullDiameterM: 0.15 + 0.3 * random(),
  ratios: random() < 0.5 ? [1, 0.92, 0.84] : [1, 0.95, 0.9, 0.85, 0.8],
  shutoffHeadM: 15 + 80 * random(),
  bepFlowM3s: (20 + 400 * random()) / 3600,
  bepHeadRatio: 0.7 + 0.15 * random(),
  peakEfficiency: 0.55 + 0.35 * random(),
}));
const sets: Array<{ id: string; set: CurveSet }> = [];
const duties = Array.from({ length: 80 }, (_, k) => {
  if (k % 3 === 0) return { flow_m3s: (10 + 500 * random()) / 3600, head_m: 5 + 90 * random() };
  // Near some family's curves, where several pumps compete.
  const f = families[Math.floor(random() * families.length)] as InventedFamily;
  const r = 0.8 + 0.2 * random();
  const q = (0.5 + 0.8 * random()) * r * f.bepFlowM3s;
  const a = (f.shutoffHeadM * (1 - (f.bepHeadRatio ?? 0.8))) / f.bepFlowM3s ** 2;
  return { flow_m3s: q, head_m: Math.max(1, r * r * f.shutoffHeadM - a * q * q) };
});

let tmp: ReturnType<typeof tempDir>;
let store: LibraryStore;
beforeAll(() => {
  tmp = tempDir('pumpscribe-index-');
  store = LibraryStore.open(join(tmp.dir, 'library.sqlite'));
  for (const f of families) {
    const set = inventedCurveSet(f);
    sets.push({ id: store.create(set).id, set });
  }
});
afterAll(() => {
  store.close();
  tmp.remove();
});

describe('duty index', () => {
  it('finds exactly the pumps the matcher accepts when run on every set, for 80 duties', () => {
    let found = 0;
    let read = 0;
    for (const duty of duties) {
      const brute = sets
        .map(({ id, set }) => ({ id, match: libraryMatcher(set, duty) }))
        .filter((x) => x.match !== null)
        .sort((a, b) => (b.match!.efficiency ?? -1) - (a.match!.efficiency ?? -1));
      const all = searchByDuty(store, duty, libraryMatcher, { limit: 500 });
      expect(all.candidates.map((c) => c.id).sort()).toEqual(brute.map((b) => b.id).sort());
      const top = searchByDuty(store, duty, libraryMatcher, { limit: 3 });
      // Same top three, in the same order (efficiencies equal to 1e-12 where ids could swap).
      expect(top.candidates.map((c) => c.efficiency)).toEqual(brute.slice(0, 3).map((b) => expect.closeTo(b.match!.efficiency ?? -1, 12)));
      found += brute.length;
      read += top.evaluated;
    }
    // The test means something: many pumps meet these duties, yet the top three need few evaluations.
    expect(found).toBeGreaterThan(150);
    expect(read / duties.length).toBeLessThan(found / duties.length);
  });

  it('keeps twelve slices per diameter family, each holding the region between the smallest and largest head curves', () => {
    const set = sets[0]!.set;
    const slices = dutySlices(set, summarize(set));
    expect(slices).toHaveLength(12);
    for (const [qa, qb, ha, hb, eta] of slices) {
      expect(qa).toBeLessThan(qb);
      expect(ha).toBeLessThan(hb);
      // The bound is at least the family's peak efficiency (every slice sees the BEP through the trim spread or not: ≥ 0).
      expect(eta).toBeGreaterThan(0);
    }
  });
});
