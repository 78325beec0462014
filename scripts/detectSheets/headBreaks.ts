/** Where courseBreak cuts the head tracks of one bed scan (a diagnostic of the scan line finder): npx tsx scripts/detectSheets/headBreaks.ts 45 */
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { findRasterPanels } from '../../src/digitize/detect/rasterPanels.ts';
import { gridLines } from '../../src/digitize/detect/rasterFrames.ts';
import { frameLines } from '../../src/digitize/detect/rasterLines.ts';
import { courseBreak } from '../../src/digitize/detect/rasterCurves.ts';
import { scanFor } from './scanBed.ts';

const seed = Number(process.argv[2] ?? 45);
const { jpeg } = await scanFor(seed);
const sheet = await loadImageSheetNode(jpeg, { name: `${seed}.jpg` });
const found = await findRasterPanels(await sheet.render(1), textReaderNode());
const page = found.page!;
const head = found.panels.find((p) => p.quantity === 'head')!;
const f = found.levelFrames!.get(head)!;
const tracks = frameLines(page.map, f, { ceiling: 0.3 * page.strong, grid: { x: gridLines(page.map, f, 'x'), y: gridLines(page.map, f, 'y') } });
for (const t of tracks) {
  const cut = courseBreak(t, 3, 0.15 * (f[2] - f[0]));
  process.stdout.write(`track u ${t.u[0]!.toFixed(0)}–${t.u.at(-1)!.toFixed(0)} n ${t.u.length}: cut ${cut === null ? '-' : `at u ${t.u[cut]!.toFixed(0)} v ${t.v[cut]!.toFixed(1)}; around ${t.v.slice(Math.max(0, cut - 6), cut + 6).map((v) => v.toFixed(1)).join(' ')}`}\n`);
}
await sheet.close();
await closeTextReaderNode();
