/**
 * Where the curve step of the scan detection spends its time on one bed scan: each progress
 * step of findRasterCurves (lines per frame, each line followed, the labels read) with the time
 * since the step before, best of three runs after a warm-up.
 *
 *   npx tsx scripts/detectSheets/curveTime.ts 20
 */
import { findRasterCurves } from '../../src/digitize/detect/rasterCurves.ts';
import { findRasterPanels } from '../../src/digitize/detect/rasterPanels.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { decode } from '../randomSheets/camera.ts';
import { scanFor } from './scanBed.ts';

const seed = Number(process.argv[2] ?? 20);
const { jpeg } = await scanFor(seed);
const d = await decode(Buffer.from(jpeg));
const image = { width: d.width, height: d.height, data: d.data, scale: 1 };
const reader = textReaderNode();
const found = await findRasterPanels(image, reader);
let best: { total: number; steps: string[] } | null = null;
for (let run = 0; run < 4; run++) {
  const t0 = performance.now();
  let last = t0;
  let what = 'start';
  const steps: string[] = [];
  await findRasterCurves(image, found, reader, {
    progress: (_f, next) => {
      const now = performance.now();
      steps.push(`${what} ${(now - last).toFixed(0)}`);
      [last, what] = [now, next];
    },
  });
  steps.push(`${what} ${(performance.now() - last).toFixed(0)}`);
  const total = performance.now() - t0;
  if (run > 0 && (!best || total < best.total)) best = { total, steps };
}
process.stdout.write(`seed ${seed}: curves best ${best!.total.toFixed(0)} ms\n${best!.steps.map((s) => `  ${s} ms`).join('\n')}\n`);
await closeTextReaderNode();
