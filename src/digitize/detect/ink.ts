/**
 * The ink of a scanned sheet, for the automatic take-off: how much darker than the paper
 * each pixel is (paper measured block by block, so uneven light does not read as ink), the
 * small rotation of the page on the scanner glass, and the page turned back level, so that
 * the frames and grid lines run along rows and columns. A `Level` maps between the level page
 * and the image's own pixels both ways.
 *
 * Pure: works on an RGBA raster.
 */
import type { H9 } from '../homography.ts';
import type { RasterImage } from '../raster.ts';

/** Darkness below the local paper (0 = paper, 255 = black), one byte a pixel, row-major. */
export interface InkMap {
  readonly width: number;
  readonly height: number;
  readonly ink: Uint8Array;
}

/** The turn of the page: level coordinates (u, v) ⇄ image pixels (x, y), about the image centre. */
export interface Level {
  /** Rotation of the page's horizontal lines in the image, radians (y down: positive leans down to the right). */
  readonly angle: number;
  toImage(u: number, v: number): [number, number];
  toLevel(x: number, y: number): [number, number];
  /** For a photographed page squared again (keystone.ts): the whole map from level pixels to image pixels. */
  readonly homography?: H9;
}

const BLOCK = 48;

/** True when the machine stores a word's low byte first. */
const LITTLE_ENDIAN = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1;

/** Darkness of every pixel below the brightness of its block's paper (the 80th percentile of the block's luminance). */
export function inkMap(image: RasterImage): InkMap {
  const { width, height, data } = image;
  const lum = new Uint8Array(width * height);
  // A pixel read as one word (red in its low byte on a little-endian machine) where the RGBA bytes allow it.
  const words = LITTLE_ENDIAN && data.byteOffset % 4 === 0 && data.length >= 4 * lum.length ? new Uint32Array(data.buffer, data.byteOffset, lum.length) : null;
  if (words) {
    for (let i = 0; i < lum.length; i++) {
      const p = words[i] as number;
      lum[i] = (77 * (p & 255) + 150 * ((p >>> 8) & 255) + 29 * ((p >>> 16) & 255)) >> 8;
    }
  } else for (let i = 0, o = 0; i < lum.length; i++, o += 4) lum[i] = (77 * (data[o] as number) + 150 * (data[o + 1] as number) + 29 * (data[o + 2] as number)) >> 8;
  const bw = Math.ceil(width / BLOCK);
  const bh = Math.ceil(height / BLOCK);
  const paper = new Float32Array(bw * bh);
  const hist = new Uint32Array(256);
  for (let by = 0; by < bh; by++) {
    for (let bx = 0; bx < bw; bx++) {
      hist.fill(0);
      let n = 0;
      for (let y = by * BLOCK; y < Math.min(height, (by + 1) * BLOCK); y += 2) {
        for (let x = bx * BLOCK; x < Math.min(width, (bx + 1) * BLOCK); x += 2) {
          hist[lum[y * width + x] as number]!++;
          n++;
        }
      }
      let seen = 0;
      let level = 255;
      for (let v = 0; v < 256; v++) {
        seen += hist[v] as number;
        if (seen >= 0.8 * n) {
          level = v;
          break;
        }
      }
      paper[by * bw + bx] = level;
    }
  }
  // A block that is mostly ink (a thick frame corner, a filled legend) takes its neighbours' paper.
  const smooth = new Float32Array(paper.length);
  for (let by = 0; by < bh; by++) {
    for (let bx = 0; bx < bw; bx++) {
      let best = 0;
      for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) {
        const x = bx + dx;
        const y = by + dy;
        if (x >= 0 && y >= 0 && x < bw && y < bh) best = Math.max(best, paper[y * bw + x] as number);
      }
      smooth[by * bw + bx] = best;
    }
  }
  // Each pixel's darkness is written over its own luminance, read last here.
  const ink = lum;
  for (let y = 0; y < height; y++) {
    const row = Math.min(bh - 1, (y / BLOCK) | 0) * bw;
    const base = y * width;
    for (let bx = 0; bx < bw; bx++) {
      // A whole level: the paper is a luminance value.
      const p = (smooth[row + bx] as number) | 0;
      const end = Math.min(width, (bx + 1) * BLOCK);
      for (let x = bx * BLOCK; x < end; x++) {
        const d = p - (lum[base + x] as number);
        ink[base + x] = d <= 0 ? 0 : d;
      }
    }
  }
  return { width, height, ink };
}

/** The darkness that most ink reaches: half the 99.9th percentile of the inked pixels, at least 40. */
export function strongInk(map: InkMap): number {
  const hist = new Uint32Array(256);
  let n = 0;
  for (let i = 0; i < map.ink.length; i += 3) {
    const v = map.ink[i] as number;
    if (v >= 20) {
      hist[v]!++;
      n++;
    }
  }
  let seen = 0;
  for (let v = 255; v >= 0; v--) {
    seen += hist[v] as number;
    if (seen >= 0.001 * n) return Math.max(40, 0.5 * v);
  }
  return 40;
}

/**
 * The page's rotation, from its dark pixels: the angle (within ±4°) at which their rows pile up
 * most sharply (the sum of squared row counts is largest), as long straight rules do when level.
 */
export function pageAngle(map: InkMap, threshold: number): number {
  return dominantAngle(map, threshold).angle;
}

/**
 * `pageAngle` with how sharply the dark pixels pile up at it: the coarse search's best score
 * over its mean score across the ±4° searched (1 for ink with no straight lines, several for
 * long rules). Angle in radians; `sharpness` 0 when there is too little ink to tell.
 */
