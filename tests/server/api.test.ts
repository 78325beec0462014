import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { FAMILIES, exactTrimDiameter, inventedCurveSet } from '../library/fixtures.ts';
import { json, postJson, startTestServer, tempDir, type TestServer } from './helpers.ts';

let tmp: ReturnType<typeof tempDir>;
let file: string;
let server: TestServer;

beforeEach(async () => {
  tmp = tempDir();
  file = join(tmp.dir, 'library.sqlite');
  server = await startTestServer(file);
});
afterEach(async () => {
  await server.close();
  tmp.remove();
});

describe('library API', () => {
  it('POST creates an entry (201 with id and revision) and GET returns it exactly as stored', async () => {
    const set = inventedCurveSet(FAMILIES.mid);
    const created = await postJson(`${server.url}/api/curvesets`, set);
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ revision: 1 });
    expect(created.body.id).toMatch(/^[0-9a-f]{16}$/);
    const got = await json(`${server.url}/api/curvesets/${created.body.id}`);
    expect(got.status).toBe(200);
    expect(got.body).toEqual(set);
    expect(got.text).toBe(server.store.get(created.body.id).body);
    expect(got.headers.get('x-pumpscribe-revision')).toBe('1');
    expect(got.headers.get('content-type')).toMatch(/^application\/json/);
  });

  it('curve sets come back identical after a server restart', async () => {
    const sets = [inventedCurveSet(FAMILIES.small), inventedCurveSet(FAMILIES.mid), inventedCurveSet(FAMILIES.large)];
    const ids: string[] = [];
    for (const s of sets) ids.push((await postJson(`${server.url}/api/curvesets`, s)).body.id);
    const renamed = { ...sets[1]!, pump: { ...sets[1]!.pump, name: 'Invented Mid, second revision' } };
    await postJson(`${server.url}/api/curvesets/${ids[1]}?as_new_revision=true`, renamed, 'PUT', { 'if-match': '"1"' });
    const before = await Promise.all(ids.map(async (id) => (await json(`${server.url}/api/curvesets/${id}`)).text));

    await server.close();
    server = await startTestServer(file);

    const after = await Promise.all(ids.map(async (id) => (await json(`${server.url}/api/curvesets/${id}`)).text));
    expect(after).toEqual(before);
    expect(JSON.parse(after[0]!)).toEqual(sets[0]);
    expect(JSON.parse(after[1]!)).toEqual(renamed);
    expect(JSON.parse((await json(`${server.url}/api/curvesets/${ids[1]}/revisions/1`)).text)).toEqual(sets[1]);
  });

  it('PUT adds a revision, the revisions list grows, and a stale If-Match gets 412', async () => {
    const set = inventedCurveSet(FAMILIES.small);
    const { id } = (await postJson(`${server.url}/api/curvesets`, set)).body;
    const put = await postJson(`${server.url}/api/curvesets/${id}`, set, 'PUT', { 'if-match': '"1"' });
    expect(put.status).toBe(200);
    expect(put.body).toMatchObject({ id, revision: 2 });
    const stale = await postJson(`${server.url}/api/curvesets/${id}`, set, 'PUT', { 'if-match': '"1"' });
    expect(stale.status).toBe(412);
    expect(stale.body.error).toMatch(/revision 2/);
    const revs = await json(`${server.url}/api/curvesets/${id}/revisions`);
    expect(revs.body.revisions.map((r: { revision: number }) => r.revision)).toEqual([1, 2]);
  });

  it('DELETE archives, the entry leaves the list and search, and restore brings it back', async () => {
    const { id } = (await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.mid))).body;
    const bare = await json(`${server.url}/api/curvesets/${id}`, { method: 'DELETE' });
    expect(bare.status).toBe(403);
    expect(bare.body.code).toBe('content-type-refused');
    const del = await json(`${server.url}/api/curvesets/${id}`, { method: 'DELETE', headers: { 'content-type': 'application/json' } });
    expect(del.status).toBe(200);
    expect(del.body.archived_at).toEqual(expect.any(String));
    expect((await json(`${server.url}/api/curvesets`)).body.total).toBe(0);
    expect((await json(`${server.url}/api/curvesets?archived=true`)).body.entries.map((e: { id: string }) => e.id)).toEqual([id]);
    const archivedGet = await json(`${server.url}/api/curvesets/${id}`);
    expect(archivedGet.status).toBe(200);
    expect(archivedGet.headers.get('x-pumpscribe-archived-at')).toBeTruthy();
    const restored = await json(`${server.url}/api/curvesets/${id}/restore`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{}' });
    expect(restored.status).toBe(200);
    expect(restored.body.archived_at).toBeNull();
    expect((await json(`${server.url}/api/curvesets?q=mid`)).body.entries.map((e: { id: string }) => e.id)).toEqual([id]);
  });

  it('GET /api/curvesets?q= searches names, makers and models', async () => {
    await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small));
    await postJson(`${server.url}/api/curvesets`, inventedCurveSet({ ...FAMILIES.large, maker: 'Other Invented Foundry' }));
    const res = await json(`${server.url}/api/curvesets?q=${encodeURIComponent('foundry')}`);
    expect(res.body.entries.map((e: { name: string }) => e.name)).toEqual([FAMILIES.large.name]);
    expect((await json(`${server.url}/api/curvesets?q=invented`)).body.total).toBe(2);
  });

  it('GET /api/search ranks the pump that meets the duty, with the trim in mm within 1 % of exact', async () => {
    for (const f of Object.values(FAMILIES)) await postJson(`${server.url}/api/curvesets`, inventedCurveSet(f));
    const res = await json(`${server.url}/api/search?flow=120&head=40&units=si`);
    expect(res.status).toBe(200);
    expect(res.body.candidates).toHaveLength(1);
    const c = res.body.candidates[0];
    expect(c.name).toBe(FAMILIES.mid.name);
    const exactMm = exactTrimDiameter(FAMILIES.mid, 120 / 3600, 40) * 1000;
    expect(Math.abs(c.diameter - exactMm) / exactMm).toBeLessThan(0.01);
    expect(c).toMatchObject({ trimmed: true, por: { position: 'within' } });
    expect(c.efficiency).toBeGreaterThan(70);
    expect(c.power).toBeGreaterThan(10);
    expect(c.npshr).toBeGreaterThan(0);
    expect(res.body.units).toMatchObject({ diameter: 'mm', power: 'kW', efficiency: '%' });
    expect(res.body.notice).toMatch(/verify/);
  });

  it('GET /api/search refuses a duty without units, with a non-number, or with a static head above the duty head', async () => {
    expect((await json(`${server.url}/api/search?flow=120&head=40`)).status).toBe(400);
    const bad = await json(`${server.url}/api/search?flow=abc&head=40&units=si`);
    expect(bad.status).toBe(400);
    expect(bad.body.error).toMatch(/flow must be a decimal number/);
    expect((await json(`${server.url}/api/search?flow=120&head=40&units=si&static=50`)).status).toBe(400);
    expect((await json(`${server.url}/api/search?flow=120&head=40&units=metric`)).status).toBe(400);
  });

  it('answers 404 in JSON for an unknown id, an unknown revision and an unknown route', async () => {
    const unknown = await json(`${server.url}/api/curvesets/0123456789abcdef`);
    expect(unknown.status).toBe(404);
    expect(unknown.body.error).toMatch(/No library entry/);
    const { id } = (await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small))).body;
    expect((await json(`${server.url}/api/curvesets/${id}/revisions/7`)).status).toBe(404);
    expect((await json(`${server.url}/api/nothing-here`)).status).toBe(404);
    expect((await postJson(`${server.url}/api/curvesets/0123456789abcdef`, inventedCurveSet(FAMILIES.small), 'PUT')).status).toBe(404);
  });
});
