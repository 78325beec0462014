/**
 * Cross-sections of a line in a raster: membership sampled along a short segment, split into
 * runs of line-coloured samples, each with its sub-pixel centre (membership-weighted centroid)
 * and its mass (Σ membership × spacing, about the line's width in pixels).
 * Coordinates are pixel coordinates with the centre of the first pixel at (0.5, 0.5).
 */
import { darknessShare, membership, type InkModel } from './colour.ts';
import type { RasterImage } from './raster.ts';

/** A stretch of line-coloured samples across a section. Offsets are in pixels from the section centre. */
export interface Run {
  centre: number;
  mass: number;
  start: number;
  end: number;
  /** Sub-pixel edges where membership crosses half the run's peak (offsets, pixels). */
  lowEdge: number;
  highEdge: number;
}

/** Counts pixel reads, so that callers can compare the work done with one pass over the page. */
export interface ReadCounter {
  reads: number;
}

/**
 * Membership at (x, y) by bilinear interpolation of the colour; 0 outside the image.
 * Called for nearly every sample a tracer takes: the four pixels inside the image are read by a
 * small function of their own (which the engine inlines), the image's edges by `membershipAtEdge`.
 */
export function membershipAt(image: RasterImage, model: InkModel, x: number, y: number, counter?: ReadCounter): number {
  const u = x - 0.5;
  const v = y - 0.5;
  const i0 = Math.floor(u);
  const j0 = Math.floor(v);
  const width = image.width;
  if (i0 >= 0 && j0 >= 0 && i0 + 1 < width && j0 + 1 < image.height) {
    if (counter) counter.reads += 4;
    return membershipInside(image.data, model, (j0 * width + i0) * 4, width * 4, u - i0, v - j0);
  }
  return membershipAtEdge(image, model, u, v, counter);
}

/** Bilinear membership from the four pixels at byte `a` (top left), `a + 4`, `a + row`, `a + row + 4`. */
function membershipInside(data: Uint8ClampedArray, model: InkModel, a: number, row: number, fx: number, fy: number): number {
  return blendedMembership(data, model, a, a + 4, a + row, a + row + 4, fx, fy);
}

/** Membership of the colour blended from the pixels at bytes a (top left), b (top right), c (bottom left), d (bottom right) with the fractions fx, fy. */
function blendedMembership(data: Uint8ClampedArray, model: InkModel, a: number, b: number, c: number, d: number, fx: number, fy: number): number {
  const w00 = (1 - fx) * (1 - fy);
  const w10 = fx * (1 - fy);
  const w01 = (1 - fx) * fy;
  const w11 = fx * fy;
  const r = w00 * (data[a] as number) + w10 * (data[b] as number) + w01 * (data[c] as number) + w11 * (data[d] as number);
  const g = w00 * (data[a + 1] as number) + w10 * (data[b + 1] as number) + w01 * (data[c + 1] as number) + w11 * (data[d + 1] as number);
  const bl = w00 * (data[a + 2] as number) + w10 * (data[b + 2] as number) + w01 * (data[c + 2] as number) + w11 * (data[d + 2] as number);
  return membership(model, r, g, bl);
}

/** `membershipAt` where the four pixels reach past the image's edge: the edge pixels stand in; 0 beyond. */
function membershipAtEdge(image: RasterImage, model: InkModel, u: number, v: number, counter?: ReadCounter): number {
  let i0 = Math.floor(u);
  let j0 = Math.floor(v);
  const fx = u - i0;
  const fy = v - j0;
  const { width, height, data } = image;
  if (i0 < -1 || j0 < -1 || i0 >= width || j0 >= height) return 0;
  let i1 = i0 + 1;
  let j1 = j0 + 1;
  if (i0 < 0) i0 = 0;
  if (j0 < 0) j0 = 0;
  if (i1 >= width) i1 = width - 1;
  if (j1 >= height) j1 = height - 1;
  const a = (j0 * width + i0) * 4;
  const b = (j0 * width + i1) * 4;
  const c = (j1 * width + i0) * 4;
  const d = (j1 * width + i1) * 4;
  if (counter) counter.reads += 4;
  return blendedMembership(data, model, a, b, c, d, fx, fy);
}

/**
 * Whether any `membershipAt` sample within the box [x0, x1] × [y0, y1] could reach `threshold`:
 * a sample mixes four pixels with weights that sum to one, and membership never exceeds the
 * darkness share (`darknessShare`, linear in the colour), so when no pixel such a sample reads
 * comes within a margin far above rounding of the threshold, no sample does. Reads each pixel once.
 */
