/**
 * Take-off figures on the invented vector sheet of the tests (not a real product):
 * 1. chord tolerance — vector capture of the Bézier head curves against their exact geometry,
 *    largest deviation (sheet units and % of the head span) and capture time, per tolerance;
 * 2. replay — whole take-off (load, paths, capture, iso crossings, fit, checks), median time;
 * 3. vector against raster — the same head curves captured from a 216-dpi rendering of the page,
 *    largest fitted head error of each way and their ratio.
 */
import { loadPdfSheetNode } from '../src/digitize/loaders/pdfNode.ts';
import { captureVector, strokeLines } from '../src/digitize/vectorCapture.ts';
import { distanceToPolyline } from '../src/digitize/polyline.ts';
import { replayTakeoff } from '../src/digitize/takeoff.ts';
import { parseTakeoff } from '../src/model/takeoff.ts';
import { evaluateUnchecked } from '../src/fit/polynomial.ts';
import { fromSI, parseUnit } from '../src/units/index.ts';
import { sheetPoint } from '../src/digitize/points.ts';
import type { Sheet } from '../src/digitize/sheet.ts';
import type { CurveSet } from '../src/model/curveset.ts';
import { DIAMETERS, LAYOUT, head, makePumpSheetPdf, pumpTakeoff, qmax } from '../tests/digitize/fixtures/pumpSheet.ts';

const ft = parseUnit('head', 'ft');
const gpm = parseUnit('flow', 'gpm');
const inch = parseUnit('diameter', 'in');

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)] as number;
}

function worstHeadPercent(set: CurveSet): number {
  let worst = 0;
  for (const d of DIAMETERS) {
    const fit = set.members.find((m) => Math.abs(fromSI(m.diameter_m!, inch) - d) < 1e-9)!.curves.head!.fit!;
    const [lo, hi] = fit.domain;
    for (let i = 0; i <= 100; i++) {
      const q = lo + (hi - lo) * (0.15 + 0.8 * (i / 100));
      worst = Math.max(worst, Math.abs(fromSI(evaluateUnchecked(fit, q), ft) - head(d, fromSI(q, gpm))));
    }
  }
  return (100 * worst) / LAYOUT.head.max;
}

export default async function (): Promise<void> {
  const pdf = await makePumpSheetPdf();
  const sheet = await loadPdfSheetNode(pdf);
  const paths = await sheet.paths();
  const truth = DIAMETERS.map((d) => Array.from({ length: 4001 }, (_, i) => {
    const q = (qmax(d) * i) / 4000;
    return [LAYOUT.x(q), LAYOUT.head.y(head(d, q))] as [number, number];
  }));
  process.stdout.write('chord tolerance → largest deviation of the captured head curves, capture time\n');
  for (const flatness of [0.1, 0.03, 0.01, 0.003, 0.001]) {
    const times: number[] = [];
    let deviation = 0;
    for (let run = 0; run < 5; run++) {
      const t0 = performance.now();
      const lines = strokeLines(paths, { flatness });
      DIAMETERS.forEach((d, k) => {
        const got = captureVector(lines, [0.05, 0.95].map((f) => sheetPoint(LAYOUT.x(f * qmax(d)), LAYOUT.head.y(head(d, f * qmax(d))))));
        for (const p of got.points) deviation = Math.max(deviation, distanceToPolyline(truth[k]!, p));
      });
      times.push(performance.now() - t0);
    }
    process.stdout.write(`  ${flatness.toString().padEnd(6)} ${deviation.toExponential(2)} units (${((100 * deviation) / (1.5 * LAYOUT.head.max)).toExponential(2)} % of span)  ${median(times).toFixed(1)} ms\n`);
  }

  // Replay against its yardstick, loading the page alone (pdf.js parse and operator list),
  // interleaved round by round; median of 7 after one warm-up round, with the spread.
  const times: number[] = [];
  const loads: number[] = [];
  let set: CurveSet | null = null;
  for (let run = 0; run < 8; run++) {
    const l0 = performance.now();
    const bare = await loadPdfSheetNode(pdf);
    await bare.paths();
    const l1 = performance.now();
    await bare.close();
    const t0 = performance.now();
    const s = await loadPdfSheetNode(pdf);
    set = (await replayTakeoff(parseTakeoff(pumpTakeoff('iso')), s)).curveSet;
    await s.close();
    if (run === 0) continue;
    times.push(performance.now() - t0);
    loads.push(l1 - l0);
  }
  const ratios = times.map((t, i) => t / (loads[i] as number));
  process.stdout.write(
    `replay of the whole take-off (15 traces, 3 panels): median ${median(times).toFixed(0)} ms (${Math.min(...times).toFixed(0)}–${Math.max(...times).toFixed(0)}); ` +
      `loading the page alone ${median(loads).toFixed(0)} ms; ratio ${(median(times) / median(loads)).toFixed(2)}× (per round ${Math.min(...ratios).toFixed(2)}–${Math.max(...ratios).toFixed(2)}×)\n`,
  );

  const vector = worstHeadPercent(set as CurveSet);
  const image = await sheet.render(3);
  const scan: Sheet = { ...sheet, kind: 'image', render: async () => image, paths: async () => [], text: async () => [], close: async () => undefined };
  const onlyHeads = pumpTakeoff('drawn') as { traces: { quantity: string; method?: string }[] };
  onlyHeads.traces = onlyHeads.traces.filter((t) => t.quantity === 'head').map((t) => ({ ...t, method: 'raster' }));
  const rasterSet = (await replayTakeoff(parseTakeoff(onlyHeads), { ...scan, kind: 'raster-pdf' })).curveSet;
  const raster = worstHeadPercent(rasterSet);
  process.stdout.write(`largest fitted head error: vector ${vector.toExponential(2)} % of span, raster at 216 dpi ${raster.toExponential(2)} % of span, ratio ${(raster / vector).toFixed(0)}×\n`);
  await sheet.close();
}