export function dominantAngle(map: InkMap, threshold: number): { angle: number; sharpness: number } {
  const { width, height, ink } = map;
  let count = 0;
  // Every row (sampling every other row would favour the level angle, whose bins it fills alternately).
  for (let y = 0; y < height; y++) for (let x = y % 3; x < width; x += 3) if ((ink[y * width + x] as number) >= threshold) count++;
  if (count < 50) return { angle: 0, sharpness: 0 };
  const xs = new Float64Array(count);
  const ys = new Float64Array(count);
  for (let y = 0, k = 0; y < height; y++) {
    for (let x = y % 3; x < width; x += 3) {
      if ((ink[y * width + x] as number) >= threshold) {
        xs[k] = x;
        ys[k++] = y;
      }
    }
  }
  const bins = new Float64Array(4 * (height + 2 * width));
  // `per`: bins a pixel (1 for the coarse search, 4 for the fine one, where a quarter pixel over the page's width matters).
  const score = (a: number, per = 1) => {
    bins.fill(0);
    const t = Math.tan(a);
    const off = width;
    let s = 0;
    for (let i = 0; i < xs.length; i++) {
      const k = Math.round(per * ((ys[i] as number) - (xs[i] as number) * t + off));
      const c = bins[k] as number;
      s += 2 * c + 1;
      bins[k] = c + 1;
    }
    return s;
  };
  const deg = Math.PI / 180;
  let best = 0;
  let bestScore = -1;
  let sum = 0;
  let tried = 0;
  for (let a = -4; a <= 4 + 1e-9; a += 0.1) {
    const s = score(a * deg);
    sum += s;
    tried++;
    if (s > bestScore) [best, bestScore] = [a, s];
  }
  let fine = best;
  for (let a = best - 0.1; a <= best + 0.1 + 1e-9; a += 0.01) {
    const s = score(a * deg);
    if (s > bestScore) [fine, bestScore] = [a, s];
  }
  let finest = fine;
  let finestScore = -1;
  for (let a = fine - 0.015; a <= fine + 0.015 + 1e-9; a += 0.0025) {
    const s = score(a * deg, 4);
    if (s > finestScore) [finest, finestScore] = [a, s];
  }
  return { angle: finest * deg, sharpness: bestScore / (sum / tried) };
}

export function levelOf(angle: number, width: number, height: number): Level {
  const cx = width / 2;
  const cy = height / 2;
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  return {
    angle,
    toImage: (u, v) => [cx + c * (u - cx) - s * (v - cy), cy + s * (u - cx) + c * (v - cy)],
    toLevel: (x, y) => [cx + c * (x - cx) + s * (y - cy), cy - s * (x - cx) + c * (y - cy)],
  };
}

/** The ink map turned level (bilinear; pixels from outside the image are paper). */
export function levelInk(map: InkMap, level: Level): InkMap {
  if (level.homography) return squaredInk(map, level.homography);
  if (level.angle === 0) return map;
  const { width, height, ink } = map;
  const out = new Uint8Array(width * height);
  const c = Math.cos(level.angle);
  const s = Math.sin(level.angle);
  const cx = width / 2;
  const cy = height / 2;
  const w1 = width - 1;
  const h1 = height - 1;
  for (let v = 0; v < height; v++) {
    // Pixel centres: (u + 0.5, v + 0.5) level ↔ (x + 0.5, y + 0.5) image.
    let x = cx + c * (0.5 - cx) - s * (v + 0.5 - cy) - 0.5;
    let y = cy + s * (0.5 - cx) + c * (v + 0.5 - cy) - 0.5;
    const row = v * width;
    for (let u = 0; u < width; u++, x += c, y += s) {
      if (x < 0 || y < 0 || x >= w1 || y >= h1) continue;
      const k = bilinear(ink, width, x, y);
      if (k !== 0) out[row + u] = k;
    }
  }
  return { width, height, ink: out };
}

/** Darkness at (x, y) of an ink map `width` wide, bilinear between the four pixels around it (0 ≤ x < width − 1, y likewise), rounded on storing; 0 where all four are paper. */
function bilinear(ink: Uint8Array, width: number, x: number, y: number): number {
  const x0 = x | 0;
  const y0 = y | 0;
  const fx = x - x0;
  const fy = y - y0;
  const i = y0 * width + x0;
  const a = ink[i] as number;
  const b = ink[i + 1] as number;
  const d = ink[i + width] as number;
  const e = ink[i + width + 1] as number;
  if ((a | b | d | e) === 0) return 0;
  const top = a + fx * (b - a);
  return top + fy * (d + fx * (e - d) - top) + 0.5;
}

/** The ink map seen through a homography from level pixels to image pixels (bilinear; pixels from outside the image are paper). */
function squaredInk(map: InkMap, h: H9): InkMap {
  const { width, height, ink } = map;
  const out = new Uint8Array(width * height);
  const [h0, h1, h2, h3, h4, h5, h6, h7, h8] = h;
  const w1 = width - 1;
  const ht1 = height - 1;
  for (let v = 0; v < height; v++) {
    const row = v * width;
    const vc = v + 0.5;
    for (let u = 0; u < width; u++) {
      // Pixel centres: (u + 0.5, v + 0.5) level ↔ (x + 0.5, y + 0.5) image.
      const uc = u + 0.5;
      const w = h6 * uc + h7 * vc + h8;
      const x = (h0 * uc + h1 * vc + h2) / w - 0.5;
      const y = (h3 * uc + h4 * vc + h5) / w - 0.5;
      if (!(x >= 0 && y >= 0 && x < w1 && y < ht1)) continue;
      const k = bilinear(ink, width, x, y);
      if (k !== 0) out[row + u] = k;
    }
  }
  return { width, height, ink: out };
}
