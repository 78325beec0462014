import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { request as httpRequest } from 'node:http';
import { json, startTestServer, tempDir, type TestServer } from './helpers.ts';
import { parseSize } from '../../src/server/quota.ts';
import { startServer } from '../../src/server/start.ts';

let tmp: ReturnType<typeof tempDir>;
let server: TestServer;
const QUOTA = 2 ** 20; // 1 MiB for the test

beforeEach(async () => {
  tmp = tempDir();
  server = await startTestServer(join(tmp.dir, 'library.sqlite'), { sheetQuota: QUOTA });
});
afterEach(async () => {
  await server.close();
  tmp.remove();
});

function pdf(fill: number, bytes: number): Uint8Array<ArrayBuffer> {
  const b = Buffer.alloc(bytes, fill);
  b.write('%PDF-1.4 invented\n');
  return new Uint8Array(b);
}

function upload(body: Uint8Array<ArrayBuffer>) {
  return json(`${server.url}/api/sheets`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body });
}

describe('the per-library sheet quota', () => {
  it('accepts sheets up to the quota, refuses the one that crosses it with 507 and a sentence, and still takes a sheet already stored', async () => {
    const first = pdf(1, 400 * 1024);
    expect((await upload(first)).status).toBe(201);
    const refused = await upload(pdf(2, 700 * 1024));
    expect(refused.status).toBe(507);
    expect(refused.body.code).toBe('sheet-quota-exceeded');
    expect(refused.body.error).toMatch(/quota for source sheets is 1\.0 MiB and 0\.4 MiB is used, so a sheet of 0\.7 MiB is refused; start the server with a larger --sheet-quota/);
    expect(server.store.counts().sheets).toBe(1);
    const again = await upload(first);
    expect(again.status).toBe(200);
    expect(again.body.created).toBe(false);
    expect((await upload(pdf(3, 500 * 1024))).status).toBe(201);
    expect(server.store.counts().sheets).toBe(2);
    // Without a Content-Length (chunked), the bytes are counted once read: a new sheet is refused, a stored one is not.
    const chunked = (body: Uint8Array<ArrayBuffer>) =>
      json(`${server.url}/api/sheets`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: new Blob([body]).stream(), duplex: 'half' } as RequestInit);
    const late = await chunked(pdf(4, 200 * 1024));
    expect(late.status).toBe(507);
    expect(late.body.code).toBe('sheet-quota-exceeded');
    expect((await chunked(first)).status).toBe(200);
    expect(server.store.counts().sheets).toBe(2);
  });

  it('refuses from the declared length before reading the body, and closes the connection', async () => {
    await upload(pdf(1, 600 * 1024));
    const u = new URL(server.url);
    const answer = await new Promise<{ status: number; body: string; connection: string | undefined }>((resolve, reject) => {
      const req = httpRequest({ host: u.hostname, port: u.port, path: '/api/sheets', method: 'POST', headers: { 'content-type': 'application/pdf', 'content-length': String(900 * 1024) } }, (res) => {
        let body = '';
        res.on('data', (c) => (body += c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, body, connection: res.headers.connection }));
      });
      req.on('error', reject);
      // Only the headers go out: the answer must come without a single byte of the body.
      req.flushHeaders();
    });
    expect(answer.status).toBe(507);
    expect(JSON.parse(answer.body).code).toBe('sheet-quota-exceeded');
    expect(answer.connection).toBe('close');
    expect(server.store.counts().sheets).toBe(1);
  });

  it('reads sizes with a unit and refuses a bare number or a bad flag at start', async () => {
    expect(parseSize('500MB')).toBe(500e6);
    expect(parseSize('2GiB')).toBe(2 * 2 ** 30);
    expect(parseSize(' 750 MiB ')).toBe(750 * 2 ** 20);
    expect(() => parseSize('500')).toThrow(/with a unit, such as 500MB or 2GiB/);
    expect(() => parseSize('0GB')).toThrow(/at least 1 byte/);
    await expect(startServer({ port: 0, library: join(tmp.dir, 'q.sqlite'), seed: false, say: () => {}, staticDir: tmp.dir, sheetQuota: 'lots', logger: false })).rejects.toThrow(/sheet quota must be a size/);
  });
});
