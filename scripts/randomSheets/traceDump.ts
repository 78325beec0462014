/**
 * Per-trace dump of the random bed, to see why a curve came out wrong: for each trace of a
 * sheet, how far its captured points lie from the line the sheet drew (pixels), how much of
 * that line it covers, the findings naming it; for each iso-trace, its crossings with each
 * head trace against the exact crossings (count, flow error in % of the flow axis); for each
 * panel, the calibration residual shown against the real error.
 *
 *   npx tsx scripts/randomSheets/traceDump.ts 15 21 23      # these seeds
 *   npx tsx scripts/randomSheets/traceDump.ts 1-40 --iso    # a range, sheets with iso-lines only
 *
 * Sheets come from the bench's cache (artifacts/random-sheets/), drawn when missing.
 */
import { createHash } from 'node:crypto';
import { sheetFor } from '../../bench/randomSheets.bench.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { nearestOnPolyline } from '../../src/digitize/polyline.ts';
import { parseTakeoff, type Trace } from '../../src/model/takeoff.ts';
import { applyH, decode } from './camera.ts';
import type { PanelPlan, Pt } from './plan.ts';
import { isoFlows } from './pumpFamily.ts';
import { calibrationError, sheetGeometry } from './randomSheet.ts';
import { scoreReplay } from './score.ts';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import { guidesOffCrossings } from '../../src/digitize/isoGuides.ts';

function seedsFrom(args: string[]): number[] {
  const out: number[] = [];
  for (const a of args) {
    const m = /^(\d+)-(\d+)$/.exec(a);
    if (m) for (let s = Number(m[1]); s <= Number(m[2]); s++) out.push(s);
    else if (/^\d+$/.test(a)) out.push(Number(a));
  }
  return out;
}

const f1 = (v: number) => (Number.isFinite(v) ? v.toFixed(1) : '–');

