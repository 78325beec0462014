/**
 * The keystone of a photographed sheet, measured from its own lines, and the page made square
 * again from it.
 *
 * A hand-held photo sees the flat printed page in perspective: the page's horizontal lines
 * (frame rules, grid rows, text lines) no longer run parallel but meet at a vanishing point,
 * and so do its vertical lines. Turning the page level cannot undo that, and the frames then
 * come out as no rectangles, or are not found at all.
 *
 * Method (R. Hartley and A. Zisserman, "Multiple View Geometry in Computer Vision", 2nd ed.,
 * 2003, §2.7 on the line at infinity and affine rectification, §8.6 on vanishing points;
 * section numbers from memory): the page is cut into tiles; in each tile the angle at which its dark
 * pixels pile up most sharply (`dominantAngle` in ink.ts) is the direction of the page's
 * horizontal lines there, and on the tile turned over its diagonal that of its vertical lines.
 * Each such direction is a line through the tile's ink centre; the vanishing point of each
 * family is the point nearest all of them in homogeneous coordinates (the eigenvector of the
 * smallest eigenvalue of Σ w l lᵀ, by ml-matrix), fitted twice with the tiles that disagree by
 * more than a set angle left out. The two vanishing points span the image of the line at
 * infinity, l; the homography [[1, 0, 0], [0, 1, 0], lᵀ/l₃] sends it back to infinity (affine
 * rectification), and an affine map then turns the two directions onto the axes. What is left
 * is a stretch along each axis, which a panel's calibration takes anyway: the frames are
 * rectangles again and every grid line is level or upright.
 *
 * The tiles give a coarse measure (a tile's direction is good to about 0.1°, a pixel or two
 * across a frame). The precise one takes the long rules (frame sides, grid lines) found on the
 * page so squared, fits each as a straight line back on the turned page, and repeats from the
 * page squared by that until the squaring stops moving (`squarePage`): frames then square to
 * about 0.3 px on the photo bed.
 *
 * Valid for a flat page (one plane); a bent page or a lens's barrel distortion is not a
 * homography, and its frames stay skewed. Pure.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { applyHomography, invertHomography, multiplyHomography, type H9 } from '../homography.ts';
import { principalAxis } from '../polyline.ts';
import { dominantAngle, levelInk, type InkMap, type Level } from './ink.ts';
import { horizontalRules, transpose, verticalRules, type Rule } from './rasterFrames.ts';

/** A direction of the page's lines measured in one tile: through (x, y), at `angle` radians from the x axis. */
export interface LineSample {
  x: number;
  y: number;
  angle: number;
  weight: number;
}

/** Tiles across and down the page where the lines' directions are measured. */
const TILES = 8;
/** A tile's lines count when they pile up at least this much sharper than at a random angle (ink with no straight lines gives about 1). */
const MIN_SHARPNESS = 1.5;
/** A tile whose direction is off the fitted vanishing point by more than this (radians, 0.25°) is left out of the second fit. */
const MAX_SAMPLE_OFF = (0.25 * Math.PI) / 180;
/**
 * Perspective is taken as shown when, across the page, the directions of one family differ by
 * more than this (radians, 0.2°) as the vanishing points predict. Chosen well above what turned
 * scans show (under 0.07° by the tiles and under 0.01° by the rules on the scan bed) and well
 * below a hand-held photo's (0.6–2° on the photo bed).
 */
const MIN_SPREAD = (0.2 * Math.PI) / 180;

/** The part [l, r) × [t, b) of an ink map, copied. */
function cropMap(map: InkMap, l: number, t: number, r: number, b: number): InkMap {
  const width = r - l;
  const height = b - t;
  const ink = new Uint8Array(width * height);
  for (let y = 0; y < height; y++) ink.set(map.ink.subarray((t + y) * map.width + l, (t + y) * map.width + r), y * width);
  return { width, height, ink };
}

/** Centre of the ink at or above `threshold` in a map, or its middle when it holds none. */
function inkCentre(map: InkMap, threshold: number): [number, number] {
  let n = 0;
  let sx = 0;
  let sy = 0;
  for (let y = 0; y < map.height; y += 2) {
    for (let x = 0; x < map.width; x += 2) {
      if ((map.ink[y * map.width + x] as number) < threshold) continue;
      n++;
      sx += x;
      sy += y;
    }
  }
  return n > 0 ? [sx / n + 0.5, sy / n + 0.5] : [map.width / 2, map.height / 2];
}

/**
 * The directions of the page's lines, tile by tile: `'level'` for its horizontal lines (angle
 * near 0), `'upright'` for its vertical ones (angle near π/2). Coordinates are the map's pixels.
 */
