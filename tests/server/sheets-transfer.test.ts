import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { FAMILIES, inventedCurveSet } from '../library/fixtures.ts';
import { json, postJson, startTestServer, tempDir, type TestServer } from './helpers.ts';

let tmp: ReturnType<typeof tempDir>;
let server: TestServer;
beforeEach(async () => {
  tmp = tempDir();
  server = await startTestServer(join(tmp.dir, 'library.sqlite'));
});
afterEach(async () => {
  await server.close();
  tmp.remove();
});

const PDF = Buffer.from('%PDF-1.4\n% invented one-page test sheet\n%%EOF\n');

const TAKEOFF = {
  sheet: 'invented-sheet.pdf',
  pump: { name: 'Invented take-off pump', speed_rpm: 1450 },
  units: { flow: 'm3/h', head: 'm', diameter: 'mm' },
  panels: [{ id: 'head', anchors: [{ at: [0, 0], x: 0, y: 0 }, { at: [100, 0], x: 200 }, { at: [0, -100], y: 60 }] }],
  traces: [{ panel: 'head', quantity: 'head', diameter: 250, points: [[10, -50], [50, -45]] }],
};

async function uploadSheet(): Promise<string> {
  const res = await json(`${server.url}/api/sheets?name=invented-sheet.pdf`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: PDF });
  return res.body.sha256;
}

describe('source sheets and take-off files', () => {
  it('stores a sheet once by SHA-256 and serves the same bytes back as PDF', async () => {
    const first = await json(`${server.url}/api/sheets?name=invented-sheet.pdf`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: PDF });
    expect(first.status).toBe(201);
    expect(first.body.sha256).toBe(createHash('sha256').update(PDF).digest('hex'));
    expect(first.body.media_type).toBe('application/pdf');
    const again = await json(`${server.url}/api/sheets`, { method: 'POST', headers: { 'content-type': 'application/octet-stream' }, body: PDF });
    expect(again.status).toBe(200);
    expect(again.body.created).toBe(false);
    const back = await fetch(`${server.url}/api/sheets/${first.body.sha256}`);
    expect(back.headers.get('content-type')).toBe('application/pdf');
    expect(Buffer.compare(Buffer.from(await back.arrayBuffer()), PDF)).toBe(0);
    expect((await json(`${server.url}/api/sheets`)).body.sheets).toHaveLength(1);
    expect((await json(`${server.url}/api/sheets/${'0'.repeat(64)}`)).status).toBe(404);
    expect((await json(`${server.url}/api/sheets`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: '' })).status).toBe(400);
  });

  it('keeps validated take-off files beside their sheet and refuses invalid ones', async () => {
    const sha = await uploadSheet();
    const saved = await postJson(`${server.url}/api/sheets/${sha}/takeoffs?name=invented.takeoff.json`, TAKEOFF);
    expect(saved.status).toBe(201);
    const list = await json(`${server.url}/api/sheets/${sha}/takeoffs`);
    expect(list.body.takeoffs.map((t: { id: string }) => t.id)).toEqual([saved.body.id]);
    const got = await json(`${server.url}/api/takeoffs/${saved.body.id}`);
    expect(got.body.pump.name).toBe('Invented take-off pump');
    expect(got.body.format).toBe('pumpscribe.takeoff');
    const bad = await postJson(`${server.url}/api/sheets/${sha}/takeoffs`, { ...TAKEOFF, traces: [{ panel: 'nowhere', quantity: 'head', diameter: 250, points: [[1, 1]] }] });
    expect(bad.status).toBe(400);
    expect(bad.body.error).toMatch(/panel "nowhere"/);
    expect((await postJson(`${server.url}/api/sheets/${'1'.repeat(64)}/takeoffs`, TAKEOFF)).status).toBe(404);
  });
});

