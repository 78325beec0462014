/**
 * The grid of one bed scan's frames against the lines found there (a tool for reading the line
 * finder): grid rows and columns found, and the ink around a few grid crossings.
 *
 *   npx tsx scripts/detectSheets/gridDump.ts 16
 */
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { findRasterPanels } from '../../src/digitize/detect/rasterPanels.ts';
import { gridLines } from '../../src/digitize/detect/rasterFrames.ts';
import { frameLines } from '../../src/digitize/detect/rasterLines.ts';
import { scanFor } from './scanBed.ts';

const seed = Number(process.argv[2] ?? 1);
const { jpeg } = await scanFor(seed);
const sheet = await loadImageSheetNode(jpeg, { name: `${seed}.jpg` });
const image = await sheet.render(1);
const found = await findRasterPanels(image, textReaderNode());
const page = found.page!;
const seen = new Set<string>();
for (const p of found.panels) {
  const f = found.levelFrames!.get(p)!;
  const key = f.join(',');
  if (seen.has(key)) continue;
  seen.add(key);
  const grid = { x: gridLines(page.map, f, 'x'), y: gridLines(page.map, f, 'y') };
  process.stdout.write(`panel ${p.id} frame ${f.map(Math.round).join(',')} strong ${page.strong}\n  x ${grid.x.map((v) => v.toFixed(1)).join(' ')}\n  y ${grid.y.map((v) => v.toFixed(1)).join(' ')}\n`);
  const tracks = frameLines(page.map, f, { ceiling: 0.3 * page.strong, grid });
  for (const tr of tracks) {
    const onCol = tr.u.filter((u) => grid.x.some((x) => Math.abs(x - u) <= 4)).length;
    process.stdout.write(`   track u ${tr.u[0]!.toFixed(0)}–${tr.u[tr.u.length - 1]!.toFixed(0)} n ${tr.u.length} v ${tr.v[0]!.toFixed(0)}→${tr.v[tr.v.length - 1]!.toFixed(0)} cover ${(tr.u.length / (tr.u[tr.u.length - 1]! - tr.u[0]! + 1)).toFixed(2)} on grid columns ${(onCol / tr.u.length).toFixed(2)}\n`);
  }
  // Ink across a grid row near two crossings
  const gy = grid.y[Math.floor(grid.y.length / 2)]!;
  const gx = grid.x[Math.floor(grid.x.length / 2)]!;
  for (const [u0, label] of [[Math.round(gx), 'at crossing'], [Math.round(gx) + 15, 'between']] as const) {
    const col: number[] = [];
    for (let v = Math.round(gy) - 5; v <= Math.round(gy) + 5; v++) col.push(page.map.ink[v * page.map.width + u0]!);
    process.stdout.write(`  column ${u0} (${label}) rows ${Math.round(gy) - 5}..: ${col.join(' ')}\n`);
  }
  const row: number[] = [];
  for (let u = Math.round(gx) - 5; u <= Math.round(gx) + 5; u++) row.push(page.map.ink[Math.round(gy + 20) * page.map.width + u]!);
  process.stdout.write(`  row ${Math.round(gy + 20)} across column ${gx.toFixed(1)}: ${row.join(' ')}\n`);
}
await sheet.close();
await closeTextReaderNode();
