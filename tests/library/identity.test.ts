/**
 * The library guards identity (a revision belongs to its entry's pump) and concurrent edits
 * (If-Match), over a real SQLite file and a real Fastify server on 127.0.0.1.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { FAMILIES, inventedCurveSet } from './fixtures.ts';
import { json, postJson, startTestServer, tempDir, type TestServer } from '../server/helpers.ts';

let tmp: ReturnType<typeof tempDir>;
let server: TestServer;
beforeEach(async () => {
  tmp = tempDir('pumpscribe-identity-');
  server = await startTestServer(join(tmp.dir, 'library.sqlite'));
});
afterEach(async () => {
  await server.close();
  tmp.remove();
});

const mid = inventedCurveSet(FAMILIES.mid);
const revisionsOf = async (id: string) => (await json(`${server.url}/api/curvesets/${id}/revisions`)).body.revisions.length as number;

describe('PUT /api/curvesets/:id', () => {
  it('creates with ETag "1" and { id, revision }, and adds a revision of the same pump with If-Match', async () => {
    const created = await postJson(`${server.url}/api/curvesets`, mid);
    expect(created.status).toBe(201);
    expect(created.headers.get('etag')).toBe('"1"');
    expect(created.body).toMatchObject({ id: expect.stringMatching(/^[0-9a-f]{16}$/), revision: 1 });
    const id = created.body.id as string;
    // Same pump, written with other case and spaces around its names: still the same pump.
    const same = { ...mid, pump: { ...mid.pump, name: `  ${mid.pump.name.toUpperCase()} `, maker: mid.pump.maker?.toLowerCase() } };
    const put = await postJson(`${server.url}/api/curvesets/${id}`, same, 'PUT', { 'if-match': '"1"' });
    expect(put.status).toBe(200);
    expect(put.headers.get('etag')).toBe('"2"');
    expect(put.body).toMatchObject({ id, revision: 2 });
    const got = await json(`${server.url}/api/curvesets/${id}`);
    expect(got.headers.get('etag')).toBe('"2"');
  });

  it('answers 428 without If-Match and 412 with a stale one, and stores nothing', async () => {
    const { id } = (await postJson(`${server.url}/api/curvesets`, mid)).body as { id: string };
    const missing = await postJson(`${server.url}/api/curvesets/${id}`, mid, 'PUT');
    expect(missing.status).toBe(428);
    expect(missing.body).toEqual({ error: expect.stringMatching(/If-Match.*nothing was stored\.$/), code: 'revision-required' });
    expect(await revisionsOf(id)).toBe(1);
    expect((await postJson(`${server.url}/api/curvesets/${id}`, mid, 'PUT', { 'if-match': '"1"' })).status).toBe(200);
    const stale = await postJson(`${server.url}/api/curvesets/${id}`, mid, 'PUT', { 'if-match': '"1"' });
    expect(stale.status).toBe(412);
    expect(stale.body.code).toBe('revision-stale');
    expect(stale.body.error).toMatch(/is at revision 2, not 1/);
    expect(await revisionsOf(id)).toBe(2);
  });

  it('answers 409 for a curve set of another pump, storing nothing, unless ?as_new_revision=true', async () => {
    const { id } = (await postJson(`${server.url}/api/curvesets`, mid)).body as { id: string };
    for (const other of [
      inventedCurveSet(FAMILIES.large),
      { ...mid, pump: { ...mid.pump, size: '125-315 (invented)' } },
      { ...mid, pump: { ...mid.pump, maker: 'Other Invented Works' } },
    ]) {
      const refused = await postJson(`${server.url}/api/curvesets/${id}`, other, 'PUT', { 'if-match': '"1"' });
      expect(refused.status).toBe(409);
      expect(refused.body.code).toBe('other-pump');
      expect(refused.body.error).toMatch(/^The curve set is for .* but entry [0-9a-f]{16} holds "Invented Mid 80-250"/);
    }
    expect(await revisionsOf(id)).toBe(1);
    const forced = await postJson(`${server.url}/api/curvesets/${id}?as_new_revision=true`, inventedCurveSet(FAMILIES.large), 'PUT', { 'if-match': '"1"' });
    expect(forced.status).toBe(200);
    expect(forced.body).toMatchObject({ id, revision: 2 });
    expect(forced.headers.get('etag')).toBe('"2"');
  });

  it('checks If-Match before identity: a stale edit of another pump is a 412', async () => {
    const { id } = (await postJson(`${server.url}/api/curvesets`, mid)).body as { id: string };
    const r = await postJson(`${server.url}/api/curvesets/${id}`, inventedCurveSet(FAMILIES.small), 'PUT', { 'if-match': '"7"' });
    expect(r.status).toBe(412);
    expect(await revisionsOf(id)).toBe(1);
  });
});
