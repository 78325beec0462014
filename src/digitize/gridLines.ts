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
 * Pure: works on the RGBA buffer only.
 */
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
/** Largest root-mean-square distance of a chain's peaks from its straight line, half-resolution pixels (a curve bends away). */
const STRAIGHT_PX = 0.35;
/** A strip's peak farther than this from the chain's first line is left out of its second fit, half-resolution pixels. */
const OUTLIER_PX = 1;
/** Largest slope of a grid line against the frame's axes (a turned scan or a photo's perspective: about 6°). */
const MAX_SLOPE = 0.1;
/** Largest half-width of a cross-section, pixels, and the step of its offsets. */
const MAX_REACH_PX = 6;
const PROFILE_STEP = 0.5;
/** Share of a block's pixels at or darker than its paper colour (grid and curves darken well under 40 % of a block). */
const PAPER_SHARE = 0.6;
/** Side of the blocks over which the paper colour is estimated, pixels (uneven light varies slowly). */
const PAPER_BLOCK_PX = 64;

/** −ln((v + 1) / 256) for each byte value: a density table, so that density = LN[v] − LN[paper]. */
const LN = Float32Array.from({ length: 256 }, (_, v) => -Math.log((v + 1) / 256));

type Box = readonly [number, number, number, number];

/**
 * The paper under a box: each channel's `PAPER_SHARE` percentile over blocks of `PAPER_BLOCK_PX`
 * (every other pixel of every other row read: the paper is most of a block), as densities (LN),
 * for densities against the local paper under uneven light. A pixel's paper is its block's
 * (light varies slowly, and a step of a level or two at a block's side is far below any line's
 * density): channel c of pixel (x, y) is `values[block(x, y) + c]`.
 */
interface Paper {
  block(x: number, y: number): number;
  values: Float32Array;
}

function paperUnder(image: RasterImage, [l, t, r, b]: Box): Paper {
  const cols = Math.max(1, Math.ceil((r - l) / PAPER_BLOCK_PX));
  const rows = Math.max(1, Math.ceil((b - t) / PAPER_BLOCK_PX));
  const paper = new Float32Array(cols * rows * 3);
  const hist = new Uint32Array(256 * 3);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < cols; i++) {
      hist.fill(0);
      let n = 0;
      for (let y = t + j * PAPER_BLOCK_PX; y < Math.min(b, t + (j + 1) * PAPER_BLOCK_PX); y += 2) {
        for (let x = l + i * PAPER_BLOCK_PX; x < Math.min(r, l + (i + 1) * PAPER_BLOCK_PX); x += 2) {
          const o = 4 * (y * image.width + x);
          hist[image.data[o] as number]!++;
          hist[256 + (image.data[o + 1] as number)]!++;
          hist[512 + (image.data[o + 2] as number)]!++;
          n++;
        }
      }
      for (let c = 0; c < 3; c++) {
        let seen = 0;
        let v = 0;
        for (; v < 255; v++) if ((seen += hist[c * 256 + v] as number) >= PAPER_SHARE * n) break;
        paper[3 * (j * cols + i) + c] = LN[v] as number;
      }
    }
  }
  const block = (x: number, y: number) => {
    let i = ((x - l) / PAPER_BLOCK_PX) | 0;
    let j = ((y - t) / PAPER_BLOCK_PX) | 0;
    if (i < 0) i = 0;
    else if (i >= cols) i = cols - 1;
    if (j < 0) j = 0;
    else if (j >= rows) j = rows - 1;
    return 3 * (j * cols + i);
  };
  return { block, values: paper };
}

