/**
 * Import in batches (importJournal.ts): batch boundaries, a bad entry in a later batch undoing the
 * batches already committed (an extended entry gets its earlier state back exactly), an import that
 * stopped without ending undone at the next open, and the same results whatever the batch size.
 * Invented pumps only (fixtures.ts).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { LibraryStore } from '../../src/library/store.ts';
import { EXPORT_FORMAT, EXPORT_VERSION, exportLines, importLines, type ImportOptions } from '../../src/library/transfer.ts';
import { IMPORT_BATCH_ENTRIES } from '../../src/library/importJournal.ts';
import { LibraryError } from '../../src/library/errors.ts';
import { searchByDuty } from '../../src/library/dutySearch.ts';
import { libraryMatcher } from '../../src/library/matcher.ts';
import type { CurveSet } from '../../src/model/curveset.ts';
import { FAMILIES, inventedCurveSet } from './fixtures.ts';
import { runLibrary } from './runCli.ts';
import { tempDir } from '../server/helpers.ts';

const SRC = join(import.meta.dirname, '..', '..', 'src');
const AT = '2025-01-01T00:00:00.000Z';
const HEADER = JSON.stringify({ kind: 'header', format: EXPORT_FORMAT, version: EXPORT_VERSION });
const SHEET_BYTES = Buffer.from('%PDF-1.4\n% invented sheet for the import batch test\n');
const SHEET_SHA = createHash('sha256').update(SHEET_BYTES).digest('hex');
const SHEET_LINE = JSON.stringify({ kind: 'sheet', sha256: SHEET_SHA, name: 'invented.pdf', media_type: 'application/pdf', stored_at: AT, data_base64: SHEET_BYTES.toString('base64') });

function idOf(i: number): string {
  return (0x3000000000000000n + BigInt(i)).toString(16);
}

function setOf(i: number): CurveSet {
  return inventedCurveSet({ ...FAMILIES.mid, name: `Invented batch pump ${i}`, model: `IBP-${i}`, shutoffHeadM: 40 + (i % 17) });
}

function entryLine(id: string, sets: CurveSet[]): string {
  return JSON.stringify({ kind: 'entry', id, created_at: AT, archived_at: null, revisions: sets.map((curveset, k) => ({ revision: k + 1, saved_at: AT, curveset })) });
}

function entryLines(count: number, from = 0): string[] {
  return Array.from({ length: count }, (_, k) => entryLine(idOf(from + k), [setOf(from + k)]));
}

/** Everything a reader of the library can see, for comparing two libraries (or one before and after). */
function snapshot(store: LibraryStore) {
  const all = (sql: string) => store.db.prepare(sql).all();
  return {
    counts: store.counts(),
    entries: all('SELECT * FROM entries ORDER BY id'),
    revisions: all('SELECT entry_id, revision, saved_at, sha256, source_sha256 FROM revisions ORDER BY entry_id, revision'),
    summaries: all('SELECT * FROM revision_summaries ORDER BY entry_id, revision'),
    events: all('SELECT entry_id, event, revision FROM entry_events ORDER BY seq'),
    index: all('SELECT d.*, c.entry_id FROM duty_index d JOIN duty_cards c ON c.entry_key = d.entry_key ORDER BY slice'),
    cards: all('SELECT entry_id, revision, card FROM duty_cards ORDER BY entry_id'),
    sheets: all('SELECT sha256 FROM sheets ORDER BY sha256'),
    journal: [...all('SELECT * FROM imports'), ...all('SELECT * FROM import_rows')],
  };
}

let tmp: ReturnType<typeof tempDir>;
let store: LibraryStore;
beforeEach(() => {
  tmp = tempDir('pumpscribe-import-batches-');
  store = LibraryStore.open(join(tmp.dir, 'office.sqlite'), { now: () => AT });
});
afterEach(() => {
  store.close();
  tmp.remove();
});

