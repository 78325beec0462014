/**
 * The camera of the random bed: rasterises the flat SVG, then maps it into a scan or a photo
 * through a homography (rotation for a scan; rotation and keystone for a hand-held photo),
 * resampled bilinearly, then blurred (repeated box filters), lit unevenly, noised and
 * compressed as JPEG. The homography is returned, so that truth, anchors and guides can be
 * placed in the final pixels exactly.
 */
import { createCanvas, loadImage } from '@napi-rs/canvas';
import type { Dice } from './dice.ts';
import type { Pt } from './plan.ts';

/** Row-major 3×3: [x', y', w'] = H · [x, y, 1]. */
export type Homography = [number, number, number, number, number, number, number, number, number];

export function applyH(h: Homography, p: readonly [number, number]): Pt {
  const w = h[6] * p[0] + h[7] * p[1] + h[8];
  return [(h[0] * p[0] + h[1] * p[1] + h[2]) / w, (h[3] * p[0] + h[4] * p[1] + h[5]) / w];
}

export function invertH(h: Homography): Homography {
  const [a, b, c, d, e, f, g, k, l] = h;
  const A = e * l - f * k;
  const B = -(d * l - f * g);
  const C = d * k - e * g;
  const det = a * A + b * B + c * C;
  return [A / det, -(b * l - c * k) / det, (b * f - c * e) / det, B / det, (a * l - c * g) / det, -(a * f - c * d) / det, C / det, -(a * k - b * g) / det, (a * e - b * d) / det];
}

/** The homography taking four points onto four points (direct solution of the 8 × 8 system). */
export function homographyFrom(from: readonly Pt[], to: readonly Pt[]): Homography {
  const m: number[][] = [];
  for (let i = 0; i < 4; i++) {
    const [x, y] = from[i] as Pt;
    const [u, v] = to[i] as Pt;
    m.push([x, y, 1, 0, 0, 0, -u * x, -u * y, u]);
    m.push([0, 0, 0, x, y, 1, -v * x, -v * y, v]);
  }
  for (let c = 0; c < 8; c++) {
    let pivot = c;
    for (let r = c + 1; r < 8; r++) if (Math.abs((m[r] as number[])[c] as number) > Math.abs((m[pivot] as number[])[c] as number)) pivot = r;
    [m[c], m[pivot]] = [m[pivot] as number[], m[c] as number[]];
    const row = m[c] as number[];
    for (let r = 0; r < 8; r++) {
      if (r === c) continue;
      const other = m[r] as number[];
      const factor = (other[c] as number) / (row[c] as number);
      for (let k = c; k < 9; k++) other[k] = (other[k] as number) - factor * (row[k] as number);
    }
  }
  const s = m.map((row, i) => (row[8] as number) / (row[i] as number));
  return [s[0], s[1], s[2], s[3], s[4], s[5], s[6], s[7], 1] as Homography;
}

export interface Shot {
  kind: 'scan' | 'photo';
  h: Homography;
  width: number;
  height: number;
  /** Far-edge shortening of a photo (0 for a scan). */
  keystone: number;
  rotationDeg: number;
  blur: number;
  light: number;
  noise: number;
  quality: number;
}

