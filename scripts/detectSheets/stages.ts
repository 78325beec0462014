/**
 * Where the drawn curves of the scan bed are lost, stage by stage (a tool for reading the
 * detector, not a score): for each drawn curve (not iso-lines) of each sheet, the first stage
 * that fails of
 *   panel    no panel found with its quantity
 *   calib    the panel's calibration is more than 0.5 % of span off
 *   ink      no line found in the frame follows it (median distance over 3 px, or under 50 % of it covered)
 *   kind     the line found is taken for an iso-line (it does not start at the axis)
 *   guides   the line never stands alone: no guide placed
 *   name     the line is not named (or named with the wrong value)
 *   unsure   named right but the tracer and the line disagree (confidence under 0.5)
 *   trace    named right, confident, but the tracer's line is beyond tolerance (see the scan bed)
 *   ok       named right, confident
 * The names are given as the scan bed gives them once asked (GIVE=1), or read from the labels.
 *
 *   STAGE_SEEDS=1-40 npx tsx scripts/detectSheets/stages.ts
 */
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { findRasterPanels } from '../../src/digitize/detect/rasterPanels.ts';
import { findRasterCurves, type RasterCurve } from '../../src/digitize/detect/rasterCurves.ts';
import { trackAt, type Track } from '../../src/digitize/detect/rasterLines.ts';
import { applyH } from '../randomSheets/camera.ts';
import { calibrationError, sheetGeometry } from '../randomSheets/randomSheet.ts';
import { scanFor } from './scanBed.ts';

const [from, to] = (process.env.STAGE_SEEDS ?? '1-10').split('-').map(Number) as [number, number];
const counts: Record<string, number> = {};
const lines: string[] = [];
for (let seed = from; seed <= (to ?? from); seed++) {
  const { plan, shot } = sheetGeometry(seed, 'scan');
  const { jpeg } = await scanFor(seed);
  const sheet = await loadImageSheetNode(jpeg, { name: `${seed}.jpg` });
  const image = await sheet.render(1);
  const found = await findRasterPanels(image, textReaderNode());
  const page = found.page;
  const notes: string[] = [];
  const give = process.env.GIVE ? { given: { family: 'diameter' as const, values: plan.family.diameters } } : {};
  const curves = page ? await findRasterCurves(image, found, textReaderNode(), { ...give, note: (l) => notes.push(l) }) : null;
  const all: RasterCurve[] = curves?.lines ?? [];
  for (const line of plan.lines.filter((l) => l.iso === undefined && l.diameter !== undefined)) {
    const id = `${line.quantity}-${line.diameter}`;
    let stage = 'ok';
    let detail = '';
    const panel = found.panels.find((p) => p.quantity === line.quantity);
    const cal = panel ? calibrationError(plan, shot, line.panel, (q) => panel.proposal.calibration.toData(q as never) as unknown as readonly [number, number]) : NaN;
    const pts = page ? line.points.map((q) => page.level.toLevel(...(applyH(shot.h, q) as [number, number]))) : [];
    const near = (t: Track) => {
      const d: number[] = [];
      for (const [u, v] of pts) {
        const y = trackAt(t, u);
        if (y !== null) d.push(Math.abs(y - v));
      }
      d.sort((a, b) => a - b);
      return { med: d.length ? (d[d.length >> 1] as number) : Infinity, cover: d.length / Math.max(1, pts.length) };
    };
    if (!panel) stage = 'panel';
    else if (!(cal <= 0.5)) [stage, detail] = ['calib', cal.toFixed(2)];
    else {
      const mine = all.filter((c) => c.panel === panel || (c.kind === 'iso' && line.quantity === 'efficiency')).map((c) => ({ c, ...near(c.track) })).filter((k) => k.med <= 3).sort((a, b) => b.cover - a.cover);
      const best = mine[0];
      if (!best || best.cover < 0.5) [stage, detail] = ['ink', best ? `cover ${(100 * best.cover).toFixed(0)} %` : 'none'];
      else if (best.c.kind === 'iso') stage = 'kind';
      else if (best.c.guides.length === 0) stage = 'guides';
      else if (best.c.value !== line.diameter) {
        const tracedEnd = Math.max(...best.c.traced.map((p) => best.c.panel.proposal.calibration.toData(p)[0]));
        const heads = all.filter((h) => h.quantity === 'head' && h.kind === 'curve' && h.value !== undefined).map((h) => `${h.value}@${h.flows[1].toPrecision(4)}/${h.confidence.toFixed(2)}`).join(' ');
        [stage, detail] = ['name', `${best.c.value ?? '-'} (${best.c.named ?? '-'}) pieces ${mine.length} track end ${best.c.flows[1].toPrecision(4)} traced end ${tracedEnd.toPrecision(4)} true end ${(line.flows[line.flows.length - 1] as number).toPrecision(4)} conf ${best.c.confidence.toFixed(2)}; heads ${heads}`];
      }
      else if (best.c.confidence < 0.5) [stage, detail] = ['unsure', best.c.confidence.toFixed(2)];
      else detail = `cover ${(100 * best.cover).toFixed(0)} %`;
    }
    counts[stage] = (counts[stage] ?? 0) + 1;
    lines.push(`${String(seed).padStart(3)} ${id.padEnd(16)} ${line.style.dash.padEnd(6)} ${stage.padEnd(7)} ${detail}`);
    process.stdout.write(`${lines[lines.length - 1]}\n`);
  }
  for (const q of curves?.questions ?? []) process.stdout.write(`    ? ${q.slice(0, 200)}\n`);
  for (const q of curves?.leftOut ?? []) process.stdout.write(`    - ${q.slice(0, 200)}\n`);
  if (process.env.STAGE_NOTES) for (const n of notes) process.stdout.write(`    ${n}\n`);
  await sheet.close();
}
await closeTextReaderNode();
process.stdout.write(`\nstages: ${Object.entries(counts).map(([k, v]) => `${k} ${v}`).join(', ')}\n`);
