/**
 * Take-off of the INVENTED sample sheets (samples/sheets) and of two four-diameter 300-dpi
 * scans generated on the spot, against their exact truth. For each sheet:
 * - the worst error of the fitted curves over 15–95 % of each curve's flow range, by quantity:
 *   head, power and NPSHr in % of their axis span, efficiency in points (from its own panel's
 *   curves or from iso-lines crossing the head curves);
 * - the time of each stage: load (parse or decode), calibrate, capture, fit and checks, and the
 *   whole replay end to end (`replayTakeoff` after loading, as `pumpscribe takeoff` runs it);
 * - for scans: all raster trace time against one bare pass over the page's pixels (each pixel's
 *   RGBA read once), decoding excluded.
 * Timings are medians of warm runs (three for the stages, seven for the trace ratio); the
 * machines are shared, so expect some spread.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { calibrate } from '../src/digitize/calibration.ts';
import { captureTrace, type CaptureSource } from '../src/digitize/capture.ts';
import { loadSheetFileNode } from '../src/digitize/loaders/sheetNode.ts';
import { sheetPoint } from '../src/digitize/points.ts';
import type { RasterImage } from '../src/digitize/raster.ts';
import { traceRaster } from '../src/digitize/rasterTrace.ts';
import { safeScale, type Sheet } from '../src/digitize/sheet.ts';
import { replayTakeoff } from '../src/digitize/takeoff.ts';
import { strokeLines } from '../src/digitize/vectorCapture.ts';
import { parseTakeoff, type Takeoff } from '../src/model/takeoff.ts';
import { writeSheet } from '../scripts/sheets/makeSheet.ts';
import { scoreCurveSet } from '../scripts/sheets/score.ts';
import type { Truth } from '../scripts/sheets/truth.ts';
import { SAMPLE_VARIANTS } from '../scripts/sheets/variants.ts';

const SAMPLES = join(import.meta.dirname, '..', 'samples', 'sheets');

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)] as number;
}

async function timed<T>(f: () => Promise<T> | T): Promise<[T, number]> {
  const t0 = performance.now();
  const value = await f();
  return [value, performance.now() - t0];
}

/** One bare pass over the page: every pixel's RGBA read once. */
function barePass(image: RasterImage): number {
  const d = image.data;
  let sum = 0;
  for (let i = 0; i < d.length; i += 4) sum += (d[i] as number) + (d[i + 1] as number) + (d[i + 2] as number) + (d[i + 3] as number);
  return sum;
}

interface Run {
  load: number;
  calibrate: number;
  capture: number;
  trace: number;
  fit: number;
  replay: number;
}

async function runOnce(dir: string, name: string): Promise<{ run: Run; takeoff: Takeoff; sheet: Sheet; image?: RasterImage }> {
  const takeoff = parseTakeoff(JSON.parse(readFileSync(join(dir, `${name}.takeoff.json`), 'utf8')));
  const [sheet, load] = await timed(() => loadSheetFileNode(join(dir, takeoff.sheet)));
  const [, cal] = await timed(() => takeoff.panels.map((p) => calibrate(p.anchors, { xScale: p.x_scale, yScale: p.y_scale, panel: p.id })));
  let image: RasterImage | undefined;
  if (sheet.kind === 'image') image = await sheet.render(1);
  let trace = 0;
  const lines = sheet.kind === 'vector-pdf' ? strokeLines(await sheet.paths()) : [];
  const source: CaptureSource = {
    kind: sheet.kind,
    lines: async () => lines,
    raster: async () => image ?? (image = await sheet.render(safeScale(sheet, 4))),
  };
  const captured: Takeoff = { ...takeoff, traces: [] };
  const [, capture] = await timed(async () => {
    for (const t of takeoff.traces) {
      const request = { guides: t.guides?.map(([x, y]) => sheetPoint(x, y)), points: t.points?.map(([x, y]) => sheetPoint(x, y)), method: t.method };
      const t0 = performance.now();
      const got = await captureTrace(request, source);
      if (got.how === 'raster') trace += performance.now() - t0;
      captured.traces.push({ ...t, captured: got.points.map((p) => [p[0], p[1]] as [number, number]) });
    }
  });
  const [, fit] = await timed(() => replayTakeoff(captured, sheet, { useCaptured: true, created: '2024-01-01T00:00:00Z' }));
  const [, replay] = await timed(() => replayTakeoff(takeoff, sheet, { created: '2024-01-01T00:00:00Z' }));
  return { run: { load, calibrate: cal, capture, trace, fit, replay }, takeoff, sheet, ...(image ? { image } : {}) };
}

