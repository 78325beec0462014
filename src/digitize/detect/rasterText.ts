/**
 * Text on a level scan, for the tick labels and axis titles: connected blots of ink outside
 * the frames, grouped into words along rows; crops of those words set one under another on a
 * clean page (a mosaic) so that one call of the character reader reads them all; and the
 * reader's words mapped back to their crops.
 *
 * The reader itself is handed in (TextReader): the core holds no recogniser, no file and no
 * worker. The Node one is src/digitize/loaders/ocrNode.ts.
 *
 * Pure.
 */
import { floodPiece } from '../flood.ts';
import type { RasterImage } from '../raster.ts';
import type { InkMap, Level } from './ink.ts';
import type { Box } from './panels.ts';

/** A grey picture for the reader: one byte a pixel, 255 paper, 0 black. */
export interface GreyImage {
  readonly width: number;
  readonly height: number;
  readonly grey: Uint8Array;
}

export interface ReadWord {
  text: string;
  /** The reader's own confidence, 0–100. */
  confidence: number;
  /** [left, top, right, bottom] in the picture read, pixels. */
  box: Box;
}

/** Reads the words of a picture; `digits` limits the reader to the characters of tick labels. */
export interface TextReader {
  read(image: GreyImage, what: 'digits' | 'words'): Promise<ReadWord[]>;
}

/** A blot or a word: box [left, top, right, bottom) in whole level pixels. */
export interface Blot {
  l: number;
  t: number;
  r: number;
  b: number;
}

/**
 * Connected blots of ink (8-neighbours) at or above `threshold`, outside the frames (inset 3 px),
 * at most `maxSize` on a side. With `word`, a wider blot is kept too when it is as tall as a line
 * of text, no wider than `word.maxWidth` and filled like print (`word.fill` of its box or more):
 * labels whose glyphs the scan ran together, never a stretch of a thin line. Only the iso labels
 * are looked for so (rasterCurves.ts, `runTogetherWords`); the curve labels and the line finder's
 * holes keep the size limit.
 */
export function inkBlots(map: InkMap, threshold: number, frames: readonly Box[], maxSize: number, word?: { minHeight: number; maxHeight: number; maxWidth: number; fill: number }): Blot[] {
  const { width, height, ink } = map;
  const seen = new Uint8Array(width * height);
  for (const [l, t, r, b] of frames) {
    for (let y = Math.max(0, Math.ceil(t + 3)); y < Math.min(height, Math.floor(b - 3)); y++) seen.fill(1, y * width + Math.max(0, Math.ceil(l + 3)), y * width + Math.min(width, Math.floor(r - 3)));
  }
  const blots: Blot[] = [];
  const take = (n: number) => {
    if (seen[n] || (ink[n] as number) < threshold) return false;
    seen[n] = 1;
    return true;
  };
  for (let i = 0; i < ink.length; i++) {
    if (!take(i)) continue;
    let l = width;
    let t = height;
    let r = 0;
    let b = 0;
    let count = 0;
    floodPiece(i, width, height, take, (_, x, y) => {
      count++;
      if (x < l) l = x;
      if (x > r) r = x;
      if (y < t) t = y;
      if (y > b) b = y;
    });
    const bw = r - l + 1;
    const bh = b - t + 1;
    const wordLike = word !== undefined && bh >= word.minHeight && bh <= word.maxHeight && bw <= word.maxWidth && count >= word.fill * bw * bh;
    if (count >= 3 && ((bw <= maxSize && bh <= maxSize) || wordLike)) blots.push({ l, t, r: r + 1, b: b + 1 });
  }
  return blots;
}

