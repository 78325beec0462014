import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { request as httpRequest } from 'node:http';
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { FAMILIES, inventedCurveSet } from '../library/fixtures.ts';
import { postJson, startTestServer, tempDir, type TestServer } from './helpers.ts';
import { isHashedAsset, noneMatch } from '../../src/server/caching.ts';

let tmp: ReturnType<typeof tempDir>;
let server: TestServer;
const ASSET = `console.log(${JSON.stringify('invented workbench code '.repeat(200))});\n`;

beforeEach(async () => {
  tmp = tempDir();
  const dist = join(tmp.dir, 'dist');
  mkdirSync(join(dist, 'assets'), { recursive: true });
  writeFileSync(join(dist, 'index.html'), `<!doctype html><title>invented workbench</title>${'<!-- padding -->'.repeat(100)}`);
  writeFileSync(join(dist, 'assets', 'app-Ab12Cd34.js'), ASSET);
  writeFileSync(join(dist, '.env'), 'INVENTED_SECRET=1');
  server = await startTestServer(join(tmp.dir, 'library.sqlite'), { staticDir: dist });
});
afterEach(async () => {
  await server.close();
  tmp.remove();
});

/** A raw GET, so that the body arrives exactly as sent (fetch would undo the compression). */
function rawGet(path: string, headers: Record<string, string> = {}): Promise<{ status: number; headers: Record<string, string | string[] | undefined>; body: Buffer }> {
  const u = new URL(server.url);
  return new Promise((resolve, reject) => {
    const req = httpRequest({ host: u.hostname, port: u.port, path, headers }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
    });
    req.on('error', reject);
    req.end();
  });
}

describe('ETag and If-None-Match', () => {
  it('JSON GETs carry an ETag and answer 304 with no body when it is named; a change gives a new one', async () => {
    await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small));
    const first = await rawGet('/api/curvesets');
    expect(first.status).toBe(200);
    const etag = first.headers.etag as string;
    expect(etag).toMatch(/^W\/"[\w-]{27}"$/);
    expect(first.headers['cache-control']).toBe('no-cache');
    const again = await rawGet('/api/curvesets', { 'if-none-match': etag });
    expect(again.status).toBe(304);
    expect(again.body.length).toBe(0);
    expect((await rawGet('/api/curvesets', { 'if-none-match': `"other", ${etag.slice(2)}` })).status).toBe(304);
    await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.large));
    const changed = await rawGet('/api/curvesets', { 'if-none-match': etag });
    expect(changed.status).toBe(200);
    expect(changed.headers.etag).not.toBe(etag);
  });

  it("a stored curve set keeps the route's own ETag, and 304 honours it", async () => {
    const { id } = (await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.mid))).body;
    const got = await rawGet(`/api/curvesets/${id}`);
    const etag = got.headers.etag as string;
    expect(etag).not.toMatch(/^W\//);
    expect((await rawGet(`/api/curvesets/${id}`, { 'if-none-match': etag })).status).toBe(304);
    expect((await rawGet(`/api/curvesets/${id}`, { 'if-none-match': '"nope"' })).status).toBe(200);
    // Errors are never validated.
    const missing = await rawGet('/api/curvesets/0123456789abcdef', { 'if-none-match': '*' });
    expect(missing.status).toBe(404);
  });

  it('hashed assets are immutable for a year, index.html and the library page are revalidated, both answer 304', async () => {
    const asset = await rawGet('/assets/app-Ab12Cd34.js');
    expect(asset.status).toBe(200);
    expect(asset.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect((await rawGet('/assets/app-Ab12Cd34.js', { 'if-none-match': asset.headers.etag as string })).status).toBe(304);
    const index = await rawGet('/');
    expect(index.headers['cache-control']).toBe('no-cache');
    expect((await rawGet('/', { 'if-none-match': index.headers.etag as string })).status).toBe(304);
    const page = await rawGet('/library');
    expect(page.headers['cache-control']).toBe('no-cache');
    expect((await rawGet('/library', { 'if-none-match': page.headers.etag as string })).status).toBe(304);
  });

  it('refuses hidden files of the build and unknown files with the one error shape', async () => {
    for (const path of ['/.env', '/assets/none-Zz99Yy88.js']) {
      const res = await rawGet(path);
      expect(res.status, path).toBeGreaterThanOrEqual(403);
      const body = JSON.parse(res.body.toString());
      expect(Object.keys(body).sort(), path).toEqual(['code', 'error']);
      expect(res.body.toString()).not.toContain('INVENTED_SECRET');
    }
  });

  it('reads If-None-Match and asset names as RFC 9110 and Vite write them', () => {
    expect(noneMatch('W/"abc"', '"abc"')).toBe(true);
    expect(noneMatch('"x", "abc"', 'W/"abc"')).toBe(true);
    expect(noneMatch('*', '"abc"')).toBe(true);
    expect(noneMatch('"abcd"', '"abc"')).toBe(false);
    expect(noneMatch(undefined, '"abc"')).toBe(false);
    expect(isHashedAsset('/srv/dist/assets/index-B3xZ_9aQ.js')).toBe(true);
    expect(isHashedAsset('/srv/dist/index.html')).toBe(false);
    expect(isHashedAsset('/srv/dist/assets/logo.svg')).toBe(false);
  });
});

describe('compression', () => {
  it('compresses JSON and assets for clients that accept it, and leaves small answers alone', async () => {
    for (const f of Object.values(FAMILIES)) await postJson(`${server.url}/api/curvesets`, inventedCurveSet(f));
    const plain = await rawGet('/api/curvesets');
    const gz = await rawGet('/api/curvesets', { 'accept-encoding': 'gzip' });
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(gz.headers.vary).toMatch(/accept-encoding/i);
    expect(gunzipSync(gz.body).equals(plain.body)).toBe(true);
    expect(gz.body.length).toBeLessThan(plain.body.length / 2);
    expect(gz.headers.etag).toBe(plain.headers.etag);

    const br = await rawGet('/assets/app-Ab12Cd34.js', { 'accept-encoding': 'br, gzip' });
    expect(br.headers['content-encoding']).toBe('br');
    expect(brotliDecompressSync(br.body).toString()).toBe(ASSET);

    const small = await rawGet('/api/health', { 'accept-encoding': 'gzip' });
    expect(small.headers['content-encoding']).toBeUndefined();
    expect(JSON.parse(small.body.toString()).ok).toBe(true);
  });
});
