/**
 * The printed grid of a raster plot panel, found and taken out before curves are traced.
 *
 * A grid line is straight (a scan turns it by a degree or two, a photo's perspective turns each
 * line by its own angle), runs the whole frame, and has one cross-section all along it. A curve
 * is none of these. The grid is found in narrow strips across the frame: each strip's median
 * darkness per row (per column for upright lines) peaks where a grid line crosses it; peaks
 * linked strip to strip into a straight chain over most of the frame make a grid line. Its
 * cross-section is the median, along the whole line, of the darkness at each offset from it, so
 * that curves crossing it or running along part of it do not count.
 *
 * Taking a line out subtracts that cross-section from each pixel near it, in optical density
 * (−ln of the pixel over the paper, per channel): ink printed over ink darkens about as densities
 * add, and a curve much darker than the grid keeps most of its own. Where a curve is no darker
 * than the grid it crosses, it fades over the crossing, and the tracer bridges the short gap.
 *
 * The cost is kept to a few passes over the frame's pixels: lines are found on bytes (the median
 * of a strip is a byte's, its density looked up), the paper is counted on a quarter of the
 * pixels, and taking a line out reads its e^density from a table made once per line.
 *
 * Pure: works on the RGBA buffer only.
 */
import { fitLine } from './calibration.ts';
import type { RasterImage } from './raster.ts';

/** One grid line: `vertical` false means y = a + b·x, true means x = a + b·y (pixels). */
export interface GridLine {
  vertical: boolean;
  a: number;
  b: number;
  /** Half-width of the cross-section, pixels. */
  reach: number;
  /** Density per channel at offsets −reach … reach in steps of `PROFILE_STEP`: [r0, g0, b0, r1, …]. */
  profile: Float32Array;
}

/** Width of the strips the frame is cut into to find lines, half-resolution pixels (32 pixels: a 2° turn moves a line by about a pixel over it). */
const STRIP_PX = 16;
/** Least density above the strip's baseline of a grid line's peak (a pale grey grid line prints about 0.1). */
const PEAK_DENSITY = 0.025;
/** A peak also stands this many robust spreads (median absolute deviation) above the baseline. */
const PEAK_SPREADS = 4;
/** How far a line may move from one strip to the next beyond its slope, half-resolution pixels. */
const LINK_PX = 1;
/** Strips a chain may miss in a row (a label or a legend over the grid line). */
const LINK_SKIP = 6;
/** Least share of the frame's strips a grid line is seen in. */
const SPAN_SHARE = 0.7;
/**
 * Strips from each side of the frame within which a grid line is first and last seen (as many as a
 * chain may miss in a row, and one): a grid line runs from side to side, while a straight curve
 * (a power line, an iso-line) that crosses most of a wide frame starts or ends inside it and is no
 * grid line, however straight.
 */
const SIDE_STRIPS = LINK_SKIP + 1;
/**
 * A line whose densities spread over more than this share of their mean (`hueOf`), and over
 * `COLOURED_OVER` times the panel's typical grid line's (at least `HUE_FLOOR`), is coloured ink
 * apart from the grid's: an orange line spreads over 2 and more, a grey grid line on a scan about 0.1–0.3.
 */
const COLOURED_HUE = 0.8;
const COLOURED_OVER = 3;
const HUE_FLOOR = 0.2;
/** Largest root-mean-square distance of a chain's peaks from its straight line, half-resolution pixels (a curve bends away). */
const STRAIGHT_PX = 0.35;
/** A strip's peak farther than this from the chain's first line is left out of its second fit, half-resolution pixels. */
const OUTLIER_PX = 1;
/** Largest slope of a grid line against the frame's axes (a turned scan or a photo's perspective: about 6°). */
const MAX_SLOPE = 0.1;
/** Largest half-width of a cross-section, pixels, and the step of its offsets. */
const MAX_REACH_PX = 6;
const PROFILE_STEP = 0.5;
/** Steps per pixel of the offsets at which a line's e^density is tabled for taking it out: a pixel takes the nearest step's (one table per line instead of an exponential per pixel; the up to 1/128 px this moves a pixel changes its byte by a few grey levels at most, at a line's sharp sides only). */
const REMOVAL_STEPS_PX = 64;
/** Share of a block's pixels at or darker than its paper colour (grid and curves darken well under 40 % of a block). */
const PAPER_SHARE = 0.6;
/** Side of the blocks over which the paper colour is estimated, pixels (uneven light varies slowly), and its log2 (a block's index by a shift). */
const PAPER_BLOCK_SHIFT = 6;
const PAPER_BLOCK_PX = 1 << PAPER_BLOCK_SHIFT;

/** −ln((v + 1) / 256) for each byte value: a density table, so that density = LN[v] − LN[paper]. */
const LN = Float32Array.from({ length: 256 }, (_, v) => -Math.log((v + 1) / 256));

/** The rounded mean of 12 bytes from their sum (the 2 × 2 pixels' three channels of the half-resolution picture). */
const MEAN_OF_12 = Uint8Array.from({ length: 12 * 255 + 1 }, (_, sum) => Math.round(sum / 12));

type Box = readonly [number, number, number, number];

/**
 * The paper under a box: each channel's `PAPER_SHARE` percentile over blocks of `PAPER_BLOCK_PX`
 * (every other pixel of every other row read: the paper is most of a block), as densities (LN),
 * for densities against the local paper under uneven light. A pixel's paper is its block's
 * (light varies slowly, and a step of a level or two at a block's side is far below any line's
 * density): channel c of pixel (x, y) in the box is `values[3 · (j · cols + i) + c]`, with i and j
 * the block's column and row, `(x − l) >> PAPER_BLOCK_SHIFT` and `(y − t) >> PAPER_BLOCK_SHIFT`.
 */
