import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { FAMILIES, inventedCurveSet } from '../library/fixtures.ts';
import { json, postJson, startTestServer, tempDir, type TestServer } from './helpers.ts';
import { crossOriginRefusal, isWriteContentType, tokenBits, tokenWeakness } from '../../src/server/security.ts';

let tmp: ReturnType<typeof tempDir>;
let server: TestServer;
let own: string;
let archivedId: string;

beforeEach(async () => {
  tmp = tempDir();
  server = await startTestServer(join(tmp.dir, 'library.sqlite'));
  own = server.url.replace(/\/$/, '');
  archivedId = server.store.create(inventedCurveSet(FAMILIES.small)).id;
  server.store.archive(archivedId);
});
afterEach(async () => {
  await server.close();
  tmp.remove();
});

/** The restore of an archived entry: the write a foreign page tried in the reported attack. */
function restore(headers: Record<string, string>, body?: string) {
  return json(`${server.url}/api/curvesets/${archivedId}/restore`, { method: 'POST', headers, ...(body === undefined ? {} : { body }) });
}

function stillArchived(): boolean {
  return server.store.info(archivedId).archived_at !== null;
}

describe('writes from pages of another origin (forged headers)', () => {
  it('refuses a plain-text POST from another local port, the attack of the report, and changes nothing', async () => {
    const otherPort = Number(new URL(server.url).port) === 5999 ? 5998 : 5999;
    const res = await restore({ origin: `http://127.0.0.1:${otherPort}`, 'content-type': 'text/plain;charset=UTF-8' }, '{}');
    expect(res.status).toBe(403);
    expect(res.body).toMatchObject({ code: 'origin-refused' });
    expect(res.body.error).toMatch(/another local port/);
    expect(stillArchived()).toBe(true);
  });

  it('refuses every foreign origin, the opaque "null" origin and localhost-for-127.0.0.1, even with a JSON body', async () => {
    const port = new URL(server.url).port;
    for (const origin of ['http://127.0.0.1:1', `http://localhost:${port}`, `https://127.0.0.1:${port}`, 'http://evil.example', 'null', 'not a url']) {
      const res = await restore({ origin, 'content-type': 'application/json' }, '{}');
      expect(res.status, origin).toBe(403);
      expect(res.body.code, origin).toBe('origin-refused');
    }
    const post = await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.mid), 'POST', { origin: 'http://127.0.0.1:1' });
    expect(post.status).toBe(403);
    expect(server.store.counts().revisions).toBe(1);
    expect(stillArchived()).toBe(true);
  });

  it('refuses the content types any page can send (plain text, forms), even from its own origin', async () => {
    for (const type of ['text/plain', 'application/x-www-form-urlencoded', 'multipart/form-data; boundary=x', '']) {
      const res = await restore({ origin: own, ...(type ? { 'content-type': type } : {}) }, type ? 'a=1' : undefined);
      expect(res.status, type).toBe(403);
      expect(res.body.code, type).toBe('content-type-refused');
      expect(res.body.error).toMatch(/plain-text and form posts are refused/);
    }
    expect(stillArchived()).toBe(true);
  });

  it('without Origin, judges by Sec-Fetch-Site, then by Referer', async () => {
    for (const site of ['cross-site', 'same-site', 'none']) {
      const res = await restore({ 'sec-fetch-site': site, 'content-type': 'application/json' }, '{}');
      expect(res.status, site).toBe(403);
    }
    const foreignReferer = await restore({ referer: 'http://127.0.0.1:1/page.html', 'content-type': 'application/json' }, '{}');
    expect(foreignReferer.status).toBe(403);
    expect(stillArchived()).toBe(true);
    const sameReferer = await restore({ referer: `${own}/library`, 'content-type': 'application/json' }, '{}');
    expect(sameReferer.status).toBe(200);
    expect(stillArchived()).toBe(false);
  });

  it('serves the workbench itself: same origin with JSON, or Sec-Fetch-Site same-origin with JSON', async () => {
    const a = await restore({ origin: own, 'content-type': 'application/json' }, '{}');
    expect(a.status).toBe(200);
    expect(stillArchived()).toBe(false);
    const del = await json(`${server.url}/api/curvesets/${archivedId}`, { method: 'DELETE', headers: { 'sec-fetch-site': 'same-origin', 'content-type': 'application/json' } });
    expect(del.status).toBe(200);
    expect(stillArchived()).toBe(true);
    // A body-less write with the JSON type: the empty body reads as no body.
    const b = await restore({ 'content-type': 'application/json' });
    expect(b.status).toBe(200);
  });

  it('lets a local script (no browser headers) write JSON, and uploads carry their own type', async () => {
    expect((await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.mid))).status).toBe(201);
    const up = await json(`${server.url}/api/sheets`, { method: 'POST', headers: { 'content-type': 'application/pdf', origin: own }, body: '%PDF-1.4 invented' });
    expect(up.status).toBe(201);
    const foreign = await json(`${server.url}/api/sheets`, { method: 'POST', headers: { 'content-type': 'application/pdf', origin: 'http://127.0.0.1:1' }, body: '%PDF-1.4 invented 2' });
    expect(foreign.status).toBe(403);
  });

  it('with a token: the Authorization header passes the rule, the cookie alone does not', async () => {
    const token = 'a3f9c2e18b7d4065f1e2d3c4b5a69788';
    const guarded = await startTestServer(join(tmp.dir, 'guarded.sqlite'), { token, loopbackOnly: false });
    try {
      const id = guarded.store.create(inventedCurveSet(FAMILIES.small)).id;
      guarded.store.archive(id);
      const url = `${guarded.url}/api/curvesets/${id}/restore`;
      const byCookie = await json(url, { method: 'POST', headers: { origin: 'http://127.0.0.1:1', cookie: `pumpscribe_token=${token}`, 'content-type': 'text/plain' }, body: '{}' });
      expect(byCookie.status).toBe(403);
      expect(guarded.store.info(id).archived_at).not.toBeNull();
      const byHeader = await json(url, { method: 'POST', headers: { origin: 'http://127.0.0.1:1', authorization: `Bearer ${token}` } });
      expect(byHeader.status).toBe(200);
      expect(guarded.store.info(id).archived_at).toBeNull();
    } finally {
      await guarded.close();
    }
  });
});