async function run(lines: string[], options: ImportOptions = {}, target = store) {
  const batches: number[] = [];
  const report = await importLines(target, [HEADER, ...lines], { ...options, onBatch: (n) => (batches.push(n), options.onBatch?.(n)) });
  return { report, batches };
}

describe('batch boundaries', () => {
  it.each([
    [3, []],
    [4, [4]],
    [5, [4]],
    [9, [4, 8]],
  ])('%i entries in batches of 4 commit after entries %j, and all are imported with no journal left', async (count, commits) => {
    const { report, batches } = await run(entryLines(count), { batchEntries: 4 });
    expect(batches).toEqual(commits);
    expect(report).toEqual({ entries_created: count, entries_extended: 0, revisions_added: count, revisions_already_present: 0, sheets_added: 0, takeoffs_added: 0 });
    expect(store.counts().entries).toBe(count);
    expect(snapshot(store).journal).toEqual([]);
    expect(store.verify().damaged).toEqual([]);
  });

  it(`the default batch is ${IMPORT_BATCH_ENTRIES} entries: N−1, N and N+1 entries`, async () => {
    const lines = entryLines(IMPORT_BATCH_ENTRIES + 1);
    for (const count of [IMPORT_BATCH_ENTRIES - 1, IMPORT_BATCH_ENTRIES, IMPORT_BATCH_ENTRIES + 1]) {
      const target = LibraryStore.open(join(tmp.dir, `n${count}.sqlite`));
      try {
        const { report, batches } = await run(lines.slice(0, count), {}, target);
        expect(batches).toEqual(count >= IMPORT_BATCH_ENTRIES ? [IMPORT_BATCH_ENTRIES] : []);
        expect(report.entries_created).toBe(count);
        expect(target.counts().entries).toBe(count);
        expect(snapshot(target).journal).toEqual([]);
      } finally {
        target.close();
      }
    }
  }, 120_000);
});

describe('a bad entry in the second batch', () => {
  it('undoes the first batch: new entries, a sheet, and revisions added to an entry already there, which gets its earlier state back', async () => {
    // A clock that moves, so that the entry's time of update is seen to come back too.
    let tick = 0;
    store.close();
    store = LibraryStore.open(store.file, { now: () => new Date(Date.UTC(2025, 0, 1, 0, 0, tick++)).toISOString() });
    const kept = store.create(setOf(100));
    store.create(setOf(101));
    const before = snapshot(store);
    const duty = { flow_m3s: 120 / 3600, head_m: 40 };
    const found = searchByDuty(store, duty, libraryMatcher).candidates.map((c) => c.id);

    const extended = entryLine(kept.id, [setOf(100), inventedCurveSet({ ...FAMILIES.mid, name: 'Invented batch pump 100', model: 'IBP-100', shutoffHeadM: 61 })]);
    const bad = entryLine(idOf(7), [{ ...setOf(7), members: 'not a list' } as unknown as CurveSet]);
    const lines = [SHEET_LINE, extended, ...entryLines(3), ...entryLines(2, 4), bad, ...entryLines(2, 8)];
    let committed: number[] = [];
    let midway: ReturnType<typeof store.counts> | null = null;
    const error = await run(lines, {
      batchEntries: 4,
      onBatch: (n) => {
        committed.push(n);
        midway = store.counts();
      },
    }).catch((e: unknown) => e);
    committed = committed.slice();
    expect(error).toBeInstanceOf(LibraryError);
    // Line 1 is the header; the bad entry is the 9th line.
    expect((error as Error).message).toMatch(/^Line 9 of the import: .*Nothing was imported\.$/);
    // The first batch (4 lines: the sheet, the extended entry and two new ones) was really committed,
    // and a reader saw it, before the bad line came.
    expect(committed).toEqual([3]);
    expect(midway).toMatchObject({ entries: 2 + 2, sheets: 1 });

    expect(snapshot(store)).toEqual(before);
    expect(store.info(kept.id).revision).toBe(1);
    expect(searchByDuty(store, duty, libraryMatcher).candidates.map((c) => c.id)).toEqual(found);
    expect(store.verify().damaged).toEqual([]);
    // The library takes writes again.
    expect(store.create(setOf(102)).revision).toBe(1);
  });

  it('a throw between batches (a fault outside the file) undoes the same way', async () => {
    const before = snapshot(store);
    const error = await run(entryLines(10), {
      batchEntries: 3,
      onBatch: (n) => {
        if (n === 6) throw new Error('invented fault after the second batch');
      },
    }).catch((e: unknown) => e);
    expect((error as Error).message).toBe('invented fault after the second batch');
    expect(snapshot(store)).toEqual(before);
  });

  it('the command line says so in one sentence and exits 2, leaving the library as it was', async () => {
    const file = join(tmp.dir, 'bad.jsonl');
    const lines = [HEADER, ...entryLines(IMPORT_BATCH_ENTRIES + 5)];
    lines[IMPORT_BATCH_ENTRIES + 3] = entryLine(idOf(IMPORT_BATCH_ENTRIES + 2), [{ ...setOf(0), format: 'something else' } as unknown as CurveSet]);
    writeFileSync(file, `${lines.join('\n')}\n`);
    store.create(setOf(5000));
    const before = snapshot(store);
    const r = await runLibrary('import', file, '--library', store.file);
    expect(r.code).toBe(2);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).toMatch(new RegExp(`Line ${IMPORT_BATCH_ENTRIES + 4} of the import: .*Nothing was imported\\.`));
    expect(snapshot(store)).toEqual(before);
  }, 120_000);
});

