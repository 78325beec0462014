/**
 * How much a pixel looks like "the line": a colour model built from the paper colour and
 * the line colour found under a guide. Pure; works on RGBA buffers only.
 *
 * Colours are taken as differences from the paper, Δ = paper − pixel, split into luma
 * Y(Δ) = 0.299 ΔR + 0.587 ΔG + 0.114 ΔB (ITU-R BT.601 weights) and chroma C(Δ) = Δ − Y(Δ)·(1,1,1).
 * Scans and JPEGs keep luma sharp but smear chroma (JPEG stores it at half resolution), so:
 *   t = Y(Δp) / Y(Δline)                       how dark the pixel is, as a fraction of the line
 * and, for a coloured line, the pixel's chroma must point the line's way:
 *   a = C(Δp)·ĉ / |C(Δline)|,  o = |C(Δp) − (C(Δp)·ĉ) ĉ| / |C(Δline)|
 *   membership = t · ramp(a / t) − 1.5·o   (ramp: 0 below 0.1, 1 from 0.35 up)
 * so a line whose colour was thinned to half by the compression still counts, black text or
 * a differently coloured curve across it does not. For a black or grey line, any chroma counts
 * against the pixel: membership = t − 1.5·|C(Δp)| / Y(Δline).
 * Anti-aliased edges (a mix of line and paper) get membership equal to the mix fraction,
 * which is what makes the sub-pixel centroid work. A line with little luma contrast (yellow
 * on white) falls back to the projection onto the paper → line segment in RGB. A line is coloured
 * when its chroma is over a quarter of its luma, or over 12 % and clear of JPEG noise (a faint
 * coloured line keeps little of its chroma on a scan); else black or grey.
 */
import type { RasterImage } from './raster.ts';

export type Rgb = readonly [number, number, number];

export interface InkModel {
  readonly line: Rgb;
  readonly paper: Rgb;
  /** The paper's channels again, as plain numbers (read for every sample). */
  readonly paperR: number;
  readonly paperG: number;
  readonly paperB: number;
  /** paper − line. */
  readonly ax: number;
  readonly ay: number;
  readonly az: number;
  readonly mode: 'chromatic' | 'achromatic' | 'projection';
  /** 1 / Y(paper − line). */
  readonly invLuma: number;
  /** Unit chroma direction of the line and 1 / |C(paper − line)|. */
  readonly cx: number;
  readonly cy: number;
  readonly cz: number;
  readonly invChroma: number;
  /**
   * 1 / the chroma against which chroma off the line's way counts: the line's own, and at least a
   * quarter of its luma (see `WEAK_CHROMATIC_SHARE`).
   */
  readonly invOff: number;
  /** For the projection fallback: 1/|paper − line|² and 1/|paper − line|. */
  readonly invNorm2: number;
  readonly invNorm: number;
}

/**
 * Smallest paper-to-line contrast (Euclidean RGB distance, 0–441) that can be followed: a thin
 * dotted line blurred by a scan keeps little more than this.
 */
export const MIN_CONTRAST = 24;

const luma = (r: number, g: number, b: number) => 0.299 * r + 0.587 * g + 0.114 * b;

/**
 * A colour (r, g, b) as its difference from the paper, Δ = paper − colour, split into luma
 * Y(Δ) and chroma C(Δ) = Δ − Y(Δ)·(1,1,1) (see the file comment), with |C(Δ)|; 0–255 units.
 */
export function lumaChroma(paper: Rgb, r: number, g: number, b: number): { luma: number; cx: number; cy: number; cz: number; chroma: number } {
  const dx = paper[0] - r;
  const dy = paper[1] - g;
  const dz = paper[2] - b;
  const y = luma(dx, dy, dz);
  const cx = dx - y;
  const cy = dy - y;
  const cz = dz - y;
  return { luma: y, cx, cy, cz, chroma: Math.hypot(cx, cy, cz) };
}

