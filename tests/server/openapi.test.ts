import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { Validator } from '@seriousme/openapi-schema-validator';
import { FAMILIES, inventedCurveSet } from '../library/fixtures.ts';
import { json, postJson, startTestServer, tempDir, type TestServer } from './helpers.ts';
import { routesOf } from '../../src/server/app.ts';
import { ROUTES } from '../../src/server/openapi.ts';
import * as S from '../../src/server/apiSchemas.ts';
import { ERROR_CODES } from '../../src/server/errors.ts';

let tmp: ReturnType<typeof tempDir>;
beforeEach(() => {
  tmp = tempDir();
});
afterEach(() => tmp.remove());

function fakeDist(): string {
  const dist = join(tmp.dir, 'dist');
  mkdirSync(join(dist, 'assets'), { recursive: true });
  writeFileSync(join(dist, 'index.html'), '<!doctype html><title>invented workbench</title>');
  writeFileSync(join(dist, 'assets', 'app-Ab12Cd34.js'), `console.log(${JSON.stringify('invented '.repeat(400))});`);
  return dist;
}

type Doc = { openapi: string; paths: Record<string, Record<string, { summary: string; responses: Record<string, unknown> }>>; info: { description: string } };

/** Method and path of every operation the document lists. */
function operations(doc: Doc): string[] {
  return Object.entries(doc.paths).flatMap(([path, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${path}`)).sort();
}

/** Every route Fastify's router holds, read from printRoutes: "segment (GET, HEAD, POST)" per node. */
function routerMethodCount(server: TestServer): number {
  const text = server.app.printRoutes({ commonPrefix: false });
  let n = 0;
  for (const m of text.matchAll(/\(([A-Z, ]+)\)/g)) n += (m[1] as string).split(',').map((x) => x.trim()).filter((x) => x !== 'HEAD' && x !== 'OPTIONS').length;
  return n;
}

async function checkServer(server: TestServer): Promise<Doc> {
  const res = await json(`${server.url}/openapi.json`);
  expect(res.status).toBe(200);
  const doc = res.body as Doc;
  const validator = new Validator();
  const verdict = await validator.validate(doc as unknown as Record<string, unknown>);
  expect(verdict.errors ?? []).toEqual([]);
  expect(verdict.valid).toBe(true);
  expect(validator.version).toBe('3.1');
  // The validator does refuse a broken document (an operation without responses, a bad parameter).
  const broken = structuredClone(doc) as unknown as { paths: Record<string, Record<string, Record<string, unknown>>> };
  delete broken.paths['/api/health']!.get!.responses;
  broken.paths['/api/search']!.get!.parameters = [{ name: 'flow', in: 'nowhere' }];
  expect((await new Validator().validate(broken as unknown as Record<string, unknown>)).valid).toBe(false);

  const registered = [...new Set(routesOf(server.app).filter((r) => r.method !== 'HEAD').map((r) => `${r.method} ${r.url.replace(/:(\w+)/g, '{$1}').replace(/\/\*$/, '/{file}')}`))].sort();
  expect(operations(doc)).toEqual(registered);
  expect(operations(doc).length).toBe(routerMethodCount(server));
  expect(operations(doc).length).toBeGreaterThanOrEqual(22);
  for (const r of routesOf(server.app)) {
    expect(server.app.hasRoute({ method: r.method as 'GET', url: r.url }), `${r.method} ${r.url}`).toBe(true);
    if (r.method !== 'HEAD') expect(ROUTES.some((d) => d.method === r.method && d.url === r.url), `${r.method} ${r.url} has a row in ROUTES`).toBe(true);
  }
  for (const ops of Object.values(doc.paths)) for (const op of Object.values(ops)) expect(op.summary).not.toBe('Undocumented route');
  return doc;
}

describe('/openapi.json', () => {
  it('validates as OpenAPI 3.1 and lists every registered route, with the workbench built', async () => {
    const server = await startTestServer(join(tmp.dir, 'a.sqlite'), { staticDir: fakeDist() });
    try {
      const doc = await checkServer(server);
      expect(Object.keys(doc.paths)).toContain('/{file}');
      expect(Object.keys(doc.paths)).toContain('/api/curvesets/{id}/revisions/{revision}');
      for (const code of Object.keys(ERROR_CODES)) expect(doc.info.description).toContain(`\`${code}\``);
      expect(doc.paths['/api/sheets']!.post!.responses['507']).toBeDefined();
    } finally {
      await server.close();
    }
  });

  it('validates and lists every route without the workbench (the library page is the home page)', async () => {
    const server = await startTestServer(join(tmp.dir, 'b.sqlite'));
    try {
      const doc = await checkServer(server);
      expect(Object.keys(doc.paths)).toContain('/');
      expect(Object.keys(doc.paths)).not.toContain('/{file}');
    } finally {
      await server.close();
    }
  });

  it('describes what the server really answers (live answers parse with the same zod schemas)', async () => {
    const server = await startTestServer(join(tmp.dir, 'c.sqlite'));
    try {
      S.Health.parse((await json(`${server.url}/api/health`)).body);
      const saved = await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.mid));
      S.SavedRevision.parse(saved.body);
      S.EntryList.parse((await json(`${server.url}/api/curvesets`)).body);
      S.EntryInfo.parse((await json(`${server.url}/api/curvesets/${saved.body.id}/summary`)).body);
      S.RevisionList.parse((await json(`${server.url}/api/curvesets/${saved.body.id}/revisions`)).body);
      S.DutySearch.parse((await json(`${server.url}/api/search?flow=120&head=40&units=si`)).body);
      const sheet = await json(`${server.url}/api/sheets?name=s.pdf`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: '%PDF-1.4 invented' });
      S.SheetStored.parse(sheet.body);
      S.SheetList.parse((await json(`${server.url}/api/sheets`)).body);
      for (const bad of [await json(`${server.url}/api/curvesets/0123456789abcdef`), await json(`${server.url}/api/search?flow=x&head=1&units=si`), await json(`${server.url}/nowhere`)]) {
        S.ErrorBody.parse(bad.body);
      }
    } finally {
      await server.close();
    }
  });
});
