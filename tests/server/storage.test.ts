/**
 * Storage faults over HTTP (issue #18, item 4): a full disk, a read-only library and a busy file
 * each get their own status, a stable code and a sentence — never "please report" — and the
 * server logs them with the code. The faults are real SQLite refusals: `max_page_count` makes the
 * engine answer SQLITE_FULL exactly as a full disk does, `query_only` makes it answer
 * SQLITE_READONLY as a read-only file does, and a second connection holding the write lock gives
 * SQLITE_BUSY.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { Writable } from 'node:stream';
import Database from 'better-sqlite3';
import { FAMILIES, inventedCurveSet } from '../library/fixtures.ts';
import { json, postJson, startTestServer, tempDir, type TestServer } from './helpers.ts';
import { ERROR_CODES, mapError } from '../../src/server/errors.ts';
import { LibraryError } from '../../src/library/errors.ts';
import { UserError } from '../../src/model/errors.ts';

let tmp: ReturnType<typeof tempDir>;
let server: TestServer;
let log: Array<Record<string, unknown>>;

function logStream(): Writable {
  return new Writable({
    write(chunk, _enc, done) {
      for (const line of chunk.toString().split('\n').filter(Boolean)) log.push(JSON.parse(line));
      done();
    },
  });
}

beforeEach(async () => {
  tmp = tempDir();
  log = [];
  server = await startTestServer(join(tmp.dir, 'library.sqlite'), { logger: { stream: logStream() } }, { busyTimeoutMs: 50 });
});
afterEach(async () => {
  await server.close();
  tmp.remove();
});

function expectSentence(body: { error: string; code: string }): void {
  expect(body.error).not.toMatch(/please report/i);
  expect(body.error).toMatch(/^[A-Z].*\.$/);
}

describe('storage faults', () => {
  it('a full disk gives 507 storage-full with a sentence, logged as an error, and stores nothing', async () => {
    const id = (await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small))).body.id;
    const pages = server.store.db.pragma('page_count', { simple: true }) as number;
    server.store.db.pragma(`max_page_count = ${pages}`);
    const res = await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.large));
    expect(res.status).toBe(507);
    expect(res.body.code).toBe('storage-full');
    expect(res.body.error).toMatch(/disk holding the library file .*is full/);
    expectSentence(res.body);
    const sheet = await json(`${server.url}/api/sheets`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: Buffer.alloc(256 * 1024, 7) });
    expect(sheet.status).toBe(507);
    expect(server.store.counts()).toMatchObject({ entries: 1, revisions: 1, sheets: 0 });
    expect((await json(`${server.url}/api/curvesets/${id}`)).status).toBe(200);
    const logged = log.filter((l) => l.code === 'storage-full');
    expect(logged.length).toBe(2);
    expect(logged[0]).toMatchObject({ level: 50, method: 'POST', url: '/api/curvesets' });
  });

  it('a read-only library gives 503 storage-read-only on writes, logged as a warning, and still answers reads', async () => {
    const id = (await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small))).body.id;
    server.store.db.pragma('query_only = ON');
    const res = await postJson(`${server.url}/api/curvesets/${id}`, inventedCurveSet(FAMILIES.small), 'PUT', { 'if-match': '"1"' });
    expect(res.status).toBe(503);
    expect(res.body.code).toBe('storage-read-only');
    expect(res.body.error).toMatch(/read-only/);
    expectSentence(res.body);
    const del = await json(`${server.url}/api/curvesets/${id}`, { method: 'DELETE', headers: { 'content-type': 'application/json' } });
    expect(del.status).toBe(503);
    expect((await json(`${server.url}/api/curvesets`)).body.total).toBe(1);
    expect((await json(`${server.url}/api/curvesets/${id}`)).status).toBe(200);
    expect((await fetch(`${server.url}/library`)).status).toBe(200);
    expect(log.filter((l) => l.code === 'storage-read-only').map((l) => l.level)).toEqual([40, 40]);
  });

  it('a library held by another writer gives 503 storage-busy with Retry-After', async () => {
    const other = new Database(server.store.file);
    try {
      other.exec('BEGIN IMMEDIATE');
      const res = await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small));
      expect(res.status).toBe(503);
      expect(res.body.code).toBe('storage-busy');
      expect(res.headers.get('retry-after')).toBe('1');
      expectSentence(res.body);
      other.exec('ROLLBACK');
    } finally {
      other.close();
    }
    expect((await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small))).status).toBe(201);
  });
});

describe('the code table', () => {
  it('maps the codes a layer gives (storage-full, storage-read-only from the library) before its generic reason', () => {
    expect(mapError(new UserError('The library folder is read-only; copy the library elsewhere to change it.', 'storage-read-only'))).toMatchObject({ status: 503, code: 'storage-read-only', log: 'warn' });
    expect(mapError(new UserError('The disk is full; free space and try again.', 'storage-full'))).toMatchObject({ status: 507, code: 'storage-full', log: 'error' });
    expect(mapError(new LibraryError('No library entry 0123.', 'not-found'))).toMatchObject({ status: 404, code: 'not-found' });
    expect(mapError(new LibraryError('Cannot open the library file.', 'unusable-file'))).toMatchObject({ status: 500, code: 'library-damaged' });
    // A reason that is itself a code of the table maps to it (the library's If-Match and storage reasons).
    for (const [reason, status] of [['precondition-failed', 412], ['precondition-required', 428], ['storage-full', 507], ['storage-read-only', 503]] as const) {
      expect(mapError(new LibraryError('Invented sentence.', reason as never)).status, reason).toBe(status);
    }
    for (const [code, status] of [['SQLITE_FULL', 507], ['ENOSPC', 507], ['EDQUOT', 507], ['SQLITE_READONLY_DBMOVED', 503], ['EROFS', 503], ['SQLITE_BUSY_SNAPSHOT', 503], ['SQLITE_IOERR_WRITE', 503], ['SQLITE_CORRUPT', 500]] as const) {
      const m = mapError(Object.assign(new Error('engine words'), { code }));
      expect(m.status, code).toBe(status);
      expect(m.message, code).not.toMatch(/please report/i);
    }
    expect(mapError(new TypeError('x is undefined'))).toMatchObject({ status: 500, code: 'internal-error' });
  });

  it('gives every code a status and a meaning', () => {
    for (const [code, info] of Object.entries(ERROR_CODES)) {
      expect(code).toMatch(/^[a-z]+(-[a-z]+)*$/);
      expect(info.status).toBeGreaterThanOrEqual(400);
      expect(info.meaning.length).toBeGreaterThan(20);
    }
  });
});
