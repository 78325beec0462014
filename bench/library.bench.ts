/**
 * Office pump library at scale, on invented curve sets (not real products), side by side in one run:
 * 1. import — one JSON Lines file of N entries into a new library, by the real command line
 *    (`pumpscribe library import`) in its own process: wall time, peak RSS (target ≤ 1 GiB at 100,000)
 *    and peak size of the log (-wal);
 * 2. duty search at N/10 and N sets, in-process, 200 duty points (three quarters where some invented
 *    family meets them, one quarter anywhere): p50 / p95 per query
 *    - cold: each query on a freshly opened store (no parsed set in memory; the OS file cache may be warm;
 *      the search code compiled by 30 searches of other duties on a store closed before timing),
 *    - warm: all queries on one store after a first pass;
 *    targets: p95 ≤ 20 ms at 10,000, p95 ≤ 50 ms cold at 100,000;
 * 3. the growth exponent from N/10 to N: log(t_N / t_N/10) / log(10) (target ≤ 0.5; 1 would be linear).
 *
 * N defaults to 100,000; set PUMPSCRIBE_BENCH_LIBRARY_N (e.g. 2000) for a quick run. The import line
 * also gives the peak size of the library's log (-wal): with a transaction per batch it stays near
 * one batch's pages, not the whole import's.
 * The generated JSON Lines files and the imported libraries are kept in bench/.cache/library/
 * (gitignored); the files are made again when missing, so a fresh machine builds them itself, or read
 * from PUMPSCRIBE_BENCH_LIBRARY_FILES (a folder of an earlier run's files, only read). The
 * import is run and timed every time, unless PUMPSCRIBE_BENCH_LIBRARY_REUSE=1 asks to search the
 * libraries of an earlier run (the run then says that it did not measure the import).
 */
import { createWriteStream, existsSync, mkdirSync, renameSync, rmSync, statSync } from 'node:fs';
import { spawn } from 'node:child_process';
import { once } from 'node:events';
import { cpus, loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { inventedCurveSet, type InventedFamily } from '../tests/library/fixtures.ts';
import { LibraryStore } from '../src/library/store.ts';
import { EXPORT_FORMAT, EXPORT_VERSION } from '../src/library/transfer.ts';
import { IMPORT_BATCH_ENTRIES } from '../src/library/importJournal.ts';
import { searchByDuty, type Duty } from '../src/library/dutySearch.ts';
import { libraryMatcher } from '../src/library/matcher.ts';
import { seededRandom } from '../src/demo/random.ts';

const N = Math.max(100, Math.trunc(Number(process.env.PUMPSCRIBE_BENCH_LIBRARY_N ?? 100_000)));
const SMALL = Math.max(10, Math.round(N / 10));
const QUERIES = 200;
/** Searches run before timing, for the JavaScript engine to compile the search code. */
const WARMUP = 30;
const SPEEDS = [1450, 1780, 2900, 3550];
/** Bump when the invented families or the file layout change, so that stale cached files are not used. */
const GENERATION = 1;
const CACHE = join(dirname(fileURLToPath(import.meta.url)), '.cache', 'library');

function percentile(sorted: number[], p: number): number {
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i] as number;
}

interface Stats {
  p50: number;
  p95: number;
  max: number;
}

function stats(ms: number[]): Stats {
  const s = [...ms].sort((a, b) => a - b);
  return { p50: percentile(s, 50), p95: percentile(s, 95), max: s[s.length - 1] as number };
}

const f1 = (x: number) => x.toFixed(1);