describe('the rule and the token strength as functions', () => {
  it('crossOriginRefusal compares scheme, host and port exactly', () => {
    const ok = { origin: 'http://127.0.0.1:5280', 'content-type': 'application/json; charset=utf-8' };
    expect(crossOriginRefusal(ok, '127.0.0.1:5280')).toBeNull();
    expect(crossOriginRefusal({ ...ok, origin: 'http://127.0.0.1:5281' }, '127.0.0.1:5280')?.code).toBe('origin-refused');
    expect(crossOriginRefusal({ ...ok, origin: 'http://127.0.0.1' }, '127.0.0.1:5280')?.code).toBe('origin-refused');
    expect(crossOriginRefusal({ ...ok, 'content-type': 'text/plain' }, '127.0.0.1:5280')?.code).toBe('content-type-refused');
    expect(isWriteContentType('image/png')).toBe(true);
    expect(isWriteContentType('application/x-ndjson')).toBe(true);
    expect(isWriteContentType('text/plain')).toBe(false);
    expect(isWriteContentType('multipart/form-data; boundary=a')).toBe(false);
  });

  it('tokens must be able to hold 128 bits and must not be a pattern', () => {
    expect(tokenBits('0123456789abcdef0123456789abcdef')).toBe(128); // 32 hex digits × 4 bits
    expect(tokenWeakness('a3f9c2e18b7d4065f1e2d3c4b5a69788')).toBeNull();
    expect(tokenWeakness('a3f9c2e18b7d4065f1e2d3c4b5a6978')).toMatch(/at most 124 bits/);
    expect(tokenWeakness('x'.repeat(100))).toMatch(/only 1 different characters/);
    expect(tokenWeakness('correct horse battery staple')).toMatch(/white space/);
    expect(tokenWeakness('')).toMatch(/128 bits/);
    // 32 random bytes in base64url, as the advice makes them (an invented fixed value).
    expect(tokenWeakness('q3Vd8_Zr1kLw-9XyPb2sTe7uAm4oCj6nHg0fYiR5WxE')).toBeNull();
  });
});
