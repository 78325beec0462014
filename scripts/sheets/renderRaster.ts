/**
 * Renders a drawing as a scanned sheet with @napi-rs/canvas: at a given resolution, turned by
 * a small angle about the page centre (a sheet laid slightly askew on the glass), on tinted
 * paper, then blurred (scanner optics), noised (sensor) and compressed as JPEG.
 * The mapping from sheet points to image pixels is exact and returned with the image, so
 * that the truth and the take-off file can be written in image pixels.
 */
import { createCanvas } from '@napi-rs/canvas';
import { gaussian, seededRandom, type Colour, type Drawing } from './drawing.ts';

export interface ScanSpec {
  dpi: number;
  rotationDeg: number;
  /** Standard deviation of the added noise, grey levels (0–255). */
  noise: number;
  /** Standard deviation of the Gaussian blur, pixels. */
  blur: number;
  /** JPEG quality 1–100; absent for a lossless PNG. */
  jpegQuality?: number;
  paper?: Colour;
  seed?: number;
}

/** Sheet point → image pixel: p_px = C + R(θ)·(s·p − C), C the image centre. */
export interface ScanGeometry {
  scale: number;
  rotation: number;
  width: number;
  height: number;
}

export function scanGeometry(drawing: Pick<Drawing, 'width' | 'height'>, spec: Pick<ScanSpec, 'dpi' | 'rotationDeg'>): ScanGeometry {
  const scale = spec.dpi / 72;
  return { scale, rotation: (spec.rotationDeg * Math.PI) / 180, width: Math.round(drawing.width * scale), height: Math.round(drawing.height * scale) };
}

/** The affine map of the geometry as [a, b, c, d, e, f]: x' = a·x + c·y + e, y' = b·x + d·y + f. */
export function scanMatrix(g: ScanGeometry): [number, number, number, number, number, number] {
  const cos = Math.cos(g.rotation);
  const sin = Math.sin(g.rotation);
  const cx = g.width / 2;
  const cy = g.height / 2;
  return [g.scale * cos, g.scale * sin, -g.scale * sin, g.scale * cos, cx - cos * cx + sin * cy, cy - sin * cx - cos * cy];
}

export function toScan(g: ScanGeometry, p: readonly [number, number]): [number, number] {
  const [a, b, c, d, e, f] = scanMatrix(g);
  return [a * p[0] + c * p[1] + e, b * p[0] + d * p[1] + f];
}

const css = (c: Colour) => `rgb(${Math.round(c[0] * 255)}, ${Math.round(c[1] * 255)}, ${Math.round(c[2] * 255)})`;

/** Separable Gaussian blur of the RGB channels, in place (edges clamp). */
function blurRgb(data: Uint8ClampedArray, width: number, height: number, sigma: number): void {
  if (!(sigma > 0)) return;
  const radius = Math.max(1, Math.ceil(2.5 * sigma));
  const raw: number[] = [];
  for (let k = -radius; k <= radius; k++) raw.push(Math.exp(-(k * k) / (2 * sigma * sigma)));
  const total = raw.reduce((a, b) => a + b, 0);
  const kernel = Float32Array.from(raw, (w) => w / total);
  const taps = kernel.length;
  const line = new Float32Array(Math.max(width, height) + 2 * radius);
  const out = new Float32Array(Math.max(width, height));
  // One channel along one row or column at a time: copy with clamped borders, convolve, write back.
  const pass = (count: number, length: number, index: (line: number, i: number) => number) => {
    for (let c = 0; c < 3; c++) {
      for (let l = 0; l < count; l++) {
        for (let i = -radius; i < length + radius; i++) line[i + radius] = data[index(l, Math.min(length - 1, Math.max(0, i))) + c] as number;
        for (let i = 0; i < length; i++) {
          let acc = 0;
          for (let k = 0; k < taps; k++) acc += (kernel[k] as number) * (line[i + k] as number);
          out[i] = acc;
        }
        for (let i = 0; i < length; i++) data[index(l, i) + c] = out[i] as number;
      }
    }
  };
  pass(height, width, (y, x) => (y * width + x) * 4);
  pass(width, height, (x, y) => (y * width + x) * 4);
}

