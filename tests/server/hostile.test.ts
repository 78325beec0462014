import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { request as httpRequest } from 'node:http';
import { createHash } from 'node:crypto';
import { FAMILIES, inventedCurveSet } from '../library/fixtures.ts';
import { json, postJson, startTestServer, tempDir, type TestServer } from './helpers.ts';
import { exportLines } from '../../src/library/transfer.ts';

let tmp: ReturnType<typeof tempDir>;
let server: TestServer;

beforeEach(async () => {
  tmp = tempDir();
  server = await startTestServer(join(tmp.dir, 'library.sqlite'), { limits: { jsonBytes: 512 * 1024, importBytes: 256 * 1024 } });
});
afterEach(async () => {
  await server.close();
  tmp.remove();
});

/** The whole library as exported, minus the export time stamp. */
function snapshot(): string[] {
  return [...exportLines(server.store)].map((line) => line.replace(/"exported_at":"[^"]*"/, ''));
}

/** A raw request, so that the path reaches the server exactly as written (fetch would normalise "..") */
function rawGet(path: string): Promise<{ status: number; body: string }> {
  const u = new URL(server.url);
  return new Promise((resolve, reject) => {
    const req = httpRequest({ host: u.hostname, port: u.port, path, method: 'GET' }, (res) => {
      let body = '';
      res.on('data', (c) => (body += c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
    });
    req.on('error', reject);
    req.end();
  });
}

describe('hostile and malformed requests', () => {
  it('rejects malformed, oversized and schema-breaking bodies and leaves the store unchanged', async () => {
    const keep = await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.mid));
    const before = snapshot();
    const url = `${server.url}/api/curvesets`;
    const cases: Array<[string, RequestInit, number]> = [
      ['broken JSON', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{"format": "pumpscribe.curveset",' }, 400],
      ['empty body', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '' }, 400],
      ['not a curve set', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{"hello": "world"}' }, 400],
      ['an array', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '[1,2,3]' }, 400],
      ['null', { method: 'POST', headers: { 'content-type': 'application/json' }, body: 'null' }, 400],
      ['prototype pollution', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{"__proto__": {"admin": true}}' }, 400],
      ['constructor pollution', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{"constructor": {"prototype": {"admin": true}}}' }, 400],
      ['oversized', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ pad: 'x'.repeat(600 * 1024) }) }, 413],
      ['form post', { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: 'a=1' }, 403],
      ['plain-text post', { method: 'POST', headers: { 'content-type': 'text/plain' }, body: '{}' }, 403],
      ['unreadable type', { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: '%PDF-1.4' }, 415],
      ['deep nesting', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '['.repeat(100_000) + ']'.repeat(100_000) }, 400],
    ];
    for (const [what, init, status] of cases) {
      const res = await json(url, init);
      expect(res.status, what).toBe(status);
      expect(typeof res.body?.error, what).toBe('string');
      expect(typeof res.body?.code, what).toBe('string');
    }
    const negative = inventedCurveSet(FAMILIES.small);
    (negative.members[0] as { speed_rpm: number }).speed_rpm = -1450;
    expect((await postJson(url, negative)).status).toBe(400);
    const extraKey = { ...inventedCurveSet(FAMILIES.small), injected: '<script>' };
    expect((await postJson(url, extraKey)).status).toBe(400);
    expect((await postJson(`${url}/${keep.body.id}`, { nope: 1 }, 'PUT', { 'if-match': '"1"' })).status).toBe(400);
    expect(({} as Record<string, unknown>).admin).toBeUndefined();
    expect(snapshot()).toEqual(before);
  });

  it('stores script tags and path tricks in names as inert text, and the library page escapes them', async () => {
    const set = inventedCurveSet({ ...FAMILIES.mid, name: '<script>alert("x")</script> Invented', maker: '"><img src=x onerror=alert(1)>' });
    set.provenance.source = { file: '../../../../etc/passwd', sha256: 'a'.repeat(64) };
    const { id } = (await postJson(`${server.url}/api/curvesets`, set)).body;
    const got = await json(`${server.url}/api/curvesets/${id}`);
    expect(got.body).toEqual(set);
    expect(got.headers.get('content-type')).toMatch(/^application\/json/);
    expect(got.headers.get('x-content-type-options')).toBe('nosniff');
    const page = await fetch(`${server.url}/library`);
    const html = await page.text();
    expect(page.headers.get('content-security-policy')).toMatch(/default-src 'none'/);
    expect(html).not.toContain('<script>');
    expect(html).not.toContain('<img src=x');
    expect(html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; Invented');
  });

  it('never lets a path parameter or a static path reach the filesystem', async () => {
    const tries = [
      '/api/curvesets/..%2F..%2Fpackage.json',
      '/api/curvesets/../../package.json',
      '/api/sheets/..%2F..%2Fpackage.json',
      '/api/takeoffs/%2e%2e%2fpackage.json',
      '/../package.json',
      '/%2e%2e/package.json',
      '/library/../package.json',
    ];
    for (const path of tries) {
      const res = await rawGet(path);
      expect(res.status, path).toBeGreaterThanOrEqual(400);
      expect(res.body, path).not.toContain('"pumpscribe"');
    }
  });

  it('serves an uploaded file that is not a PDF or image as inert bytes in a sandbox', async () => {
    const up = await json(`${server.url}/api/sheets?name=${encodeURIComponent('../../evil.html')}`, {
      method: 'POST',
      headers: { 'content-type': 'application/octet-stream' },
      body: '<html><script>alert(1)</script></html>',
    });
    expect(up.status).toBe(201);
    expect(up.body.name).toBe('evil.html');
    const res = await fetch(`${server.url}/api/sheets/${up.body.sha256}`);
    expect(res.headers.get('content-type')).toBe('application/octet-stream');
    expect(res.headers.get('content-security-policy')).toMatch(/sandbox/);
    const svg = await json(`${server.url}/api/sheets?name=plot.svg`, { method: 'POST', headers: { 'content-type': 'image/svg+xml' }, body: '<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>' });
    expect(svg.status).toBe(201);
    expect(svg.body.media_type).toBe('application/octet-stream');
    expect((await fetch(`${server.url}/api/sheets/${svg.body.sha256}`)).headers.get('content-type')).toBe('application/octet-stream');
  });

  it('refuses a damaged or oversized import as a whole and changes nothing', async () => {
    await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small));
    const before = snapshot();
    const lines = [...exportLines(server.store)];
    const good = inventedCurveSet(FAMILIES.large);
    const bad = { ...inventedCurveSet(FAMILIES.mid), speed_rpm: 'fast' };
    const body = [
      lines[0],
      JSON.stringify({ kind: 'entry', id: 'aaaaaaaaaaaaaaaa', created_at: '2025-01-01T00:00:00Z', archived_at: null, revisions: [{ revision: 1, saved_at: '2025-01-01T00:00:00Z', curveset: good }] }),
      JSON.stringify({ kind: 'entry', id: 'bbbbbbbbbbbbbbbb', created_at: '2025-01-01T00:00:00Z', archived_at: null, revisions: [{ revision: 1, saved_at: '2025-01-01T00:00:00Z', curveset: bad }] }),
    ].join('\n');
    const res = await json(`${server.url}/api/library/import`, { method: 'POST', headers: { 'content-type': 'application/x-ndjson' }, body });
    expect(res.status).toBe(400);
    expect(res.body.error).toMatch(/Line 3/);
    expect(res.body.error).toMatch(/Nothing was imported/);
    const sheetLine = (i: number) => {
      const bytes = Buffer.from(`%PDF-1.4 invented sheet ${i} ${'x'.repeat(2000)}`);
      return JSON.stringify({ kind: 'sheet', sha256: createHash('sha256').update(bytes).digest('hex'), name: `s${i}.pdf`, media_type: 'application/pdf', stored_at: '2025-01-01T00:00:00Z', data_base64: bytes.toString('base64') });
    };
    const big = [lines[0], ...Array.from({ length: 200 }, (_, i) => sheetLine(i))].join('\n');
    const tooBig = await json(`${server.url}/api/library/import`, { method: 'POST', headers: { 'content-type': 'application/x-ndjson' }, body: big });
    expect(tooBig.status).toBe(413);
    expect(snapshot()).toEqual(before);
  });
});