export function lineSamples(map: InkMap, threshold: number, family: 'level' | 'upright', tiles = TILES): LineSample[] {
  const out: LineSample[] = [];
  const tw = Math.floor(map.width / tiles);
  const th = Math.floor(map.height / tiles);
  if (tw < 32 || th < 32) return out;
  for (let j = 0; j < tiles; j++) {
    for (let i = 0; i < tiles; i++) {
      const l = i * tw;
      const t = j * th;
      const tile = cropMap(map, l, t, l + tw, t + th);
      const seen = family === 'level' ? tile : transpose(tile);
      const { angle, sharpness } = dominantAngle(seen, threshold);
      if (!(sharpness >= MIN_SHARPNESS)) continue;
      const [cx, cy] = inkCentre(tile, threshold);
      // On the turned tile a slope dy'/dx' = tan a is dx/dy = tan a on the page: the angle π/2 − a.
      out.push({ x: l + cx, y: t + cy, angle: family === 'level' ? angle : Math.PI / 2 - angle, weight: sharpness - 1 });
    }
  }
  return out;
}

type V3 = [number, number, number];

/** The line through (x, y) at `angle`, homogeneous, in coordinates centred on (cx, cy) and divided by s. */
function sampleLine(p: LineSample, cx: number, cy: number, s: number): V3 {
  const x = (p.x - cx) / s;
  const y = (p.y - cy) / s;
  const nx = -Math.sin(p.angle);
  const ny = Math.cos(p.angle);
  return [nx, ny, -(nx * x + ny * y)];
}

/** The point (homogeneous, unit length) nearest the given lines in the least-squares sense. */
function nearestPoint(lines: readonly V3[], weights: readonly number[]): V3 {
  const m = new Matrix(3, 3);
  lines.forEach((l, k) => {
    const w = weights[k] as number;
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) m.set(i, j, m.get(i, j) + w * (l[i] as number) * (l[j] as number));
  });
  const e = new EigenvalueDecomposition(m, { assumeSymmetric: true });
  const values = e.realEigenvalues;
  let k = 0;
  for (let i = 1; i < 3; i++) if ((values[i] as number) < (values[k] as number)) k = i;
  const v = e.eigenvectorMatrix.getColumn(k);
  return [v[0] as number, v[1] as number, v[2] as number];
}

/** The direction at (x, y) (normalised coordinates) of the line from there to the vanishing point v, folded into (−π/2, π/2] about `near`. */
function directionTo(v: V3, x: number, y: number, near: number): number {
  let a = Math.atan2(v[1] - v[2] * y, v[0] - v[2] * x);
  while (a - near > Math.PI / 2) a -= Math.PI;
  while (a - near <= -Math.PI / 2) a += Math.PI;
  return a;
}

/** A family's vanishing point from its samples: fitted, then fitted again without the samples off it by more than `MAX_SAMPLE_OFF`. */
function vanishingPoint(samples: readonly LineSample[], cx: number, cy: number, s: number, near: number): { v: V3; kept: LineSample[] } | null {
  if (samples.length < 3) return null;
  const fit = (list: readonly LineSample[]) => nearestPoint(list.map((p) => sampleLine(p, cx, cy, s)), list.map((p) => p.weight));
  const first = fit(samples);
  const off = (v: V3, p: LineSample) => Math.abs(directionTo(v, (p.x - cx) / s, (p.y - cy) / s, near) - p.angle);
  const kept = samples.filter((p) => off(first, p) <= MAX_SAMPLE_OFF);
  if (kept.length < 3) return null;
  return { v: fit(kept), kept };
}

/** What the keystone measurement found: the squaring homography, how far the directions spread across the page, and what it rests on. */
export interface Keystone {
  /** The homography from the level map's pixels to the squared page's (same size, same centre). */
  square: H9;
  /** Largest difference, radians, between the directions the vanishing points predict across the page, for each family. */
  spread: { level: number; upright: number };
  /** Tiles (or rules) measured and kept, each family. */
  tiles: { level: number; upright: number };
  /** Sum of the weights of the samples kept, both families (for rules: their length in pixels). */
  support: number;
}

/**
 * The keystone from samples of both families' directions (coordinates: the pixels of a
 * width × height map): the homography that makes the lines level and upright again, about the
 * map's centre and at its scale there. Null when either family has too few samples to tell.
 */