describe('an import that stopped without ending (its process gone)', () => {
  it('is readable meanwhile, is undone by the next open for writing with one sentence, and the same import then runs whole', async () => {
    store.create(setOf(200));
    const before = snapshot(store);
    store.close();
    const file = join(tmp.dir, 'stopped.jsonl');
    writeFileSync(file, `${[HEADER, ...entryLines(7)].join('\n')}\n`);
    // A process that imports in batches of 3 and is killed (SIGKILL, no clean-up of any kind) right
    // after its second batch is committed.
    const script = `
      import { LibraryStore } from ${JSON.stringify(join(SRC, 'library/store.ts'))};
      import { importLines } from ${JSON.stringify(join(SRC, 'library/transfer.ts'))};
      import { linesOf } from ${JSON.stringify(join(SRC, 'library/lines.ts'))};
      import { createReadStream } from 'node:fs';
      const store = LibraryStore.open(${JSON.stringify(store.file)});
      await importLines(store, linesOf(createReadStream(${JSON.stringify(file)})), {
        source: 'stopped.jsonl', batchEntries: 3, onBatch: (n) => { if (n === 6) process.kill(process.pid, 'SIGKILL'); },
      });`;
    const child = spawnSync(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', script], { encoding: 'utf8' });
    expect(child.signal).toBe('SIGKILL');

    const reader = LibraryStore.open(store.file, { readonly: true });
    expect(reader.counts().entries).toBe(1 + 6);
    expect(reader.verify().damaged).toEqual([]);
    expect(reader.importNotices).toHaveLength(1);
    expect(reader.importNotices[0]).toMatch(/from "stopped\.jsonl".*stopped before it finished; 6 of its entries are in the library until it is opened where it can be written/);
    expect(() => [...exportLines(reader)]).toThrow(/stopped before it finished and is not yet removed; open the library where it can be written/);
    reader.close();

    const r = await runLibrary('list', '--library', store.file);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/^pumpscribe: An import into this library \(from "stopped\.jsonl", started .*\) stopped before it finished; the 6 entries it had written were removed again, so the library is as it was before that import\. Run that import again\.\n$/);
    store = LibraryStore.open(store.file, { now: () => AT });
    expect(store.importNotices).toEqual([]);
    expect(snapshot(store)).toEqual(before);
    const again = await runLibrary('import', file, '--library', store.file);
    expect(again.err).toBe('');
    expect(again.out).toMatch(/imported: 7 new entries/);
    expect(store.counts().entries).toBe(8);
  }, 60_000);
});

