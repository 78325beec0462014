/**
 * The automatic take-off of a committed sample scan (samples/sheets, INVENTED sheets), from its
 * take-off file with the panels and traces taken out: what `pumpscribe takeoff --detect` reads.
 * Tests that call it close the character reader after all (`closeTextReaderNode`).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { detectTakeoff } from '../../src/digitize/detect/detect.ts';
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { parseTakeoffToDetect } from '../../src/model/takeoff.ts';

export async function detectSample(name: string) {
  const root = join(import.meta.dirname, '..', '..', 'samples', 'sheets');
  const jpeg = readFileSync(join(root, `${name}.jpg`));
  const sheet = await loadImageSheetNode(new Uint8Array(jpeg), { name: `${name}.jpg` });
  const raw = JSON.parse(readFileSync(join(root, `${name}.takeoff.json`), 'utf8')) as Record<string, unknown>;
  delete raw.panels;
  delete raw.traces;
  return detectTakeoff(parseTakeoffToDetect(raw), raw, sheet, { reader: textReaderNode() });
}
