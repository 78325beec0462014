/**
 * The library keeps sound records: findings summaries per revision, failing sets only when accepted
 * (marked and ranked last), no sets in unknown units or without a head curve, damaged rows isolated
 * and reported, and backups that can always be imported again. Real SQLite files throughout.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { existsSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { LibraryStore } from '../../src/library/store.ts';
import { LibraryError } from '../../src/library/errors.ts';
import { searchByDuty } from '../../src/library/dutySearch.ts';
import { libraryMatcher } from '../../src/library/matcher.ts';
import { FAMILIES, inventedCurveSet } from './fixtures.ts';
import { runLibrary } from './runCli.ts';
import { json, postJson, startTestServer, tempDir } from '../server/helpers.ts';

let tmp: ReturnType<typeof tempDir>;
let file: string;
beforeEach(() => {
  tmp = tempDir('pumpscribe-sound-');
  file = join(tmp.dir, 'library.sqlite');
});
afterEach(() => tmp.remove());

/** Invented: the mid family with a 97 % peak efficiency, which the plausibility check fails (no pump reaches 95 %). */
const failing = () => inventedCurveSet({ ...FAMILIES.mid, name: 'Invented Too Good 80-250', model: 'ITG-80', peakEfficiency: 0.97 });

function codeOf(body: () => unknown): string | undefined {
  try {
    body();
  } catch (error) {
    if (error instanceof LibraryError) return error.code;
    throw error;
  }
  return undefined;
}

describe('sound records', () => {
  it('takes a set with fail findings only when accepted, and keeps its findings summary per revision', () => {
    const store = LibraryStore.open(file);
    // Its stored findings are empty: the checks run again on saving find the fail all the same.
    expect(failing().findings).toEqual([]);
    expect(codeOf(() => store.create(failing()))).toBe('failing-set');
    expect(() => store.create(failing())).toThrow(/3 failing checks \(efficiency\.too-high\); .*--accept-failing/);
    expect(store.counts().entries).toBe(0);
    const { id } = store.create(failing(), { acceptFailing: true });
    expect(store.info(id).findings).toEqual({ fail_count: 3, warn_count: expect.any(Number), fail_codes: ['efficiency.too-high'] });
    expect(store.revisions(id)[0]).toMatchObject({ fail_count: 3, fail_codes: ['efficiency.too-high'], accepted_failing: true });
    const sound = store.create(inventedCurveSet(FAMILIES.mid));
    expect(store.revisions(sound.id)[0]).toMatchObject({ fail_count: 0, fail_codes: [], accepted_failing: false });
    store.close();
  });

  it('refuses a set in unknown units or without a fitted head curve, with one sentence', () => {
    const store = LibraryStore.open(file);
    const set = inventedCurveSet(FAMILIES.small);
    const units = { ...set, display_units: { ...set.display_units, flow: 'buckets/h' } };
    // The curve-set reader itself refuses unknown unit tokens now (its schema lists the known ones); the library's own gate stays behind it.
    expect(['invalid-input', 'unsound-set']).toContain(codeOf(() => store.create(units)));
    expect(() => store.create(units)).toThrow(/buckets\/h|display_units\.flow/);
    const headless = { ...set, members: set.members.map((m) => ({ ...m, curves: { efficiency: m.curves.efficiency } })) };
    expect(codeOf(() => store.create(headless))).toBe('unsound-set');
    expect(() => store.create(headless)).toThrow(/has no fitted head curve/);
    expect(store.counts().entries).toBe(0);
    store.close();
  });

  it('duty search marks a failing set and ranks it after sound ones, though its efficiency is higher', () => {
    const store = LibraryStore.open(file);
    const bad = store.create(failing(), { acceptFailing: true }).id;
    const good = store.create(inventedCurveSet(FAMILIES.mid)).id;
    const result = searchByDuty(store, { flow_m3s: 120 / 3600, head_m: 40 }, libraryMatcher);
    expect(result.candidates.map((c) => c.id)).toEqual([good, bad]);
    expect(result.candidates.map((c) => c.failing)).toEqual([false, true]);
    expect(result.candidates[1]!.fail_codes).toEqual(['efficiency.too-high']);
    expect(result.candidates[1]!.efficiency!).toBeGreaterThan(result.candidates[0]!.efficiency!);
    // With room for one only, the sound pump is the answer.
    expect(searchByDuty(store, { flow_m3s: 120 / 3600, head_m: 40 }, libraryMatcher, { limit: 1 }).candidates.map((c) => c.id)).toEqual([good]);
    store.close();
  });

  it('HTTP: a failing set is refused with code failing-set, and kept with ?accept_failing=true', async () => {
    const server = await startTestServer(file);
    try {
      const refused = await postJson(`${server.url}/api/curvesets`, failing());
      expect(refused.status).toBe(400);
      expect(refused.body.code).toBe('failing-set');
      const kept = await postJson(`${server.url}/api/curvesets?accept_failing=true`, failing());
      expect(kept.status).toBe(201);
      const search = await json(`${server.url}/api/search?flow=120&head=40&units=si`);
      expect(search.body.candidates[0]).toMatchObject({ id: kept.body.id, failing: true, fail_codes: ['efficiency.too-high'] });
    } finally {
      await server.close();
    }
  });
});