/** Blots joined into words along a row: overlapping rows and a gap under 0.6 of the taller one's height. */
export function wordsOf(blots: readonly Blot[]): Blot[] {
  const sorted = [...blots].sort((a, b) => a.l - b.l);
  const parent = sorted.map((_, i) => i);
  const tallest = Math.max(0, ...sorted.map((b) => b.b - b.t));
  // The common glyph height: a dot joins only a blot of about that height (a digit), never a long upright word.
  const heights = sorted.map((b) => b.b - b.t).sort((x, y) => x - y);
  const glyph = heights[Math.floor(heights.length / 2)] ?? 0;
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i] as number)));
  for (let i = 0; i < sorted.length; i++) {
    const a = sorted[i] as Blot;
    const ha = a.b - a.t;
    for (let j = i + 1; j < sorted.length; j++) {
      const c = sorted[j] as Blot;
      const hc = c.b - c.t;
      const tall = Math.max(ha, hc);
      if (c.l - a.r > 0.6 * tallest) break;
      const overlap = Math.min(a.b, c.b) - Math.max(a.t, c.t);
      if (overlap < 0.5 * Math.min(ha, hc)) continue;
      // A dot, comma or minus beside digits joins (small both ways); otherwise the two must be of
      // about one height, and the gap is measured by the smaller (a tall blot, such as an upright
      // title, does not swallow the labels beside it).
      const small = ha <= hc ? a : c;
      const dot = Math.min(ha, hc) <= 0.45 * tall && small.r - small.l <= 0.6 * tall && tall <= 1.6 * glyph;
      if (!dot && Math.abs(ha - hc) > 0.35 * tall) continue;
      if (c.l - a.r > 0.6 * (dot ? tall : Math.min(ha, hc))) continue;
      parent[find(j)] = find(i);
    }
  }
  const words = new Map<number, Blot>();
  sorted.forEach((b, i) => {
    const k = find(i);
    const w = words.get(k);
    words.set(k, w ? { l: Math.min(w.l, b.l), t: Math.min(w.t, b.t), r: Math.max(w.r, b.r), b: Math.max(w.b, b.b) } : { ...b });
  });
  return [...words.values()];
}

export interface Crop {
  box: Blot;
  /** Turned a quarter clockwise before reading (text written upwards). */
  upright: boolean;
}

export interface CropReading {
  text: string;
  confidence: number;
}

/**
 * Reads crops in one call: each crop enlarged so its height (level text) or width (upright
 * text) is about `across` pixels (40 unless a second reading asks for another size), drawn dark on white with its ink stretched to full contrast, one
 * under another with a line's gap between; the reader's words go back to the crop they lie on.
 */
export async function readCrops(map: InkMap, crops: readonly Crop[], reader: TextReader, what: 'digits' | 'words', inkFull: number, across = 40): Promise<CropReading[]> {
  if (crops.length === 0) return [];
  const pad = 6;
  const placed: { y0: number; y1: number; w: number; h: number; k: number }[] = [];
  let y = 20;
  let width = 0;
  for (const c of crops) {
    const size = c.upright ? c.box.r - c.box.l : c.box.b - c.box.t;
    const k = Math.max(1, Math.min(6, across / Math.max(1, size)));
    const w = Math.round((c.upright ? c.box.b - c.box.t : c.box.r - c.box.l) * k) + 2 * pad;
    const h = Math.round(size * k) + 2 * pad;
    placed.push({ y0: y, y1: y + h, w, h, k });
    y += h + Math.max(24, Math.round(0.8 * h));
    width = Math.max(width, w + 40);
  }
  const height = y + 20;
  const grey = new Uint8Array(width * height).fill(255);
  crops.forEach((c, i) => {
    const p = placed[i] as (typeof placed)[number];
    for (let oy = 0; oy < p.h - 2 * pad; oy++) {
      for (let ox = 0; ox < p.w - 2 * pad; ox++) {
        // Level crop: (ox, oy) ← (l + ox/k, t + oy/k). Upright crop turned clockwise: (ox, oy) ← (l + oy/k, b − ox/k).
        const sx = c.upright ? c.box.l + (oy + 0.5) / p.k - 0.5 : c.box.l + (ox + 0.5) / p.k - 0.5;
        const sy = c.upright ? c.box.b - (ox + 0.5) / p.k - 0.5 : c.box.t + (oy + 0.5) / p.k - 0.5;
        const v = sample(map, sx, sy);
        grey[(p.y0 + pad + oy) * width + 20 + pad + ox] = 255 - Math.min(255, Math.round((255 * v) / inkFull));
      }
    }
  });
  const words = await reader.read({ width, height, grey }, what);
  const out: CropReading[] = crops.map(() => ({ text: '', confidence: 100 }));
  const parts: { x: number; text: string; confidence: number }[][] = crops.map(() => []);
  for (const w of words) {
    const cy = (w.box[1] + w.box[3]) / 2;
    const i = placed.findIndex((p) => cy >= p.y0 - 4 && cy <= p.y1 + 4);
    if (i >= 0) parts[i]!.push({ x: w.box[0], text: w.text, confidence: w.confidence });
  }
  parts.forEach((list, i) => {
    list.sort((a, b) => a.x - b.x);
    out[i] = { text: list.map((p) => p.text).join(what === 'digits' ? '' : ' ').trim(), confidence: list.length ? Math.min(...list.map((p) => p.confidence)) : 0 };
  });
  return out;
}

