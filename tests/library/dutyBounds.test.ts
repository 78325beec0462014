import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { LibraryStore } from '../../src/library/store.ts';
import { screenDuty } from '../../src/library/dutyBounds.ts';
import { searchByDuty } from '../../src/library/dutySearch.ts';
import { libraryMatcher } from '../../src/library/matcher.ts';
import { seededRandom } from '../../src/demo/random.ts';
import { inventedCurveSet, type InventedFamily } from './fixtures.ts';

const random = seededRandom(7);
const families: InventedFamily[] = Array.from({ length: 60 }, (_, i) => ({
  name: `Invented bound test ${i}`,
  fullDiameterM: 0.2 + 0.1 * random(),
  ratios: random() < 0.5 ? [1, 0.92, 0.84] : [1, 0.94, 0.88, 0.82],
  shutoffHeadM: 30 + 30 * random(),
  bepFlowM3s: (80 + 120 * random()) / 3600,
  bepHeadRatio: 0.75 + 0.1 * random(),
  peakEfficiency: 0.6 + 0.28 * random(),
}));
const duties = Array.from({ length: 12 }, () => ({ flow_m3s: (60 + 120 * random()) / 3600, head_m: 25 + 25 * random() }));

let dir: string;
let store: LibraryStore;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'pumpscribe-bounds-'));
  store = LibraryStore.open(join(dir, 'library.sqlite'));
  for (const f of families) store.create(inventedCurveSet(f));
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('duty screening bounds', () => {
  it('never reject a pump the duty engine accepts, and bound its efficiency from above and its power from below', () => {
    let accepted = 0;
    for (const f of families) {
      const set = inventedCurveSet(f);
      for (const d of duties) {
        const match = libraryMatcher(set, d);
        const screen = screenDuty(set, d.flow_m3s, d.head_m);
        if (!match) continue;
        accepted += 1;
        expect(screen).not.toBeNull();
        expect(screen!.efficiencyBound).toBeGreaterThanOrEqual(match.efficiency as number);
        expect(screen!.powerBound).toBeLessThanOrEqual(match.power_W as number);
      }
    }
    expect(accepted).toBeGreaterThan(20);
  });

  it('give the same top of the ranking as evaluating every pump, by efficiency and by energy cost', () => {
    let cut = 0;
    for (const d of duties) {
      const all = searchByDuty(store, d, libraryMatcher, { limit: 500 });
      expect(all.complete).toBe(true);
      const top = searchByDuty(store, d, libraryMatcher, { limit: 3 });
      expect(top.candidates.map((c) => c.id)).toEqual(all.candidates.slice(0, 3).map((c) => c.id));
      if (!top.complete) cut += 1;
      const costAll = searchByDuty(store, d, libraryMatcher, { limit: 500, hoursPerYear: 6000, tariffPerKWh: 0.12 });
      const costTop = searchByDuty(store, d, libraryMatcher, { limit: 3, hoursPerYear: 6000, tariffPerKWh: 0.12 });
      expect(costTop.candidates.map((c) => c.id)).toEqual(costAll.candidates.slice(0, 3).map((c) => c.id));
    }
    // The bounds must actually save work on some of these duties, or the test proves nothing.
    expect(cut).toBeGreaterThan(0);
  });
});
