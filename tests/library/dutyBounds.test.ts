import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { LibraryStore } from '../../src/library/store.ts';
import { extremaOn, screenDuty } from '../../src/library/dutyBounds.ts';
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

describe('extrema of a fitted curve on an interval', () => {
  const fit = (coefficients: number[], flow_scale = 2) => ({
    kind: 'polynomial' as const, flow_scale, coefficients, domain: [0, 2] as [number, number], degree: coefficients.length - 1,
    through_origin: false, rms: 0, max_residual: 0, condition: 1, reason: 'test',
  });
  it('finds the vertex of a parabola inside the interval, and only the ends when it lies outside', () => {
    // y = 1 + 2t − t², t = Q/2: vertex at t = 1 (Q = 2), y = 2 (exact arithmetic, 1e-12).
    expect(extremaOn(fit([1, 2, -1]), 0, 3).max).toBeCloseTo(2, 12);
    expect(extremaOn(fit([1, 2, -1]), 0, 1).max).toBeCloseTo(1 + 1 - 0.25, 12);
  });
  it('finds both stationary points of a cubic, and agrees with dense sampling for a quintic', () => {
    // y = t³ − 3t: local max 2 at t = −1, local min −2 at t = 1 (flow scale 1).
    const cubic = fit([0, -3, 0, 1], 1);
    expect(extremaOn(cubic, -1.5, 1.5)).toEqual({ min: expect.closeTo(-2, 12), max: expect.closeTo(2, 12) });
    const quintic = fit([0.1, 1, -2, 0.5, 0.8, -0.6], 1);
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i <= 20000; i++) {
      const t = -1 + (2 * i) / 20000;
      const y = [0.1, 1, -2, 0.5, 0.8, -0.6].reduce((acc, c, k) => acc + c * t ** k, 0);
      lo = Math.min(lo, y);
      hi = Math.max(hi, y);
    }
    const e = extremaOn(quintic, -1, 1);
    // Dense sampling with step 1e-4 is within 1e-6 of the true extremes.
    expect(e.max).toBeGreaterThanOrEqual(hi - 1e-9);
    expect(e.max - hi).toBeLessThan(1e-6);
    expect(e.min).toBeLessThanOrEqual(lo + 1e-9);
  });
});