const root = process.getuid?.() === 0;
const sh = (cmd: string, args: string[]) => spawnSync(cmd, args, { stdio: 'ignore' }).status === 0;

describe.skipIf(!root)('a disk that fills up during a later batch (a small tmpfs, needs root to mount)', () => {
  it('refuses with a full-disk sentence; the batches already committed are removed (at once, or at the first open once there is room); then the import runs whole', async () => {
    const mnt = join(tmp.dir, 'mnt');
    mkdirSync(mnt);
    expect(sh('mount', ['-t', 'tmpfs', '-o', 'size=3m', 'tmpfs', mnt])).toBe(true);
    try {
      const file = join(mnt, 'office.sqlite');
      let target = LibraryStore.open(file, { now: () => AT });
      target.create(setOf(300));
      const before = snapshot(target);
      const batches: number[] = [];
      const lines = [HEADER, ...entryLines(400)];
      const error = await importLines(target, lines, { batchEntries: 10, onBatch: (n) => batches.push(n) }).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(LibraryError);
      expect((error as LibraryError).code).toBe('storage-full');
      expect(batches.length).toBeGreaterThan(1);
      const removedNow = /so nothing was changed; free some space and try again\.$/.test((error as Error).message);
      if (!removedNow) {
        // Removing rows needs room in the log too; the sentence says what happens instead.
        expect((error as Error).message).toBe(
          'The disk holding the library is full, so the import stopped, and what it had written so far could not be removed yet; free some space, then open the library (for example with "library list"), which removes it, and run the import again.',
        );
      }
      target.close();
      expect(sh('mount', ['-o', 'remount,size=64m', mnt])).toBe(true);
      target = LibraryStore.open(file, { now: () => AT });
      expect(target.importNotices.length).toBe(removedNow ? 0 : 1);
      expect(snapshot(target)).toEqual(before);
      expect(target.verify().damaged).toEqual([]);
      expect((await importLines(target, lines)).entries_created).toBe(400);
      target.close();
    } finally {
      sh('umount', ['-l', mnt]);
    }
  });
});

describe('duplicates and revisions across batches', () => {
  it('give the same report and the same library with batches of 1 as in one batch, and a second import adds nothing', async () => {
    const lines = [SHEET_LINE, ...entryLines(5), entryLine(idOf(50), [setOf(50), setOf(51)]), ...entryLines(3, 10)];
    const results = [];
    for (const batchEntries of [1, 1_000_000]) {
      const target = LibraryStore.open(join(tmp.dir, `b${batchEntries}.sqlite`), { now: () => AT });
      try {
        // The library already holds two of the entries: one the same, one with a revision fewer.
        target.create(setOf(2), { id: idOf(2) });
        target.create(setOf(50), { id: idOf(50) });
        const first = await run(lines, { batchEntries }, target);
        const second = await run(lines, { batchEntries }, target);
        const exported = [...exportLines(target)].slice(1);
        results.push({ first: first.report, second: second.report, snapshot: snapshot(target), exported });
      } finally {
        target.close();
      }
    }
    const [one, whole] = results;
    expect(one!.first).toEqual({ entries_created: 7, entries_extended: 1, revisions_added: 8, revisions_already_present: 2, sheets_added: 1, takeoffs_added: 0 });
    expect(one!.second).toEqual({ entries_created: 0, entries_extended: 0, revisions_added: 0, revisions_already_present: 10, sheets_added: 0, takeoffs_added: 0 });
    expect(one).toEqual(whole);
  });

  it('an id twice in one file is refused even when the two lines fall in different batches', async () => {
    const error = await run([...entryLines(3), entryLine(idOf(0), [setOf(0)])], { batchEntries: 2 }).catch((e: unknown) => e);
    expect((error as Error).message).toMatch(/^Line 5 of the import: entry 3000000000000000 appears twice\. Nothing was imported\.$/);
    expect(store.counts().entries).toBe(0);
  });
});

