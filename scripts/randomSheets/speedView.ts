/**
 * Picture of one trace of a speed sheet (speedSheet.ts), as traceView.ts draws one of the random
 * bed: the sheet cropped around the trace, its guides (blue), the replay's points (red) and the
 * drawn lines of every speed of the same quantity (green for the trace's own, yellow the others).
 *
 *   SPEED_KIND=scan npx tsx scripts/randomSheets/speedView.ts 10 efficiency-1450 /tmp/out.png [zoom]
 */
import sharp from 'sharp';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { applyH, decode } from './camera.ts';
import { benchOptions, cachedSpeedSheet, sheetOf } from './speedDump.ts';

const [seedArg, id, out = '/tmp/speed-view.png', zoomArg = '1'] = process.argv.slice(2);
const seed = Number(seedArg);
const zoom = Number(zoomArg);
const kind = (process.env.SPEED_KIND ?? 'scan') as 'scan' | 'vector';
const s = await cachedSpeedSheet(seed, benchOptions(seed, kind));
const sheet = await sheetOf(s);
const result = await replayTakeoff(parseTakeoff(s.takeoff), sheet, { created: '2026-01-01T00:00:00.000Z' });
await sheet.close();
const d = await decode(Buffer.from(s.bytes));
const line = s.plan.lines.find((l) => l.id === id);
if (!line) throw new Error(`no line ${id}`);
const toShot = (p: readonly [number, number]) => applyH(s.shot.h, p);
const own = line.points.map(toShot);
const others = s.plan.lines.filter((l) => l.id !== id && l.quantity === line.quantity && l.panel === line.panel).map((l) => l.points.map(toShot));
const traced = (result.traces.find((t) => t.id === id)?.points ?? []).map((p) => [p[0], p[1]] as [number, number]);
const guides = (s.takeoff.traces.find((t) => t.id === id)?.guides ?? []) as Array<[number, number]>;
const xs = [...own.map((p) => p[0]), ...guides.map((g) => g[0])];
const ys = [...own.map((p) => p[1]), ...guides.map((g) => g[1])];
const x0 = Math.max(0, Math.floor(Math.min(...xs) - 20));
const y0 = Math.max(0, Math.floor(Math.min(...ys) - 20));
const x1 = Math.min(d.width, Math.ceil(Math.max(...xs) + 20));
const y1 = Math.min(d.height, Math.ceil(Math.max(...ys) + 20));
const w = (x1 - x0) * zoom;
const h = (y1 - y0) * zoom;
const buf = Buffer.alloc(w * h * 4);
for (let y = 0; y < h; y++) {
  for (let x = 0; x < w; x++) {
    const i = ((y0 + Math.floor(y / zoom)) * d.width + x0 + Math.floor(x / zoom)) * 4;
    const o = (y * w + x) * 4;
    buf[o] = d.data[i] as number;
    buf[o + 1] = d.data[i + 1] as number;
    buf[o + 2] = d.data[i + 2] as number;
    buf[o + 3] = 255;
  }
}
const dot = (p: readonly [number, number], rgb: [number, number, number], r: number) => {
  const cx = (p[0] - x0) * zoom;
  const cy = (p[1] - y0) * zoom;
  for (let y = Math.floor(cy - r); y <= cy + r; y++) {
    for (let x = Math.floor(cx - r); x <= cx + r; x++) {
      if (x < 0 || y < 0 || x >= w || y >= h) continue;
      const o = (y * w + x) * 4;
      [buf[o], buf[o + 1], buf[o + 2]] = rgb;
    }
  }
};
for (const l of others) l.forEach((p, k) => k % 3 === 0 && dot(p, [230, 200, 0], 0.5));
own.forEach((p, k) => k % 3 === 0 && dot(p, [0, 170, 0], 0.5));
for (const p of traced) dot(p, [230, 0, 0], 1);
for (const g of guides) dot(g, [0, 0, 255], 2.5);
await sharp(buf, { raw: { width: w, height: h, channels: 4 } }).png().toFile(out);
process.stdout.write(`${out}: ${w}x${h}, crop ${x0},${y0}–${x1},${y1}; guides ${guides.map((g) => `(${g[0].toFixed(0)},${g[1].toFixed(0)})`).join(' ')}\n`);