describe('moving a whole library as JSON Lines', () => {
  it('exports everything and imports it into an empty library identically, then adds nothing twice', async () => {
    const sha = await uploadSheet();
    await postJson(`${server.url}/api/sheets/${sha}/takeoffs`, TAKEOFF);
    const a = (await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small))).body.id;
    const b = (await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.mid))).body.id;
    await postJson(`${server.url}/api/curvesets/${b}?as_new_revision=true`, inventedCurveSet({ ...FAMILIES.mid, name: 'Invented Mid r2' }), 'PUT', { 'if-match': '"1"' });
    await json(`${server.url}/api/curvesets/${a}`, { method: 'DELETE', headers: { 'content-type': 'application/json' } });

    const exported = await fetch(`${server.url}/api/library/export`);
    expect(exported.headers.get('content-type')).toMatch(/application\/x-ndjson/);
    expect(exported.headers.get('content-disposition')).toMatch(/attachment; filename="pumpscribe-library-/);
    const text = await exported.text();
    expect(text.trim().split('\n')).toHaveLength(1 + 1 + 1 + 2);

    const other = await startTestServer(join(tmp.dir, 'other.sqlite'));
    try {
      const imported = await json(`${other.url}/api/library/import`, { method: 'POST', headers: { 'content-type': 'application/x-ndjson' }, body: text });
      expect(imported.status).toBe(200);
      expect(imported.body).toEqual({ entries_created: 2, entries_extended: 0, revisions_added: 3, revisions_already_present: 0, sheets_added: 1, takeoffs_added: 1 });
      for (const id of [a, b]) {
        for (const r of server.store.revisions(id)) expect(other.store.get(id, r.revision).body).toBe(server.store.get(id, r.revision).body);
      }
      expect(other.store.info(a).archived_at).toBe(server.store.info(a).archived_at);
      expect(other.store.info(b).name).toBe('Invented Mid r2');
      const twice = await json(`${other.url}/api/library/import`, { method: 'POST', headers: { 'content-type': 'application/x-ndjson' }, body: text });
      expect(twice.body).toMatchObject({ entries_created: 0, revisions_added: 0, revisions_already_present: 3, sheets_added: 0, takeoffs_added: 0 });
      expect(other.store.counts()).toMatchObject({ revisions: 3, sheets: 1 });
    } finally {
      await other.close();
    }
  });

  it('appends new revisions of an entry the library already holds, without overwriting any', async () => {
    const id = (await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small))).body.id;
    const text = await (await fetch(`${server.url}/api/library/export`)).text();
    const other = await startTestServer(join(tmp.dir, 'other.sqlite'));
    try {
      await json(`${other.url}/api/library/import`, { method: 'POST', headers: { 'content-type': 'application/x-ndjson' }, body: text });
      await postJson(`${other.url}/api/curvesets/${id}?as_new_revision=true`, inventedCurveSet({ ...FAMILIES.small, name: 'Invented Small, edited elsewhere' }), 'PUT', { 'if-match': '"1"' });
      await postJson(`${server.url}/api/curvesets/${id}?as_new_revision=true`, inventedCurveSet({ ...FAMILIES.small, name: 'Invented Small, edited here' }), 'PUT', { 'if-match': '"1"' });
      const back = await (await fetch(`${server.url}/api/library/export`)).text();
      const res = await json(`${other.url}/api/library/import`, { method: 'POST', headers: { 'content-type': 'application/x-ndjson' }, body: back });
      expect(res.body).toMatchObject({ entries_extended: 1, revisions_added: 1, revisions_already_present: 1 });
      const names = other.store.revisions(id).map((r) => JSON.parse(other.store.get(id, r.revision).body).pump.name);
      expect(names).toEqual([FAMILIES.small.name, 'Invented Small, edited elsewhere', 'Invented Small, edited here']);
    } finally {
      await other.close();
    }
  });
});

describe('the plain library page', () => {
  it('lists the entries and answers a duty search in US units, escaping every stored text', async () => {
    for (const f of Object.values(FAMILIES)) await postJson(`${server.url}/api/curvesets`, inventedCurveSet(f));
    const page = await fetch(`${server.url}/library?flow=${120 / 0.2271247}&head=${40 / 0.3048}&units=us`);
    const html = await page.text();
    expect(page.status).toBe(200);
    expect(html).toContain(FAMILIES.large.name);
    expect(html).toMatch(/1 of the \d+ pumps spanning the duty can meet it/);
    expect(html).toContain('Diameter (in)');
    expect(html).toContain('licensed professional');
    const bad = await fetch(`${server.url}/library?flow=abc&head=40&units=si`);
    expect(bad.status).toBe(400);
    expect(await bad.text()).toContain('The flow must be a decimal number');
  });
});