/**
 * Chroma, as a share of the luma (both against the paper), above which a line colour is held to
 * its hue: a coloured line always clears a quarter.
 */
const CHROMATIC_SHARE = 0.25;

/**
 * A weaker hue that still holds a line colour to it: chroma over 12 % of the luma and at least
 * 8 (0–255 units). A faint or dotted coloured line on a scan or photo keeps only part of its
 * chroma (JPEG stores chroma at half resolution, and a dot or thin line blurs into the paper),
 * often under a quarter of its luma; read as grey, its model takes the grey grid and black lines
 * for the line wherever they are about as dark. Grey ink keeps under 5 of chroma in JPEG noise
 * and colour fringes, and the black lines of the random bed's one-colour sheets, sampled on tinted
 * paper, keep under 8 % of their luma (254 of 255 traces), so neither reaches this. Chroma off
 * the line's way is held against at least a quarter of the luma (`invOff`), not against so weak a
 * hue: else JPEG chroma noise, a good share of a weak hue, counts against the line's own pixels
 * and the line is lost where it crosses the grid. The tracer holds a sample to a weak hue only
 * where the line is dashed or dotted and the ink around the click keeps colour (`acquire` in
 * rasterTrace.ts); on the random bed (seeds 1–100) that leaves 9 fewer of 1085 curves wrong (11
 * right that were wrong, 2 wrong that were right, both flagged).
 */
const WEAK_CHROMATIC_SHARE = 0.12;
const WEAK_CHROMA_MIN = 8;

/**
 * The model of a line of colour `line` on `paper`. With `weakHue` false a colour whose hue is
 * weak (see `WEAK_CHROMATIC_SHARE`) is read as grey: the reading under which a grey sample is
 * told to lie on a grid line.
 */
export function inkModel(line: Rgb, paper: Rgb, weakHue = true): InkModel {
  const ax = paper[0] - line[0];
  const ay = paper[1] - line[1];
  const az = paper[2] - line[2];
  const n2 = Math.max(ax * ax + ay * ay + az * az, 1);
  const { luma: y, cx: kx, cy: ky, cz: kz, chroma } = lumaChroma(paper, line[0], line[1], line[2]);
  const hue = chroma > CHROMATIC_SHARE * y || (weakHue && chroma > WEAK_CHROMATIC_SHARE * y && chroma >= WEAK_CHROMA_MIN);
  const mode = y < 0.3 * Math.sqrt(n2) ? 'projection' : hue ? 'chromatic' : 'achromatic';
  return {
    line,
    paper,
    paperR: paper[0],
    paperG: paper[1],
    paperB: paper[2],
    ax,
    ay,
    az,
    mode,
    invLuma: y > 0 ? 1 / y : 0,
    cx: chroma > 0 ? kx / chroma : 0,
    cy: chroma > 0 ? ky / chroma : 0,
    cz: chroma > 0 ? kz / chroma : 0,
    invChroma: chroma > 0 ? 1 / chroma : 0,
    invOff: chroma > 0 ? 1 / Math.max(chroma, CHROMATIC_SHARE * y) : 0,
    invNorm2: 1 / n2,
    invNorm: 1 / Math.sqrt(n2),
  };
}

/**
 * Membership 0…1 of the colour (r, g, b) in the line (see the file comment). Called for every
 * sample a tracer takes: each mode is its own small function, so that the engine can inline it.
 */
export function membership(model: InkModel, r: number, g: number, b: number): number {
  const dx = model.paperR - r;
  const dy = model.paperG - g;
  const dz = model.paperB - b;
  if (model.mode === 'chromatic') return chromaticMembership(model, dx, dy, dz);
  if (model.mode === 'achromatic') return achromaticMembership(model, dx, dy, dz);
  return projectionMembership(model, dx, dy, dz);
}

/**
 * The colour's darkness share: t of the file comment (for the projection fallback, the projection
 * onto the paper → line segment). Linear in the colour, and membership never exceeds it, so a
 * mix of pixels none of which reaches a share cannot reach that membership either.
 */
