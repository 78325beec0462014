/**
 * Where a raster trace of the random bed stops short of its drawn line, and a picture of it:
 * for each named trace, the stretches of the drawn line the trace does not cover (by position
 * along the line), the trace's lost stretches and notes, and a crop (PNG, /tmp/pumpscribe-end-crops)
 * around each uncovered stretch's near end with the drawn line (green), the trace (red) and the
 * guides (blue) overlaid.
 *
 *   npx tsx scripts/randomSheets/endDump.ts 12:power-12 24:head-12.625
 */
import { mkdirSync } from 'node:fs';
import sharp from 'sharp';
import { nearestOnPolyline } from '../../src/digitize/polyline.ts';
import { applyH } from './camera.ts';
import { bedReplay } from './bedReplay.ts';
import type { SheetPoint } from '../../src/digitize/points.ts';

const out = '/tmp/pumpscribe-end-crops';
mkdirSync(out, { recursive: true });
const bySeed = new Map<number, string[]>();
for (const a of process.argv.slice(2)) {
  const [s, id] = a.split(':');
  bySeed.set(Number(s), [...(bySeed.get(Number(s)) ?? []), id ?? '']);
}
for (const [seed, ids] of bySeed) {
  const { plan, shot, raster, takeoff, replay } = await bedReplay(seed);
  for (const id of ids) {
    const line = plan.lines.find((l) => l.id === id);
    const o = replay.traces.find((t) => t.id === id);
    const t = takeoff.traces.find((x) => x.id === id);
    if (!line || !o || !t) { console.log(`${seed} ${id}: not found`); continue; }
    const truth = line.points.map((p) => applyH(shot.h, p)) as unknown as SheetPoint[];
    const near = Math.max(3, 2 * line.style.width);
    const cov = truth.map((p) => o.points.length > 0 && nearestOnPolyline(o.points, p).distance <= near);
    const gaps: [number, number][] = [];
    cov.forEach((c, i) => { if (!c) { const g = gaps[gaps.length - 1]; if (g && g[1] === i - 1) g[1] = i; else gaps.push([i, i]); } });
    console.log(`\n== ${seed} ${id} ${line.style.dash} w${line.style.width.toFixed(2)} ${line.style.colour} truth ${truth.length} pts, trace ${o.points.length} pts; guides ${(t.guides ?? []).map((g) => `(${g[0].toFixed(0)},${g[1].toFixed(0)})`).join(' ')}`);
    console.log(`   truth from (${truth[0]![0].toFixed(0)},${truth[0]![1].toFixed(0)}) to (${truth[truth.length - 1]![0].toFixed(0)},${truth[truth.length - 1]![1].toFixed(0)}); trace from ${o.points[0] ? `(${o.points[0][0].toFixed(0)},${o.points[0][1].toFixed(0)})` : '-'} to ${o.points.length ? `(${o.points[o.points.length - 1]![0].toFixed(0)},${o.points[o.points.length - 1]![1].toFixed(0)})` : '-'}`);
    for (const g of gaps) console.log(`   uncovered truth ${g[0]}..${g[1]} (${truth[g[0]]![0].toFixed(0)},${truth[g[0]]![1].toFixed(0)})..(${truth[g[1]]![0].toFixed(0)},${truth[g[1]]![1].toFixed(0)})`);
    const offs = o.points.map((p) => nearestOnPolyline(truth, p).distance);
    const bad = offs.map((d, i) => [d, i] as const).filter(([d]) => d > near);
    if (bad.length) console.log(`   trace points off the line (> ${near.toFixed(1)} px): ${bad.length} of ${offs.length}, worst ${Math.max(...offs).toFixed(1)} px at (${o.points[offs.indexOf(Math.max(...offs))]![0].toFixed(0)},${o.points[offs.indexOf(Math.max(...offs))]![1].toFixed(0)}); first off at (${o.points[bad[0]![1]]![0].toFixed(0)},${o.points[bad[0]![1]]![1].toFixed(0)})`);
    for (const l of o.lost ?? []) console.log(`   lost at (${l.at[0].toFixed(0)},${l.at[1].toFixed(0)}) ${l.reason}`);
    for (const n of o.notes) console.log(`   note: ${n}`);
    const findings = replay.curveSet.findings.filter((f) => f.subject.trace === id).map((f) => `${f.severity}:${f.code}`);
    console.log(`   findings ${findings.join(' ')}`);
    // Crops around the boundary of each uncovered stretch.
    let k = 0;
    for (const g of process.env.CROPS ? gaps : []) {
      const at = g[0] > 0 ? truth[g[0]]! : truth[g[1]]!;
      const R = 90;
      const x0 = Math.max(0, Math.round(at[0] - R));
      const y0 = Math.max(0, Math.round(at[1] - R));
      const w = Math.min(raster.width - x0, 2 * R);
      const h = Math.min(raster.height - y0, 2 * R);
      const buf = Buffer.alloc(w * h * 4);
      for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) { const s = ((y + y0) * raster.width + x + x0) * 4; const d = (y * w + x) * 4; for (let c = 0; c < 4; c++) buf[d + c] = raster.data[s + c]!; }
      const put = (p: readonly number[], rgb: [number, number, number]) => { const x = Math.round(p[0]! - x0); const y = Math.round(p[1]! - y0); if (x >= 0 && y >= 0 && x < w && y < h) { const d = (y * w + x) * 4; buf[d] = rgb[0]; buf[d + 1] = rgb[1]; buf[d + 2] = rgb[2]; } };
      const dense = (pts: readonly (readonly number[])[], rgb: [number, number, number], off: number) => { for (let i = 1; i < pts.length; i++) { const a = pts[i - 1]!, b = pts[i]!; const n = Math.ceil(Math.hypot(b[0]! - a[0]!, b[1]! - a[1]!)); for (let j = 0; j <= n; j++) put([a[0]! + ((b[0]! - a[0]!) * j) / n + off, a[1]! + ((b[1]! - a[1]!) * j) / n + off], rgb); } };
      dense(truth, [0, 200, 0], 6);
      dense(o.points, [255, 0, 0], -6);
      for (const gd of (t.guides ?? [])) for (let dx = -2; dx <= 2; dx++) put([gd[0] + dx, gd[1]], [0, 0, 255]);
      const file = `${out}/${seed}-${id}-${k++}.png`;
      await sharp(buf, { raw: { width: w, height: h, channels: 4 } }).resize(w * 3, h * 3, { kernel: 'nearest' }).png().toFile(file);
      console.log(`   crop ${file} around (${at[0].toFixed(0)},${at[1].toFixed(0)}) [truth drawn +6px, trace -6px]`);
    }
  }
}