/** Sensor noise: mostly shared by the three channels (luminance), a little per channel. */
function addNoise(data: Uint8ClampedArray, sigma: number, random: () => number): void {
  if (!(sigma > 0)) return;
  // A table of normal deviates, drawn from at random offsets: fast and plenty for noise.
  const size = 1 << 16;
  const table = new Float32Array(size);
  for (let i = 0; i < size; i++) table[i] = gaussian(random);
  let state = Math.floor(random() * 0xffffffff) | 1;
  const next = () => {
    state ^= state << 13;
    state ^= state >>> 17;
    state ^= state << 5;
    return table[(state >>> 0) & (size - 1)] as number;
  };
  const common = sigma * 0.85;
  const own = sigma * 0.3;
  for (let i = 0; i < data.length; i += 4) {
    const n = next() * common;
    data[i] = (data[i] as number) + n + next() * own;
    data[i + 1] = (data[i + 1] as number) + n + next() * own;
    data[i + 2] = (data[i + 2] as number) + n + next() * own;
  }
}

export interface Scan {
  bytes: Uint8Array;
  format: 'jpeg' | 'png';
  geometry: ScanGeometry;
}

export function renderScan(drawing: Drawing, spec: ScanSpec): Scan {
  const geometry = scanGeometry(drawing, spec);
  const canvas = createCanvas(geometry.width, geometry.height);
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = css(spec.paper ?? [0.97, 0.96, 0.93]);
  ctx.fillRect(0, 0, geometry.width, geometry.height);
  const [a, b, c, d, e, f] = scanMatrix(geometry);
  ctx.setTransform(a, b, c, d, e, f);
  ctx.lineCap = 'round';
  ctx.lineJoin = 'round';
  for (const item of drawing.items) {
    if (item.kind === 'polyline') {
      ctx.strokeStyle = css(item.ink.colour);
      ctx.lineWidth = item.ink.width;
      ctx.beginPath();
      item.points.forEach((p, i) => (i === 0 ? ctx.moveTo(p[0], p[1]) : ctx.lineTo(p[0], p[1])));
      ctx.stroke();
    } else if (item.kind === 'rect') {
      if (item.fill) {
        ctx.fillStyle = item.fill[0] === 1 && item.fill[1] === 1 && item.fill[2] === 1 ? css(spec.paper ?? [0.97, 0.96, 0.93]) : css(item.fill);
        ctx.fillRect(item.x, item.y, item.w, item.h);
      }
      if (item.stroke) {
        ctx.strokeStyle = css(item.stroke.colour);
        ctx.lineWidth = item.stroke.width;
        ctx.strokeRect(item.x, item.y, item.w, item.h);
      }
    } else {
      ctx.fillStyle = css(item.colour);
      ctx.font = `${item.bold ? 'bold ' : ''}${item.size}px "Liberation Sans"`;
      ctx.textAlign = item.align;
      ctx.textBaseline = 'alphabetic';
      ctx.fillText(item.text, item.x, item.y);
    }
  }
  ctx.setTransform(1, 0, 0, 1, 0, 0);
  const pixels = ctx.getImageData(0, 0, geometry.width, geometry.height);
  blurRgb(pixels.data, geometry.width, geometry.height, spec.blur);
  addNoise(pixels.data, spec.noise, seededRandom(spec.seed ?? 7));
  ctx.putImageData(pixels, 0, 0);
  if (spec.jpegQuality !== undefined) {
    return { bytes: new Uint8Array(canvas.toBuffer('image/jpeg', spec.jpegQuality)), format: 'jpeg', geometry };
  }
  return { bytes: new Uint8Array(canvas.toBuffer('image/png')), format: 'png', geometry };
}
