import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { LibraryStore } from '../../src/library/store.ts';
import { searchByDuty } from '../../src/library/dutySearch.ts';
import { libraryMatcher } from '../../src/library/matcher.ts';
import { dutyFromDisplay, dutySearchView } from '../../src/library/dutyView.ts';
import { FAMILIES, exactEfficiencyAt, exactTrimDiameter, inventedCurveSet, type InventedFamily } from './fixtures.ts';

let dir: string;
let store: LibraryStore;
const ids: Record<string, string> = {};

beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'pumpscribe-duty-'));
  store = LibraryStore.open(join(dir, 'library.sqlite'));
  for (const [key, family] of Object.entries(FAMILIES)) ids[key] = store.create(inventedCurveSet(family)).id;
});
afterEach(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

const m3h = (v: number) => v / 3600;

describe('duty search', () => {
  it('finds the only pump that meets 120 m³/h at 40 m, at the exact trim within 1 %', () => {
    const q = m3h(120);
    const result = searchByDuty(store, { flow_m3s: q, head_m: 40 }, libraryMatcher);
    expect(result.candidates.map((c) => c.id)).toEqual([ids.mid]);
    const c = result.candidates[0]!;
    const exact = exactTrimDiameter(FAMILIES.mid, q, 40);
    // The family obeys the trim law exactly, so the trim must agree within 1 % (acceptance criterion).
    expect(Math.abs((c.diameter_m as number) - exact) / exact).toBeLessThan(0.01);
    expect(c.trimmed).toBe(true);
    // Efficiency of the exact trim at the duty, within 0.5 % points (blend of exact-law neighbours).
    expect(c.efficiency as number).toBeCloseTo(exactEfficiencyAt(FAMILIES.mid, q, 40), 2);
    expect(c.por_position).toBe('within');
    // Power is ρgQH/η at the duty, within 2 % (the fixture's power is a cubic fit of that).
    const hydraulic = 998.2 * 9.80665 * q * 40;
    expect(Math.abs((c.power_W as number) / (hydraulic / (c.efficiency as number)) - 1)).toBeLessThan(0.02);
  });

  it('qualifies a pump with one of its captured diameters exactly, not as a trim', () => {
    const f = FAMILIES.large;
    const r = 0.92;
    const q = 0.9 * r * f.bepFlowM3s;
    const law = (f.shutoffHeadM - 0.8 * f.shutoffHeadM) / f.bepFlowM3s ** 2;
    const h = r * r * f.shutoffHeadM - law * q * q;
    const result = searchByDuty(store, { flow_m3s: q, head_m: h }, libraryMatcher);
    const c = result.candidates.find((x) => x.id === ids.large)!;
    expect(c).toBeDefined();
    // Relative tolerance 1e-6 on a captured diameter (0.92 × 0.41 m).
    expect(Math.abs((c.diameter_m as number) - r * f.fullDiameterM) / (r * f.fullDiameterM)).toBeLessThan(1e-6);
    expect(c.trimmed).toBe(false);
  });

  it('leaves out pumps that would need a trim below their smallest diameter', () => {
    // 300 m³/h at 40 m: the large pump would need r² = (40 + a·Q²)/95 → r ≈ 0.71, below its 0.84.
    const result = searchByDuty(store, { flow_m3s: m3h(300), head_m: 40 }, libraryMatcher);
    expect(result.candidates.map((c) => c.id)).not.toContain(ids.large);
  });

  it('ranks by efficiency by default and by annual energy cost when hours and tariff are given', () => {
    const efficient: InventedFamily = { ...FAMILIES.mid, name: 'Invented Mid, efficient', peakEfficiency: 0.84 };
    const idEfficient = store.create(inventedCurveSet(efficient)).id;
    const duty = { flow_m3s: m3h(120), head_m: 40 };
    const byEff = searchByDuty(store, duty, libraryMatcher);
    expect(byEff.ranking).toBe('efficiency');
    expect(byEff.candidates.map((c) => c.id)).toEqual([idEfficient, ids.mid]);
    const byCost = searchByDuty(store, duty, libraryMatcher, { hoursPerYear: 4000, tariffPerKWh: 0.2 });
    expect(byCost.ranking).toBe('annual-cost');
    expect(byCost.candidates[0]!.id).toBe(idEfficient);
    const c = byCost.candidates[0]!;
    // Annual energy = shaft power × hours (exact arithmetic, 1e-9 relative).
    expect(c.annual_energy_kWh).toBeCloseTo(((c.power_W as number) * 4000) / 1000, 6);
    expect(c.annual_cost).toBeCloseTo((c.annual_energy_kWh as number) * 0.2, 6);
  });

  it('skips archived entries', () => {
    store.archive(ids.mid!);
    expect(searchByDuty(store, { flow_m3s: m3h(120), head_m: 40 }, libraryMatcher).candidates).toEqual([]);
  });

  it('reports the answer in US units: diameter in inches, power in hp, NPSHr in feet', () => {
    const duty = dutyFromDisplay('us', 120 / 0.2271247, 40 / 0.3048);
    const view = dutySearchView(searchByDuty(store, duty, libraryMatcher), 'us');
    const c = view.candidates[0]!;
    const exactIn = exactTrimDiameter(FAMILIES.mid, m3h(120), 40) / 0.0254;
    // gpm factor from NIST SP 811 (1 gpm = 0.2271247 m³/h, rounded to 7 digits): 1e-6 relative on the duty.
    expect(Math.abs((c.diameter as number) - exactIn) / exactIn).toBeLessThan(0.01);
    expect(view.units).toMatchObject({ flow: 'gpm', head: 'ft', diameter: 'in', power: 'hp' });
    expect(c.efficiency as number).toBeGreaterThan(50);
  });

  it('refuses a duty that is not a positive flow and head, and a static head above the duty head', () => {
    expect(() => searchByDuty(store, { flow_m3s: 0, head_m: 40 }, libraryMatcher)).toThrow(/flow/);
    expect(() => searchByDuty(store, { flow_m3s: 0.03, head_m: Number.NaN }, libraryMatcher)).toThrow(/head/);
    expect(() => searchByDuty(store, { flow_m3s: 0.03, head_m: 40, static_head_m: 41 }, libraryMatcher)).toThrow(/static/);
  });
});

describe('duty search with a failing engine', () => {
  it('leaves out and names a curve set the engine fails on, and still ranks the others', () => {
    const failing = (set: Parameters<typeof libraryMatcher>[0], duty: Parameters<typeof libraryMatcher>[1]) => {
      if (set.pump.name === FAMILIES.mid.name) throw new Error('invented engine failure');
      return libraryMatcher(set, duty);
    };
    const extra = store.create(inventedCurveSet({ ...FAMILIES.mid, name: 'Invented Mid twin' })).id;
    const result = searchByDuty(store, { flow_m3s: m3h(120), head_m: 40 }, failing);
    expect(result.failed).toEqual([ids.mid]);
    expect(result.candidates.map((c) => c.id)).toEqual([extra]);
  });
});