export function inkPossible(image: RasterImage, model: InkModel, x0: number, y0: number, x1: number, y1: number, threshold: number): boolean {
  const { width, height, data } = image;
  const i0 = Math.max(0, Math.floor(x0 - 0.5));
  const j0 = Math.max(0, Math.floor(y0 - 0.5));
  const i1 = Math.min(width - 1, Math.floor(x1 - 0.5) + 1);
  const j1 = Math.min(height - 1, Math.floor(y1 - 0.5) + 1);
  const below = threshold - 1e-9;
  for (let j = j0; j <= j1; j++) {
    for (let i = i0; i <= i1; i++) {
      const k = (j * width + i) * 4;
      if (darknessShare(model, data[k] as number, data[k + 1] as number, data[k + 2] as number) >= below) return true;
    }
  }
  return false;
}

/**
 * Samples membership at centre + k·spacing·normal for k = −n…n into `out` (length 2n+1).
 */
export function sampleSection(
  image: RasterImage,
  model: InkModel,
  cx: number,
  cy: number,
  nx: number,
  ny: number,
  n: number,
  spacing: number,
  out: Float64Array,
  counter?: ReadCounter,
): void {
  // `membershipAt` for each sample, with the image's size read once and the pixels read counted
  // once for the section (samples off the image's edges go through `membershipAtEdge`, which counts its own).
  const { width, height, data } = image;
  const row = width * 4;
  let inside = 0;
  for (let k = -n; k <= n; k++) {
    const o = k * spacing;
    const u = cx + nx * o - 0.5;
    const v = cy + ny * o - 0.5;
    const i0 = Math.floor(u);
    const j0 = Math.floor(v);
    if (i0 >= 0 && j0 >= 0 && i0 + 1 < width && j0 + 1 < height) {
      inside++;
      out[k + n] = membershipInside(data, model, j0 * row + i0 * 4, row, u - i0, v - j0);
    } else {
      out[k + n] = membershipAtEdge(image, model, u, v, counter);
    }
  }
  if (counter) counter.reads += 4 * inside;
}

/**
 * Like `sampleSection`, for ink of any colour: each sample is the nearest pixel's colour distance
 * from the paper as a share of `contrast` (the line's own distance), at most 1; 0 off the image.
 */
export function sampleInkSection(
  image: RasterImage,
  paper: readonly [number, number, number],
  contrast: number,
  cx: number,
  cy: number,
  nx: number,
  ny: number,
  n: number,
  spacing: number,
  out: Float64Array,
  counter?: ReadCounter,
): void {
  const { data, width, height } = image;
  for (let j = -n; j <= n; j++) {
    const x = Math.floor(cx + nx * j * spacing);
    const y = Math.floor(cy + ny * j * spacing);
    if (x < 0 || y < 0 || x >= width || y >= height) {
      out[j + n] = 0;
      continue;
    }
    const i = (y * width + x) * 4;
    const dr = paper[0] - (data[i] as number);
    const dg = paper[1] - (data[i + 1] as number);
    const db = paper[2] - (data[i + 2] as number);
    out[j + n] = Math.min(1, Math.sqrt(dr * dr + dg * dg + db * db) / contrast);
  }
  if (counter) counter.reads += 2 * n + 1;
}

/**
 * Like `sampleSection`, for a broken (dashed or dotted) line: each sample is the largest
 * membership along the line's direction within ±`reach` pixels of the section, so that a
 * section that falls in a gap between two dashes still sees the line. The direction is the
 * normal turned back by a quarter turn, (ny, −nx). Reads (2·⌈reach⌉ + 1) times the pixels.
 */
export function sampleLongSection(
  image: RasterImage,
  model: InkModel,
  cx: number,
  cy: number,
  nx: number,
  ny: number,
  n: number,
  spacing: number,
  reach: number,
  out: Float64Array,
  counter?: ReadCounter,
): void {
  const steps = Math.max(1, Math.ceil(reach));
  const along = reach / steps;
  const dx = ny;
  const dy = -nx;
  for (let k = -n; k <= n; k++) {
    const o = k * spacing;
    const x = cx + nx * o;
    const y = cy + ny * o;
    let best = 0;
    for (let j = -steps; j <= steps; j++) {
      const m = membershipAt(image, model, x + dx * j * along, y + dy * j * along, counter);
      if (m > best) best = m;
    }
    out[k + n] = best;
  }
}

/**
 * The offsets −across, −across + 0.5, … up to across (each the sum the loop over them would
 * reach), nearest 0 first: where any sample across a line will do, the middle is likeliest ink.
 */
export function centreFirst(across: number): number[] {
  const offsets: number[] = [];
  for (let s = -across; s <= across; s += 0.5) offsets.push(s);
  return offsets.sort((a, b) => Math.abs(a) - Math.abs(b));
}