async function dump(seed: number, isoOnly: boolean): Promise<void> {
  const kind = seed % 3 === 2 ? 'photo' : 'scan';
  const { jpeg, meta } = await sheetFor(seed, kind);
  const { plan, shot } = sheetGeometry(seed, kind);
  if (isoOnly && plan.efficiencyAs !== 'iso') return;
  const decoded = await decode(jpeg);
  const raster = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
  const sheet = imageSheet(raster, createHash('sha256').update(jpeg).digest('hex'), () => raster);
  const takeoff = parseTakeoff(meta.takeoff);
  process.stdout.write(`\n== seed ${seed} ${kind} (efficiency as ${plan.efficiencyAs}, dpi ${plan.dpi}, keystone ${shot.keystone.toFixed(3)})\n`);
  let replay;
  try {
    replay = await replayTakeoff(takeoff, sheet);
  } catch (error) {
    process.stdout.write(`  refused: ${error instanceof Error ? error.message : String(error)}\n`);
    return;
  }
  const findings = replay.curveSet.findings;
  for (const [id, cal] of replay.calibrations) {
    const real = calibrationError(plan, shot, id, (p) => cal.toData(p as never));
    const ratio = real > 0 ? cal.maxPercentOfSpan / real : Infinity;
    process.stdout.write(`  panel ${id}: ${cal.projection} (${cal.residualKind}, ${takeoff.panels.find((p) => p.id === id)?.anchors.length} anchors) shown ${cal.maxPercentOfSpan.toFixed(3)} real ${real.toFixed(3)} % of span, ratio ${ratio.toFixed(2)}${ratio > 3 || ratio < 1 / 3 ? '  <-- off' : ''}\n`);
  }
  const inImage = (p: Pt) => applyH(shot.h, p);
  const outcomes = new Map(replay.traces.map((o) => [o.id, o]));
  for (const line of plan.lines) {
    if (isoOnly && line.quantity !== 'head' && line.iso === undefined) continue;
    const o = outcomes.get(line.id);
    const truth = line.points.map(inImage) as unknown as SheetPoint[];
    const codes = findings.filter((f) => f.subject.trace === line.id && f.severity !== 'note').map((f) => `${f.severity}:${f.code}`);
    if (!o) {
      process.stdout.write(`  ${line.id.padEnd(18)} no points  ${codes.join(' ')}\n`);
      continue;
    }
    let off = 0;
    for (const p of o.points) off = Math.max(off, nearestOnPolyline(truth, p).distance);
    const near = Math.max(3, 2 * line.style.width);
    const covered = truth.filter((t) => nearestOnPolyline(o.points, t).distance <= near).length / truth.length;
    process.stdout.write(`  ${line.id.padEnd(18)} ${o.how.padEnd(6)} ${String(o.points.length).padStart(4)} pts  off ${f1(off).padStart(6)} px  covers ${(100 * covered).toFixed(0).padStart(3)} %  width ${line.style.width.toFixed(1)} ${line.style.dash} ${line.style.colour}  ${codes.join(' ')}\n`);
  }
  // Iso crossings against the exact ones.
  const headPanel = plan.panels.find((p) => p.quantity === 'head') as PanelPlan;
  const cal = replay.calibrations.get(headPanel.id);
  const flowSpan = headPanel.x.max - headPanel.x.min;
  const heads = plan.lines.filter((l) => l.quantity === 'head' && l.iso === undefined && outcomes.has(l.id)).map((l) => ({ key: l.diameter as number, points: (outcomes.get(l.id) as { points: SheetPoint[] }).points }));
  for (const line of plan.lines) {
    if (line.iso === undefined) continue;
    const o = outcomes.get(line.id);
    const branch = line.id.endsWith('right') ? 1 : 0;
    const parts: string[] = [];
    const got = replay.crossings.get(line.id) ?? [];
    for (const d of plan.family.diameters) {
      const want = isoFlows(plan.family, d, line.iso)[branch];
      const onSheet = want !== undefined && line.flows.length > 0 && want >= Math.min(...line.flows) - 1e-9 && want <= Math.max(...line.flows) + 1e-9;
      const mine = got.filter((c) => c.key === d).map((c) => (cal ? cal.toData(c.at)[0] : Number.NaN));
      const err = onSheet && mine.length > 0 ? Math.min(...mine.map((q) => (100 * Math.abs(q - (want as number))) / flowSpan)) : Number.NaN;
      parts.push(`${d}: ${mine.length}/${onSheet ? 1 : 0}${Number.isFinite(err) ? ` (${err.toFixed(2)} %)` : ''}`);
    }
    const guides = (takeoff.traces.find((t) => t.id === line.id) as Trace | undefined)?.guides ?? [];
    const onCrossing = guides.filter((g) => heads.some((h) => nearestOnPolyline(h.points, g as unknown as SheetPoint).distance < 4)).length;
    const headOutcomes = replay.traces.filter((t) => t.id.startsWith('head-') && t.lineWidth !== undefined).map((t) => ({ points: t.points, width: t.lineWidth as number }));
    const moves = guidesOffCrossings(raster, guides.map(([x, y]) => sheetPoint(x, y)), headOutcomes).moved;
    const movedNote = moves.length > 0 ? { message: `guides ${moves.map((m) => `${m.index + 1} to (${m.to[0].toFixed(0)},${m.to[1].toFixed(0)}) ${nearestOnPolyline(line.points.map(inImage) as unknown as SheetPoint[], m.to).distance.toFixed(1)}px`).join(', ')} sat` } : undefined;
    process.stdout.write(`  ${line.id.padEnd(18)} guides ${guides.map((g) => `(${g[0].toFixed(0)},${g[1].toFixed(0)}) ${nearestOnPolyline(line.points.map(inImage) as unknown as SheetPoint[], g as unknown as SheetPoint).distance.toFixed(1)}px`).join(' ')}${movedNote ? ' moved: ' + movedNote.message.replace(/^.*guides? ([\d, ]+) sat.*$/, '$1') : ''}\n`);
    process.stdout.write(`  ${line.id.padEnd(18)} crossings per head (found/drawn, flow error % of axis): ${parts.join('  ')}; guides on a head line ${onCrossing}/${guides.length}\n`);
  }
  for (const s of scoreReplay(meta.family, meta.truth, replay.curveSet)) {
    if (isoOnly && s.source !== 'iso') continue;
    if (s.wrong) process.stdout.write(`  WRONG ${s.id} ${Number.isFinite(s.error) ? s.error.toFixed(2) : 'missing'}${s.flagged ? ` flagged (${[...new Set(s.flags)].join(', ')})` : ' UNFLAGGED'}\n`);
  }
}

const args = process.argv.slice(2);
for (const seed of seedsFrom(args)) await dump(seed, args.includes('--iso'));