/** An invented family with log-uniform size; the diameter follows a head coefficient of about 0.5 (invented). */
function randomFamily(random: () => number, i: number): InventedFamily {
  const bepFlowM3h = 10 * 100 ** random();
  const shutoff = 15 * 10 ** random();
  const speed = SPEEDS[Math.floor(random() * SPEEDS.length)] as number;
  const tipSpeed = Math.sqrt(2 * 9.80665 * shutoff);
  const ratios = random() < 0.5 ? [1, 0.92, 0.84] : [1, 0.94, 0.88, 0.82];
  return {
    name: `Invented bench pump ${String(i).padStart(6, '0')}`,
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

/** Writes the N-entry file, and the first N/10 entries to the small file, in one pass. */
async function writeExports(families: InventedFamily[], large: string, small: string): Promise<void> {
  const outs = [createWriteStream(`${large}.tmp`), createWriteStream(`${small}.tmp`)];
  const header = `${JSON.stringify({ kind: 'header', format: EXPORT_FORMAT, version: EXPORT_VERSION })}\n`;
  for (const o of outs) o.write(header);
  for (let i = 0; i < families.length; i++) {
    const id = (0x1000000000000000n + BigInt(i)).toString(16);
    const line = `${JSON.stringify({ kind: 'entry', id, created_at: '2025-01-01T00:00:00.000Z', archived_at: null, revisions: [{ revision: 1, saved_at: '2025-01-01T00:00:00.000Z', curveset: inventedCurveSet(families[i] as InventedFamily) }] })}\n`;
    const targets = i < SMALL ? outs : [outs[0]!];
    for (const o of targets) if (!o.write(line)) await once(o, 'drain');
  }
  for (const o of outs) o.end();
  await Promise.all(outs.map((o) => once(o, 'finish')));
  renameSync(`${small}.tmp`, small);
  renameSync(`${large}.tmp`, large);
}

/**
 * `pumpscribe library import` in its own process, timed, with its peak RSS from /usr/bin/time and
 * the peak size of the library's log (-wal), sampled every 50 ms while it runs.
 */
async function importByCommand(file: string, library: string): Promise<{ seconds: number; cpuSeconds: number | null; peakMiB: number | null; walPeakMiB: number; out: string }> {
  for (const f of [library, `${library}-wal`, `${library}-shm`]) rmSync(f, { force: true });
  const args = ['--import', 'tsx', 'src/cli/main.ts', 'library', 'import', file, '--library', library];
  const timed = existsSync('/usr/bin/time');
  const start = performance.now();
  const child = timed ? spawn('/usr/bin/time', ['-f', 'PEAK_RSS_KB=%M CPU_S=%U+%S', process.execPath, ...args]) : spawn(process.execPath, args);
  let stdout = '';
  let stderr = '';
  child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
  child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
  let walPeak = 0;
  const wal = `${library}-wal`;
  const sample = () => {
    try {
      walPeak = Math.max(walPeak, statSync(wal).size);
    } catch {
      /* not there yet */
    }
  };
  const timer = setInterval(sample, 50);
  const [status] = (await once(child, 'close')) as [number | null];
  clearInterval(timer);
  sample();
  const seconds = (performance.now() - start) / 1000;
  if (status !== 0) throw new Error(`import failed (${status}): ${stderr}`);
  const kb = /PEAK_RSS_KB=(\d+)/.exec(stderr);
  const cpu = /CPU_S=([\d.]+)\+([\d.]+)/.exec(stderr);
  return { seconds, cpuSeconds: cpu ? Number(cpu[1]) + Number(cpu[2]) : null, peakMiB: kb ? Number(kb[1]) / 1024 : null, walPeakMiB: walPeak / 2 ** 20, out: stdout.trim() };
}

function dutiesFor(families: InventedFamily[], random: () => number): Duty[] {
  const duties: Duty[] = [];
  for (let k = 0; k < QUERIES; k++) {
    if (k % 4 === 3) {
      duties.push({ flow_m3s: (10 * 150 ** random()) / 3600, head_m: 10 * 15 ** random() });
      continue;
    }
    const f = families[Math.floor(random() * families.length)] as InventedFamily;
    const r = 0.86 + 0.13 * random();
    const q = (0.75 + 0.4 * random()) * r * f.bepFlowM3s;
    const a = (f.shutoffHeadM * (1 - (f.bepHeadRatio ?? 0.8))) / f.bepFlowM3s ** 2;
    duties.push({ flow_m3s: q, head_m: r * r * f.shutoffHeadM - a * q * q });
  }
  return duties;
}

interface SearchFigures {
  cold: Stats;
  /** CPU time of the same cold queries (this process, user + system): what the query costs whatever else runs on the machine. */
  coldCpu: Stats;
  warm: Stats;
  openMs: Stats;
  examined: number;
  evaluated: number;
  found: number;
}

function searchFigures(library: string, duties: Duty[]): SearchFigures {
  const cold: number[] = [];
  const coldCpu: number[] = [];
  const open: number[] = [];
  let examined = 0;
  let evaluated = 0;
  let found = 0;
  for (const d of duties) {
    let t = performance.now();
    const store = LibraryStore.open(library);
    open.push(performance.now() - t);
    t = performance.now();
    const c0 = process.cpuUsage();
    const r = searchByDuty(store, d, libraryMatcher);
    cold.push(performance.now() - t);
    const c1 = process.cpuUsage(c0);
    coldCpu.push((c1.user + c1.system) / 1000);
    store.close();
    examined += r.examined;
    evaluated += r.evaluated;
    if (r.candidates.length) found += 1;
  }
  const store = LibraryStore.open(library);
  for (const d of duties) searchByDuty(store, d, libraryMatcher);
  const warm: number[] = [];
  for (const d of duties) {
    const t = performance.now();
    searchByDuty(store, d, libraryMatcher);
    warm.push(performance.now() - t);
  }
  store.close();
  return { cold: stats(cold), coldCpu: stats(coldCpu), warm: stats(warm), openMs: stats(open), examined: examined / duties.length, evaluated: evaluated / duties.length, found };
}

/** The machine's state, printed beside the figures: on a shared machine they scale with its load. */
function machineLine(when: string): string {
  const [one, five] = loadavg();
  return `machine ${when}: ${cpus().length} CPUs, load average ${one!.toFixed(1)} (1 min), ${five!.toFixed(1)} (5 min)\n`;
}

export default async function (): Promise<void> {
  process.stdout.write(machineLine('at the start'));
  {
    const random = seededRandom(20250101);
    const families = Array.from({ length: N }, (_, i) => randomFamily(random, i));
    const t = performance.now();
    mkdirSync(CACHE, { recursive: true });
    // PUMPSCRIBE_BENCH_LIBRARY_FILES names a folder holding the JSON Lines files of an earlier run
    // (read only; the libraries are still written to this checkout's cache).
    const filesDir = process.env.PUMPSCRIBE_BENCH_LIBRARY_FILES || CACHE;
    const largeFile = join(filesDir, `entries-${N}-g${GENERATION}.jsonl`);
    const smallFile = join(filesDir, `entries-${N}-first-${SMALL}-g${GENERATION}.jsonl`);
    const cached = existsSync(largeFile) && existsSync(smallFile);
    if (!cached) {
      if (filesDir !== CACHE) throw new Error(`PUMPSCRIBE_BENCH_LIBRARY_FILES: ${filesDir} holds no entries-${N}-g${GENERATION}.jsonl and entries-${N}-first-${SMALL}-g${GENERATION}.jsonl`);
      await writeExports(families, largeFile, smallFile);
    }
    process.stdout.write(
      `${cached ? 'cached' : 'generated'} ${N} and ${SMALL} invented curve sets (${(statSync(largeFile).size / 2 ** 20).toFixed(0)} MiB and ${(statSync(smallFile).size / 2 ** 20).toFixed(0)} MiB of JSON Lines)` +
        `${cached ? ` in ${filesDir}` : ` in ${f1((performance.now() - t) / 1000)} s`}\n`,
    );

    const smallLib = join(CACHE, `library-${SMALL}-g${GENERATION}.sqlite`);
    const largeLib = join(CACHE, `library-${N}-g${GENERATION}.sqlite`);
    const rss = (x: number | null) => (x === null ? 'n/a' : `${x.toFixed(0)} MiB`);
    if (process.env.PUMPSCRIBE_BENCH_LIBRARY_REUSE === '1' && existsSync(smallLib) && existsSync(largeLib)) {
      // For working on the search only: the import is NOT measured in this run.
      process.stdout.write(`import NOT run (PUMPSCRIBE_BENCH_LIBRARY_REUSE=1): searching the libraries imported by an earlier run in ${CACHE}\n`);
    } else {
      const importSmall = await importByCommand(smallFile, smallLib);
      const importLarge = await importByCommand(largeFile, largeLib);
      process.stdout.write(`import by "pumpscribe library import" (own process, every set checked, a transaction per ${IMPORT_BATCH_ENTRIES} entries, undone as a whole on failure):\n`);
      for (const [n, r] of [[SMALL, importSmall], [N, importLarge]] as const) {
        process.stdout.write(
          `  ${String(n).padStart(7)} entries: ${f1(r.seconds)} s wall including start-up (${Math.round(n / r.seconds)} entries/s; ` +
            `${r.cpuSeconds === null ? 'CPU time n/a' : `${f1(r.cpuSeconds)} s of CPU, ${Math.round(n / r.cpuSeconds)} entries per CPU-second`}), peak RSS ${rss(r.peakMiB)}, ` +
            `log (-wal) peak ${r.walPeakMiB.toFixed(0)} MiB against a library file of ${(statSync(n === N ? largeLib : smallLib).size / 2 ** 20).toFixed(0)} MiB` +
            `${n === N ? ` (target ≤ 1024 MiB: ${r.peakMiB !== null && r.peakMiB <= 1024 ? 'met' : 'NOT met'})` : ''}\n`,
        );
      }
    }

    const duties = dutiesFor(families.slice(0, SMALL), random);
    // The code is compiled by the first searches of a process; a running server has long done so.
    // Warm it on duties of their own, on a store that is closed again: no set stays parsed.
    const warmup = dutiesFor(families.slice(0, SMALL), seededRandom(7)).slice(0, WARMUP);
    const warmStore = LibraryStore.open(smallLib);
    for (const d of warmup) searchByDuty(warmStore, d, libraryMatcher);
    warmStore.close();
    process.stdout.write(`(before timing: ${WARMUP} searches of other duties on a store closed again, so that the code is compiled; no cache survives them)\n`);
    const small = searchFigures(smallLib, duties);
    const large = searchFigures(largeLib, duties);
    const exponent = (a: number, b: number) => Math.log(b / a) / Math.log(N / SMALL);
    const row = (label: string, s: Stats) => `${label.padEnd(6)} p50 ${f1(s.p50).padStart(6)} ms  p95 ${f1(s.p95).padStart(6)} ms  max ${f1(s.max).padStart(6)} ms`;
    process.stdout.write(`duty search, ${QUERIES} queries, in-process (the same duties at both sizes, all placed among the first ${SMALL} families):\n`);
    for (const [n, s] of [[SMALL, small], [N, large]] as const) {
      process.stdout.write(`  ${String(n).padStart(7)} sets  ${row('cold', s.cold)}   (opening the store: p50 ${f1(s.openMs.p50)} ms)\n`);
      process.stdout.write(`  ${' '.repeat(12)}  ${row('cold', s.coldCpu)}   (CPU time of the same queries)\n`);
      process.stdout.write(`  ${' '.repeat(12)}  ${row('warm', s.warm)}\n`);
      process.stdout.write(`  ${' '.repeat(12)}  per query: ${s.examined.toFixed(0)} sets' index boxes hold the duty, ${s.evaluated.toFixed(1)} evaluated by the duty engine for the best 10; ${s.found} of ${QUERIES} found a pump\n`);
    }
    const verdict = (ok: boolean) => (ok ? 'met' : 'NOT met');
    process.stdout.write(
      `growth exponent ${SMALL} → ${N}: cold p95 ${exponent(small.cold.p95, large.cold.p95).toFixed(2)}, cold p50 ${exponent(small.cold.p50, large.cold.p50).toFixed(2)}, ` +
        `warm p95 ${exponent(small.warm.p95, large.warm.p95).toFixed(2)}, warm p50 ${exponent(small.warm.p50, large.warm.p50).toFixed(2)} (target ≤ 0.5: ${verdict(exponent(small.cold.p95, large.cold.p95) <= 0.5)})\n`,
    );
    process.stdout.write(
      `targets: p95 at ${SMALL} ≤ 20 ms: ${verdict(Math.max(small.cold.p95, small.warm.p95) <= 20)} (cold ${f1(small.cold.p95)}, warm ${f1(small.warm.p95)}); ` +
        `cold p95 at ${N} ≤ 50 ms: ${verdict(large.cold.p95 <= 50)} (${f1(large.cold.p95)})${N === 100_000 ? '' : ` — N is ${N}, not the 100,000 of the targets`}\n`,
    );
  }
  process.stdout.write(machineLine('at the end'));
}