describe('damaged rows', () => {
  /** Three sound entries, one accepted failing; then one entry's search copy and another's revision text are damaged by hand. */
  function damagedLibrary() {
    const store = LibraryStore.open(file);
    const ids = {
      small: store.create(inventedCurveSet(FAMILIES.small)).id,
      mid: store.create(inventedCurveSet(FAMILIES.mid)).id,
      large: store.create(inventedCurveSet(FAMILIES.large)).id,
      failing: store.create(failing(), { acceptFailing: true }).id,
      twin: store.create(inventedCurveSet({ ...FAMILIES.mid, name: 'Invented Mid twin 80-250', model: 'IMT' })).id,
      rotten: store.create(inventedCurveSet({ ...FAMILIES.small, name: 'Invented rotten 50-160', model: 'IR' })).id,
    };
    store.close();
    const db = new Database(file);
    db.prepare(`UPDATE entries SET search_json = '{"members": [tr' WHERE id = ?`).run(ids.twin);
    db.exec('DROP TRIGGER revisions_append_only_u');
    db.prepare(`UPDATE revisions SET body = substr(body, 1, 200) WHERE entry_id = ?`).run(ids.rotten);
    db.close();
    return ids;
  }

  it('search skips a damaged row, names it, and still ranks the sound pumps', async () => {
    const ids = damagedLibrary();
    const store = LibraryStore.open(file);
    const result = searchByDuty(store, { flow_m3s: 120 / 3600, head_m: 40 }, libraryMatcher);
    expect(result.damaged.map((d) => d.id)).toEqual([ids.twin]);
    expect(result.candidates.map((c) => c.id)).toEqual([ids.mid, ids.failing]);
    store.close();
    const server = await startTestServer(file);
    try {
      const r = await json(`${server.url}/api/search?flow=120&head=40&units=si`);
      expect(r.status).toBe(200);
      expect(r.body.damaged).toEqual([{ id: ids.twin, revision: 1, problem: expect.stringMatching(/cannot be read/) }]);
      // The backup over HTTP is refused before its first byte, with a sentence and a stable code.
      const backup = await json(`${server.url}/api/library/export`);
      expect(backup.status).toBe(409);
      expect(backup.body).toEqual({ error: expect.stringMatching(/^The export stopped at entry [0-9a-f]{16} revision 1 /), code: 'damaged-rows' });
    } finally {
      await server.close();
    }
    const text = await runLibrary('find', '--flow', '120 m3/h', '--head', '40 m', '--library', file);
    expect(text.code).toBe(0);
    expect(text.out).toMatch(new RegExp(`1 damaged entry was skipped \\(${ids.twin}\\); run "library verify"`));
    expect(text.out).toMatch(/FAILING checks \(efficiency\.too-high\)/);
  });

  it('verify names every damaged row and exits 1; export refuses, and --skip-damaged writes a backup that round-trips every sound entry', async () => {
    const ids = damagedLibrary();
    const verify = await runLibrary('verify', '--library', file);
    expect(verify.code).toBe(1);
    expect(verify.out).toContain(`damaged revision ${ids.rotten} revision 1: its text no longer matches its SHA-256`);
    expect(verify.out).toContain(`damaged entry ${ids.twin} revision 1: its summary row cannot be read (search_json)`);
    expect(verify.out).toMatch(/^2 damaged rows in 6 entries/m);

    const backup = join(tmp.dir, 'backup.jsonl');
    const refused = await runLibrary('export', '-o', backup, '--library', file);
    expect(refused.code).toBe(2);
    expect(refused.err).toMatch(new RegExp(`^pumpscribe: The export stopped at entry ${ids.rotten} revision 1 \\(its text no longer matches its SHA-256\\), so a backup written now could not be imported again; .*\\n$`));
    expect(existsSync(backup)).toBe(false);
    expect(readdirSync(tmp.dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);

    const skipped = await runLibrary('export', '-o', backup, '--skip-damaged', '--library', file);
    expect(skipped.code).toBe(0);
    expect(skipped.err).toContain(`left out ${ids.rotten} (revision 1): its text no longer matches its SHA-256`);
    const copy = join(tmp.dir, 'copy.sqlite');
    const imported = await runLibrary('import', backup, '--library', copy);
    expect(imported.code).toBe(0);
    expect(imported.out).toMatch(/imported: 5 new entries/);
    // Every sound entry comes back byte for byte, the accepted failing one still marked failing.
    for (const id of [ids.small, ids.mid, ids.large, ids.failing, ids.twin]) {
      expect((await runLibrary('show', id, '--raw', '--library', copy)).out).toBe((await runLibrary('show', id, '--raw', '--library', file)).out);
    }
    const again = LibraryStore.open(copy);
    expect(again.info(ids.failing).findings.fail_codes).toEqual(['efficiency.too-high']);
    expect(again.verify().damaged).toEqual([]);
    again.close();
  });

  it('restore --from rebuilds a library from an export or a backup copy into a new file, never over an existing one', async () => {
    const store = LibraryStore.open(file);
    const id = store.create(inventedCurveSet(FAMILIES.mid)).id;
    store.create(failing(), { acceptFailing: true });
    store.close();
    const exported = join(tmp.dir, 'all.jsonl');
    expect((await runLibrary('export', '-o', exported, '--library', file)).code).toBe(0);
    const copy = join(tmp.dir, 'copy.sqlite');
    expect((await runLibrary('backup', copy, '--library', file)).code).toBe(0);
    for (const from of [exported, copy]) {
      const target = join(tmp.dir, `restored-${from.endsWith('.jsonl') ? 'export' : 'copy'}.sqlite`);
      const r = await runLibrary('restore', '--from', from, '--library', target);
      expect(r.code).toBe(0);
      expect(r.out).toMatch(/^restored 2 entries from/);
      expect((await runLibrary('show', id, '--raw', '--library', target)).out).toBe((await runLibrary('show', id, '--raw', '--library', file)).out);
      const over = await runLibrary('restore', '--from', from, '--library', target);
      expect(over.code).toBe(2);
      expect(over.err).toMatch(/already exists; restore into a new file name/);
    }
    // A refused restore leaves no file behind.
    const junk = join(tmp.dir, 'junk.jsonl');
    writeFileSync(junk, '{"kind":"header","format":"pumpscribe.library-export","version":1}\nnot json\n');
    const target = join(tmp.dir, 'never.sqlite');
    expect((await runLibrary('restore', '--from', junk, '--library', target)).code).toBe(2);
    expect(readdirSync(tmp.dir).filter((f) => f.startsWith('never'))).toEqual([]);
  });
});
