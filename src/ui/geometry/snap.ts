/**
 * Where an anchor or a frame corner should land near a click: on the crossing of two grid
 * lines, on the end or foot of a tick mark, or on a single straight line. Vector sheets
 * give their straight strokes; scans give their pixels. Sheet units throughout.
 */
import type { RasterImage } from '../../digitize/raster.ts';
import type { VectorPath } from '../../digitize/sheet.ts';

export type XY = readonly [number, number];

export interface Snap {
  at: [number, number];
  what: 'crossing' | 'tick' | 'line';
}

/** A straight piece of a stroke that runs level or upright (within about 1°). */
export interface Straight {
  a: XY;
  b: XY;
  level: boolean;
}

const SLOPE = 0.02;

/** The level and upright straight pieces of the stroked paths of a page. */
export function straightPieces(paths: readonly VectorPath[]): Straight[] {
  const out: Straight[] = [];
  for (const path of paths) {
    if (path.stroke === null && path.fill === null) continue;
    let start: XY | null = null;
    let last: XY | null = null;
    for (const seg of path.segments) {
      if (seg.kind === 'move') {
        start = last = seg.to;
        continue;
      }
      const to: XY | null = seg.kind === 'close' ? start : seg.to;
      if (seg.kind !== 'cubic' && last && to) {
        const dx = to[0] - last[0];
        const dy = to[1] - last[1];
        const len = Math.hypot(dx, dy);
        if (len > 0 && Math.abs(dy) <= SLOPE * len) out.push({ a: last, b: to, level: true });
        else if (len > 0 && Math.abs(dx) <= SLOPE * len) out.push({ a: last, b: to, level: false });
      }
      last = to;
    }
  }
  return out;
}

function within(v: number, a: number, b: number, slack: number): boolean {
  return v >= Math.min(a, b) - slack && v <= Math.max(a, b) + slack;
}

/**
 * The best snap for `p` among straight pieces within `radius`: crossings first, then the ends
 * of short pieces (tick marks), then the foot on the nearest line. Null when nothing is near.
 */
export function snapToStraights(pieces: readonly Straight[], p: XY, radius: number): Snap | null {
  const near = pieces.filter((s) => within(p[0], s.a[0], s.b[0], radius) && within(p[1], s.a[1], s.b[1], radius));
  const level = near.filter((s) => s.level);
  const upright = near.filter((s) => !s.level);
  const candidates: { at: [number, number]; what: Snap['what']; d: number }[] = [];
  const slack = 0.25;
  for (const h of level) {
    const y = (h.a[1] + h.b[1]) / 2;
    for (const v of upright) {
      const x = (v.a[0] + v.b[0]) / 2;
      if (within(x, h.a[0], h.b[0], slack) && within(y, v.a[1], v.b[1], slack)) candidates.push({ at: [x, y], what: 'crossing', d: Math.hypot(x - p[0], y - p[1]) });
    }
  }
  for (const s of near) {
    const len = Math.hypot(s.b[0] - s.a[0], s.b[1] - s.a[1]);
    if (len > 4 * radius) continue;
    for (const e of [s.a, s.b]) candidates.push({ at: [e[0], e[1]], what: 'tick', d: Math.hypot(e[0] - p[0], e[1] - p[1]) });
  }
  const best = pickNearest(candidates, radius);
  if (best) return best;
  const feet = near.map((s) => {
    const at: [number, number] = s.level ? [p[0], (s.a[1] + s.b[1]) / 2] : [(s.a[0] + s.b[0]) / 2, p[1]];
    return { at, what: 'line' as const, d: Math.hypot(at[0] - p[0], at[1] - p[1]) };
  });
  return pickNearest(feet, radius);
}

function pickNearest(candidates: { at: [number, number]; what: Snap['what']; d: number }[], radius: number): Snap | null {
  let best: (typeof candidates)[number] | null = null;
  for (const c of candidates) if (c.d <= radius && (!best || c.d < best.d)) best = c;
  return best ? { at: best.at, what: best.what } : null;
}

/**
 * Snapping on a scan: within a square window around `p`, rows and columns that are mostly
 * ink are lines. Their ink-weighted centres give the crossing (or the single line).
 * `radius` is in sheet units; the window is at least 5 pixels either side.
 */
export function snapToRaster(image: RasterImage, p: XY, radius: number): Snap | null {
  const cx = p[0] * image.scale;
  const cy = p[1] * image.scale;
  const r = Math.max(5, Math.round(radius * image.scale));
  const x0 = Math.max(0, Math.floor(cx - r));
  const y0 = Math.max(0, Math.floor(cy - r));
  const x1 = Math.min(image.width - 1, Math.ceil(cx + r));
  const y1 = Math.min(image.height - 1, Math.ceil(cy + r));
  const w = x1 - x0 + 1;
  const h = y1 - y0 + 1;
  if (w < 3 || h < 3) return null;
  const ink = new Float32Array(w * h);
  let paper = 0;
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = ((y0 + y) * image.width + (x0 + x)) * 4;
      const lum = 0.299 * (image.data[i] as number) + 0.587 * (image.data[i + 1] as number) + 0.114 * (image.data[i + 2] as number);
      ink[y * w + x] = lum;
      if (lum > paper) paper = lum;
    }
  }
  if (paper < 64) return null;
  for (let k = 0; k < ink.length; k++) ink[k] = Math.max(0, 1 - (ink[k] as number) / paper);
  const rows = new Float32Array(h);
  const cols = new Float32Array(w);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    const v = ink[y * w + x] as number;
    rows[y] = (rows[y] as number) + v / w;
    cols[x] = (cols[x] as number) + v / h;
  }
  const row = strongestRun(rows, 0.45);
  const col = strongestRun(cols, 0.45);
  const toSheet = (x: number, y: number): [number, number] => [(x0 + x + 0.5) / image.scale, (y0 + y + 0.5) / image.scale];
  if (row !== null && col !== null) return { at: toSheet(col, row), what: 'crossing' };
  // A tick mark is shorter than the window: look for half-strength runs across a found line.
  if (row !== null) {
    const tick = strongestRun(cols, 0.2);
    if (tick !== null) return { at: toSheet(tick, row), what: 'tick' };
    return { at: [p[0], toSheet(0, row)[1]], what: 'line' };
  }
  if (col !== null) {
    const tick = strongestRun(rows, 0.2);
    if (tick !== null) return { at: toSheet(col, tick), what: 'tick' };
    return { at: [toSheet(col, 0)[0], p[1]], what: 'line' };
  }
  return null;
}

/** Ink-weighted centre of the strongest run of values above `threshold`, or null. */
export function strongestRun(values: Float32Array, threshold: number): number | null {
  let best: { centre: number; mass: number } | null = null;
  let i = 0;
  while (i < values.length) {
    if ((values[i] as number) < threshold) {
      i++;
      continue;
    }
    let mass = 0;
    let moment = 0;
    let j = i;
    while (j < values.length && (values[j] as number) >= threshold) {
      mass += values[j] as number;
      moment += j * (values[j] as number);
      j++;
    }
    if (!best || mass > best.mass) best = { centre: moment / mass, mass };
    i = j;
  }
  return best ? best.centre : null;
}