function sample(map: InkMap, x: number, y: number): number {
  const x0 = Math.floor(x);
  const y0 = Math.floor(y);
  if (x0 < 0 || y0 < 0 || x0 >= map.width - 1 || y0 >= map.height - 1) return 0;
  const fx = x - x0;
  const fy = y - y0;
  const i = y0 * map.width + x0;
  const a = map.ink[i] as number;
  const b = map.ink[i + 1] as number;
  const c = map.ink[i + map.width] as number;
  const d = map.ink[i + map.width + 1] as number;
  return a + fx * (b - a) + fy * (c + fx * (d - c) - a - fx * (b - a));
}

/**
 * Labels read again, more carefully, where the first reading named no curve: each label's box
 * widened right over the ink beside it on its row (a unit, an inch mark or the decimals the word
 * grouping left apart: "8." and "625"", "19" and "7 mm"), the ink taken from the picture's
 * colour (coloured print counts as dark as its darkest colour channel shows it, not as its
 * brightness: orange text is nearly black on the blue channel) less the grid's darkness (the
 * level ink `raw` less the grid-free ink `plain`, which starts at level column `at[0]`, row
 * `at[1]`: the grid is grey, so a stroke of coloured print crossing a grid line keeps what the
 * grid-free ink lost of it), each crop stretched to its own full contrast. Returns a picture of
 * the crops one under another and the crops in it, for `readCrops` with full ink 255, and each
 * label's widened box. Boxes are level pixels; `level` maps them to the image's pixels.
 */
export function labelPicture(image: RasterImage, level: Level, raw: InkMap, plain: InkMap, at: readonly [number, number], boxes: readonly Blot[]): { map: InkMap; crops: Crop[]; boxes: Blot[] } {
  const parts: { l: number; t: number; w: number; h: number; ink: Uint8Array; cl: number; cr: number }[] = [];
  for (const word of boxes) {
    const h = Math.max(4, word.b - word.t);
    // The word's row, from a little left of it to three text heights right.
    const l = Math.max(at[0], Math.floor(word.l - 3));
    const r = Math.min(at[0] + plain.width, Math.ceil(word.r + 3 * h));
    const t = Math.max(at[1], Math.floor(word.t - 0.25 * h));
    const b = Math.min(at[1] + plain.height, Math.ceil(word.b + 0.25 * h));
    const w = Math.max(1, r - l);
    const hh = Math.max(1, b - t);
    const ink = colourInk(image, level, raw, plain, at, l, t, w, hh);
    // Full contrast: the crop's own dark ink (the 98th percentile of its inked pixels).
    const full = Math.max(24, percentileInk(ink, 0.98));
    for (let i = 0; i < ink.length; i++) ink[i] = Math.min(255, Math.round(((ink[i] as number) * 255) / full));
    const right = labelRight(ink, w, hh, word.r - l, h);
    parts.push({ l, t, w, h: hh, ink, cl: 0, cr: Math.min(w, right + 2) });
  }
  const width = Math.max(1, ...parts.map((p) => p.w));
  const height = Math.max(1, parts.reduce((s, p) => s + p.h + 4, 0));
  const out = new Uint8Array(width * height);
  const crops: Crop[] = [];
  let y = 0;
  for (const p of parts) {
    for (let k = 0; k < p.h; k++) out.set(p.ink.subarray(k * p.w, (k + 1) * p.w), (y + k) * width);
    crops.push({ box: { l: p.cl, t: y, r: p.cr, b: y + p.h }, upright: false });
    y += p.h + 4;
  }
  return { map: { width, height, ink: out }, crops, boxes: parts.map((p) => ({ l: p.l + p.cl, t: p.t, r: p.l + p.cr, b: p.t + p.h })) };
}