async function benchSheet(dir: string, name: string): Promise<void> {
  const truth = JSON.parse(readFileSync(join(dir, `${name}.truth.json`), 'utf8')) as Truth;
  const runs: Run[] = [];
  let last: Awaited<ReturnType<typeof runOnce>> | undefined;
  for (let i = 0; i < 4; i++) {
    if (last) await last.sheet.close();
    last = await runOnce(dir, name);
    if (i > 0) runs.push(last.run); // the first run warms the JIT up
  }
  const { takeoff, sheet, image } = last as NonNullable<typeof last>;
  const result = await replayTakeoff(takeoff, sheet, { created: '2024-01-01T00:00:00Z' });
  await sheet.close();
  const rows = scoreCurveSet(truth, result.curveSet);
  const worst = (pick: (r: (typeof rows)[number]) => boolean) => {
    const chosen = rows.filter(pick);
    return chosen.length ? Math.max(...chosen.map((r) => r.worst)) : undefined;
  };
  const fmt = (v: number | undefined, unit: string) => (v === undefined ? '—' : `${v.toFixed(3)}${unit}`);
  const m = (k: keyof Run) => median(runs.map((r) => r[k]));
  const kind = truth.kind === 'image' ? `scan ${truth.scan?.dpi} dpi, ${truth.scan?.rotationDeg}°` : 'vector PDF';
  const fails = result.curveSet.findings.filter((f) => f.severity === 'fail').map((f) => f.code);
  process.stdout.write(`\n${name} (${kind}, ${takeoff.traces.length} traces)\n`);
  process.stdout.write(
    `  worst error: head ${fmt(worst((r) => r.quantity === 'head'), ' %')}, power ${fmt(worst((r) => r.quantity === 'power'), ' %')}, NPSHr ${fmt(worst((r) => r.quantity === 'npshr'), ' %')} of span; ` +
      `efficiency ${fmt(worst((r) => r.quantity === 'efficiency' && r.source === 'curve'), ' pt')} from curves, ${fmt(worst((r) => r.source === 'iso'), ' pt')} from iso-lines` +
      `${rows.some((r) => r.worst >= r.limit) ? '  ← OVER THE ACCEPTANCE' : ''}\n`,
  );
  process.stdout.write(`  checks: ${fails.length ? `fail ${fails.join(', ')}` : 'no fail'}\n`);
  process.stdout.write(
    `  stages (ms): load ${m('load').toFixed(0)}, calibrate ${m('calibrate').toFixed(1)}, capture ${m('capture').toFixed(0)}, fit and checks ${m('fit').toFixed(0)}; whole replay ${m('replay').toFixed(0)}, with loading ${(m('load') + m('replay')).toFixed(0)}\n`,
  );
  if (image) {
    const bare: number[] = [];
    for (let i = 0; i < 5; i++) bare.push((await timed(() => barePass(image)))[1]);
    const pixels = image.width * image.height;
    // Trace time alone, the way the capture stage spends it, for the ratio.
    const traceOnly: number[] = [];
    for (let i = 0; i < 8; i++) {
      const t0 = performance.now();
      for (const t of takeoff.traces) if (t.guides) traceRaster(image, t.guides.map(([x, y]) => sheetPoint(x, y)));
      if (i > 0) traceOnly.push(performance.now() - t0); // the first round warms up
    }
    const b = median(bare);
    const tr = median(traceOnly);
    process.stdout.write(
      `  raster tracing: ${tr.toFixed(1)} ms for ${takeoff.traces.length} traces; one bare pass over ${(pixels / 1e6).toFixed(1)} Mpx ${b.toFixed(1)} ms; ratio ${(tr / b).toFixed(2)} (target ≤ 2)\n`,
    );
  }
}

export default async function (): Promise<void> {
  process.stdout.write('Invented sample sheets: errors against exact truth, stage times, raster trace time against one bare pass\n');
  for (const v of SAMPLE_VARIANTS) await benchSheet(SAMPLES, v.spec.name);

  const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-bench-'));
  try {
    process.stdout.write('\nFour-diameter 300-dpi scans generated for this run (target: whole take-off under 5 s)\n');
    const scans = [
      { spec: { name: 'us-iso-colour-300dpi', system: 'us', layout: 'iso', ink: 'colour', labelsOnLines: true, seed: 31 }, scan: { dpi: 300, rotationDeg: 1.2, noise: 8, blur: 0.8, jpegQuality: 80, seed: 31 } },
      { spec: { name: 'si-panels-black-300dpi', system: 'si', layout: 'panels', ink: 'black', labelsOnLines: true, seed: 32 }, scan: { dpi: 300, rotationDeg: -1.5, noise: 8, blur: 0.8, jpegQuality: 80, seed: 32 } },
    ] as const;
    for (const v of scans) {
      await writeSheet(dir, { spec: { ...v.spec }, scan: { ...v.scan } });
      await benchSheet(dir, v.spec.name);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
