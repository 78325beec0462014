/**
 * Import is all or nothing, even when the process is killed with SIGKILL while it is writing: the
 * kill is aimed inside the write (the library's log file is growing under the import's open
 * transaction). Real command line in a child process, real SQLite file.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { createWriteStream, existsSync, statSync } from 'node:fs';
import { once } from 'node:events';
import { join } from 'node:path';
import { LibraryStore } from '../../src/library/store.ts';
import { EXPORT_FORMAT, EXPORT_VERSION } from '../../src/library/transfer.ts';
import { FAMILIES, inventedCurveSet } from './fixtures.ts';
import { tempDir } from '../server/helpers.ts';

const ENTRIES = 1500;
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
  it('leaves nothing when killed inside the write, and everything when let run', async () => {
    const child = spawn(process.execPath, ['--import', 'tsx', 'src/cli/main.ts', 'library', 'import', exportFile, '--library', library], { stdio: 'ignore' });
    const wal = `${library}-wal`;
    // Aim inside the write: the log has grown past 2 MiB under the open transaction, and the import is still running.
    let walBytes = 0;
    const deadline = Date.now() + 120_000;
    while (Date.now() < deadline && child.exitCode === null) {
      walBytes = existsSync(wal) ? statSync(wal).size : 0;
      if (walBytes > 2 * 2 ** 20) break;
      await new Promise((r) => setTimeout(r, 10));
    }
    expect(child.exitCode).toBeNull();
    expect(walBytes).toBeGreaterThan(2 * 2 ** 20);
    child.kill('SIGKILL');
    const [code, signal] = (await once(child, 'exit')) as [number | null, string | null];
    expect(code).toBeNull();
    expect(signal).toBe('SIGKILL');

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
