/**
 * Storage faults say what is wrong. Exercised for real, not simulated:
 * - a read-only library: a small tmpfs remounted read-only (root ignores file modes, a read-only
 *   mount it cannot), and a folder and file without write permission read by another user (setpriv);
 * - a full disk: a small tmpfs filled to the last byte.
 * Those need root (mount, setpriv); elsewhere the cases are skipped and say so.
 * And: no stray files after a refused open or a refused import.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { chmodSync, mkdirSync, readdirSync, writeFileSync, openSync, writeSync, closeSync, unlinkSync } from 'node:fs';
import { join, resolve } from 'node:path';
import Database from 'better-sqlite3';
import { LibraryStore } from '../../src/library/store.ts';
import { LibraryError } from '../../src/library/errors.ts';
import { searchByDuty } from '../../src/library/dutySearch.ts';
import { libraryMatcher } from '../../src/library/matcher.ts';
import { FAMILIES, inventedCurveSet } from './fixtures.ts';
import { runLibrary } from './runCli.ts';
import { postJson, json, startTestServer, tempDir } from '../server/helpers.ts';

const root = process.getuid?.() === 0;
function sh(cmd: string, args: string[]): boolean {
  return spawnSync(cmd, args, { stdio: 'ignore' }).status === 0;
}
const tmp = tempDir('pumpscribe-storage-');
chmodSync(tmp.dir, 0o755);
const mnt = join(tmp.dir, 'mnt');
mkdirSync(mnt);
const canMount = root && sh('mount', ['-t', 'tmpfs', '-o', 'size=4m', 'tmpfs', mnt]) && (sh('umount', [mnt]) || true);
afterAll(() => {
  sh('umount', ['-l', mnt]);
  tmp.remove();
});

function codeOf(body: () => unknown): string | undefined {
  try {
    body();
  } catch (error) {
    if (error instanceof LibraryError) return error.code;
    throw error;
  }
  return undefined;
}

describe.skipIf(!canMount)('a read-only library (tmpfs remounted read-only)', () => {
  const file = join(mnt, 'office.sqlite');
  beforeAll(() => {
    expect(sh('mount', ['-t', 'tmpfs', '-o', 'size=8m', 'tmpfs', mnt])).toBe(true);
    const store = LibraryStore.open(file);
    for (const f of Object.values(FAMILIES)) store.create(inventedCurveSet(f));
    store.close();
    expect(sh('mount', ['-o', 'remount,ro', mnt])).toBe(true);
  });
  afterAll(() => sh('umount', ['-l', mnt]));

  it('opens read-only: lists and searches, and refuses every write with a sentence and code storage-read-only', () => {
    const before = readdirSync(mnt);
    const store = LibraryStore.open(file);
    expect(store.readonly).toBe(true);
    expect(store.list().total).toBe(3);
    expect(searchByDuty(store, { flow_m3s: 120 / 3600, head_m: 40 }, libraryMatcher).candidates).toHaveLength(1);
    expect(codeOf(() => store.create(inventedCurveSet(FAMILIES.small)))).toBe('storage-read-only');
    expect(() => store.create(inventedCurveSet(FAMILIES.small))).toThrow(/^The library is read-only because the library file ".*" is read-only, so nothing was changed; it can still be listed and searched\./);
    store.close();
    expect(readdirSync(mnt)).toEqual(before);
  });

  it('command line: list and find work, add exits 2 with the sentence, never "please report"', async () => {
    const list = await runLibrary('list', '--library', file);
    expect(list.code).toBe(0);
    expect(list.out).toMatch(/3 of 3 shown\. \(read-only: /);
    expect((await runLibrary('find', '--flow', '120 m3/h', '--head', '40 m', '--library', file)).code).toBe(0);
    const add = await runLibrary('add', join(resolve('samples/demo'), readdirSync('samples/demo').find((f) => f.endsWith('.curveset.json'))!), '--library', file);
    expect(add.code).toBe(2);
    expect(add.err).toMatch(/^pumpscribe: The library is read-only because .*\n$/);
    expect(add.err).not.toMatch(/report/);
  });

  it('HTTP: a write answers 503 with code storage-read-only; reading still works', async () => {
    const server = await startTestServer(file);
    try {
      const r = await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small));
      expect(r.status).toBe(503);
      expect(r.body.code).toBe('storage-read-only');
      expect((await json(`${server.url}/api/search?flow=120&head=40&units=si`)).status).toBe(200);
    } finally {
      await server.close();
    }
  });

  it('a new library in a read-only folder is refused, and no file is made', () => {
    expect(codeOf(() => LibraryStore.open(join(mnt, 'new.sqlite')))).toBe('storage-read-only');
    expect(readdirSync(mnt)).toEqual(['office.sqlite']);
  });
});

describe.skipIf(!root)('a library folder and file without write permission, read by another user (setpriv)', () => {
  it('lists with exit 0 and refuses add with exit 2 and the sentence', () => {
    const dir = join(tmp.dir, 'locked');
    mkdirSync(dir);
    const file = join(dir, 'office.sqlite');
    const store = LibraryStore.open(file);
    store.create(inventedCurveSet(FAMILIES.mid));
    store.close();
    const set = join(tmp.dir, 'small.curveset.json');
    writeFileSync(set, JSON.stringify(inventedCurveSet(FAMILIES.small)));
    chmodSync(set, 0o644);
    chmodSync(file, 0o444);
    chmodSync(dir, 0o555);
    const asNobody = (...args: string[]) =>
      spawnSync('setpriv', ['--reuid=65534', '--regid=65534', '--clear-groups', process.execPath, join('node_modules', 'tsx', 'dist', 'cli.mjs'), 'src/cli/main.ts', 'library', ...args], {
        encoding: 'utf8',
        env: { ...process.env, HOME: tmp.dir },
      });
    const list = asNobody('list', '--library', file);
    expect(list.stderr).toBe('');
    expect(list.status).toBe(0);
    expect(list.stdout).toMatch(/1 of 1 shown\. \(read-only: the library file ".*" is read-only\)/);
    const add = asNobody('add', set, '--library', file);
    expect(add.status).toBe(2);
    expect(add.stderr).toMatch(/^pumpscribe: The library is read-only because the library file ".*" is read-only, so nothing was changed; .*\n$/);
    expect(readdirSync(dir)).toEqual(['office.sqlite']);
  });
});

describe.skipIf(!canMount)('a full disk (a 2 MiB tmpfs filled up)', () => {
  const file = join(mnt, 'office.sqlite');
  const filler = join(mnt, 'filler');
  /** Fills every remaining byte of the tmpfs. */
  function fill(): void {
    const fd = openSync(filler, 'a');
    const block = Buffer.alloc(4096, 1);
    try {
      for (;;) writeSync(fd, block);
    } catch (error) {
      expect((error as NodeJS.ErrnoException).code).toBe('ENOSPC');
    } finally {
      closeSync(fd);
    }
  }
  beforeAll(() => {
    expect(sh('mount', ['-t', 'tmpfs', '-o', 'size=2m', 'tmpfs', mnt])).toBe(true);
    const store = LibraryStore.open(file);
    store.create(inventedCurveSet(FAMILIES.mid));
    store.close();
  });
  afterAll(() => sh('umount', ['-l', mnt]));

  it('a save on a disk that fills up answers storage-full with a sentence; the library keeps what it had', () => {
    const store = LibraryStore.open(file);
    fill();
    let code: string | undefined;
    let message = '';
    for (let i = 0; i < 20 && code === undefined; i++) {
      try {
        store.create(inventedCurveSet({ ...FAMILIES.large, name: `Invented filler ${i}` }));
      } catch (error) {
        if (!(error instanceof LibraryError)) throw error;
        code = error.code;
        message = error.message;
      }
    }
    expect(code).toBe('storage-full');
    expect(message).toMatch(/^The disk holding the library file ".*" is full, so nothing was changed; free some space and try again\.$/);
    store.close();
  });

  it('a library on a full disk still opens for reading (list, search) and says why a save is refused', async () => {
    // Closing freed the log; fill the disk again so that not even SQLite's shared-memory file fits.
    fill();
    const store = LibraryStore.open(file);
    expect(store.readonly).toBe(true);
    expect(store.list().total).toBeGreaterThanOrEqual(1);
    expect(codeOf(() => store.create(inventedCurveSet(FAMILIES.small)))).toBe('storage-full');
    store.close();
    const list = await runLibrary('list', '--library', file);
    expect(list.code).toBe(0);
    expect(list.out).toMatch(/\(read-only: the disk holding it is full\)/);
  });

  it('HTTP answers 507 with code storage-full', async () => {
    unlinkSync(filler);
    const server = await startTestServer(file);
    try {
      fill();
      let status = 0;
      let body: { code?: string } = {};
      for (let i = 0; i < 20 && status !== 507; i++) {
        const r = await postJson(`${server.url}/api/curvesets`, inventedCurveSet({ ...FAMILIES.large, name: `Invented http filler ${i}` }));
        status = r.status;
        body = r.body;
        if (status !== 201 && status !== 507) break;
      }
      expect(status).toBe(507);
      expect(body.code).toBe('storage-full');
    } finally {
      await server.close();
      unlinkSync(filler);
    }
    const again = LibraryStore.open(file);
    expect(again.readonly).toBe(false);
    expect(again.verify().damaged).toEqual([]);
    again.close();
  });
});