interface Paper {
  /** The box's left and top, pixels. */
  l: number;
  t: number;
  cols: number;
  rows: number;
  values: Float32Array;
  /** The paper's bytes, as `values` (its densities) are laid out. */
  bytes: Uint8Array;
}

/** The paper under the box (pixels: left, top, right, bottom; whole pixels inside the image). */
function paperUnder(image: RasterImage, [l, t, r, b]: Box): Paper {
  const cols = Math.max(1, Math.ceil((r - l) / PAPER_BLOCK_PX));
  const rows = Math.max(1, Math.ceil((b - t) / PAPER_BLOCK_PX));
  const paper = new Float32Array(cols * rows * 3);
  const bytes = new Uint8Array(cols * rows * 3);
  // Two histograms a channel, for pixels in turn: counting the same value twice running
  // (the paper) waits on the count before.
  const counts = new Uint32Array(6 * 256);
  const data = image.data;
  for (let j = 0; j < rows; j++) {
    const y1 = Math.min(b, t + (j + 1) * PAPER_BLOCK_PX);
    for (let i = 0; i < cols; i++) {
      counts.fill(0);
      const x0 = l + i * PAPER_BLOCK_PX;
      const x1 = Math.min(r, x0 + PAPER_BLOCK_PX);
      let n = 0;
      for (let y = t + j * PAPER_BLOCK_PX; y < y1; y += 2) {
        const end = 4 * (y * image.width + x1);
        let o = 4 * (y * image.width + x0);
        for (; o + 8 < end; o += 16) {
          counts[data[o] as number]!++;
          counts[256 + (data[o + 1] as number)]!++;
          counts[512 + (data[o + 2] as number)]!++;
          counts[768 + (data[o + 8] as number)]!++;
          counts[1024 + (data[o + 9] as number)]!++;
          counts[1280 + (data[o + 10] as number)]!++;
          n += 2;
        }
        if (o < end) {
          counts[data[o] as number]!++;
          counts[256 + (data[o + 1] as number)]!++;
          counts[512 + (data[o + 2] as number)]!++;
          n++;
        }
      }
      const need = PAPER_SHARE * n;
      const at = 3 * (j * cols + i);
      for (let c = 0; c < 3; c++) {
        bytes[at + c] = percentile(counts, 256 * c, 256 * (c + 3), n, need);
        paper[at + c] = LN[bytes[at + c] as number] as number;
      }
    }
  }
  return { l, t, cols, rows, values: paper, bytes };
}

/**
 * The least byte value at which the running count of two histograms of `n` values together (at
 * `first` and `second` in `counts`) reaches `need`: counted down from 255, where the paper is.
 */
function percentile(counts: Uint32Array, first: number, second: number, n: number, need: number): number {
  // `seen` is the count at or below v.
  let seen = n;
  let v = 255;
  while (v > 0) {
    const below = seen - (counts[first + v] as number) - (counts[second + v] as number);
    if (below < need) break;
    seen = below;
    v--;
  }
  return v;
}

/**
 * Median of the first `n` values, none below zero (densities over the paper); reorders them
 * (selection in place, Hoare's partition). Over paper many values are zero (often most, and then
 * so is the median): the selection runs on the others only.
 */
