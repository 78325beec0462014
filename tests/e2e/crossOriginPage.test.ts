/**
 * A page of another local web app cannot change the library (issue #18, item 6).
 *
 * The library server runs in-process on 127.0.0.1 with a fresh library holding one archived entry.
 * A second tiny HTTP server on another port of 127.0.0.1 serves a hostile page. Debian's Chromium
 * (playwright-core) opens it; the page tries every write a page can make without the server's
 * consent: no-cors fetches with a plain-text and a JSON-looking body, a CORS fetch with JSON (which
 * needs a preflight), sendBeacon, and a text/plain form post shaped like JSON. Afterwards the entry
 * is still archived, nothing was added, and the server log shows each write that reached it was
 * refused with 403. A positive control from the library's own origin then does restore the entry,
 * so the test can fail.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createServer, type Server as HttpServer } from 'node:http';
import { join } from 'node:path';
import { buildApp } from '../../src/server/app.ts';
import { LibraryStore } from '../../src/library/store.ts';
import { libraryMatcher } from '../../src/library/matcher.ts';
import { FAMILIES, inventedCurveSet } from '../library/fixtures.ts';
import { tempDir } from '../server/helpers.ts';
import { openBrowser, type Browser } from './harness.ts';
import type { FastifyInstance } from 'fastify';

interface Seen {
  method: string;
  url: string;
  status: number;
  origin: string | undefined;
  type: string | undefined;
}

let tmp: ReturnType<typeof tempDir>;
let store: LibraryStore;
let app: FastifyInstance;
let library: string;
let archivedId: string;
let attacker: HttpServer;
let attackerUrl: string;
let browser: Browser;
const seen: Seen[] = [];

function hostilePage(lib: string, id: string): string {
  const set = JSON.stringify(inventedCurveSet({ ...FAMILIES.mid, name: 'Invented set planted by a foreign page' }));
  return `<!doctype html><html><head><meta charset="utf-8"><title>another local app</title></head><body>
<form id="plain" method="POST" action="${lib}/api/curvesets/${id}/restore" enctype="text/plain" target="sink">
<input type="hidden" name='{"x":"' value='"}'></form>
<form id="urlencoded" method="POST" action="${lib}/api/curvesets" target="sink2"><input type="hidden" name="a" value="1"></form>
<iframe name="sink"></iframe><iframe name="sink2"></iframe>
<script>
window.attack = async () => {
  const out = [];
  const LIB = ${JSON.stringify(lib)};
  const ID = ${JSON.stringify(id)};
  const tryFetch = async (what, url, init) => {
    try { const r = await fetch(url, init); out.push(what + ': answered ' + r.status + ' ' + r.type); }
    catch (e) { out.push(what + ': blocked (' + e.message + ')'); }
  };
  await tryFetch('no-cors text/plain restore', LIB + '/api/curvesets/' + ID + '/restore', { method: 'POST', mode: 'no-cors', headers: { 'content-type': 'text/plain' }, body: '{}' });
  await tryFetch('no-cors "json" create', LIB + '/api/curvesets', { method: 'POST', mode: 'no-cors', headers: { 'content-type': 'application/json' }, body: ${JSON.stringify(set)} });
  await tryFetch('cors json restore', LIB + '/api/curvesets/' + ID + '/restore', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{}' });
  await tryFetch('no-cors delete', LIB + '/api/curvesets/' + ID, { method: 'DELETE', mode: 'no-cors' });
  out.push('beacon queued: ' + navigator.sendBeacon(LIB + '/api/curvesets/' + ID + '/restore', '{}'));
  return out;
};
</script></body></html>`;
}

beforeAll(async () => {
  tmp = tempDir('pumpscribe-cross-origin-');
  store = LibraryStore.open(join(tmp.dir, 'library.sqlite'));
  archivedId = store.create(inventedCurveSet(FAMILIES.small)).id;
  store.archive(archivedId);
  app = await buildApp({ store, matcher: libraryMatcher, staticDir: null, loopbackOnly: true });
  app.addHook('onResponse', async (request, reply) => {
    seen.push({ method: request.method, url: request.url, status: reply.statusCode, origin: request.headers.origin, type: request.headers['content-type'] });
  });
  library = (await app.listen({ port: 0, host: '127.0.0.1' })).replace(/\/$/, '');
  attacker = createServer((_req, res) => {
    res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
    res.end(hostilePage(library, archivedId));
  });
  await new Promise<void>((resolve) => attacker.listen(0, '127.0.0.1', resolve));
  const address = attacker.address();
  if (!address || typeof address === 'string') throw new Error('The page server has no port.');
  attackerUrl = `http://127.0.0.1:${address.port}/`;
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
  await new Promise((resolve) => attacker?.close(resolve));
  await app?.close();
  store?.close();
  tmp?.remove();
});

describe('a page served from another local port', () => {
  it('cannot restore, create or archive through fetch, sendBeacon or a form post', async () => {
    const { page } = browser;
    expect(new URL(attackerUrl).port).not.toBe(new URL(library).port);
    await page.goto(attackerUrl);
    const tried = await page.evaluate(() => (window as unknown as { attack: () => Promise<string[]> }).attack());
    // The CORS fetch with JSON needs a preflight the server never grants: the browser blocks it.
    expect(tried.find((t) => t.startsWith('cors json restore'))).toMatch(/blocked/);
    // A page cannot even send DELETE without CORS; the browser refuses before the request leaves.
    expect(tried.find((t) => t.startsWith('no-cors delete'))).toMatch(/unsupported in no-cors mode/);

    for (const id of ['plain', 'urlencoded']) {
      const posted = page.waitForResponse((r) => r.request().method() === 'POST' && r.url().startsWith(library));
      await page.evaluate((f) => (document.getElementById(f) as HTMLFormElement).submit(), id);
      const answer = await posted;
      expect(answer.status(), id).toBe(403);
    }
    // sendBeacon is fire-and-forget: wait until the server has answered it.
    const deadline = Date.now() + 10_000;
    while (Date.now() < deadline && seen.filter((s) => s.method === 'POST' && s.type?.startsWith('text/plain')).length < 3) await page.waitForTimeout(100);

    expect(store.info(archivedId).archived_at).not.toBeNull();
    expect(store.counts().revisions).toBe(1);

    const writes = seen.filter((s) => s.method !== 'GET' && s.method !== 'OPTIONS');
    // Both no-cors fetches (the "json" one goes out as text/plain: no-cors drops the header), the beacon and both forms reached the server.
    expect(writes.length).toBe(5);
    expect(writes.filter((w) => w.url === '/api/curvesets').length).toBe(2);
    for (const w of writes) {
      expect(w.status, `${w.method} ${w.url} (${w.type})`).toBe(403);
      expect(w.origin).toBe(attackerUrl.replace(/\/$/, ''));
    }
    // The one write a page may send with application/json is the preflighted one, and the preflight failed.
    expect(writes.some((w) => w.type?.startsWith('application/json'))).toBe(false);
    expect(seen.some((s) => s.method === 'OPTIONS' && s.status >= 400)).toBe(true);
  });

  it('while the library origin itself may write (the positive control)', async () => {
    const { page } = browser;
    await page.goto(`${library}/api/health`);
    const status = await page.evaluate(async (id) => {
      const r = await fetch(`/api/curvesets/${id}/restore`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{}' });
      return r.status;
    }, archivedId);
    expect(status).toBe(200);
    expect(store.info(archivedId).archived_at).toBeNull();
  });
});