describe('no stray files', () => {
  it('a refused open of a file that is not a library leaves no -wal, -shm or journal beside it', () => {
    const dir = join(tmp.dir, 'strays');
    mkdirSync(dir);
    const text = join(dir, 'notes.sqlite');
    writeFileSync(text, 'not a database, only words '.repeat(100));
    expect(() => LibraryStore.open(text)).toThrow(LibraryError);
    const other = join(dir, 'other.sqlite');
    const db = new Database(other);
    db.exec('CREATE TABLE t (x)');
    db.close();
    expect(() => LibraryStore.open(other)).toThrow(/not a Pumpscribe library/);
    expect(readdirSync(dir).sort()).toEqual(['notes.sqlite', 'other.sqlite']);
    // The foreign file was not switched to WAL either.
    const check = new Database(other, { readonly: true });
    expect(check.pragma('journal_mode', { simple: true })).toBe('delete');
    check.close();
  });

  it('a refused import into a new library leaves no library file', async () => {
    const dir = join(tmp.dir, 'import');
    mkdirSync(dir);
    const bad = join(dir, 'bad.jsonl');
    writeFileSync(bad, '{"kind":"header","format":"pumpscribe.library-export","version":1}\n{"kind":"entry"}\n');
    const r = await runLibrary('import', bad, '--library', join(dir, 'new.sqlite'));
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^pumpscribe: Line 2 of the import: .* Nothing was imported\.\n$/);
    expect(readdirSync(dir)).toEqual(['bad.jsonl']);
    // So does a refused add of a failing set.
    const failing = join(dir, 'failing.curveset.json');
    writeFileSync(failing, JSON.stringify(inventedCurveSet({ ...FAMILIES.mid, peakEfficiency: 0.97 })));
    expect((await runLibrary('add', failing, '--library', join(dir, 'new.sqlite'))).code).toBe(2);
    expect(readdirSync(dir).sort()).toEqual(['bad.jsonl', 'failing.curveset.json']);
  });
});