export function keystoneOf(levelSamples: readonly LineSample[], uprightSamples: readonly LineSample[], width: number, height: number): Keystone | null {
  const cx = width / 2;
  const cy = height / 2;
  const s = Math.max(width, height) / 2;
  const level = vanishingPoint(levelSamples, cx, cy, s, 0);
  const upright = vanishingPoint(uprightSamples, cx, cy, s, Math.PI / 2);
  if (!level || !upright) return null;
  const vh = level.v;
  const vv = upright.v;
  // The image of the line at infinity through both vanishing points.
  const l: V3 = [vh[1] * vv[2] - vh[2] * vv[1], vh[2] * vv[0] - vh[0] * vv[2], vh[0] * vv[1] - vh[1] * vv[0]];
  if (!(Math.abs(l[2]) > 1e-12)) return null;
  const g = l[0] / l[2];
  const k = l[1] / l[2];
  // After the affine rectification the vanishing points are directions; they are turned onto the axes.
  const unit = (a: number, b: number, sign: number): [number, number] => {
    const n = Math.hypot(a, b) * sign;
    return [a / n, b / n];
  };
  const [hx, hy] = unit(vh[0], vh[1], vh[0] >= 0 ? 1 : -1);
  const [ux, uy] = unit(vv[0], vv[1], vv[1] >= 0 ? 1 : -1);
  // A = [[hx, ux], [hy, uy]]⁻¹.
  const det = hx * uy - ux * hy;
  if (!(Math.abs(det) > 0.5)) return null;
  const a11 = uy / det;
  const a12 = -ux / det;
  const a21 = -hy / det;
  const a22 = hx / det;
  // In normalised coordinates: G = A · [[1, 0, 0], [0, 1, 0], [g, k, 1]]; in pixels: N⁻¹ G N.
  const gn: H9 = [a11, a12, 0, a21, a22, 0, g, k, 1];
  const n: H9 = [1 / s, 0, -cx / s, 0, 1 / s, -cy / s, 0, 0, 1];
  const ni: H9 = [s, 0, cx, 0, s, cy, 0, 0, 1];
  const square = multiplyHomography(multiplyHomography(ni, gn), n);
  const spreadOf = (v: V3, near: number, kept: readonly LineSample[]) => {
    const angles = kept.map((p) => directionTo(v, (p.x - cx) / s, (p.y - cy) / s, near));
    return Math.max(...angles) - Math.min(...angles);
  };
  return {
    square,
    spread: { level: spreadOf(vh, 0, level.kept), upright: spreadOf(vv, Math.PI / 2, upright.kept) },
    tiles: { level: level.kept.length, upright: upright.kept.length },
    support: [...level.kept, ...upright.kept].reduce((t, p) => t + p.weight, 0),
  };
}

/** The keystone of a level ink map (the page already turned by its mean angle), from its tiles (`lineSamples`): a first, coarse measure. */
export function measureKeystone(map: InkMap, threshold: number): Keystone | null {
  return keystoneOf(lineSamples(map, threshold, 'level'), lineSamples(map, threshold, 'upright'), map.width, map.height);
}

/**
 * Precise directions from the long rules of a page already squared roughly (frame sides, grid
 * lines): along each rule, every 4 px, the darkness-weighted centre across it (within 3 px of
 * where the rule runs); those points are taken back to the turned page by `back` and a straight
 * line is fitted through them (total least squares; points off it by more than a pixel left out,
 * then fitted again). A rule that is not straight there (a curve, text) is left out. Weight: the
 * rule's length.
 */
export function ruleSamples(map: InkMap, rules: readonly Rule[], family: 'level' | 'upright', back: (u: number, v: number) => [number, number]): LineSample[] {
  const out: LineSample[] = [];
  const { width, height, ink } = map;
  for (const rule of rules) {
    const pts: [number, number][] = [];
    for (let along = rule.from + 6; along <= rule.to - 6; along += 4) {
      let sw = 0;
      let sp = 0;
      const a = Math.round(along);
      for (let k = Math.round(rule.at - 0.5) - 3; k <= Math.round(rule.at - 0.5) + 3; k++) {
        const inside = family === 'level' ? k >= 0 && k < height && a >= 0 && a < width : k >= 0 && k < width && a >= 0 && a < height;
        if (!inside) continue;
        const d = (family === 'level' ? ink[k * width + a] : ink[a * width + k]) as number;
        sw += d;
        sp += d * (k + 0.5);
      }
      if (sw <= 0) continue;
      const across = sp / sw;
      pts.push(family === 'level' ? back(a + 0.5, across) : back(across, a + 0.5));
    }
    const line = straightLine(pts);
    if (!line) continue;
    const angle = family === 'level' ? line.angle : line.angle < 0 ? line.angle + Math.PI : line.angle;
    out.push({ x: line.x, y: line.y, angle, weight: rule.to - rule.from });
  }
  return out;
}

