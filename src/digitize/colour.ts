/**
 * How much a pixel looks like "the line": a colour model built from the paper colour and
 * the line colour found under a guide. Pure; works on RGBA buffers only.
 *
 * A pixel p is projected onto the segment paper → line in RGB space:
 *   t = (paper − p)·(paper − line) / |paper − line|²      (0 on paper, 1 on the line)
 *   s = |(paper − p) − t·(paper − line)| / |paper − line|   (how far off that segment p lies)
 *   membership = clamp(t − OFF_AXIS_WEIGHT·s, 0, 1)
 * Anti-aliased edges of the line fall on the segment and keep a partial membership, which is
 * what makes the sub-pixel centroid work; other inks (black text over a blue curve, a green
 * curve crossing a blue one) lie off the segment and drop out.
 */
import type { RasterImage } from './raster.ts';

export type Rgb = readonly [number, number, number];

/** Weight of the off-segment distance; 1 keeps JPEG-desaturated edges of thin coloured lines. */
const OFF_AXIS_WEIGHT = 1.0;

export interface InkModel {
  readonly line: Rgb;
  readonly paper: Rgb;
  /** paper − line, and 1/|paper − line|², kept for the hot loop. */
  readonly ax: number;
  readonly ay: number;
  readonly az: number;
  readonly invNorm2: number;
  readonly invNorm: number;
}

/** Smallest paper-to-line contrast (Euclidean RGB distance, 0–441) that can be followed. */
export const MIN_CONTRAST = 40;

export function inkModel(line: Rgb, paper: Rgb): InkModel {
  const ax = paper[0] - line[0];
  const ay = paper[1] - line[1];
  const az = paper[2] - line[2];
  const n2 = Math.max(ax * ax + ay * ay + az * az, 1);
  return { line, paper, ax, ay, az, invNorm2: 1 / n2, invNorm: 1 / Math.sqrt(n2) };
}

/** Membership 0…1 of the colour (r, g, b) in the line (see the file comment). */
export function membership(model: InkModel, r: number, g: number, b: number): number {
  const dx = model.paper[0] - r;
  const dy = model.paper[1] - g;
  const dz = model.paper[2] - b;
  const t = (dx * model.ax + dy * model.ay + dz * model.az) * model.invNorm2;
  const ox = dx - t * model.ax;
  const oy = dy - t * model.ay;
  const oz = dz - t * model.az;
  const s = Math.sqrt(ox * ox + oy * oy + oz * oz) * model.invNorm;
  const m = t - OFF_AXIS_WEIGHT * s;
  return m <= 0 ? 0 : m >= 1 ? 1 : m;
}

/** Euclidean RGB distance. */
export function colourDistance(a: Rgb, r: number, g: number, b: number): number {
  const dx = a[0] - r;
  const dy = a[1] - g;
  const dz = a[2] - b;
  return Math.sqrt(dx * dx + dy * dy + dz * dz);
}

/** Pixels of a square window clipped to the image: [x0, y0, x1, y1), integer pixel indices. */
export function windowAround(image: RasterImage, cx: number, cy: number, radius: number): [number, number, number, number] {
  const x0 = Math.max(0, Math.floor(cx - radius));
  const y0 = Math.max(0, Math.floor(cy - radius));
  const x1 = Math.min(image.width, Math.ceil(cx + radius));
  const y1 = Math.min(image.height, Math.ceil(cy + radius));
  return [x0, y0, x1, y1];
}

/**
 * Paper colour around a point: the mean of the lighter half of the pixels in the window.
 * Lines, text and grid cover far less than half of any window wider than a few line widths,
 * so the lighter half is paper plus its noise.
 */
export function estimatePaper(image: RasterImage, cx: number, cy: number, radius: number): Rgb {
  const [x0, y0, x1, y1] = windowAround(image, cx, cy, radius);
  const { data, width } = image;
  const lum: number[] = [];
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const i = (y * width + x) * 4;
      lum.push((data[i] as number) + (data[i + 1] as number) + (data[i + 2] as number));
    }
  }
  if (lum.length === 0) return [255, 255, 255];
  const sorted = [...lum].sort((a, b) => a - b);
  const median = sorted[Math.floor(sorted.length / 2)] as number;
  let r = 0;
  let g = 0;
  let b = 0;
  let n = 0;
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const i = (y * width + x) * 4;
      const l = (data[i] as number) + (data[i + 1] as number) + (data[i + 2] as number);
      if (l < median) continue;
      r += data[i] as number;
      g += data[i + 1] as number;
      b += data[i + 2] as number;
      n++;
    }
  }
  return [r / n, g / n, b / n];
}
