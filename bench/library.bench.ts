/**
 * Office pump library figures on 10,000 invented curve sets (not real products):
 * 1. bulk import — one JSON Lines file of 10,000 entries into a new library file, through the same
 *    code as `pumpscribe library import` (target: under 30 s);
 * 2. duty search — GET /api/search against a real server on 127.0.0.1 over that library, for 200
 *    duty points (three quarters placed where some invented family meets them, one quarter anywhere),
 *    latency per request at the 50th and 95th percentile and the worst (target: p95 under 100 ms),
 *    first with an empty search cache, then after warming it as the server does when it starts;
 *    the same searches in-process, to show what HTTP adds;
 * 3. export — the whole library back out as JSON Lines.
 */
import { createReadStream, createWriteStream, mkdtempSync, rmSync, statSync } from 'node:fs';
import { once } from 'node:events';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { inventedCurveSet, type InventedFamily } from '../tests/library/fixtures.ts';
import { LibraryStore } from '../src/library/store.ts';
import { importLines, exportLines, EXPORT_FORMAT, EXPORT_VERSION } from '../src/library/transfer.ts';
import { linesOf } from '../src/library/lines.ts';
import { searchByDuty } from '../src/library/dutySearch.ts';
import { libraryMatcher } from '../src/library/matcher.ts';
import { buildApp } from '../src/server/app.ts';
import { seededRandom } from '../src/demo/random.ts';

const ENTRIES = 10_000;
const QUERIES = 200;
const SPEEDS = [1450, 1780, 2900, 3550];

function percentile(sorted: number[], p: number): number {
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i] as number;
}

function stats(ms: number[]): string {
  const s = [...ms].sort((a, b) => a - b);
  return `p50 ${percentile(s, 50).toFixed(1)} ms, p95 ${percentile(s, 95).toFixed(1)} ms, max ${(s[s.length - 1] as number).toFixed(1)} ms`;
}

/** An invented family with log-uniform size; the diameter follows a head coefficient of about 0.5 (invented). */
function randomFamily(random: () => number, i: number): InventedFamily {
  const bepFlowM3h = 10 * 100 ** random();
  const shutoff = 15 * 10 ** random();
  const speed = SPEEDS[Math.floor(random() * SPEEDS.length)] as number;
  const tipSpeed = Math.sqrt(2 * 9.80665 * shutoff);
  const ratios = random() < 0.5 ? [1, 0.92, 0.84] : [1, 0.94, 0.88, 0.82];
  return {
    name: `Invented bench pump ${String(i).padStart(5, '0')}`,
    maker: `Invented maker ${i % 37}`,
    model: `IB-${i}`,
    speedRpm: speed,
    fullDiameterM: (60 * tipSpeed) / (Math.PI * speed),
    ratios,
    shutoffHeadM: shutoff,
    bepFlowM3s: bepFlowM3h / 3600,
    bepHeadRatio: 0.75 + 0.1 * random(),
    peakEfficiency: 0.6 + 0.28 * random(),
  };
}

