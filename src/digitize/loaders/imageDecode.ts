/**
 * In-process decoding of PNG and JPEG scans into one RGBA raster, in strips or rows, so that the
 * only page-sized allocation is the result itself (4 bytes a pixel at the working size):
 *  - PNG: the compressed data is inflated as a stream (node:zlib) and each row is unfiltered
 *    as it arrives (PNG specification, ISO/IEC 15948, section 9), needing two rows at a time;
 *    a page larger than the working size is reduced while it is decoded, by averaging the
 *    source pixels that fall into each working pixel (a box filter), so thin lines fade but
 *    never vanish;
 *  - JPEG (and interlaced PNG): libjpeg-turbo, through the sharp package, writes the raster
 *    itself (decodeNative below): the browser's decoder, so the workbench sees the same pixels.
 * Transparent areas are laid on white paper.
 *
 * The caller has checked the header (size limits) before anything here allocates.
 */
import { createInflate } from 'node:zlib';

export interface DecodedImage {
  width: number;
  height: number;
  data: Uint8ClampedArray;
}

/** Collects full-resolution RGBA rows into the working raster, averaging when it is smaller. */
class RowSink {
  readonly data: Uint8ClampedArray;
  private readonly sums: Uint32Array | null;
  private readonly counts: Uint32Array | null;
  private readonly columnOf: Uint32Array | null;
  private currentRow = -1;
  private y = 0;

  constructor(
    private readonly srcWidth: number,
    private readonly srcHeight: number,
    readonly width: number,
    readonly height: number,
  ) {
    this.data = new Uint8ClampedArray(width * height * 4);
    if (width === srcWidth && height === srcHeight) {
      this.sums = this.counts = this.columnOf = null;
    } else {
      this.sums = new Uint32Array(width * 4);
      this.counts = new Uint32Array(width);
      this.columnOf = new Uint32Array(srcWidth);
      for (let x = 0; x < srcWidth; x++) this.columnOf[x] = Math.min(width - 1, Math.floor((x * width) / srcWidth));
    }
  }

  get rowsSeen(): number {
    return this.y;
  }

  push(row: Uint8Array | Uint8ClampedArray): void {
    if (!this.sums) {
      this.data.set(row, this.y * this.width * 4);
      this.y++;
      return;
    }
    const target = Math.min(this.height - 1, Math.floor((this.y * this.height) / this.srcHeight));
    if (target !== this.currentRow) {
      this.flush();
      this.currentRow = target;
    }
    const sums = this.sums;
    const counts = this.counts as Uint32Array;
    const columnOf = this.columnOf as Uint32Array;
    for (let x = 0; x < this.srcWidth; x++) {
      const o = columnOf[x] as number;
      const i = x * 4;
      sums[o * 4] = (sums[o * 4] as number) + (row[i] as number);
      sums[o * 4 + 1] = (sums[o * 4 + 1] as number) + (row[i + 1] as number);
      sums[o * 4 + 2] = (sums[o * 4 + 2] as number) + (row[i + 2] as number);
      counts[o] = (counts[o] as number) + 1;
    }
    this.y++;
    if (this.y === this.srcHeight) this.flush();
  }

  private flush(): void {
    if (!this.sums || this.currentRow < 0) return;
    const sums = this.sums;
    const counts = this.counts as Uint32Array;
    const base = this.currentRow * this.width * 4;
    for (let x = 0; x < this.width; x++) {
      const n = (counts[x] as number) || 1;
      this.data[base + x * 4] = (sums[x * 4] as number) / n;
      this.data[base + x * 4 + 1] = (sums[x * 4 + 1] as number) / n;
      this.data[base + x * 4 + 2] = (sums[x * 4 + 2] as number) / n;
      this.data[base + x * 4 + 3] = 255;
    }
    sums.fill(0);
    counts.fill(0);
    this.currentRow = -1;
  }
}

function u32(bytes: Uint8Array, at: number): number {
  return (((bytes[at] as number) << 24) >>> 0) + ((bytes[at + 1] as number) << 16) + ((bytes[at + 2] as number) << 8) + (bytes[at + 3] as number);
}

const CHANNELS: Record<number, number> = { 0: 1, 2: 3, 3: 1, 4: 2, 6: 4 };

/** Thrown for PNG features this decoder leaves to the native decoder (interlaced files). */
export class PngNotStreamable extends Error {}

