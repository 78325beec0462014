/**
 * The sample sheets the browser tests read: the committed invented samples in samples/sheets
 * (or a folder named by PUMPSCRIBE_SAMPLES), and a 300-dpi scan generated from the spec of a
 * committed one, for the responsiveness measurement.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { writeSheet } from '../../scripts/sheets/makeSheet.ts';
import { ROOT } from './harness.ts';

function sample(name: string): string {
  const dir = process.env.PUMPSCRIBE_SAMPLES ?? join(ROOT, 'samples', 'sheets');
  const path = join(dir, `${name}.takeoff.json`);
  if (!existsSync(path)) throw new Error(`The sample take-off file ${path} is missing; run "npx tsx scripts/make-sheets.ts".`);
  return path;
}

/** A vector PDF: US units, efficiency as iso-lines across the head curves. */
export const vectorSample = () => sample(process.env.PUMPSCRIBE_VECTOR_SAMPLE ?? 'us-iso-colour');
/** A 200-dpi JPEG scan: SI units, efficiency in its own panel, labels on the power curves. */
export const scanSample = () => sample(process.env.PUMPSCRIBE_SCAN_SAMPLE ?? 'si-panels-colour-scan');

/**
 * A 300-dpi scan (lossless PNG, turned 0.4°, light noise and blur) of an invented US sheet with
 * efficiency in its own panel, written into `dir` by the sample generator.
 */
export async function scan300(dir: string): Promise<string> {
  const name = 'us-panels-black-300dpi';
  await writeSheet(dir, { spec: { name, system: 'us', layout: 'panels', ink: 'black', seed: 7 }, scan: { dpi: 300, rotationDeg: 0.4, noise: 6, blur: 0.6, seed: 7 } });
  return join(dir, `${name}.takeoff.json`);
}