export default async function (): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-bench-library-'));
  try {
    const random = seededRandom(20250101);
    const families = Array.from({ length: ENTRIES }, (_, i) => randomFamily(random, i));

    // 1. Bulk import.
    let t = performance.now();
    const jsonl = join(dir, 'library.jsonl');
    const out = createWriteStream(jsonl);
    out.write(`${JSON.stringify({ kind: 'header', format: EXPORT_FORMAT, version: EXPORT_VERSION })}\n`);
    for (let i = 0; i < ENTRIES; i++) {
      const id = (0x1000000000000000n + BigInt(i)).toString(16);
      const line = JSON.stringify({ kind: 'entry', id, created_at: '2025-01-01T00:00:00.000Z', archived_at: null, revisions: [{ revision: 1, saved_at: '2025-01-01T00:00:00.000Z', curveset: inventedCurveSet(families[i] as InventedFamily) }] });
      if (!out.write(`${line}\n`)) await once(out, 'drain');
    }
    out.end();
    await once(out, 'finish');
    const generated = performance.now() - t;
    const bytes = statSync(jsonl).size;
    process.stdout.write(`generated ${ENTRIES} invented curve sets (${(bytes / 2 ** 20).toFixed(1)} MiB of JSON Lines) in ${(generated / 1000).toFixed(1)} s\n`);

    const file = join(dir, 'library.sqlite');
    let store = LibraryStore.open(file);
    t = performance.now();
    const report = await importLines(store, linesOf(createReadStream(jsonl)));
    const importMs = performance.now() - t;
    store.close();
    process.stdout.write(
      `bulk import: ${report.entries_created} entries in ${(importMs / 1000).toFixed(2)} s ` +
        `(${Math.round(report.entries_created / (importMs / 1000))} entries/s; target under 30 s: ${importMs < 30_000 ? 'met' : 'NOT met'})\n`,
    );

    // 2. Duty search through a real server, opened afresh (empty cache) as after a restart.
    store = LibraryStore.open(file);
    const app = await buildApp({ store, matcher: libraryMatcher, staticDir: null, loopbackOnly: true });
    const base = await app.listen({ port: 0, host: '127.0.0.1' });
    const duties: Array<{ flowM3h: number; headM: number }> = [];
    for (let k = 0; k < QUERIES; k++) {
      if (k % 4 === 3) {
        duties.push({ flowM3h: 10 * 150 ** random(), headM: 10 * 15 ** random() });
        continue;
      }
      const f = families[Math.floor(random() * ENTRIES)] as InventedFamily;
      const r = 0.86 + 0.13 * random();
      const q = (0.75 + 0.4 * random()) * r * f.bepFlowM3s;
      const a = (f.shutoffHeadM * (1 - (f.bepHeadRatio ?? 0.8))) / f.bepFlowM3s ** 2;
      duties.push({ flowM3h: q * 3600, headM: r * r * f.shutoffHeadM - a * q * q });
    }
    const httpMs: number[] = [];
    let examined = 0;
    let reachable = 0;
    let evaluated = 0;
    let withCandidates = 0;
    for (const d of duties) {
      const start = performance.now();
      const res = await fetch(`${base}/api/search?flow=${d.flowM3h}&head=${d.headM}&units=si`);
      const body = (await res.json()) as { examined: number; reachable: number; evaluated: number; candidates: unknown[] };
      httpMs.push(performance.now() - start);
      if (res.status !== 200) throw new Error(`search answered ${res.status}`);
      examined += body.examined;
      reachable += body.reachable;
      evaluated += body.evaluated;
      if (body.candidates.length) withCandidates += 1;
    }
    process.stdout.write(`duty search over ${ENTRIES} curve sets, ${QUERIES} queries via HTTP, cold (search cache empty, no warming): ${stats(httpMs)}\n`);
    process.stdout.write(
      `  per query on average: ${(examined / QUERIES).toFixed(0)} sets inside the SQL envelope, ${(reachable / QUERIES).toFixed(0)} bracket the duty with their diameters, ` +
        `${(evaluated / QUERIES).toFixed(1)} evaluated by the duty engine to rank the best 10 (the default); ` +
        `${withCandidates} of ${QUERIES} queries found a pump\n`,
    );
    // Restart: a fresh store whose search cache is warmed, as `serve` does after it starts.
    await app.close();
    store.close();
    global.gc?.();
    const heapBefore = process.memoryUsage().heapUsed;
    store = LibraryStore.open(file);
    t = performance.now();
    const warmed = await store.warmSearchCache();
    process.stdout.write(
      `  after a restart, warming the search cache (as the server does in the background): ${warmed} entries in ${((performance.now() - t) / 1000).toFixed(2)} s, ` +
        `heap about ${((process.memoryUsage().heapUsed - heapBefore) / 2 ** 20).toFixed(0)} MiB more\n`,
    );
    const warmApp = await buildApp({ store, matcher: libraryMatcher, staticDir: null, loopbackOnly: true });
    const warmBase = await warmApp.listen({ port: 0, host: '127.0.0.1' });
    const warmMs: number[] = [];
    for (const d of duties) {
      const start = performance.now();
      await (await fetch(`${warmBase}/api/search?flow=${d.flowM3h}&head=${d.headM}&units=si`)).json();
      warmMs.push(performance.now() - start);
    }
    process.stdout.write(`  warm (every search copy cached): ${stats(warmMs)}\n`);
    const p95 = percentile([...warmMs].sort((x, y) => x - y), 95);
    process.stdout.write(`  target p95 under 100 ms (warm server): ${p95 < 100 ? 'met' : 'NOT met'}\n`);

    const inProcess: number[] = [];
    for (const d of duties) {
      const start = performance.now();
      searchByDuty(store, { flow_m3s: d.flowM3h / 3600, head_m: d.headM }, libraryMatcher);
      inProcess.push(performance.now() - start);
    }
    process.stdout.write(`  the same searches in-process (no HTTP): ${stats(inProcess)}\n`);
    await warmApp.close();

    // 3. Export.
    t = performance.now();
    let lines = 0;
    let exportedBytes = 0;
    for (const line of exportLines(store)) {
      lines += 1;
      exportedBytes += line.length + 1;
    }
    const exportMs = performance.now() - t;
    process.stdout.write(`export: ${lines} lines, ${(exportedBytes / 2 ** 20).toFixed(1)} MiB in ${(exportMs / 1000).toFixed(2)} s\n`);
    store.close();
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