export function darknessShare(model: InkModel, r: number, g: number, b: number): number {
  const dx = model.paperR - r;
  const dy = model.paperG - g;
  const dz = model.paperB - b;
  if (model.mode === 'projection') return (dx * model.ax + dy * model.ay + dz * model.az) * model.invNorm2;
  return (0.299 * dx + 0.587 * dy + 0.114 * dz) * model.invLuma;
}

const clamp01 = (m: number) => (m <= 0 ? 0 : m >= 1 ? 1 : m);

/**
 * A margin far above the rounding of a few operations: a comparison without root or division
 * that clears it by this factor decides exactly as the full computation would.
 */
const SURE = 1 + 1e-9;

/** A coloured line: the luma share, held to the chroma pointing the line's way (Δ = paper − colour). */
function chromaticMembership(model: InkModel, dx: number, dy: number, dz: number): number {
  const y = 0.299 * dx + 0.587 * dy + 0.114 * dz;
  const t = y * model.invLuma;
  if (t <= 0) return 0;
  const kx = dx - y;
  const ky = dy - y;
  const kz = dz - y;
  const along = kx * model.cx + ky * model.cy + kz * model.cz;
  const a = along * model.invChroma;
  // Chroma clearly short of the line's way (the ramp is 0 below a / t = 0.1): 0 without the root.
  if (a * SURE < 0.1 * t) return 0;
  const ox = kx - along * model.cx;
  const oy = ky - along * model.cy;
  const oz = kz - along * model.cz;
  const o = Math.sqrt(ox * ox + oy * oy + oz * oz) * model.invOff;
  const ratio = a / t;
  const ramp = ratio <= 0.1 ? 0 : ratio >= 0.35 ? 1 : (ratio - 0.1) / 0.25;
  return clamp01((t > 1 ? 1 : t) * ramp - 1.5 * o);
}

/** A black or grey line: the luma share less any chroma. */
function achromaticMembership(model: InkModel, dx: number, dy: number, dz: number): number {
  const y = 0.299 * dx + 0.587 * dy + 0.114 * dz;
  const t = y * model.invLuma;
  if (t <= 0) return 0;
  const kx = dx - y;
  const ky = dy - y;
  const kz = dz - y;
  const k2 = kx * kx + ky * ky + kz * kz;
  // Chroma clearly outweighing the luma share (most paper pixels) gives 0 without the root.
  if (2.25 * k2 * model.invLuma * model.invLuma > t * t * SURE) return 0;
  return clamp01(t - 1.5 * Math.sqrt(k2) * model.invLuma);
}

/** A line of little luma contrast: the projection onto the paper → line segment, less the distance off it. */
function projectionMembership(model: InkModel, dx: number, dy: number, dz: number): number {
  const t = (dx * model.ax + dy * model.ay + dz * model.az) * model.invNorm2;
  const s = Math.hypot(dx - t * model.ax, dy - t * model.ay, dz - t * model.az) * model.invNorm;
  return clamp01(t - 2 * s);
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
  // Median of r+g+b from a histogram (0…765), then the mean colour of the pixels at or above it.
  const histogram = new Uint32Array(766);
  let count = 0;
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const i = (y * width + x) * 4;
      (histogram[(data[i] as number) + (data[i + 1] as number) + (data[i + 2] as number)] as number)++;
      count++;
    }
  }
  if (count === 0) return [255, 255, 255];
  let median = 0;
  for (let seen = 0; median < 766; median++) {
    seen += histogram[median] as number;
    if (seen * 2 >= count) break;
  }
  let r = 0;
  let g = 0;
  let b = 0;
  let n = 0;
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const i = (y * width + x) * 4;
      if ((data[i] as number) + (data[i + 1] as number) + (data[i + 2] as number) < median) continue;
      r += data[i] as number;
      g += data[i + 1] as number;
      b += data[i + 2] as number;
      n++;
    }
  }
  return [r / n, g / n, b / n];
}
