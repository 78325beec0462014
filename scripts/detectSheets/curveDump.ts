/**
 * The lines found in each raster panel of one bed scan, against the plan's lines: for each
 * drawn line, the found track nearest to it and how far (level pixels, median and worst over
 * the track's common columns). A tool for reading the line finder, not a score. With GRID=1 it
 * also prints each frame's grid rows and columns, each track's share on a grid column, and the
 * ink across a grid crossing (a faint grid whose crossings chain into false lines shows there).
 *
 *   [GRID=1] npx tsx scripts/detectSheets/curveDump.ts 3
 */
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { findRasterPanels } from '../../src/digitize/detect/rasterPanels.ts';
import { gridLines } from '../../src/digitize/detect/rasterFrames.ts';
import { frameLines, trackAt } from '../../src/digitize/detect/rasterLines.ts';
import { findRasterCurves } from '../../src/digitize/detect/rasterCurves.ts';
import { applyH } from '../randomSheets/camera.ts';
import { sheetGeometry } from '../randomSheets/randomSheet.ts';
import { scanFor } from './scanBed.ts';

const seed = Number(process.argv[2] ?? 1);
const { plan, shot } = sheetGeometry(seed, 'scan');
const { jpeg } = await scanFor(seed);
const sheet = await loadImageSheetNode(jpeg, { name: `${seed}.jpg` });
const image = await sheet.render(1);
const found = await findRasterPanels(image, textReaderNode());
const page = found.page!;
process.stdout.write(`seed ${seed}: ${plan.dpi} dpi, strong ${page.strong}, efficiency as ${plan.efficiencyAs}, lines ${plan.lines.length}\n`);
const seen = new Set<string>();
for (const p of found.panels) {
  const f = found.levelFrames!.get(p)!;
  const key = f.join(',');
  if (seen.has(key)) continue;
  seen.add(key);
  const grid = { x: gridLines(page.map, f, 'x'), y: gridLines(page.map, f, 'y') };
  const t0 = performance.now();
  const tracks = frameLines(page.map, f, { ceiling: 0.3 * page.strong, grid });
  process.stdout.write(`panel ${p.id} frame ${f.map(Math.round).join(',')} grid ${grid.x.length}x${grid.y.length}: ${tracks.length} tracks in ${(performance.now() - t0).toFixed(0)} ms\n`);
  // GRID=1: the grid rows and columns found, each track's share on a grid column, and the ink across a grid crossing.
  const onColumns = (tr: (typeof tracks)[number]) => (process.env.GRID ? ` cover ${(tr.u.length / (tr.u[tr.u.length - 1]! - tr.u[0]! + 1)).toFixed(2)} on grid columns ${(tr.u.filter((u) => grid.x.some((x) => Math.abs(x - u) <= 4)).length / tr.u.length).toFixed(2)}` : '');
  for (const tr of tracks) process.stdout.write(`   track u ${tr.u[0]!.toFixed(0)}–${tr.u[tr.u.length - 1]!.toFixed(0)} n ${tr.u.length} v ${tr.v[0]!.toFixed(0)}→${tr.v[tr.v.length - 1]!.toFixed(0)}${onColumns(tr)}\n`);
  if (process.env.GRID && grid.x.length > 0 && grid.y.length > 0) {
    process.stdout.write(`  grid x ${grid.x.map((v) => v.toFixed(1)).join(' ')}\n  grid y ${grid.y.map((v) => v.toFixed(1)).join(' ')}\n`);
    const gy = Math.round(grid.y[grid.y.length >> 1]!);
    const gx = Math.round(grid.x[grid.x.length >> 1]!);
    for (const [u0, where] of [[gx, 'at a crossing'], [gx + 15, 'between crossings']] as const) {
      const col: number[] = [];
      for (let v = gy - 5; v <= gy + 5; v++) col.push(page.map.ink[v * page.map.width + u0]!);
      process.stdout.write(`  ink down column ${u0} (${where}), rows ${gy - 5}–${gy + 5}: ${col.join(' ')}\n`);
    }
  }
  const planPanel = plan.panels.find((q) => q.quantity === p.quantity);
  for (const line of plan.lines.filter((l) => planPanel && l.panel === planPanel.id || (p.quantity === 'head' && l.iso !== undefined))) {
    const pts = line.points.map((q) => { const [x, y] = applyH(shot.h, q); return page.level.toLevel(x, y); });
    let best = { i: -1, med: Infinity, max: Infinity, cover: 0 };
    tracks.forEach((tr, i) => {
      const d: number[] = [];
      for (const [u, v] of pts) { const y = trackAt(tr, u); if (y !== null) d.push(Math.abs(y - v)); }
      if (d.length < 5) return;
      d.sort((a, b) => a - b);
      const med = d[d.length >> 1]!;
      if (med < best.med) best = { i, med, max: d[d.length - 1]!, cover: d.length / pts.length };
    });
    process.stdout.write(`  ${line.id} (${line.style.dash}, w ${line.style.width.toFixed(1)}, ${line.style.colour}): track ${best.i} median ${best.med.toFixed(1)} worst ${best.max.toFixed(1)} px over ${(100 * best.cover).toFixed(0)} %\n`);
  }
}
const curves = await findRasterCurves(image, found, textReaderNode(), { ...(process.env.GIVE ? { given: { family: "diameter" as const, values: plan.family.diameters } } : {}), note: (l) => process.stdout.write(`  ${l}\n`) });
const nearestLine = (p: readonly [number, number]) => {
  let best = { id: '-', d: Infinity };
  for (const line of plan.lines) for (const q of line.points) {
    const [x, y] = applyH(shot.h, q);
    const d = Math.hypot(x - p[0] * image.scale, y - p[1] * image.scale);
    if (d < best.d) best = { id: line.id, d };
  }
  return `${best.id}@${best.d.toFixed(1)}`;
};
for (const c of curves.curves) {
  const tracedOn = c.traced.length ? [c.traced[0]!, c.traced[c.traced.length >> 1]!, c.traced[c.traced.length - 1]!].map(nearestLine).join(' ') : '-';
  process.stdout.write(`curve ${c.panel.id} ${c.quantity} ${c.value} (${c.named}) conf ${c.confidence.toFixed(2)} flows ${c.flows.map((f) => f.toPrecision(4)).join('–')} guides ${c.guides.map((g) => `${g.map((v) => v.toFixed(0)).join(',')} on ${nearestLine(g)}`).join(' ')}; traced start/middle/end on ${tracedOn}\n`);
}
for (const q of curves.questions) process.stdout.write(`? ${q}\n`);
await sheet.close();
await closeTextReaderNode();
