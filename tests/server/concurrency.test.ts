import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { spawn } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import Database from 'better-sqlite3';
import { FAMILIES, inventedCurveSet } from '../library/fixtures.ts';
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

function revisionsAreComplete(id: string, count: number): void {
  const numbers = server.store.revisions(id).map((r) => r.revision);
  expect(numbers).toEqual(Array.from({ length: count }, (_, i) => i + 1));
}

describe('concurrent writers', () => {
  it('200 concurrent POST and PUT requests: every POST is kept, and of the PUTs naming one revision exactly one wins, the rest get 412 and store nothing', async () => {
    const base = inventedCurveSet(FAMILIES.mid);
    const targets: string[] = [];
    for (let i = 0; i < 10; i++) targets.push((await postJson(`${server.url}/api/curvesets`, base)).body.id);

    const requests: Array<Promise<{ status: number; body: any }>> = [];
    for (let i = 0; i < 100; i++) {
      const set = { ...base, pump: { ...base.pump, name: `Invented concurrent ${i}` } };
      requests.push(postJson(`${server.url}/api/curvesets`, set));
      const target = targets[i % targets.length] as string;
      const put = { ...set, pump: { ...set.pump, name: `Invented put ${i}` } };
      requests.push(postJson(`${server.url}/api/curvesets/${target}?as_new_revision=true`, put, 'PUT', { 'if-match': '"1"' }));
    }
    const replies = await Promise.all(requests);
    expect(replies.filter((r) => r.status !== 201 && r.status !== 200 && r.status !== 412)).toEqual([]);

    const created = replies.filter((r) => r.status === 201).map((r) => r.body.id as string);
    expect(new Set(created).size).toBe(100);
    for (const id of created) revisionsAreComplete(id, 1);
    // No lost update: one PUT per target wins revision 2; every other one was refused.
    const won = replies.filter((r) => r.status === 200);
    expect(won.map((r) => r.body.id).sort()).toEqual([...targets].sort());
    expect(replies.filter((r) => r.status === 412)).toHaveLength(90);
    for (const id of targets) revisionsAreComplete(id, 2);
    for (const r of won) {
      expect(r.body.revision).toBe(2);
      const stored = JSON.parse(server.store.get(r.body.id, r.body.revision).body);
      expect(stored.pump.name).toMatch(/^Invented put \d+$/);
    }
    expect(server.store.counts()).toMatchObject({ entries: 110, revisions: 120 });
  });

  it('a writer in another process and the server never lose a revision of the same entry', async () => {
    const set = inventedCurveSet(FAMILIES.small);
    const { id } = (await postJson(`${server.url}/api/curvesets`, set)).body;
    const script = join(tmp.dir, 'writer.ts');
    const storeModule = join(process.cwd(), 'src', 'library', 'store.ts');
    writeFileSync(
      script,
      `import { LibraryStore } from ${JSON.stringify(storeModule)};
const [file, id, n] = process.argv.slice(2);
const store = LibraryStore.open(file);
const set = JSON.parse(store.get(id).body);
process.stdout.write('ready\\n');
const write = (i) => store.addRevision(id, { ...set, pump: { ...set.pump, name: 'Invented other process ' + i } }, { asNewRevision: true });
const half = Math.floor(Number(n) / 2);
for (let i = 0; i < half; i++) write(i);
// Wait (at most 20 s) until the server has written one revision, so the two writers overlap
// on any machine rather than this process finishing before the server starts.
const pause = new Int32Array(new SharedArrayBuffer(4));
const serverWrote = () => store.revisions(id).some((r) => JSON.parse(store.get(id, r.revision).body).pump.name.startsWith('Invented server'));
for (let waited = 0; waited < 4000 && !serverWrote(); waited++) Atomics.wait(pause, 0, 0, 5);
for (let i = half; i < Number(n); i++) write(i);
store.close();
`,
    );
    const child = spawn(process.execPath, ['--import', 'tsx', script, file, id, '100'], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (c) => (stderr += c));
    const exited = new Promise<number>((resolve) => child.on('exit', (code) => resolve(code ?? -1)));
    await new Promise<void>((resolve) => {
      child.stdout.on('data', (c: Buffer) => c.toString().includes('ready') && resolve());
      child.on('exit', () => resolve());
    });
    // Each server write names the revision it read (If-Match); when the other process got in
    // between, the answer is 412 and nothing is stored, and the writer reads again and retries.
    const statuses: number[] = [];
    let refused = 0; // 412 answers, each followed by a fresh read
    for (let i = 0; i < 60; i++) {
      for (let attempt = 0; attempt < 50; attempt++) {
        const current = (await json(`${server.url}/api/curvesets/${id}`)).headers.get('etag') ?? '';
        const put = await postJson(`${server.url}/api/curvesets/${id}?as_new_revision=true`, { ...set, pump: { ...set.pump, name: `Invented server ${i}` } }, 'PUT', { 'if-match': current });
        if (put.status === 412) {
          refused++;
          continue;
        }
        statuses.push(put.status);
        break;
      }
    }
    expect(await exited, stderr).toBe(0);
    expect(statuses.length).toBe(60);
    expect(statuses.every((s) => s === 200)).toBe(true);
    revisionsAreComplete(id, 161);
    const names = server.store.revisions(id).map((r) => JSON.parse(server.store.get(id, r.revision).body).pump.name as string);
    expect(names.filter((n) => n.startsWith('Invented other process')).length).toBe(100);
    expect(names.filter((n) => n.startsWith('Invented server')).length).toBe(60);
    // The two writers really overlapped (the other process waits for the server's first revision
    // before writing its second half): their revisions interleave rather than forming two blocks.
    const switches = names.slice(2).filter((n, i) => n.slice(0, 12) !== names[i + 1]!.slice(0, 12)).length;
    expect(switches).toBeGreaterThan(1);
    expect((await json(`${server.url}/api/curvesets/${id}`)).status).toBe(200);
  });

  it('answers 503 and changes nothing while another process holds the write lock, then accepts the write', async () => {
    await server.close();
    server = await startTestServer(file, {}, { busyTimeoutMs: 200 });
    const other = new Database(file, { timeout: 0 });
    other.exec('BEGIN IMMEDIATE');
    try {
      const busy = await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small));
      expect(busy.status).toBe(503);
      expect(busy.body.error).toMatch(/busy with another writer/);
    } finally {
      other.exec('ROLLBACK');
      other.close();
    }
    expect(server.store.counts().entries).toBe(0);
    expect((await postJson(`${server.url}/api/curvesets`, inventedCurveSet(FAMILIES.small))).status).toBe(201);
  });
});
