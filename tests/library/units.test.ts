/**
 * `library list` and `library find` default to each set's own units; a library written by the
 * previous schema (version 1, a committed fixture of invented sets) is brought up to date on opening.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { copyFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { LibraryStore } from '../../src/library/store.ts';
import { SCHEMA_VERSION } from '../../src/library/schema.ts';
import { searchByDuty } from '../../src/library/dutySearch.ts';
import { libraryMatcher } from '../../src/library/matcher.ts';
import { FAMILIES, inventedCurveSet } from './fixtures.ts';
import { runLibrary } from './runCli.ts';
import { tempDir } from '../server/helpers.ts';

let tmp: ReturnType<typeof tempDir>;
let lib: string;
const US_UNITS = { flow: 'gpm', head: 'ft', npsh: 'ft', power: 'hp', diameter: 'in' };
beforeAll(() => {
  tmp = tempDir('pumpscribe-units-');
  lib = join(tmp.dir, 'office.sqlite');
  const store = LibraryStore.open(lib);
  store.create(inventedCurveSet(FAMILIES.small));
  store.create({ ...inventedCurveSet(FAMILIES.mid), display_units: US_UNITS });
  store.close();
});
afterAll(() => tmp.remove());

describe('own units', () => {
  it('list shows each set in the units it was saved in, with the unit beside every figure', async () => {
    const r = await runLibrary('list', '--library', lib);
    expect(r.code).toBe(0);
    const small = r.out.split('\n').find((l) => l.includes('Invented Small'))!;
    const mid = r.out.split('\n').find((l) => l.includes('Invented Mid'))!;
    // Small: 0.84/0.92/1 × 170 mm, saved in mm and m³/h; mid: 0.26 m = 10.24 in, saved in gpm and ft.
    expect(small).toMatch(/142\.8, 156\.4, 170 mm/);
    expect(small).toMatch(/ m³\/h /);
    expect(mid).toMatch(/8\.598, 9\.417, 10\.24 in/);
    expect(mid).toMatch(/ gpm /);
    // Shutoff 58 m = 190.3 ft, shown to three figures.
    expect(mid).toMatch(/88\.9–190 ft/);
    // --units still converts every row to one system.
    const si = await runLibrary('list', '--units', 'si', '--library', lib);
    expect(si.out.split('\n').find((l) => l.includes('Invented Mid'))).toMatch(/218\.4, 239\.2, 260 mm/);
  });

  it('find takes figures with their units and answers each pump in its own units; plain numbers need --units', async () => {
    const r = await runLibrary('find', '--flow', '528.3 gpm', '--head', '131.2 ft', '--json', '--library', lib);
    expect(r.code).toBe(0);
    const view = JSON.parse(r.out);
    expect(view.units.flow).toBe('gpm');
    // 528.3 gpm = 120.0 m³/h (NIST SP 811: 1 gpm = 0.2271247 m³/h), within 0.1 %.
    expect(view.duty.flow).toBeCloseTo(528.3, 6);
    expect(view.candidates).toHaveLength(1);
    expect(view.candidates[0].units).toEqual({ flow: 'gpm', head: 'ft', diameter: 'in', power: 'hp', npshr: 'ft' });
    expect(view.candidates[0].diameter).toBeGreaterThan(8.5);
    expect(view.candidates[0].diameter).toBeLessThan(10.3);
    const plain = await runLibrary('find', '--flow', '120', '--head', '40', '--library', lib);
    expect(plain.code).toBe(2);
    expect(plain.err).toMatch(/^pumpscribe: Say which unit --flow is in: write it beside the number \(--flow "120 m3\/h"\) or give --units si\|us\.\n$/);
    const bad = await runLibrary('find', '--flow', '120 furlongs', '--head', '40 m', '--library', lib);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/Unknown flow unit "furlongs"/);
  });
});

describe('a library of schema version 1', () => {
  it('is migrated on opening: findings summaries, units and the duty index are filled from the stored sets', () => {
    const file = join(tmp.dir, 'v1.sqlite');
    copyFileSync(join(import.meta.dirname, 'fixtures', 'v1-library.sqlite'), file);
    const store = LibraryStore.open(file);
    expect(store.db.pragma('user_version', { simple: true })).toBe(SCHEMA_VERSION);
    // Schema 3 fills the duty card of every diameter family from its search copy.
    expect((store.db.prepare(`SELECT count(*) AS n FROM duty_cards WHERE length(card) > 0`).get() as { n: number }).n).toBe(3);
    expect(store.counts()).toEqual({ entries: 3, archived: 0, revisions: 4, sheets: 1 });
    expect(store.verify().damaged).toEqual([]);
    expect(store.revisions('00000000000000a2').map((r) => r.fail_count)).toEqual([0, 0]);
    // The large set was stored before the library refused failing sets: it is kept and now marked.
    expect(store.info('00000000000000a3').findings.fail_codes).toEqual(['efficiency.too-high']);
    const found = searchByDuty(store, { flow_m3s: 120 / 3600, head_m: 40 }, libraryMatcher);
    expect(found.candidates.map((c) => [c.id, c.revision])).toEqual([['00000000000000a2', 2]]);
    store.close();
    writeFileSync(join(tmp.dir, 'done'), '');
  });
});