export function chooseShot(dice: Dice, kind: 'scan' | 'photo', width: number, height: number): Shot {
  const rotationDeg = dice.between(-2, 2);
  const keystone = kind === 'photo' ? dice.between(0.02, 0.1) : 0;
  const corners: Pt[] = [
    [0, 0],
    [width, 0],
    [width, height],
    [0, height],
  ];
  const lean = kind === 'photo' ? dice.between(-0.3, 0.3) : 0;
  const shrink = keystone * width;
  const quad: Pt[] = [
    [shrink * (0.5 + lean), kind === 'photo' ? dice.between(0, 0.02) * height : 0],
    [width - shrink * (0.5 - lean), 0],
    [width, height],
    [0, height],
  ];
  const scale = kind === 'photo' ? dice.between(0.85, 1) : 1;
  const turn = (rotationDeg * Math.PI) / 180;
  const moved = quad.map(([x, y]) => {
    const cx = x - width / 2;
    const cy = y - height / 2;
    return [scale * (Math.cos(turn) * cx - Math.sin(turn) * cy), scale * (Math.sin(turn) * cx + Math.cos(turn) * cy)] as Pt;
  });
  const margin = kind === 'photo' ? dice.between(20, 60) : dice.between(4, 20);
  const minX = Math.min(...moved.map((p) => p[0])) - margin;
  const minY = Math.min(...moved.map((p) => p[1])) - margin;
  const placed = moved.map(([x, y]) => [x - minX, y - minY] as Pt);
  const outW = Math.ceil(Math.max(...placed.map((p) => p[0])) + margin);
  const outH = Math.ceil(Math.max(...placed.map((p) => p[1])) + margin);
  return {
    kind,
    h: homographyFrom(corners, placed),
    width: outW,
    height: outH,
    keystone,
    rotationDeg,
    blur: kind === 'photo' ? dice.between(0.3, 1.1) : dice.between(0, 0.8),
    light: kind === 'photo' ? dice.between(0.05, 0.3) : dice.between(0, 0.1),
    noise: dice.between(0, kind === 'photo' ? 4 : 2.5),
    quality: dice.whole(40, 90),
  };
}

/** Rasterises the SVG at its own size into RGBA. */
export async function rasterise(svg: string, width: number, height: number): Promise<Uint8ClampedArray> {
  const image = await loadImage(Buffer.from(svg));
  const canvas = createCanvas(width, height);
  const ctx = canvas.getContext('2d');
  ctx.drawImage(image, 0, 0, width, height);
  return ctx.getImageData(0, 0, width, height).data as unknown as Uint8ClampedArray;
}

/** Box blur of radius r along rows then columns (RGB, edges clamp), in place, by running sums. */
function boxPass(data: Float32Array, width: number, height: number, r: number): void {
  const line = new Float32Array(Math.max(width, height));
  const norm = 1 / (2 * r + 1);
  const blurLine = (start: number, stride: number, count: number) => {
    for (let c = 0; c < 3; c++) {
      for (let i = 0; i < count; i++) line[i] = data[start + i * stride + c] as number;
      let sum = 0;
      for (let k = -r; k <= r; k++) sum += line[k < 0 ? 0 : k >= count ? count - 1 : k] as number;
      for (let i = 0; i < count; i++) {
        data[start + i * stride + c] = sum * norm;
        const leave = i - r;
        const enter = i + r + 1;
        sum += (line[enter >= count ? count - 1 : enter] as number) - (line[leave < 0 ? 0 : leave] as number);
      }
    }
  };
  for (let y = 0; y < height; y++) blurLine(y * width * 3, 3, width);
  for (let x = 0; x < width; x++) blurLine(x * 3, width * 3, height);
}