/**
 * The darkness of a region (w × hh from level column l, row t) on its darkest colour channel,
 * each channel against the region's paper (its 85th percentile), less the grid's darkness there
 * (`raw` less `plain`; see labelPicture).
 */
function colourInk(image: RasterImage, level: Level, raw: InkMap, plain: InkMap, at: readonly [number, number], l: number, t: number, w: number, hh: number): Uint8Array {
  const rgb = new Float32Array(3 * w * hh);
  const { width, height, data } = image;
  for (let y = 0; y < hh; y++) {
    for (let x = 0; x < w; x++) {
      const [ix, iy] = level.toImage(l + x + 0.5, t + y + 0.5);
      const x0 = Math.max(0, Math.min(width - 2, Math.floor(ix - 0.5)));
      const y0 = Math.max(0, Math.min(height - 2, Math.floor(iy - 0.5)));
      const fx = Math.max(0, Math.min(1, ix - 0.5 - x0));
      const fy = Math.max(0, Math.min(1, iy - 0.5 - y0));
      for (let c = 0; c < 3; c++) {
        const i = 4 * (y0 * width + x0) + c;
        const a = data[i] as number;
        const b = data[i + 4] as number;
        const d = data[i + 4 * width] as number;
        const e = data[i + 4 * width + 4] as number;
        const top = a + fx * (b - a);
        rgb[3 * (y * w + x) + c] = top + fy * (d + fx * (e - d) - top);
      }
    }
  }
  const paper = [0, 1, 2].map((c) => {
    const vs: number[] = [];
    for (let i = c; i < rgb.length; i += 3) vs.push(rgb[i] as number);
    vs.sort((p, q) => p - q);
    return vs[Math.floor(0.85 * (vs.length - 1))] as number;
  }) as [number, number, number];
  const ink = new Uint8Array(w * hh);
  for (let y = 0; y < hh; y++) {
    for (let x = 0; x < w; x++) {
      const u = l + x;
      const v = t + y;
      const grid = Math.max(0, (raw.ink[v * raw.width + u] as number) - (plain.ink[(v - at[1]) * plain.width + (u - at[0])] as number));
      const k = 3 * (y * w + x);
      const dark = Math.max(paper[0] - (rgb[k] as number), paper[1] - (rgb[k + 1] as number), paper[2] - (rgb[k + 2] as number));
      ink[y * w + x] = Math.max(0, Math.min(255, Math.round(dark - grid)));
    }
  }
  return ink;
}

function percentileInk(ink: Uint8Array, q: number): number {
  const hist = new Uint32Array(256);
  let n = 0;
  for (const v of ink) if (v > 0) (hist[v]!++, n++);
  let seen = 0;
  for (let v = 0; v < 256; v++) if ((seen += hist[v] as number) >= q * n) return v;
  return 255;
}

/**
 * The right end of a label in its region (ink at full contrast): from the word's right column
 * `wr`, widened over inked columns with gaps of at most 0.6 text heights, up to where a line
 * begins: a run of columns whose ink is thin across (under 0.4 text heights) and longer than 0.8
 * text heights is a line's stub, not print.
 */
function labelRight(ink: Uint8Array, w: number, hh: number, wr: number, h: number): number {
  const extent = new Float32Array(w);
  for (let x = 0; x < w; x++) {
    let top = -1;
    let bottom = -1;
    for (let y = 0; y < hh; y++) {
      if ((ink[y * w + x] as number) < 96) continue;
      if (top < 0) top = y;
      bottom = y;
    }
    extent[x] = top < 0 ? 0 : bottom - top + 1;
  }
  const thin = (x: number) => (extent[x] as number) > 0 && (extent[x] as number) < 0.4 * h;
  const lineFrom = (x: number) => {
    let n = 0;
    for (let k = x; k < w && thin(k); k++) n++;
    return n > 0.8 * h;
  };
  let r = Math.max(0, Math.min(w, Math.round(wr)));
  for (let x = r, gap = 0; x < w; x++) {
    if ((extent[x] as number) === 0) {
      if (++gap > 0.6 * h) break;
      continue;
    }
    if (lineFrom(x)) break;
    gap = 0;
    r = x + 1;
  }
  return r;
}
