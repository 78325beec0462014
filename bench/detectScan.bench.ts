/**
 * Detection of the panels of a whole 300-dpi scan (an INVENTED sheet of the independent random
 * bed): decoded image to calibrated panels, tick labels and titles read by tesseract.js. It
 * prints the reader's start (once per process), then for three runs the time of each step as
 * the progress callback reports it, and the whole, against the 3 s.
 * Runs on the main thread here; the workbench does not run it in its worker yet.
 *
 *   npm run bench -- detectScan
 */
import { cpus, loadavg } from 'node:os';
import { findRasterPanels } from '../src/digitize/detect/rasterPanels.ts';
import { closeTextReaderNode, textReaderNode } from '../src/digitize/loaders/ocrNode.ts';
import { decode } from '../scripts/randomSheets/camera.ts';
import { sheetGeometry } from '../scripts/randomSheets/randomSheet.ts';
import { scanFor } from '../scripts/detectSheets/scanBed.ts';

export default async function main(): Promise<void> {
  let seed = 1;
  while (sheetGeometry(seed, 'scan').plan.dpi !== 300) seed++;
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
  for (let run = 1; run <= 3; run++) {
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
  }
  await closeTextReaderNode();
  // Other work on the machine stretches every figure above; the load says by about how much.
  process.stdout.write(`machine load average ${loadavg()[0]!.toFixed(1)} on ${cpus().length} cores\n`);
  const best = Math.min(...totals);
  process.stdout.write(`whole 300-dpi sheet, panels only (no curves yet): best ${best.toFixed(0)} ms, worst ${Math.max(...totals).toFixed(0)} ms — ${best < 3000 ? 'under' : 'OVER'} the 3 s of the issue (reader start not counted; main thread, not a worker)\n`);
}

if (process.argv[1] && import.meta.url.endsWith(process.argv[1].split('/').pop() as string)) await main();