/**
 * Splits a sampled section into runs where membership ≥ threshold (into `runs`, whose
 * objects are reused, when given). Each run also takes in the
 * samples just outside it (the anti-aliased fringe below the threshold) so that its centroid
 * and mass do not depend on where the threshold cuts.
 */
export function findRuns(values: Float64Array, n: number, spacing: number, threshold: number, runs: Run[] = []): Run[] {
  // `runs` may be handed in again and again by a caller in a loop: its objects are reused.
  let used = 0;
  const count = 2 * n + 1;
  let k = 0;
  while (k < count) {
    if ((values[k] as number) < threshold) {
      k++;
      continue;
    }
    let end = k;
    while (end + 1 < count && (values[end + 1] as number) >= threshold) end++;
    const lo = Math.max(0, k - 1);
    const hi = Math.min(count - 1, end + 1);
    let mass = 0;
    let moment = 0;
    let peak = 0;
    for (let i = lo; i <= hi; i++) {
      const m = values[i] as number;
      mass += m;
      moment += m * (i - n);
      if (m > peak) peak = m;
    }
    const half = peak / 2;
    let a = lo;
    while (a < hi && (values[a] as number) < half) a++;
    let b = hi;
    while (b > lo && (values[b] as number) < half) b--;
    const lowEdge = a > lo ? a - 1 + (half - (values[a - 1] as number)) / ((values[a] as number) - (values[a - 1] as number)) : a;
    const highEdge = b < hi ? b + ((values[b] as number) - half) / ((values[b] as number) - (values[b + 1] as number)) : b;
    const run = runs[used] ?? { centre: 0, mass: 0, start: 0, end: 0, lowEdge: 0, highEdge: 0 };
    run.centre = (moment / mass) * spacing;
    run.mass = mass * spacing;
    run.start = (k - n) * spacing;
    run.end = (end - n) * spacing;
    run.lowEdge = (lowEdge - n) * spacing;
    run.highEdge = (highEdge - n) * spacing;
    runs[used++] = run;
    k = end + 1;
  }
  if (runs.length !== used) runs.length = used; // only when it changes: setting the length takes a slow path
  return runs;
}

/**
 * Direction of the ink around (cx, cy): the principal axis of the membership-weighted second
 * moments within `radius` pixels. Returns the unit direction, the ink's centroid and the ratio
 * of the two eigenvalues (near 0 for a clean line, near 1 for a blob or a crossing). With `band`,
 * only the ink within `band.half` pixels of the line through (cx, cy) along `band.dir` counts.
 */
export function inkAxis(
  image: RasterImage,
  model: InkModel,
  cx: number,
  cy: number,
  radius: number,
  threshold: number,
  band?: { dir: readonly [number, number]; half: number },
): { dx: number; dy: number; mx: number; my: number; mass: number; isotropy: number } | undefined {
  const { width, height, data } = image;
  const bx = band ? -band.dir[1] : 0;
  const by = band ? band.dir[0] : 0;
  const bandHalf = band ? band.half : Infinity;
  const x0 = Math.max(0, Math.floor(cx - radius));
  const y0 = Math.max(0, Math.floor(cy - radius));
  const x1 = Math.min(width - 1, Math.ceil(cx + radius));
  const y1 = Math.min(height - 1, Math.ceil(cy + radius));
  let s = 0;
  let sx = 0;
  let sy = 0;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  const r2 = radius * radius;
  for (let y = y0; y <= y1; y++) {
    const py = y + 0.5 - cy;
    for (let x = x0; x <= x1; x++) {
      const px = x + 0.5 - cx;
      if (px * px + py * py > r2) continue;
      if (band && Math.abs(px * bx + py * by) > bandHalf) continue;
      const i = (y * width + x) * 4;
      const m = membership(model, data[i] as number, data[i + 1] as number, data[i + 2] as number);
      if (m < threshold) continue;
      s += m;
      sx += m * px;
      sy += m * py;
      sxx += m * px * px;
      sxy += m * px * py;
      syy += m * py * py;
    }
  }
  if (s <= 0) return undefined;
  const mx = sx / s;
  const my = sy / s;
  const cxx = sxx / s - mx * mx;
  const cxy = sxy / s - mx * my;
  const cyy = syy / s - my * my;
  const half = (cxx + cyy) / 2;
  const root = Math.sqrt(((cxx - cyy) / 2) ** 2 + cxy * cxy);
  const big = half + root;
  const small = half - root;
  const angle = 0.5 * Math.atan2(2 * cxy, cxx - cyy);
  return { dx: Math.cos(angle), dy: Math.sin(angle), mx: cx + mx, my: cy + my, mass: s, isotropy: big > 0 ? small / big : 1 };
}
