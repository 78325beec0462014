/**
 * Picture of one trace of the random bed, to see where a trace leaves its line: the sheet
 * cropped around the drawn line, with the guides (blue), the captured points (red) and the
 * drawn line (green dots).
 *
 *   npx tsx scripts/randomSheets/traceView.ts 12 efficiency-10.5 /tmp/out.png
 */
import sharp from 'sharp';
import type { Trace } from '../../src/model/takeoff.ts';
import { applyH } from './camera.ts';
import { bedReplay } from './bedReplay.ts';

const [seedArg, id, out = '/tmp/view.png', zoomArg = '3'] = process.argv.slice(2);
const seed = Number(seedArg);
const zoom = Number(zoomArg);
const { plan, shot, raster, takeoff, replay } = await bedReplay(seed);
const line = plan.lines.find((l) => l.id === id);
if (!line) throw new Error(`no line ${id}`);
const truth = line.points.map((p) => applyH(shot.h, p));
const traced = replay.traces.find((t) => t.id === id)?.points ?? [];
const guides = (takeoff.traces.find((t) => t.id === id) as Trace | undefined)?.guides ?? [];
const xs = [...truth.map((p) => p[0]), ...guides.map((g) => g[0]), ...traced.map((p) => p[0])];
const ys = [...truth.map((p) => p[1]), ...guides.map((g) => g[1]), ...traced.map((p) => p[1])];
const x0 = Math.max(0, Math.floor(Math.min(...xs) - 20));
const y0 = Math.max(0, Math.floor(Math.min(...ys) - 20));
const x1 = Math.min(raster.width, Math.ceil(Math.max(...xs) + 20));
const y1 = Math.min(raster.height, Math.ceil(Math.max(...ys) + 20));
const w = (x1 - x0) * zoom;
const h = (y1 - y0) * zoom;
const buf = Buffer.alloc(w * h * 4);
for (let y = 0; y < h; y++) {
  for (let x = 0; x < w; x++) {
    const si = ((y0 + Math.floor(y / zoom)) * raster.width + x0 + Math.floor(x / zoom)) * 4;
    const di = (y * w + x) * 4;
    buf[di] = raster.data[si] as number;
    buf[di + 1] = raster.data[si + 1] as number;
    buf[di + 2] = raster.data[si + 2] as number;
    buf[di + 3] = 255;
  }
}
const dot = (p: readonly [number, number], rgb: [number, number, number], r: number) => {
  const cx = (p[0] - x0) * zoom;
  const cy = (p[1] - y0) * zoom;
  for (let y = Math.floor(cy - r); y <= cy + r; y++) {
    for (let x = Math.floor(cx - r); x <= cx + r; x++) {
      if (x < 0 || y < 0 || x >= w || y >= h) continue;
      const di = (y * w + x) * 4;
      buf[di] = rgb[0];
      buf[di + 1] = rgb[1];
      buf[di + 2] = rgb[2];
    }
  }
};
for (const p of truth) dot(p, [0, 200, 0], 0.5);
for (const p of traced) dot(p, [255, 0, 0], 1);
for (const g of guides) dot(g, [0, 0, 255], 3);
await sharp(buf, { raw: { width: w, height: h, channels: 4 } }).png().toFile(out);
console.log(`${out}: ${w}x${h}, crop ${x0},${y0}–${x1},${y1}; ${guides.length} guides at ${guides.map((g) => `(${g[0].toFixed(0)},${g[1].toFixed(0)})`).join(' ')}`);
