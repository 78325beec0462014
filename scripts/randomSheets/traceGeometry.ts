/**
 * Geometry of every raster trace of the random bed against the drawn line, without fitting:
 * how much of the line the trace covers (its first and last point along the truth, as shares of
 * the drawn line), how far its points stray from the line (p95 and max, pixels), and the line's
 * style, so that the styles that fail show at once. Reads the sheets the randomSheets bench
 * cached (artifacts/random-sheets/), drawing those it lacks.
 *
 *   TRACE_SHEETS=40 TRACE_SEED=1 npx tsx scripts/randomSheets/traceGeometry.ts [out.json] [--png seed trace]
 *
 * With --png it writes artifacts/trace-<seed>-<trace>.png: the sheet around the line, the truth
 * in green, the guides in blue, the trace in red.
 */
import { RENDER_VERSION } from './svg.ts';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { createCanvas } from '@napi-rs/canvas';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { applyH, decode } from './camera.ts';
import { makeRandomSheet, sheetGeometry } from './randomSheet.ts';
import type { TakeoffInput } from '../../src/model/takeoff.ts';

const CACHE = join(import.meta.dirname, '..', '..', 'artifacts', 'random-sheets', RENDER_VERSION);

export interface TraceGeometry {
  seed: number;
  kind: 'scan' | 'photo';
  id: string;
  quantity: string;
  iso: boolean;
  dash: string;
  width: number;
  dpi: number;
  mono: boolean;
  guides: number;
  /** Share of the drawn line (0–1) where the trace starts and ends (along the truth). */
  from: number;
  to: number;
  /** Distance of trace points from the drawn line, pixels. */
  p95: number;
  max: number;
  /** Share of trace points farther than max(2, width) px from the line. */
  offShare: number;
  lost: string[];
  doubts: string[];
  ms: number;
  /** Pixels read by the trace. */
  reads: number;
}

async function sheet(seed: number, kind: 'scan' | 'photo'): Promise<{ jpeg: Buffer; takeoff: TakeoffInput }> {
  const base = join(CACHE, `${seed}-${kind}`);
  if (existsSync(`${base}.jpg`)) return { jpeg: readFileSync(`${base}.jpg`), takeoff: (JSON.parse(readFileSync(`${base}.json`, 'utf8')) as { takeoff: TakeoffInput }).takeoff };
  const s = await makeRandomSheet(seed, kind);
  return { jpeg: s.jpeg, takeoff: s.takeoff };
}

/** Distance of `p` from a polyline, and where along it (0–1) the nearest point lies. */
export function nearest(truth: ReadonlyArray<readonly [number, number]>, p: readonly [number, number]): { k: number; d: number } {
  let best = 0;
  let bestD = Infinity;
  for (let k = 0; k + 1 < truth.length; k++) {
    const a = truth[k] as readonly [number, number];
    const b = truth[k + 1] as readonly [number, number];
    const vx = b[0] - a[0];
    const vy = b[1] - a[1];
    const l2 = vx * vx + vy * vy || 1;
    const t = Math.max(0, Math.min(1, ((p[0] - a[0]) * vx + (p[1] - a[1]) * vy) / l2));
    const d = Math.hypot(a[0] + t * vx - p[0], a[1] + t * vy - p[1]);
    if (d < bestD) {
      bestD = d;
      best = k + t;
    }
  }
  return { k: best / (truth.length - 1), d: bestD };
}

