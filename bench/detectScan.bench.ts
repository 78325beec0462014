/**
 * Detection of a whole 300-dpi scan (an INVENTED sheet of the independent random bed): decoded
 * image to calibrated panels, tick labels and titles read by tesseract.js, then the curves of
 * those panels (lines, guides, the tracer, the curve labels read). It prints the reader's start
 * (once per process), then for three runs the time of each step as the progress callback
 * reports it, the curves' time, and the whole, against the issue's 3 s.
 * Then the whole detection, panels and curves, in a Node worker thread
 * (scripts/detectSheets/detectWorker.ts), the progress printed as the worker posts it. The workbench runs the same detector in its sheet worker with
 * the browser's reader (src/digitize/loaders/ocrBrowser.ts); tests/e2e/detectScan.test.ts times it there.
 *
 *   npm run bench -- detectScan
 *   DETECT_BENCH_RUNS=6 npm run bench -- detectScan    (more runs each way; the figures give best and median)
 */
import { cpus, loadavg } from 'node:os';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import type { FromWorker } from '../scripts/detectSheets/detectWorker.ts';
import { findRasterCurves } from '../src/digitize/detect/rasterCurves.ts';
import { findRasterPanels } from '../src/digitize/detect/rasterPanels.ts';
import { closeTextReaderNode, textReaderNode } from '../src/digitize/loaders/ocrNode.ts';
import { decode } from '../scripts/randomSheets/camera.ts';
import { sheetGeometry } from '../scripts/randomSheets/randomSheet.ts';
import { scanFor } from '../scripts/detectSheets/scanBed.ts';

/** Runs on the main thread and in the worker (the first of each includes warming up). */
const RUNS = Math.max(1, Number(process.env.DETECT_BENCH_RUNS ?? 3));

function median(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s.length % 2 ? (s[s.length >> 1] as number) : ((s[s.length / 2 - 1] as number) + (s[s.length / 2] as number)) / 2;
}

