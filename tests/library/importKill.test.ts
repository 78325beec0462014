/**
 * Import is all or nothing, even when the process is killed with SIGKILL while it is writing: the
 * kill is aimed after the first batch of IMPORT_BATCH_ENTRIES entries is committed (a reader sees
 * them), while later batches are still being written. The library stays readable, the next command
 * removes the stopped import and says so, and the import then runs whole.
 * Real command line in a child process, real SQLite file.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { createWriteStream, existsSync, statSync } from 'node:fs';
import { once } from 'node:events';
import { join } from 'node:path';
import { LibraryStore } from '../../src/library/store.ts';
import { EXPORT_FORMAT, EXPORT_VERSION, exportLines } from '../../src/library/transfer.ts';
import { IMPORT_BATCH_ENTRIES } from '../../src/library/importJournal.ts';
import Database from 'better-sqlite3';
import { runLibrary } from './runCli.ts';
import { FAMILIES, inventedCurveSet } from './fixtures.ts';
import { tempDir } from '../server/helpers.ts';

const ENTRIES = IMPORT_BATCH_ENTRIES + 700;
// One process (tsx as a loader, not its CLI, which would run the command in a second process the kill would miss).
let tmp: ReturnType<typeof tempDir>;
let exportFile: string;
let library: string;

beforeAll(async () => {
  tmp = tempDir('pumpscribe-import-kill-');
  exportFile = join(tmp.dir, 'big.jsonl');
  const out = createWriteStream(exportFile);
  out.write(`${JSON.stringify({ kind: 'header', format: EXPORT_FORMAT, version: EXPORT_VERSION })}\n`);
  for (let i = 0; i < ENTRIES; i++) {
    const set = inventedCurveSet({ ...FAMILIES.mid, name: `Invented kill test ${i}`, model: `IKT-${i}`, shutoffHeadM: 40 + (i % 50) });
    const id = (0x2000000000000000n + BigInt(i)).toString(16);
    const line = JSON.stringify({ kind: 'entry', id, created_at: '2025-01-01T00:00:00.000Z', archived_at: null, revisions: [{ revision: 1, saved_at: '2025-01-01T00:00:00.000Z', curveset: set }] });
    if (!out.write(`${line}\n`)) await once(out, 'drain');
  }
  out.end();
  await once(out, 'finish');
  library = join(tmp.dir, 'office.sqlite');
  const store = LibraryStore.open(library);
  store.create(inventedCurveSet(FAMILIES.small));
  store.close();
}, 120_000);
afterAll(() => tmp.remove());

describe('import under kill -9', () => {
  it('leaves a readable library when killed between batches, undoes it at the next command with one sentence, and everything when let run', async () => {
    const child = spawn(process.execPath, ['--import', 'tsx', 'src/cli/main.ts', 'library', 'import', exportFile, '--library', library], { stdio: 'ignore' });
    // Aim after the first batch: a reader sees its entries, and the import is still running.
    const reader = new Database(library, { readonly: true });
    const count = reader.prepare('SELECT count(*) AS n FROM entries');
    let seen = 0;
    const deadline = Date.now() + 120_000;
    while (Date.now() < deadline && child.exitCode === null) {
      seen = (count.get() as { n: number }).n;
      if (seen > 1) break;
      await new Promise((r) => setTimeout(r, 5));
    }
    reader.close();
    expect(child.exitCode).toBeNull();
    expect(seen).toBe(1 + IMPORT_BATCH_ENTRIES);
    // Opened for writing meanwhile, the library leaves the running import alone and refuses writes.
    const writer = LibraryStore.open(library);
    expect(writer.importNotices).toEqual([]);
    let refused: unknown = null;
    try {
      writer.create(inventedCurveSet(FAMILIES.large));
    } catch (error) {
      refused = error;
    }
    // An export now would hold part of the import: refused with a sentence.
    expect(() => [...exportLines(writer)]).toThrow(/is being written; export when it has finished, so that the export holds all of it or none\.$/);
    writer.close();
    expect((refused as { code?: string }).code).toBe('import-busy');
    expect((refused as Error).message).toMatch(/^An import into this library \(from "big\.jsonl", started .*\) is being written; nothing was changed, try again when it has finished\.$/);
    expect(child.exitCode).toBeNull();
    child.kill('SIGKILL');
    const [code, signal] = (await once(child, 'exit')) as [number | null, string | null];
    expect(code).toBeNull();
    expect(signal).toBe('SIGKILL');
    // The log holds about one batch, not the whole import.
    const walMiB = existsSync(`${library}-wal`) ? statSync(`${library}-wal`).size / 2 ** 20 : 0;
    expect(walMiB).toBeLessThan(64);

    const readOnly = LibraryStore.open(library, { readonly: true });
    expect(readOnly.verify().damaged).toEqual([]);
    expect(readOnly.importNotices.join(' ')).toMatch(/stopped before it finished/);
    readOnly.close();
    const listed = await runLibrary('list', '--library', library);
    expect(listed.code).toBe(0);
    expect(listed.err).toMatch(/the \d+ entries it had written were removed again, so the library is as it was before that import\. Run that import again\./);
    const after = LibraryStore.open(library);
    expect(after.counts().entries).toBe(1);
    expect(after.verify().damaged).toEqual([]);
    after.close();

    const full = spawnSync(process.execPath, ['--import', 'tsx', 'src/cli/main.ts', 'library', 'import', exportFile, '--library', library], { encoding: 'utf8' });
    expect(full.stderr).toBe('');
    expect(full.status).toBe(0);
    expect(full.stdout).toMatch(new RegExp(`imported: ${ENTRIES} new entries`));
    const done = LibraryStore.open(library);
    expect(done.counts().entries).toBe(ENTRIES + 1);
    done.close();
  }, 300_000);
});