function median(values: Float32Array, n: number): number {
  if (n <= 0) return 0;
  // The values above zero are moved to the front; the median is zero or the (k − zeros)th of them.
  let above = 0;
  for (let i = 0; i < n; i++) {
    const value = values[i] as number;
    values[above] = value;
    above += value > 0 ? 1 : 0;
  }
  const k = (n >> 1) - (n - above);
  if (k < 0) return 0;
  let lo = 0;
  let hi = above - 1;
  while (lo < hi) {
    const pivot = values[(lo + hi) >> 1] as number;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while ((values[i] as number) < pivot) i++;
      while ((values[j] as number) > pivot) j--;
      if (i <= j) {
        const tmp = values[i] as number;
        values[i] = values[j] as number;
        values[j] = tmp;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return values[k] as number;
}

/**
 * The eighth smallest of 16 bytes `values[o]`, `values[o + step]`, …: the low median, so that the
 * density of the median byte is the median density (density falls as the byte rises). Each half
 * of 8 is sorted by a sorting network, then the two sorted halves give their eighth smallest as
 * the least over i of max(first[i − 1], second[7 − i]).
 */
function lowMedian16(values: Uint8Array, o: number, step: number): number {
  let a0 = values[o] as number;
  let a1 = values[o + step] as number;
  let a2 = values[o + 2 * step] as number;
  let a3 = values[o + 3 * step] as number;
  let a4 = values[o + 4 * step] as number;
  let a5 = values[o + 5 * step] as number;
  let a6 = values[o + 6 * step] as number;
  let a7 = values[o + 7 * step] as number;
  let b0 = values[o + 8 * step] as number;
  let b1 = values[o + 9 * step] as number;
  let b2 = values[o + 10 * step] as number;
  let b3 = values[o + 11 * step] as number;
  let b4 = values[o + 12 * step] as number;
  let b5 = values[o + 13 * step] as number;
  let b6 = values[o + 14 * step] as number;
  let b7 = values[o + 15 * step] as number;
  let m: number;
  // Sorting network of 8 (19 compare-exchanges), on each half.
  if (a0 > a2) { m = a0; a0 = a2; a2 = m; }
  if (a1 > a3) { m = a1; a1 = a3; a3 = m; }
  if (a4 > a6) { m = a4; a4 = a6; a6 = m; }
  if (a5 > a7) { m = a5; a5 = a7; a7 = m; }
  if (a0 > a4) { m = a0; a0 = a4; a4 = m; }
  if (a1 > a5) { m = a1; a1 = a5; a5 = m; }
  if (a2 > a6) { m = a2; a2 = a6; a6 = m; }
  if (a3 > a7) { m = a3; a3 = a7; a7 = m; }
  if (a0 > a1) { m = a0; a0 = a1; a1 = m; }
  if (a2 > a3) { m = a2; a2 = a3; a3 = m; }
  if (a4 > a5) { m = a4; a4 = a5; a5 = m; }
  if (a6 > a7) { m = a6; a6 = a7; a7 = m; }
  if (a2 > a4) { m = a2; a2 = a4; a4 = m; }
  if (a3 > a5) { m = a3; a3 = a5; a5 = m; }
  if (a1 > a4) { m = a1; a1 = a4; a4 = m; }
  if (a3 > a6) { m = a3; a3 = a6; a6 = m; }
  if (a1 > a2) { m = a1; a1 = a2; a2 = m; }
  if (a3 > a4) { m = a3; a3 = a4; a4 = m; }
  if (a5 > a6) { m = a5; a5 = a6; a6 = m; }
  if (b0 > b2) { m = b0; b0 = b2; b2 = m; }
  if (b1 > b3) { m = b1; b1 = b3; b3 = m; }
  if (b4 > b6) { m = b4; b4 = b6; b6 = m; }
  if (b5 > b7) { m = b5; b5 = b7; b7 = m; }
  if (b0 > b4) { m = b0; b0 = b4; b4 = m; }
  if (b1 > b5) { m = b1; b1 = b5; b5 = m; }
  if (b2 > b6) { m = b2; b2 = b6; b6 = m; }
  if (b3 > b7) { m = b3; b3 = b7; b7 = m; }
  if (b0 > b1) { m = b0; b0 = b1; b1 = m; }
  if (b2 > b3) { m = b2; b2 = b3; b3 = m; }
  if (b4 > b5) { m = b4; b4 = b5; b5 = m; }
  if (b6 > b7) { m = b6; b6 = b7; b7 = m; }
  if (b2 > b4) { m = b2; b2 = b4; b4 = m; }
  if (b3 > b5) { m = b3; b3 = b5; b5 = m; }
  if (b1 > b4) { m = b1; b1 = b4; b4 = m; }
  if (b3 > b6) { m = b3; b3 = b6; b6 = m; }
  if (b1 > b2) { m = b1; b1 = b2; b2 = m; }
  if (b3 > b4) { m = b3; b3 = b4; b4 = m; }
  if (b5 > b6) { m = b5; b5 = b6; b6 = m; }
  // The eighth smallest of both: i of the first half's below it and 8 − i of the second's.
  let best = b7 < a7 ? b7 : a7;
  m = a0 > b6 ? a0 : b6;
  if (m < best) best = m;
  m = a1 > b5 ? a1 : b5;
  if (m < best) best = m;
  m = a2 > b4 ? a2 : b4;
  if (m < best) best = m;
  m = a3 > b3 ? a3 : b3;
  if (m < best) best = m;
  m = a4 > b2 ? a4 : b2;
  if (m < best) best = m;
  m = a5 > b1 ? a5 : b1;
  if (m < best) best = m;
  m = a6 > b0 ? a6 : b0;
  if (m < best) best = m;
  return best;
}

/**
 * Grid lines of one orientation in a half-resolution picture `luma` (w × h, row-major, luma
 * bytes) over paper of luma density `paperLuma` per paper block (`cols` blocks a row, each
 * `PAPER_BLOCK_PX / 2` values wide): `vertical` false finds lines running across (left to right),
 * true lines running down. Positions in the picture's own pixels.
 */
function linesOf(luma: Uint8Array, w: number, h: number, paperLuma: Float64Array, cols: number, vertical: boolean): { a: number; b: number }[] {
  // In the line's own frame: u runs along the line, v across it.
  const along = vertical ? h : w;
  const across = vertical ? w : h;
  const strips = Math.floor(along / STRIP_PX);
  if (strips < 3) return [];
  // A strip lies inside one column (one row) of paper blocks: its paper is one value per v.
  const blockShift = Math.log2(PAPER_BLOCK_PX / 2);
  const peaks: { s: number; v: number }[][] = [];
  const profile = new Float32Array(across);
  // The profile's copy reordered by the medians of its values and of their distances from the baseline.
  const scratch = new Float32Array(across);
  const blockRows = paperLuma.length / cols;
  for (let s = 0; s < strips; s++) {
    // The strip's median density at each v: that of its low median byte, over the paper.
    const stripBlock = Math.min((s * STRIP_PX) >> blockShift, (vertical ? blockRows : cols) - 1);
    for (let v = 0; v < across; v++) {
      const vBlock = Math.min(v >> blockShift, (vertical ? cols : blockRows) - 1);
      const byte = vertical ? lowMedian16(luma, s * STRIP_PX * w + v, w) : lowMedian16(luma, v * w + s * STRIP_PX, 1);
      const d = (LN[byte] as number) - (paperLuma[vertical ? stripBlock * cols + vBlock : vBlock * cols + stripBlock] as number);
      profile[v] = d > 0 ? d : 0;
    }
    scratch.set(profile);
    const base = median(scratch, across);
    for (let v = 0; v < across; v++) scratch[v] = Math.abs((profile[v] as number) - base);
    const spread = median(scratch, across);
    const floor = base + Math.max(PEAK_DENSITY, PEAK_SPREADS * spread);
    const found: { s: number; v: number }[] = [];
    // A peak is the highest within two values each way (the box's edges count as low).
    const level = (v: number) => (v >= 0 && v < across ? (profile[v] as number) : 0);
    for (let v = 0; v < across; v++) {
      const p = profile[v] as number;
      if (p < floor || p < level(v - 1) || p < level(v + 1) || p <= level(v - 2) || p < level(v + 2)) continue;
      let sum = 0;
      let moment = 0;
      for (let k = -2; k <= 2; k++) {
        const q = Math.max(0, level(v + k) - base);
        sum += q;
        moment += q * (v + k);
      }
      found.push({ s, v: moment / sum });
    }
    peaks.push(found);
  }
  // Chains of peaks, strip to strip, each with its slope over its length so far.
  interface Chain {
    points: { u: number; v: number }[];
    slope: number;
    last: number;
    /** The strip whose peak it took last (a chain takes one peak a strip). */
    taken: number;
  }
  const chains: Chain[] = [];
  // The chains a peak may still link to (missed no more than `LINK_SKIP` strips), in the order made.
  let live: Chain[] = [];
  for (let s = 0; s < strips; s++) {
    const u = s * STRIP_PX + STRIP_PX / 2;
    live = live.filter((c) => s - c.last <= LINK_SKIP + 1);
    for (const p of peaks[s] as { s: number; v: number }[]) {
      let best: Chain | undefined;
      let bestD = Infinity;
      for (const c of live) {
        if (c.taken === s) continue;
        const end = c.points[c.points.length - 1] as { u: number; v: number };
        const d = Math.abs(p.v - (end.v + c.slope * (u - end.u)));
        if (d <= LINK_PX + 0.2 * (s - c.last) && d < bestD) {
          best = c;
          bestD = d;
        }
      }
      if (best) {
        // The slope over the chain's whole length so far (a peak moved by a crossing curve bends it little).
        const start = best.points[0] as { u: number; v: number };
        best.slope = best.points.length >= 3 ? (p.v - start.v) / (u - start.u) : 0;
        best.points.push({ u, v: p.v });
        best.last = s;
        best.taken = s;
      } else {
        const c: Chain = { points: [{ u, v: p.v }], slope: 0, last: s, taken: s };
        chains.push(c);
        live.push(c);
      }
    }
  }
  const out: { a: number; b: number }[] = [];
  const fit = (points: readonly { u: number; v: number }[]) => {
    const n = points.length;
    const mu = points.reduce((sum, p) => sum + p.u, 0) / n;
    const mv = points.reduce((sum, p) => sum + p.v, 0) / n;
    let suv = 0;
    let suu = 0;
    for (const p of points) {
      suv += (p.u - mu) * (p.v - mv);
      suu += (p.u - mu) ** 2;
    }
    const b = suu > 0 ? suv / suu : 0;
    const a = mv - b * mu;
    return { a, b, rms: Math.sqrt(points.reduce((sum, p) => sum + (p.v - a - b * p.u) ** 2, 0) / n) };
  };
  for (const c of chains) {
    if (c.points.length < SPAN_SHARE * strips) continue;
    // Fitted twice: the second time without the peaks far off the first line (where a curve
    // crossing the grid line, or running along it for a strip, moved the strip's peak).
    const first = fit(c.points);
    const kept = c.points.filter((p) => Math.abs(p.v - first.a - first.b * p.u) <= OUTLIER_PX);
    if (kept.length < SPAN_SHARE * strips) continue;
    const line = fit(kept);
    if (line.rms > STRAIGHT_PX || Math.abs(line.b) > MAX_SLOPE) continue;
    // Seen near both sides of the frame: a strip's peak on the line within the first and the last
    // `SIDE_STRIPS` strips (any chain's: a curve running along the grid line for a stretch can
    // break its chain in two).
    const onLine = (s: number) => (peaks[s] as { v: number }[]).some((p) => Math.abs(p.v - line.a - line.b * (s * STRIP_PX + STRIP_PX / 2)) <= OUTLIER_PX);
    let near = false;
    for (let s = 0; s < Math.min(strips, SIDE_STRIPS) && !near; s++) near = onLine(s);
    let far = false;
    for (let s = strips - 1; s >= Math.max(0, strips - SIDE_STRIPS) && !far; s--) far = onLine(s);
    if (!near || !far) continue;
    out.push({ a: line.a, b: line.b });
  }
  return out.sort((p, q) => p.a - q.a);
}

/**
 * The grid lines inside a box of the image (pixels: left, top, right, bottom), with their
 * cross-sections. Lines are given in image pixels.
 */
export function findGridLines(image: RasterImage, box: Box): GridLine[] {
  return gridIn(image, box).lines;
}

/** The grid lines of the box (clamped to the image, whole pixels) and the paper under it. */
function gridIn(image: RasterImage, box: Box): { lines: GridLine[]; paper: Paper; box: [number, number, number, number] } {
  const l = Math.max(0, Math.floor(box[0]));
  const t = Math.max(0, Math.floor(box[1]));
  const r = Math.min(image.width, Math.ceil(box[2]));
  const b = Math.min(image.height, Math.ceil(box[3]));
  const w = r - l;
  const h = b - t;
  const paper = paperUnder(image, [l, t, r, b]);
  if (w < 6 * STRIP_PX || h < 6 * STRIP_PX) return { lines: [], paper, box: [l, t, r, b] };
  // Lines are found on the luma density at half resolution (each value the density of the mean
  // of 2 × 2 pixels against the paper's): a quarter of the work, and a grid line 1–3 px wide
  // still stands out in it. The picture keeps the mean's byte; its density is taken per strip
  // median (linesOf), the paper being one value over each strip.
  const hw = w >> 1;
  const hh = h >> 1;
  const luma = new Uint8Array(hw * hh);
  const data = image.data;
  const rowBytes = 4 * image.width;
  for (let y = 0; y < hh; y++) {
    let o = rowBytes * (t + 2 * y) + 4 * l;
    const end = o + 8 * hw;
    let at = y * hw;
    for (; o < end; o += 8) {
      const m = o + rowBytes;
      luma[at++] = MEAN_OF_12[(data[o] as number) + (data[o + 1] as number) + (data[o + 2] as number) + (data[o + 4] as number) + (data[o + 5] as number) + (data[o + 6] as number) + (data[m] as number) + (data[m + 1] as number) + (data[m + 2] as number) + (data[m + 4] as number) + (data[m + 5] as number) + (data[m + 6] as number)] as number;
    }
  }
  const paperLuma = new Float64Array(paper.cols * paper.rows);
  for (let k = 0; k < paperLuma.length; k++) paperLuma[k] = ((paper.values[3 * k] as number) + (paper.values[3 * k + 1] as number) + (paper.values[3 * k + 2] as number)) / 3;
  const found: GridLine[] = [];
  for (const vertical of [false, true]) {
    // Half-resolution value i is centred on pixel 2i + ½: v = a + b·u there is v = 2a + ½ − ½b + b·u here.
    const lines = linesOf(luma, hw, hh, paperLuma, paper.cols, vertical).map((q) => ({ a: 2 * q.a + 0.5 - 0.5 * q.b, b: q.b }));
    lines.forEach((line, k) => {
      // Box-relative to image pixels: v = a + b·u in the box becomes, in the image, v + origin.
      const [u0, v0] = vertical ? [t, l] : [l, t];
      const a = line.a + v0 - line.b * u0;
      // The cross-section reaches no farther than halfway to the neighbouring lines.
      const gaps = [lines[k - 1], lines[k + 1]].filter((n): n is { a: number; b: number } => n !== undefined).map((n) => Math.abs(n.a - line.a));
      const reach = Math.min(MAX_REACH_PX, ...gaps.map((g) => 0.45 * g));
      if (reach < 1) return;
      found.push({ vertical, a, b: line.b, reach, profile: crossSection(image, paper, [l, t, r, b], vertical, a, line.b, reach) });
    });
    const [u0, u1] = vertical ? [t, b] : [l, r];
    const across = (vertical ? [l, r] : [t, b]) as [number, number];
    found.push(...missingLines(found.filter((g) => g.vertical === vertical), (u0 + u1) / 2, across, (a, slope, reach) => crossSection(image, paper, [l, t, r, b], vertical, a, slope, reach)));
  }
  // A grid is printed in one ink. A line much more coloured than the panel's typical grid line is a
  // straight curve (a coloured power line whose label at its end stands in for the frame's side).
  const hues = found.map(hueOf);
  const typical = [...hues].sort((p, q) => p - q)[hues.length >> 1] ?? 0;
  const kept = found.filter((_, k) => !((hues[k] as number) > COLOURED_HUE && (hues[k] as number) > COLOURED_OVER * Math.max(typical, HUE_FLOOR)));
  return { lines: kept, paper, box: [l, t, r, b] };
}

/**
 * Gaps of the grid's spacing: a gap between neighbouring lines within this share of a whole
 * number of spacings holds that many lines less one. Lines of a printed grid are evenly spaced to
 * well under 1 % (common practice; a photo's perspective changes the spacing across the frame by a
 * few per cent).
 */
const SPACING_SLACK = 0.04;
/** The most spacings a gap may hold to vouch for the spacing, and the least spacing filled in, pixels. */
const SPACING_SUPPORT = 4;
const MIN_SPACING_PX = 4;
/** Least peak density of a grid line filled into a gap, as a share of its weaker neighbour's. */
const FILLED_DENSITY = 0.5;
/** A line found whose slope lies farther than this many typical spreads (or `SLOPE_FLOOR`) off the slopes of the others is left out of the slope a filled line takes. */
const SLOPE_SPREAD = 4;
const SLOPE_FLOOR = 0.0005;
/** Farthest a filled line's peak may lie from where the spacing puts it, pixels (it is moved there). */
const FILLED_SHIFT_PX = 2;

/** The darkest offset of a cross-section (its first channel's index in `profile`, and pixels from the centre) and its mean density there. */
function peakOf(line: { reach: number; profile: Float32Array }): { index: number; offset: number; density: number } {
  const { profile } = line;
  let best = 0;
  for (let k = 0; k < profile.length; k += 3) if ((profile[k] as number) + (profile[k + 1] as number) + (profile[k + 2] as number) > (profile[best] as number) + (profile[best + 1] as number) + (profile[best + 2] as number)) best = k;
  return { index: best, offset: -line.reach + (best / 3) * PROFILE_STEP, density: ((profile[best] as number) + (profile[best + 1] as number) + (profile[best + 2] as number)) / 3 };
}

/**
 * The grid lines the strips missed, of one direction: a line that curves run along for much of
 * its length (the peaks of efficiency curves along one grid line) shows in too few strips to be
 * linked, and left in the picture it leads a tracer off its curve along it (speed bench seed 10, a
 * scan: an efficiency trace ran 290 px along it, 3.9 points off). Where the lines found are
 * evenly spaced (the smallest gap that another gap is a whole number of) and a gap holds a whole
 * number of spacings, a line is looked for at each spacing inside it (and beyond the first and
 * last lines, a spacing at a time, inside the box), its slope from the slopes of the lines found
 * (straight across them, for a photo's perspective; a line pulled askew by a curve left out); it
 * is kept where its cross-section (the median along its whole length, so the curves over part of
 * it do not count) peaks within `FILLED_SHIFT_PX` of there at `FILLED_DENSITY` of its neighbours'
 * density at least. `section` reads a cross-section; `middle` is the position along the lines at
 * which they are spaced (the box's middle), `across` the box's extent across them.
 */
function missingLines(lines: readonly GridLine[], middle: number, across: readonly [number, number], section: (a: number, slope: number, reach: number) => Float32Array): GridLine[] {
  if (lines.length < 3) return [];
  const sorted = [...lines].sort((p, q) => p.a + p.b * middle - (q.a + q.b * middle));
  const at = (g: GridLine) => g.a + g.b * middle;
  const gaps = sorted.slice(1).map((g, k) => at(g) - at(sorted[k] as GridLine));
  // The spacing: the smallest gap that another gap is a whole number of, up to `SPACING_SUPPORT`
  // (two lines printed close together, a doubled frame, say, are no spacing that every gap fits).
  const whole = (gap: number, spacing: number) => {
    const n = Math.round(gap / spacing);
    return n >= 1 && Math.abs(gap - n * spacing) <= SPACING_SLACK * gap ? n : 0;
  };
  const spacing = [...gaps].sort((p, q) => p - q).find((g, k, all) => all.some((h, j) => j !== k && whole(h, g) > 0 && whole(h, g) <= SPACING_SUPPORT));
  if (spacing === undefined || spacing < MIN_SPACING_PX) return [];
  const reach = Math.min(MAX_REACH_PX, 0.45 * spacing);
  if (reach < 1) return [];
  // The slope at a place across the lines: straight in the place over the lines found (a scan
  // turns every line alike; a photo's perspective turns them by steadily changing angles), fitted
  // again without a line far off that (one that a curve along it pulled askew).
  const fitSlope = (kept: readonly GridLine[]) => {
    const [a, b] = fitLine(kept.map(at), kept.map((g) => g.b));
    return (u: number) => a + b * u;
  };
  const rough = fitSlope(sorted);
  const off = sorted.map((g) => Math.abs(g.b - rough(at(g))));
  const typical = [...off].sort((p, q) => p - q)[off.length >> 1] as number;
  const straight = sorted.filter((_, k) => (off[k] as number) <= Math.max(SLOPE_SPREAD * typical, SLOPE_FLOOR));
  const slopeAt = fitSlope(straight.length >= 3 ? straight : sorted);
  const out: GridLine[] = [];
  /** A line looked for at `centre` (its position at the middle) with `slope`, kept when it is there as dark as `least` at least. */
  const lookFor = (centre: number, slope: number, least: number) => {
    let a = centre - slope * middle;
    let profile = section(a, slope, reach);
    const peak = peakOf({ reach, profile });
    if (Math.abs(peak.offset) > FILLED_SHIFT_PX || peak.density < FILLED_DENSITY * least) return false;
    if (peak.offset !== 0) {
      a += peak.offset;
      profile = section(a, slope, reach);
    }
    out.push({ vertical: (sorted[0] as GridLine).vertical, a, b: slope, reach, profile });
    return true;
  };
  gaps.forEach((gap, k) => {
    const n = whole(gap, spacing);
    if (n < 2) return;
    const [below, above] = [sorted[k] as GridLine, sorted[k + 1] as GridLine];
    const least = Math.min(peakOf(below).density, peakOf(above).density);
    for (let j = 1; j < n; j++) lookFor(at(below) + (gap * j) / n, slopeAt(at(below) + (gap * j) / n), least);
  });
  // Beyond the first and the last line found, while inside the box, a line a spacing on at a time.
  for (const [end, step] of [[sorted[0] as GridLine, -spacing], [sorted[sorted.length - 1] as GridLine, spacing]] as const) {
    const least = peakOf(end).density;
    for (let centre = at(end) + step; centre - reach >= across[0] && centre + reach <= across[1]; centre += step) if (!lookFor(centre, slopeAt(centre), least)) break;
  }
  return out;
}

/** How coloured a line's ink is: at its darkest offset, the spread of the three densities over their mean (0 for a grey line). */
function hueOf(line: GridLine): number {
  const { profile } = line;
  const best = peakOf(line).index;
  const d = [profile[best] as number, profile[best + 1] as number, profile[best + 2] as number];
  const mean = (d[0]! + d[1]! + d[2]!) / 3;
  return mean > 0 ? (Math.max(...d) - Math.min(...d)) / mean : 0;
}

/** Room for the samples of a cross-section, kept from one line to the next (each line's are written before they are read). */
let sectionSamples = new Float32Array(0);

/** Step along a line between the samples of its cross-section, pixels (the median needs no more). */
const SECTION_STEP_PX = 5;

/**
 * The median density per channel at each offset from a line, along its whole length inside the
 * box. A sample lies on a whole pixel along the line, so it is interpolated across the line only.
 */
function crossSection(image: RasterImage, paper: Paper, [l, t, r, b]: Box, vertical: boolean, a: number, slope: number, reach: number): Float32Array {
  const offsets = Math.round((2 * reach) / PROFILE_STEP) + 1;
  const [u0, u1] = vertical ? [t, b] : [l, r];
  const profile = new Float32Array(3 * offsets);
  const size = Math.ceil((u1 - u0) / SECTION_STEP_PX) + 1;
  // Samples of offset k, channel c at [(3k + c)·size …], `counts[k]` of them.
  if (sectionSamples.length < 3 * offsets * size) sectionSamples = new Float32Array(3 * offsets * size);
  const samples = sectionSamples;
  const counts = new Int32Array(offsets);
  const { data, width } = image;
  // One pixel across the line in the image's bytes: along a row for upright lines, down a column otherwise.
  const across = vertical ? 4 : 4 * width;
  const offs = Float64Array.from({ length: offsets }, (_, k) => -reach + k * PROFILE_STEP);
  const paperValues = paper.values;
  for (let u = u0; u < u1; u += SECTION_STEP_PX) {
    const centre = a + slope * u;
    for (let k = 0; k < offsets; k++) {
      const v = centre + (offs[k] as number);
      const v0 = Math.floor(v);
      const x0 = vertical ? v0 : u;
      const y0 = vertical ? u : v0;
      if (x0 < l || y0 < t || x0 + 1 >= r || y0 + 1 >= b) continue;
      const f = v - v0;
      // The paper of the first pixel's block (inside the box: no block off it).
      const pb = 3 * (((y0 - t) >> PAPER_BLOCK_SHIFT) * paper.cols + ((x0 - l) >> PAPER_BLOCK_SHIFT));
      const o = 4 * (y0 * width + x0);
      const o2 = o + across;
      const n = counts[k] as number;
      const e = 1 - f;
      const at = 3 * k * size + n;
      // Linear in density between the two pixels, per channel.
      const d0 = e * (LN[data[o] as number] as number) + f * (LN[data[o2] as number] as number) - (paperValues[pb] as number);
      const d1 = e * (LN[data[o + 1] as number] as number) + f * (LN[data[o2 + 1] as number] as number) - (paperValues[pb + 1] as number);
      const d2 = e * (LN[data[o + 2] as number] as number) + f * (LN[data[o2 + 2] as number] as number) - (paperValues[pb + 2] as number);
      samples[at] = d0 > 0 ? d0 : 0;
      samples[at + size] = d1 > 0 ? d1 : 0;
      samples[at + 2 * size] = d2 > 0 ? d2 : 0;
      counts[k] = n + 1;
    }
  }
  for (let k = 0; k < offsets; k++) {
    for (let c = 0; c < 3; c++) profile[3 * k + c] = median(samples.subarray((3 * k + c) * size, (3 * k + c + 1) * size), counts[k] as number);
  }
  return profile;
}

/**
 * Takes the grid lines out of `data` (the image's pixels or a copy of them, same size) inside the box:
 * each pixel within a line's reach loses that line's density at its offset (the nearest of the
 * line's `REMOVAL_STEPS_PX` steps a pixel), per channel, never becoming lighter than the paper.
 * Where two lines cross, each takes its own share.
 */
export function removeGrid(image: RasterImage, data: Uint8ClampedArray, box: Box): GridLine[] {
  const { lines, paper, box: [l, t, r, b] } = gridIn(image, box);
  const width = image.width;
  const paperBytes = paper.bytes;
  for (const p of paperBytes) fadeTo(p);
  for (const line of lines) {
    const { profile, reach, vertical } = line;
    const offsets = profile.length / 3;
    // The offsets where the cross-section has density: a pixel more than a step beyond them
    // interpolates between zeros and loses nothing.
    let first = -1;
    let last = -1;
    for (let k = 0; k < offsets; k++) {
      if ((profile[3 * k] as number) > 0 || (profile[3 * k + 1] as number) > 0 || (profile[3 * k + 2] as number) > 0) {
        if (first < 0) first = k;
        last = k;
      }
    }
    if (first < 0) continue;
    // e^density per channel at offsets from −reach in steps of 1 / `REMOVAL_STEPS_PX` pixel,
    // interpolated between the cross-section's offsets.
    const steps = Math.ceil(2 * reach * REMOVAL_STEPS_PX) + 2;
    const gains = new Float64Array(3 * steps);
    for (let q = 0; q < steps; q++) {
      const k = q / (REMOVAL_STEPS_PX * PROFILE_STEP);
      const k0 = Math.min(offsets - 1, Math.floor(k));
      const k1 = Math.min(offsets - 1, k0 + 1);
      const f = k - k0;
      for (let c = 0; c < 3; c++) {
        const g = (1 - f) * (profile[3 * k0 + c] as number) + f * (profile[3 * k1 + c] as number);
        gains[3 * q + c] = expOf(g > 0 ? g : 0);
      }
    }
    const [u0, u1, v0, v1] = vertical ? [t, b, l, r] : [l, r, t, b];
    // Bytes from one pixel to the next along the line and across it.
    const [alongBytes, acrossBytes] = vertical ? [4 * width, 4] : [4, 4 * width];
    // Paper blocks from one block to the next along the line and across it.
    const [alongBlocks, acrossBlocks] = vertical ? [3 * paper.cols, 3] : [3, 3 * paper.cols];
    const firstByte = 4 * (t * width + l);
    for (let u = u0; u < u1; u++) {
      const centre = line.a + line.b * u;
      // A pixel to spare each way of the offsets with density, against rounding at their ends.
      const from = Math.max(v0, Math.ceil(centre - reach), Math.ceil(centre - reach + (first - 1) * PROFILE_STEP) - 1);
      const to = Math.min(v1 - 1, Math.floor(centre + reach), Math.floor(centre - reach + (last + 1) * PROFILE_STEP) + 1);
      const rowByte = firstByte + (u - u0) * alongBytes;
      const rowBlock = ((u - u0) >> PAPER_BLOCK_SHIFT) * alongBlocks;
      // The run of pixels across the line lies in one or two paper blocks: taken in one piece
      // per block, its paper hoisted.
      for (let start = from; start <= to; ) {
        const block = (start - v0) >> PAPER_BLOCK_SHIFT;
        const end = Math.min(to, v0 + ((block + 1) << PAPER_BLOCK_SHIFT) - 1);
        const pb = rowBlock + block * acrossBlocks;
        const red = (paperBytes[pb] as number) * 256;
        const green = (paperBytes[pb + 1] as number) * 256;
        const blue = (paperBytes[pb + 2] as number) * 256;
        let o = rowByte + (start - v0) * acrossBytes;
        for (let v = start; v <= end; v++, o += acrossBytes) {
          const q = 3 * Math.min(steps - 1, ((v - centre + reach) * REMOVAL_STEPS_PX + 0.5) | 0);
          // Per channel, without branches (whether a byte is darker than its paper is a toss-up):
          // lighter by the line's density there, but no lighter than the paper (the density left
          // in `data` over the paper: lines crossing take their shares in turn). Lighter is
          // monotone in the density, so the lesser density gives the darker byte. The store into
          // the byte array rounds (halves to even) and holds to 255.
          let byte = data[o] as number;
          data[o] = Math.min(FADED[red + byte] as number, (byte + 1) * (gains[q] as number) - 1);
          byte = data[o + 1] as number;
          data[o + 1] = Math.min(FADED[green + byte] as number, (byte + 1) * (gains[q + 1] as number) - 1);
          byte = data[o + 2] as number;
          data[o + 2] = Math.min(FADED[blue + byte] as number, (byte + 1) * (gains[q + 2] as number) - 1);
        }
        start = end + 1;
      }
    }
  }
  return lines;
}

/** A byte lighter by density `d`: v + 1 = (paper + 1)·e^(−density), so v + 1 grows by e^d. */
function lighter(byte: number, d: number): number {
  return Math.min(255, Math.round((byte + 1) * expOf(d) - 1));
}

/**
 * Bytes with all their density over a paper byte taken off (about the paper's byte; a byte at or
 * lighter than the paper's is kept), per paper byte and byte: at `paper · 256 + byte`, the rows
 * filled as their paper bytes are first met (`fadeTo`).
 */
const FADED = new Uint8Array(256 * 256);
const fadedRows = new Uint8Array(256);

/** Fills the row of `FADED` for a paper byte, if not yet filled. */
function fadeTo(paperByte: number): void {
  if (fadedRows[paperByte]) return;
  for (let byte = 0; byte < 256; byte++) FADED[paperByte * 256 + byte] = byte < paperByte ? lighter(byte, (LN[byte] as number) - (LN[paperByte] as number)) : byte;
  fadedRows[paperByte] = 1;
}

/** e^d for densities 0–8 in steps of 1/256, linear between steps (to well under a grey level). */
const EXP_STEP = 256;
const EXP = Float32Array.from({ length: 8 * EXP_STEP + 2 }, (_, k) => Math.exp(k / EXP_STEP));
function expOf(d: number): number {
  const x = Math.min(8 * EXP_STEP, d * EXP_STEP);
  const k = x | 0;
  return (EXP[k] as number) + (x - k) * ((EXP[k + 1] as number) - (EXP[k] as number));
}

/** Copies of images with the grid taken out of the boxes asked for so far: one copy per image, boxes cleaned as they are asked for. */
const cleaned = new WeakMap<RasterImage, { image: RasterImage; boxes: number[][] }>();

/** How far apart the sides of two boxes may lie for them to be the same panel's, pixels. */
const SAME_BOX_PX = 8;

/**
 * The image with the grid lines taken out inside `box` (pixels), for tracing curves there: one
 * copy of the image kept per image, each box cleaned once. Outside the boxes asked for, the copy
 * is the image.
 */
export function withoutGrid(image: RasterImage, box: Box): RasterImage {
  let entry = cleaned.get(image);
  if (!entry) {
    entry = { image: { width: image.width, height: image.height, scale: image.scale, data: new Uint8ClampedArray(image.data) }, boxes: [] };
    cleaned.set(image, entry);
  }
  // A box about the same as one cleaned already (the same panel framed a little differently) is
  // that one: cleaning it again would only move the lines found by a fraction of a pixel.
  const same = entry.boxes.some((b) => b.every((v, i) => Math.abs(v - (box[i] as number)) <= SAME_BOX_PX));
  if (!same) {
    entry.boxes.push([...box]);
    // Found on the copy as cleaned so far: where a box overlaps one cleaned before, no grid is
    // left there to find, and nothing is taken out twice.
    removeGrid(entry.image, entry.image.data as Uint8ClampedArray, box);
  }
  return entry.image;
}