export default async function main(): Promise<void> {
  // The first 300-dpi sheet of the bed with four panels: the issue's whole sheet, on which the
  // detector finds curves on every panel (seed 16, the first 300-dpi sheet, gets none named, so
  // its curve step timed little).
  let seed = 1;
  for (let g = sheetGeometry(seed, 'scan'); g.plan.dpi !== 300 || g.plan.panels.length < 4; g = sheetGeometry(++seed, 'scan'));
  const { plan } = sheetGeometry(seed, 'scan');
  const { jpeg } = await scanFor(seed);
  const d = await decode(Buffer.from(jpeg));
  const image = { width: d.width, height: d.height, data: d.data, scale: 1 };
  process.stdout.write(`sheet: random bed seed ${seed}, 300 dpi, ${d.width} × ${d.height} px (${((d.width * d.height) / 1e6).toFixed(1)} Mpx), ${plan.panels.length} panels\n`);
  const reader = textReaderNode();
  const s0 = performance.now();
  await reader.read({ width: 8, height: 8, grey: new Uint8Array(64).fill(255) }, 'digits');
  process.stdout.write(`reader start (WebAssembly and English data from node_modules): ${(performance.now() - s0).toFixed(0)} ms, once per process\n`);
  const totals: number[] = [];
  const wholes: number[] = [];
  for (let run = 1; run <= RUNS; run++) {
    const t0 = performance.now();
    let last = t0;
    const steps: string[] = [];
    let lastWhat = 'start';
    const found = await findRasterPanels(image, reader, (fraction, what) => {
      const now = performance.now();
      steps.push(`${lastWhat} ${(now - last).toFixed(0)} ms`);
      last = now;
      lastWhat = `${Math.round(fraction * 100)} % ${what}`;
    });
    const total = performance.now() - t0;
    totals.push(total);
    process.stdout.write(`run ${run}: ${total.toFixed(0)} ms, ${found.panels.length} panels, ${found.questions.length} questions — ${steps.slice(1).join('; ')}\n`);
    // Then the curves of those panels (lines, guides, the tracer, the labels read): the whole detection.
    const c0 = performance.now();
    const curves = await findRasterCurves(image, found, reader);
    const whole = performance.now() - t0;
    wholes.push(whole);
    process.stdout.write(`       curves: ${(performance.now() - c0).toFixed(0)} ms, ${curves.curves.length} named; panels and curves ${whole.toFixed(0)} ms\n`);
  }
  await closeTextReaderNode();

  // Node 20 passes no TypeScript loader on to a worker, so the worker is bundled first (esbuild, as the CLI is).
  const { build } = await import('esbuild');
  const outfile = join(import.meta.dirname, '.cache', 'detectWorker.mjs');
  await build({ entryPoints: [join(import.meta.dirname, '..', 'scripts', 'detectSheets', 'detectWorker.ts')], bundle: true, platform: 'node', format: 'esm', outfile, external: ['tesseract.js', '@tesseract.js-data/*'], logLevel: 'error' });
  const worker = new Worker(outfile);
  const w0 = performance.now();
  const queue: FromWorker[] = [];
  let waiting: ((m: FromWorker) => void) | null = null;
  let broken: Error | null = null;
  worker.on('message', (m: FromWorker) => (waiting ? (waiting(m), (waiting = null)) : queue.push(m)));
  worker.on('error', (e) => {
    broken = e;
    waiting?.({ kind: 'failed', message: e.message });
  });
  const next = () => (queue.length > 0 ? Promise.resolve(queue.shift() as FromWorker) : broken ? Promise.resolve<FromWorker>({ kind: 'failed', message: (broken as Error).message }) : new Promise<FromWorker>((resolve) => (waiting = resolve)));
  await next();
  process.stdout.write(`worker with its reader started: ${(performance.now() - w0).toFixed(0)} ms\n`);
  const inWorker: number[] = [];
  for (let run = 1; run <= RUNS; run++) {
    const t0 = performance.now();
    worker.postMessage({ kind: 'detect', width: image.width, height: image.height, data: image.data });
    const shown: string[] = [];
    for (;;) {
      const m = await next();
      if (m.kind === 'progress') shown.push(`${Math.round(m.fraction * 100)} % at ${(performance.now() - t0).toFixed(0)} ms`);
      else {
        inWorker.push(performance.now() - t0);
        process.stdout.write(`worker run ${run}: ${inWorker.at(-1)!.toFixed(0)} ms, ${m.kind === 'found' ? `${m.panels.length} panels, ${m.curves} curves named, ${m.questions.length} questions` : `failed: ${m.kind === 'failed' ? m.message : m.kind}`}; progress shown: ${shown.join(', ')}\n`);
        break;
      }
    }
  }
  worker.postMessage({ kind: 'close' });
  await new Promise((resolve) => worker.once('exit', resolve));
  process.stdout.write(`whole 300-dpi sheet, panels and curves, in a worker thread: best ${Math.min(...inWorker).toFixed(0)} ms, median ${median(inWorker).toFixed(0)} ms, worst ${Math.max(...inWorker).toFixed(0)} ms — ${Math.min(...inWorker) < 3000 ? 'under' : 'OVER'} the 3 s of the issue (reader start not counted)\n`);
  // Other work on the machine stretches every figure above; the load says by about how much.
  process.stdout.write(`machine load average ${loadavg()[0]!.toFixed(1)} on ${cpus().length} cores\n`);
  const best = Math.min(...totals);
  process.stdout.write(`whole 300-dpi sheet, panels only: best ${best.toFixed(0)} ms, median ${median(totals).toFixed(0)} ms, worst ${Math.max(...totals).toFixed(0)} ms (reader start not counted; main thread)\n`);
  const bestWhole = Math.min(...wholes);
  process.stdout.write(`whole 300-dpi sheet, panels and curves: best ${bestWhole.toFixed(0)} ms, median ${median(wholes).toFixed(0)} ms, worst ${Math.max(...wholes).toFixed(0)} ms — ${bestWhole < 3000 ? 'under' : 'OVER'} the 3 s of the issue (reader start not counted; main thread)\n`);
}

if (process.argv[1] && import.meta.url.endsWith(process.argv[1].split('/').pop() as string)) await main();