/** Decodes a PNG into a `width` × `height` RGBA raster (the source size, or smaller). */
export async function decodePng(bytes: Uint8Array, width: number, height: number): Promise<DecodedImage> {
  const w = u32(bytes, 16);
  const h = u32(bytes, 20);
  const bitDepth = bytes[24] as number;
  const colorType = bytes[25] as number;
  const interlace = bytes[28] as number;
  const channels = CHANNELS[colorType];
  if (channels === undefined || ![1, 2, 4, 8, 16].includes(bitDepth)) throw new Error(`unsupported PNG colour type ${colorType} with bit depth ${bitDepth}`);
  if (interlace !== 0) throw new PngNotStreamable('interlaced PNG');

  let palette: Uint8Array | null = null;
  let paletteAlpha: Uint8Array | null = null;
  const idat: Uint8Array[] = [];
  for (let at = 8; at + 12 <= bytes.length; ) {
    const length = u32(bytes, at);
    const type = String.fromCharCode(bytes[at + 4] as number, bytes[at + 5] as number, bytes[at + 6] as number, bytes[at + 7] as number);
    const body = bytes.subarray(at + 8, at + 8 + length);
    if (type === 'PLTE') palette = body;
    else if (type === 'tRNS' && colorType === 3) paletteAlpha = body;
    else if (type === 'IDAT') idat.push(body);
    else if (type === 'IEND') break;
    at += 12 + length;
  }
  if (colorType === 3 && !palette) throw new Error('the palette (PLTE chunk) is missing');

  const sink = new RowSink(w, h, width, height);
  const rowBytes = Math.ceil((w * channels * bitDepth) / 8);
  const bpp = Math.max(1, (channels * bitDepth) >> 3);
  let previous = new Uint8Array(rowBytes);
  let current = new Uint8Array(rowBytes);
  const rgba = new Uint8Array(w * 4);
  let filter = -1;
  let filled = 0;
  const maxSample = (1 << Math.min(bitDepth, 8)) - 1;

  const sample = (row: Uint8Array, index: number): number => {
    // The index-th sample of the row, scaled to 0…255 (16-bit samples keep their high byte).
    if (bitDepth === 8) return row[index] as number;
    if (bitDepth === 16) return row[index * 2] as number;
    const perByte = 8 / bitDepth;
    const byte = row[Math.floor(index / perByte)] as number;
    const shift = 8 - bitDepth * ((index % perByte) + 1);
    return (byte >> shift) & maxSample;
  };

  /** True when every pixel of an 8-bit RGBA row is opaque. */
  const opaque = (row: Uint8Array): boolean => {
    for (let i = 3; i < w * 4; i += 4) if (row[i] !== 255) return false;
    return true;
  };

  const finishRow = (): void => {
    const row = current;
    if (filter === 1) {
      for (let i = bpp; i < rowBytes; i++) row[i] = ((row[i] as number) + (row[i - bpp] as number)) & 255;
    } else if (filter === 2) {
      for (let i = 0; i < rowBytes; i++) row[i] = ((row[i] as number) + (previous[i] as number)) & 255;
    } else if (filter === 3) {
      for (let i = 0; i < rowBytes; i++) row[i] = ((row[i] as number) + (((i >= bpp ? (row[i - bpp] as number) : 0) + (previous[i] as number)) >> 1)) & 255;
    } else if (filter === 4) {
      for (let i = 0; i < rowBytes; i++) {
        const a = i >= bpp ? (row[i - bpp] as number) : 0;
        const b = previous[i] as number;
        const c = i >= bpp ? (previous[i - bpp] as number) : 0;
        const p = a + b - c;
        const pa = Math.abs(p - a);
        const pb = Math.abs(p - b);
        const pc = Math.abs(p - c);
        row[i] = ((row[i] as number) + (pa <= pb && pa <= pc ? a : pb <= pc ? b : c)) & 255;
      }
    } else if (filter !== 0) throw new Error(`unknown row filter ${filter}`);
    if (bitDepth === 8 && (colorType === 2 || colorType === 0 || (colorType === 6 && opaque(row)))) {
      // The common cases of scans, without per-sample calls.
      if (colorType === 2) {
        for (let x = 0, i = 0; x < w; x++, i += 3) {
          rgba[x * 4] = row[i] as number;
          rgba[x * 4 + 1] = row[i + 1] as number;
          rgba[x * 4 + 2] = row[i + 2] as number;
          rgba[x * 4 + 3] = 255;
        }
      } else if (colorType === 6) {
        rgba.set(row.subarray(0, w * 4));
      } else {
        for (let x = 0; x < w; x++) {
          const v = row[x] as number;
          rgba[x * 4] = v;
          rgba[x * 4 + 1] = v;
          rgba[x * 4 + 2] = v;
          rgba[x * 4 + 3] = 255;
        }
      }
      sink.push(rgba);
      [previous, current] = [current, previous];
      filter = -1;
      filled = 0;
      return;
    }
    for (let x = 0; x < w; x++) {
      let r: number;
      let g: number;
      let bl: number;
      let alpha = 255;
      if (colorType === 3) {
        const index = sample(row, x);
        r = palette![index * 3] ?? 0;
        g = palette![index * 3 + 1] ?? 0;
        bl = palette![index * 3 + 2] ?? 0;
        alpha = paletteAlpha && index < paletteAlpha.length ? (paletteAlpha[index] as number) : 255;
      } else if (colorType === 0 || colorType === 4) {
        const v = bitDepth < 8 ? Math.round((sample(row, x * channels) * 255) / maxSample) : sample(row, x * channels);
        r = g = bl = v;
        if (colorType === 4) alpha = sample(row, x * channels + 1);
      } else {
        r = sample(row, x * channels);
        g = sample(row, x * channels + 1);
        bl = sample(row, x * channels + 2);
        if (colorType === 6) alpha = sample(row, x * channels + 3);
      }
      if (alpha !== 255) {
        // on white paper: c·α + 255·(1 − α)
        r = (r * alpha + 255 * (255 - alpha)) / 255;
        g = (g * alpha + 255 * (255 - alpha)) / 255;
        bl = (bl * alpha + 255 * (255 - alpha)) / 255;
      }
      rgba[x * 4] = r;
      rgba[x * 4 + 1] = g;
      rgba[x * 4 + 2] = bl;
      rgba[x * 4 + 3] = 255;
    }
    sink.push(rgba);
    [previous, current] = [current, previous];
    filter = -1;
    filled = 0;
  };

  await new Promise<void>((resolve, reject) => {
    const inflate = createInflate({ chunkSize: 1 << 16 });
    inflate.on('data', (chunk: Buffer) => {
      try {
        for (let i = 0; i < chunk.length && sink.rowsSeen < h; i++) {
          if (filter < 0) {
            filter = chunk[i] as number;
            continue;
          }
          const take = Math.min(rowBytes - filled, chunk.length - i);
          current.set(chunk.subarray(i, i + take), filled);
          filled += take;
          i += take - 1;
          if (filled === rowBytes) finishRow();
        }
      } catch (error) {
        inflate.destroy();
        reject(error);
      }
    });
    inflate.on('error', reject);
    inflate.on('end', () => resolve());
    for (const part of idat) inflate.write(part);
    inflate.end();
  });
  if (sink.rowsSeen !== h) throw new Error(`the image data holds ${sink.rowsSeen} of ${h} rows`);
  return { width, height, data: sink.data };
}