/** Median of the first `n` values; reorders them (selection in place, Hoare's partition). */
function median(values: Float32Array, n: number): number {
  if (n <= 0) return 0;
  const k = n >> 1;
  let lo = 0;
  let hi = n - 1;
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
 * Grid lines of one orientation in a density picture `dens` (w × h, row-major, luma density
 * against the local paper): `vertical` false finds lines running across (left to right), true
 * lines running down. Positions in the picture's own pixels.
 */
function linesOf(dens: Float32Array, w: number, h: number, vertical: boolean): { a: number; b: number }[] {
  // In the line's own frame: u runs along the line, v across it.
  const along = vertical ? h : w;
  const across = vertical ? w : h;
  const at = (u: number, v: number) => (vertical ? (dens[u * w + v] as number) : (dens[v * w + u] as number));
  const strips = Math.floor(along / STRIP_PX);
  if (strips < 3) return [];
  const peaks: { s: number; v: number }[][] = [];
  const column = new Float32Array(STRIP_PX);
  const profile = new Float32Array(across);
  for (let s = 0; s < strips; s++) {
    for (let v = 0; v < across; v++) {
      for (let k = 0; k < STRIP_PX; k++) column[k] = at(s * STRIP_PX + k, v);
      profile[v] = median(column, STRIP_PX);
    }
    const base = median(profile.slice(), across);
    const spread = median(profile.map((p) => Math.abs(p - base)), across);
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
  }
  const chains: Chain[] = [];
  for (let s = 0; s < strips; s++) {
    const u = s * STRIP_PX + STRIP_PX / 2;
    const taken = new Set<Chain>();
    for (const p of peaks[s] as { s: number; v: number }[]) {
      let best: Chain | undefined;
      let bestD = Infinity;
      for (const c of chains) {
        if (taken.has(c) || s - c.last > LINK_SKIP + 1) continue;
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
        taken.add(best);
      } else {
        const c: Chain = { points: [{ u, v: p.v }], slope: 0, last: s };
        chains.push(c);
        taken.add(c);
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
  // still stands out in it.
  const hw = w >> 1;
  const hh = h >> 1;
  const dens = new Float32Array(hw * hh);
  const data = image.data;
  for (let y = 0; y < hh; y++) {
    const py = t + 2 * y;
    const paperLuma = (x: number) => {
      const pb = paper.block(x, py);
      return ((paper.values[pb] as number) + (paper.values[pb + 1] as number) + (paper.values[pb + 2] as number)) / 3;
    };
    let blockPaper = 0;
    for (let x = 0; x < hw; x++) {
      const px = l + 2 * x;
      if ((x & 31) === 0) blockPaper = paperLuma(px);
      const o = 4 * (py * image.width + px);
      const m = o + 4 * image.width;
      const sum = (data[o] as number) + (data[o + 1] as number) + (data[o + 2] as number) + (data[o + 4] as number) + (data[o + 5] as number) + (data[o + 6] as number) + (data[m] as number) + (data[m + 1] as number) + (data[m + 2] as number) + (data[m + 4] as number) + (data[m + 5] as number) + (data[m + 6] as number);
      const d = (LN[Math.round(sum / 12)] as number) - blockPaper;
      dens[y * hw + x] = d > 0 ? d : 0;
    }
  }
  const found: GridLine[] = [];
  for (const vertical of [false, true]) {
    // Half-resolution value i is centred on pixel 2i + ½: v = a + b·u there is v = 2a + ½ − ½b + b·u here.
    const lines = linesOf(dens, hw, hh, vertical).map((q) => ({ a: 2 * q.a + 0.5 - 0.5 * q.b, b: q.b }));
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
  }
  return { lines: found, paper, box: [l, t, r, b] };
}

/** Step along a line between the samples of its cross-section, pixels (the median needs no more). */
const SECTION_STEP_PX = 5;

/** The median density per channel at each offset from a line, along its whole length inside the box. */
function crossSection(image: RasterImage, paper: Paper, [l, t, r, b]: Box, vertical: boolean, a: number, slope: number, reach: number): Float32Array {
  const offsets = Math.round((2 * reach) / PROFILE_STEP) + 1;
  const [u0, u1] = vertical ? [t, b] : [l, r];
  const profile = new Float32Array(3 * offsets);
  const size = Math.ceil((u1 - u0) / SECTION_STEP_PX) + 1;
  const samples: Float32Array[] = [new Float32Array(size), new Float32Array(size), new Float32Array(size)];
  const { data, width } = image;
  for (let k = 0; k < offsets; k++) {
    const off = -reach + k * PROFILE_STEP;
    let n = 0;
    for (let u = u0; u < u1; u += SECTION_STEP_PX) {
      const v = a + slope * u + off;
      const x = vertical ? v : u;
      const y = vertical ? u : v;
      const x0 = Math.floor(x);
      const y0 = Math.floor(y);
      if (x0 < l || y0 < t || x0 + 1 >= r || y0 + 1 >= b) continue;
      const fx = x - x0;
      const fy = y - y0;
      const pb = paper.block(x0, y0);
      const o = 4 * (y0 * width + x0);
      const o2 = o + 4 * width;
      for (let c = 0; c < 3; c++) {
        // Bilinear in density between the four pixels (paper of the first one's block).
        const top = (1 - fx) * (LN[data[o + c] as number] as number) + fx * (LN[data[o + 4 + c] as number] as number);
        const bottom = (1 - fx) * (LN[data[o2 + c] as number] as number) + fx * (LN[data[o2 + 4 + c] as number] as number);
        const d = (1 - fy) * top + fy * bottom - (paper.values[pb + c] as number);
        (samples[c] as Float32Array)[n] = d > 0 ? d : 0;
      }
      n++;
    }
    for (let c = 0; c < 3; c++) profile[3 * k + c] = median(samples[c] as Float32Array, n);
  }
  return profile;
}

/**
 * Takes the grid lines out of `data` (the image's pixels or a copy of them, same size) inside the box:
 * each pixel within a line's reach loses that line's density at its offset, per channel, never
 * becoming lighter than the paper. Where two lines cross, each takes its own share.
 */
export function removeGrid(image: RasterImage, data: Uint8ClampedArray, box: Box): GridLine[] {
  const { lines, paper, box: [l, t, r, b] } = gridIn(image, box);
  for (const line of lines) {
    const offsets = line.profile.length / 3;
    const [u0, u1, v0, v1] = line.vertical ? [t, b, l, r] : [l, r, t, b];
    for (let u = u0; u < u1; u++) {
      const centre = line.a + line.b * u;
      for (let v = Math.max(v0, Math.ceil(centre - line.reach)); v <= Math.min(v1 - 1, Math.floor(centre + line.reach)); v++) {
        const k = (v - centre + line.reach) / PROFILE_STEP;
        const k0 = Math.max(0, Math.min(offsets - 1, Math.floor(k)));
        const k1 = Math.min(offsets - 1, k0 + 1);
        const f = k - k0;
        const x = line.vertical ? v : u;
        const y = line.vertical ? u : v;
        const o = 4 * (y * image.width + x);
        const pb = paper.block(x, y);
        for (let c = 0; c < 3; c++) {
          const g = (1 - f) * (line.profile[3 * k0 + c] as number) + f * (line.profile[3 * k1 + c] as number);
          if (g <= 0) continue;
          // The density left in `data` (lines crossing take their shares in turn), never below the paper.
          const before = (LN[data[o + c] as number] as number) - (paper.values[pb + c] as number);
          if (before <= 0) continue;
          // v + 1 = (paper + 1)·e^(−density): lighter by the density taken off.
          data[o + c] = Math.min(255, Math.round(((data[o + c] as number) + 1) * expOf(Math.min(before, g)) - 1));
        }
      }
    }
  }
  return lines;
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