/** Takes the flat page through the camera and returns the JPEG bytes. */
export async function shoot(dice: Dice, flat: Uint8ClampedArray, flatW: number, flatH: number, shot: Shot): Promise<Buffer> {
  const inv = invertH(shot.h);
  const { width, height } = shot;
  const out = new Float32Array(width * height * 3);
  const table = shot.kind === 'photo' ? [118, 112, 100] : [250, 250, 250];
  const tint = [dice.between(238, 255), dice.between(236, 253), dice.between(228, 250)];
  const [h0, h1, h2, h3, h4, h5, h6, h7, h8] = inv;
  const t0 = table[0] as number;
  const t1 = table[1] as number;
  const t2 = table[2] as number;
  const k0 = (tint[0] as number) / 255;
  const k1 = (tint[1] as number) / 255;
  const k2 = (tint[2] as number) / 255;
  for (let y = 0; y < height; y++) {
    const py = y + 0.5;
    for (let x = 0; x < width; x++) {
      const px = x + 0.5;
      const w = h6 * px + h7 * py + h8;
      const u = (h0 * px + h1 * py + h2) / w - 0.5;
      const v = (h3 * px + h4 * py + h5) / w - 0.5;
      const o = (y * width + x) * 3;
      if (u < 0 || v < 0 || u > flatW - 1 || v > flatH - 1) {
        out[o] = t0;
        out[o + 1] = t1;
        out[o + 2] = t2;
        continue;
      }
      const i0 = Math.floor(u);
      const j0 = Math.floor(v);
      const fx = u - i0;
      const fy = v - j0;
      const i1 = i0 + 1 < flatW ? i0 + 1 : i0;
      const j1 = j0 + 1 < flatH ? j0 + 1 : j0;
      const a = (j0 * flatW + i0) * 4;
      const b = (j0 * flatW + i1) * 4;
      const c = (j1 * flatW + i0) * 4;
      const d = (j1 * flatW + i1) * 4;
      const wa = (1 - fx) * (1 - fy);
      const wb = fx * (1 - fy);
      const wc = (1 - fx) * fy;
      const wd = fx * fy;
      // Paper takes the tint; ink keeps its colour.
      out[o] = k0 * (wa * (flat[a] as number) + wb * (flat[b] as number) + wc * (flat[c] as number) + wd * (flat[d] as number));
      out[o + 1] = k1 * (wa * (flat[a + 1] as number) + wb * (flat[b + 1] as number) + wc * (flat[c + 1] as number) + wd * (flat[d + 1] as number));
      out[o + 2] = k2 * (wa * (flat[a + 2] as number) + wb * (flat[b + 2] as number) + wc * (flat[c + 2] as number) + wd * (flat[d + 2] as number));
    }
  }
  if (shot.blur > 0.15) {
    const r = Math.max(1, Math.round(shot.blur));
    const passes = shot.blur < 0.5 ? 1 : 2;
    for (let p = 0; p < passes; p++) boxPass(out, width, height, r);
  }
  const cx = dice.between(0.2, 0.8);
  const cy = dice.between(0.2, 0.8);
  const gx = dice.between(-1, 1);
  const gy = dice.between(-1, 1);
  const rgba = new Uint8ClampedArray(width * height * 4);
  // Sensor noise from a table of normal deviates, read at random offsets (cheap, still seeded).
  const normals = new Float32Array(65536);
  for (let i = 0; i < normals.length; i++) normals[i] = shot.noise * dice.normal();
  let cursor = dice.whole(0, 65535);
  const stride = 7919;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const px = x / width;
      const py = y / height;
      const light = 1 - shot.light * (0.6 * ((px - cx) ** 2 + (py - cy) ** 2) * 2 + 0.4 * (0.5 + 0.5 * (gx * (px - 0.5) + gy * (py - 0.5))));
      const o = (y * width + x) * 3;
      cursor = (cursor + stride) & 65535;
      const noise = normals[cursor] as number;
      for (let c = 0; c < 3; c++) rgba[(y * width + x) * 4 + c] = (out[o + c] as number) * light + noise;
      rgba[(y * width + x) * 4 + 3] = 255;
    }
  }
  const canvas = createCanvas(width, height);
  const ctx = canvas.getContext('2d');
  const img = ctx.createImageData(width, height);
  img.data.set(rgba);
  ctx.putImageData(img, 0, 0);
  return canvas.encode('jpeg', shot.quality);
}

/** Decodes JPEG bytes into RGBA. */
export async function decode(bytes: Buffer): Promise<{ width: number; height: number; data: Uint8ClampedArray }> {
  const image = await loadImage(bytes);
  const canvas = createCanvas(image.width, image.height);
  const ctx = canvas.getContext('2d');
  ctx.drawImage(image, 0, 0);
  return { width: image.width, height: image.height, data: ctx.getImageData(0, 0, image.width, image.height).data as unknown as Uint8ClampedArray };
}