type Sharp = typeof import('sharp');
let sharpModule: Promise<Sharp> | null = null;

/** The native JPEG library, loaded on the first JPEG (a take-off of a PDF never loads it). */
function nativeJpeg(): Promise<Sharp> {
  sharpModule ??= import('sharp').then((m) => {
    const sharp = ((m as { default?: Sharp }).default ?? m) as Sharp;
    sharp.cache(false); // one decode per file: no cache of decoded images kept around
    sharp.concurrency(1); // the machines are shared; one thread decodes a JPEG in about 0.1 s per 8 megapixels
    return sharp;
  });
  return sharpModule;
}

/**
 * Decodes a JPEG (or a PNG that the streaming decoder above leaves aside: interlaced) of
 * `srcWidth` × `srcHeight` into a `width` × `height` RGBA raster (the file's size, or smaller by
 * a whole factor). libjpeg-turbo decodes it, the library browsers use, with the same settings as
 * the canvas library (exact integer IDCT, smooth chroma upsampling; the tests compare pixel for
 * pixel): the workbench and the headless replay follow the same pixels. The library writes the
 * RGBA raster itself, reading the file in strips, so the peak is the raster plus a few strips.
 * A page reduced on load is scaled down inside the decoder (libjpeg-turbo's 1/2, 1/4, 1/8 block
 * scaling, a low-pass reduction: thin lines fade but never vanish), and any factor left over is
 * an area-weighted reduction; the file's full-resolution pixels are never held at once.
 */
export async function decodeNative(bytes: Uint8Array, srcWidth: number, srcHeight: number, width: number, height: number): Promise<DecodedImage> {
  let pipeline = await nativePipeline(bytes, srcWidth, srcHeight);
  if (width !== srcWidth || height !== srcHeight) pipeline = pipeline.resize(width, height, { fit: 'fill', kernel: 'linear', fastShrinkOnLoad: true });
  return rgbaOf(pipeline, width, height);
}

/** Decodes the region `r` of the file at full resolution (decoding in strips, keeping only the region). */
export async function decodeNativeRegion(bytes: Uint8Array, srcWidth: number, srcHeight: number, r: { left: number; top: number; width: number; height: number }): Promise<DecodedImage> {
  return rgbaOf((await nativePipeline(bytes, srcWidth, srcHeight)).extract(r), r.width, r.height);
}

async function nativePipeline(bytes: Uint8Array, srcWidth: number, srcHeight: number) {
  const sharp = await nativeJpeg();
  return sharp(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), {
    sequentialRead: true,
    // A damaged file is an error; a warning (stray bytes between segments, common from some
    // scanners) is not, as browsers show such files too. Cut-off files were refused from the header.
    failOn: 'error',
    limitInputPixels: srcWidth * srcHeight, // the size the header promised, checked again by the library
  })
    .flatten({ background: { r: 255, g: 255, b: 255 } }) // transparent areas on white paper (PNG)
    .toColourspace('srgb'); // grey scans come out as RGB too
}

async function rgbaOf(pipeline: import('sharp').Sharp, width: number, height: number): Promise<DecodedImage> {
  const { data, info } = await pipeline.ensureAlpha(1).raw().toBuffer({ resolveWithObject: true });
  if (info.width !== width || info.height !== height || info.channels !== 4) throw new Error(`the image data holds ${info.width} × ${info.height} pixels of ${info.channels} channels`);
  // The library's own output buffer is the raster: no copy.
  return { width, height, data: new Uint8ClampedArray(data.buffer, data.byteOffset, data.byteLength) };
}