/** A straight line through points by total least squares, refitted without the points more than 1 px off; null when fewer than 20 points hold or they are not straight (RMS over 0.5 px). */
function straightLine(points: readonly [number, number][]): { x: number; y: number; angle: number } | null {
  const fit = (list: readonly [number, number][]) => {
    const {
      centre: [mx, my],
      angle,
    } = principalAxis(list);
    const off = (p: readonly [number, number]) => Math.abs(-(p[0] - mx) * Math.sin(angle) + (p[1] - my) * Math.cos(angle));
    return { x: mx, y: my, angle, off };
  };
  if (points.length < 20) return null;
  const first = fit(points);
  const kept = points.filter((p) => first.off(p) <= 1);
  if (kept.length < 20) return null;
  const line = fit(kept);
  const rms = Math.sqrt(kept.reduce((t, p) => t + line.off(p) ** 2, 0) / kept.length);
  return rms <= 0.5 ? { x: line.x, y: line.y, angle: line.angle } : null;
}

/**
 * A turned page squared again, when it shows perspective. `turned` is the ink turned level by
 * `angle` (ink.ts `levelOf`, about the centre of the `raw` map); `minSide` the shortest rule
 * counted. The precise measure (`ruleSamples`) needs long rules, which a strong keystone tilts
 * out of the rows; so it starts twice: from the turned page as it is, and from the page squared
 * by the coarse measure of its tiles. Each start is squared again from its rules until it no
 * longer moves; the start whose page shows the most rule length, straight and agreeing, wins.
 * Null when the page shows no perspective or its lines cannot tell.
 */
export function squarePage(raw: InkMap, turned: InkMap, angle: number, threshold: number, minSide: number): { level: Level; map: InkMap; keystone: Keystone } | null {
  const starts = [null, measureKeystone(turned, threshold)];
  let best: { level: Level; map: InkMap; keystone: Keystone } | null = null;
  for (const start of starts) {
    const found = refine(raw, turned, angle, threshold, minSide, start);
    if (found && (!best || found.keystone.support > best.keystone.support)) best = found;
  }
  return best && showsPerspective(best.keystone) ? best : null;
}

/** The precise measure repeated from a start (null: the turned page as it is), each pass on the page squared by the one before. */
function refine(raw: InkMap, turned: InkMap, angle: number, threshold: number, minSide: number, start: Keystone | null): { level: Level; map: InkMap; keystone: Keystone } | null {
  let keystone = start;
  let map = keystone ? levelInk(raw, squaredLevel(angle, raw.width, raw.height, keystone.square)) : turned;
  let last: Keystone | null = null;
  for (let pass = 0; pass < FINE_PASSES; pass++) {
    const inverse = keystone ? invertHomography(keystone.square) : null;
    const back = (u: number, v: number): [number, number] => (inverse ? applyHomography(inverse, u, v) : [u, v]);
    const levelLines = ruleSamples(map, horizontalRules(map, threshold, minSide), 'level', back);
    const uprightLines = ruleSamples(map, verticalRules(map, threshold, minSide), 'upright', back);
    const fine = keystoneOf(levelLines, uprightLines, turned.width, turned.height);
    if (!fine) break;
    const moved = keystone ? largestMove(keystone.square, fine.square, turned.width, turned.height) : Infinity;
    keystone = fine;
    last = fine;
    map = levelInk(raw, squaredLevel(angle, raw.width, raw.height, keystone.square));
    if (moved < 0.05) break;
  }
  if (!last) return null;
  return { level: squaredLevel(angle, raw.width, raw.height, last.square), map, keystone: last };
}

/** Passes of the precise measure at most (each on the page squared by the one before). */
const FINE_PASSES = 4;

/** Largest distance, pixels, between where two homographies put the corners of a width × height map. */
function largestMove(a: H9, b: H9, width: number, height: number): number {
  let most = 0;
  for (const [x, y] of [[0, 0], [width, 0], [width, height], [0, height]] as const) {
    const p = applyHomography(a, x, y);
    const q = applyHomography(b, x, y);
    most = Math.max(most, Math.hypot(p[0] - q[0], p[1] - q[1]));
  }
  return most;
}

/** True when a keystone measurement shows perspective worth squaring. */
export function showsPerspective(k: Keystone): boolean {
  return Math.max(k.spread.level, k.spread.upright) > MIN_SPREAD;
}

/**
 * The level of a squared page: the page turned by `angle` about the centre of a width × height
 * image (as `levelOf` turns it), then squared by `square`. The result maps squared-page pixels
 * to the image and back, and carries the whole map as `homography` (squared page → image) for
 * resampling the ink.
 */
export function squaredLevel(angle: number, width: number, height: number, square: H9): Level {
  const cx = width / 2;
  const cy = height / 2;
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  const turnedToImage: H9 = [c, -s, cx - c * cx + s * cy, s, c, cy - s * cx - c * cy, 0, 0, 1];
  const toImageH = multiplyHomography(turnedToImage, invertHomography(square));
  const toLevelH = invertHomography(toImageH);
  return {
    angle,
    homography: toImageH,
    toImage: (u, v) => applyHomography(toImageH, u, v),
    toLevel: (x, y) => applyHomography(toLevelH, x, y),
  };
}
