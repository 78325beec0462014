/**
 * A picture of part of a sheet for looking at traces: the pixels around some points, enlarged
 * `zoom` times, on which square dots mark points of the sheet. Shared by traceView.ts and
 * speedView.ts.
 */
import sharp from 'sharp';

export interface MarkedCrop {
  /** The crop, sheet pixels: [x0, y0, x1, y1]. */
  readonly box: readonly [number, number, number, number];
  readonly width: number;
  readonly height: number;
  /** Marks the sheet point `p` with a square dot of half-size `r` (picture pixels). */
  dot(p: readonly [number, number], rgb: readonly [number, number, number], r: number): void;
  /** Writes the picture as PNG. */
  save(file: string): Promise<void>;
}

/** The crop around `points` with 20 pixels to spare, of an RGBA raster. */
export function markedCrop(raster: { width: number; height: number; data: Uint8Array | Uint8ClampedArray }, points: readonly (readonly [number, number])[], zoom: number): MarkedCrop {
  const xs = points.map((p) => p[0]);
  const ys = points.map((p) => p[1]);
  const x0 = Math.max(0, Math.floor(Math.min(...xs) - 20));
  const y0 = Math.max(0, Math.floor(Math.min(...ys) - 20));
  const x1 = Math.min(raster.width, Math.ceil(Math.max(...xs) + 20));
  const y1 = Math.min(raster.height, Math.ceil(Math.max(...ys) + 20));
  const w = (x1 - x0) * zoom;
  const h = (y1 - y0) * zoom;
  const buf = Buffer.alloc(w * h * 4);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const si = ((y0 + Math.floor(y / zoom)) * raster.width + x0 + Math.floor(x / zoom)) * 4;
      const di = (y * w + x) * 4;
      buf[di] = raster.data[si] as number;
      buf[di + 1] = raster.data[si + 1] as number;
      buf[di + 2] = raster.data[si + 2] as number;
      buf[di + 3] = 255;
    }
  }
  return {
    box: [x0, y0, x1, y1],
    width: w,
    height: h,
    dot(p, rgb, r) {
      const cx = (p[0] - x0) * zoom;
      const cy = (p[1] - y0) * zoom;
      for (let y = Math.floor(cy - r); y <= cy + r; y++) {
        for (let x = Math.floor(cx - r); x <= cx + r; x++) {
          if (x < 0 || y < 0 || x >= w || y >= h) continue;
          const di = (y * w + x) * 4;
          [buf[di], buf[di + 1], buf[di + 2]] = rgb;
        }
      }
    },
    async save(file) {
      await sharp(buf, { raw: { width: w, height: h, channels: 4 } }).png().toFile(file);
    },
  };
}