export async function dumpSheet(seed: number, png?: string): Promise<TraceGeometry[]> {
  const kind = seed % 3 === 2 ? 'photo' : 'scan';
  const { jpeg, takeoff } = await sheet(seed, kind);
  const { plan, shot } = sheetGeometry(seed, kind);
  const decoded = await decode(jpeg);
  const image = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
  const out: TraceGeometry[] = [];
  for (const trace of takeoff.traces) {
    if (png && trace.id !== png) continue;
    const line = plan.lines.find((l) => l.id === trace.id);
    if (!line || !trace.guides) continue;
    const truth = line.points.map((p) => applyH(shot.h, p));
    const frame = takeoff.panels.find((p) => p.id === trace.panel)?.frame;
    const t0 = performance.now();
    const got = traceRaster(image, trace.guides.map(([x, y]) => sheetPoint(x, y)), frame ? { frame } : {});
    const ms = performance.now() - t0;
    const near = got.points.map((p) => nearest(truth, p));
    const ds = near.map((n) => n.d).sort((a, b) => a - b);
    const onLine = near.filter((n) => n.d < Math.max(3, 1.5 * line.style.width));
    out.push({
      seed,
      kind,
      id: trace.id ?? line.id,
      quantity: trace.quantity,
      iso: line.iso !== undefined,
      dash: line.style.dash,
      width: Number(line.style.width.toFixed(2)),
      dpi: plan.dpi,
      mono: line.style.colour === '#111111',
      guides: trace.guides.length,
      from: onLine.length ? Math.min(...onLine.map((n) => n.k)) : Number.NaN,
      to: onLine.length ? Math.max(...onLine.map((n) => n.k)) : Number.NaN,
      p95: ds.length ? (ds[Math.floor(0.95 * (ds.length - 1))] as number) : Number.NaN,
      max: ds.length ? (ds[ds.length - 1] as number) : Number.NaN,
      offShare: ds.length ? ds.filter((d) => d > Math.max(2, line.style.width)).length / ds.length : Number.NaN,
      lost: got.lost.map((l) => l.reason),
      doubts: got.doubts.map((d) => d.code),
      ms,
      reads: got.pixelsRead,
    });
    if (png) {
      const xs = [...truth.map((p) => p[0]), ...got.points.map((p) => p[0])];
      const ys = [...truth.map((p) => p[1]), ...got.points.map((p) => p[1])];
      const x0 = Math.max(0, Math.floor(Math.min(...xs)) - 30);
      const y0 = Math.max(0, Math.floor(Math.min(...ys)) - 30);
      const x1 = Math.min(image.width, Math.ceil(Math.max(...xs)) + 30);
      const y1 = Math.min(image.height, Math.ceil(Math.max(...ys)) + 30);
      const zoom = Number(process.env.TRACE_ZOOM ?? 2);
      const canvas = createCanvas((x1 - x0) * zoom, (y1 - y0) * zoom);
      const ctx = canvas.getContext('2d');
      const img = ctx.createImageData(x1 - x0, y1 - y0);
      for (let y = y0; y < y1; y++) for (let x = x0; x < x1; x++) for (let c = 0; c < 4; c++) img.data[((y - y0) * (x1 - x0) + (x - x0)) * 4 + c] = image.data[(y * image.width + x) * 4 + c] as number;
      const small = createCanvas(x1 - x0, y1 - y0);
      small.getContext('2d').putImageData(img, 0, 0);
      ctx.imageSmoothingEnabled = false;
      ctx.drawImage(small, 0, 0, (x1 - x0) * zoom, (y1 - y0) * zoom);
      const path = (pts: ReadonlyArray<readonly [number, number]>, colour: string) => {
        ctx.strokeStyle = colour;
        ctx.lineWidth = 1;
        ctx.beginPath();
        pts.forEach((p, i) => (i === 0 ? ctx.moveTo((p[0] - x0) * zoom, (p[1] - y0) * zoom) : ctx.lineTo((p[0] - x0) * zoom, (p[1] - y0) * zoom)));
        ctx.stroke();
      };
      path(truth, 'rgba(0,200,0,0.6)');
      path(got.points, 'rgba(255,0,0,0.8)');
      ctx.fillStyle = 'blue';
      for (const g of trace.guides) ctx.fillRect((g[0] - x0) * zoom - 3, (g[1] - y0) * zoom - 3, 6, 6);
      mkdirSync(join(CACHE, '..', '..'), { recursive: true });
      writeFileSync(join(CACHE, '..', '..', `trace-${seed}-${trace.id}.png`), canvas.toBuffer('image/png'));
    }
  }
  return out;
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const pngAt = args.indexOf('--png');
  if (pngAt >= 0) {
    const rows = await dumpSheet(Number(args[pngAt + 1]), args[pngAt + 2]);
    process.stdout.write(`${JSON.stringify(rows, null, 1)}\n`);
    return;
  }
  const count = Number(process.env.TRACE_SHEETS ?? 40);
  const first = Number(process.env.TRACE_SEED ?? 1);
  const rows: TraceGeometry[] = [];
  for (let s = first; s < first + count; s++) rows.push(...(await dumpSheet(s)));
  const bad = rows.filter((r) => !(r.from < 0.05 && r.to > 0.95 && r.p95 < Math.max(1.5, r.width)));
  process.stdout.write(`${rows.length} traces; ${bad.length} short or off the line; trace time ${rows.reduce((s, r) => s + r.ms, 0).toFixed(0)} ms\n`);
  if (args[0]) writeFileSync(args[0], JSON.stringify(rows));
}

if (import.meta.url === `file://${process.argv[1]}`) await main();
