/**
 * Why an iso level is lost on a bed scan: for each seed, every line the head frame sorted as an
 * iso-line (found on the page or on the turned ink) against the drawn lines (which drawn line it
 * lies on, median distance in level pixels, and that line's true level, or the head curve it is
 * a piece of), whether the tracer followed it, the level it got (sure or unsure) and whether that
 * level is right; then each drawn iso-line that no found line covers, whether it printed a label,
 * and the detector's notes about iso labels. A tool for reading, not a score.
 *
 *   GIVE=1 npx tsx scripts/detectSheets/isoDump.ts 9 17 19
 *   ISO_NOTES=0 … (leave out the notes)
 */
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { findRasterPanels } from '../../src/digitize/detect/rasterPanels.ts';
import { findRasterCurves } from '../../src/digitize/detect/rasterCurves.ts';
import { distanceToPolyline } from '../../src/digitize/polyline.ts';
import { applyH } from '../randomSheets/camera.ts';
import { sheetGeometry } from '../randomSheets/randomSheet.ts';
import { scanFor } from './scanBed.ts';

const seeds = process.argv.slice(2).map(Number).filter((s) => Number.isFinite(s));
for (const seed of seeds.length ? seeds : [1]) {
  const { plan, shot } = sheetGeometry(seed, 'scan');
  if (plan.efficiencyAs !== 'iso') {
    process.stdout.write(`seed ${seed}: no iso-lines drawn (efficiency as ${plan.efficiencyAs})\n`);
    continue;
  }
  const { jpeg } = await scanFor(seed);
  const sheet = await loadImageSheetNode(jpeg, { name: `${seed}.jpg` });
  const image = await sheet.render(1);
  const found = await findRasterPanels(image, textReaderNode());
  const page = found.page;
  if (!page) {
    process.stdout.write(`seed ${seed}: no level page\n`);
    await sheet.close();
    continue;
  }
  const notes: string[] = [];
  const result = await findRasterCurves(image, found, textReaderNode(), {
    ...(process.env.GIVE ? { given: { family: 'diameter' as const, values: plan.family.diameters } } : {}),
    note: (l) => notes.push(l),
  });
  const head = plan.panels[0]!;
  const drawn = plan.lines
    .filter((l) => l.panel === head.id)
    .map((l) => ({ line: l, pts: l.points.map((q) => { const [x, y] = applyH(shot.h, q); return page.level.toLevel(x, y); }) }));
  const isoDrawn = drawn.filter((d) => d.line.iso !== undefined);
  process.stdout.write(`seed ${seed}: ${plan.dpi} dpi, ${isoDrawn.length} iso-lines drawn (${isoDrawn.map((d) => `${d.line.id}${d.line.label ? '' : ' unlabelled'}`).join(', ')})\n`);
  const lines = (result.lines ?? []).filter((c) => c.kind === 'iso');
  const covered = new Set<string>();
  for (const c of lines) {
    const pts = c.track.u.map((u, i): [number, number] => (c.transposed ? [c.track.v[i]!, u] : [u, c.track.v[i]!]));
    let best = { id: '-', med: Infinity, iso: undefined as number | undefined };
    for (const d of drawn) {
      const ds = pts.filter((_, i) => i % 3 === 0).map((p) => distanceToPolyline(d.pts, p)).sort((a, b) => a - b);
      const med = ds[ds.length >> 1] ?? Infinity;
      if (med < best.med) best = { id: d.line.id, med, iso: d.line.iso };
    }
    if (best.med <= 4 && best.iso !== undefined) covered.add(best.id);
    const kept = result.curves.includes(c);
    const followed = c.confidence > 0 && c.guides.length > 0 && c.traced.length >= 2;
    const verdict = c.value === undefined ? 'NO LEVEL' : best.iso === undefined ? 'level on a head piece' : c.value === best.iso ? 'right' : 'WRONG level';
    const a = pts[0]!;
    const b = pts[pts.length - 1]!;
    const t = c.traced.map((p) => page.level.toLevel(p[0] * image.scale, p[1] * image.scale));
    const tracedEnds = t.length >= 2 ? ` traced [${t[0]!.map((v) => v.toFixed(0)).join(',')}]→[${t[t.length - 1]!.map((v) => v.toFixed(0)).join(',')}]` : '';
    process.stdout.write(
      `  ${c.transposed ? 'steep  ' : 'shallow'} [${a.map((v) => v.toFixed(0)).join(',')}]→[${b.map((v) => v.toFixed(0)).join(',')}] on ${best.id} (${best.med.toFixed(1)} px${best.iso === undefined ? ', a head curve' : `, level ${best.iso}`}) ${followed ? 'followed' : 'NOT FOLLOWED'} conf ${c.confidence.toFixed(2)} level ${c.value ?? '-'}${kept ? '' : ' (not out)'} → ${verdict}${tracedEnds}\n`,
    );
  }
  for (const d of isoDrawn) if (!covered.has(d.line.id)) process.stdout.write(`  drawn ${d.line.id}${d.line.label ? ` (label "${d.line.label.text}")` : ' (no label)'}: no iso-line found on it\n`);
  // Where each label is printed (its middle, level pixels): the words found there show in the notes.
  for (const d of isoDrawn) {
    const label = d.line.label;
    if (!label) continue;
    const at = d.pts[Math.round(label.at * (d.pts.length - 1))]!;
    process.stdout.write(`  label "${label.text}" of ${d.line.id} printed at [${at.map((v) => v.toFixed(0)).join(', ')}]\n`);
  }
  if (process.env.ISO_NOTES !== '0') for (const n of notes) if (/iso|steep|label at|word at|pieces/.test(n)) process.stdout.write(`    · ${n}\n`);
  for (const q of result.leftOut) if (/iso|start neither/.test(q)) process.stdout.write(`    ? ${q}\n`);
  await sheet.close();
}
await closeTextReaderNode();
