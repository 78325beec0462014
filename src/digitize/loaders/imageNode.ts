/**
 * Loads a PNG or JPEG scan as a RasterImage and as a Sheet, in Node, decoded in this process.
 *
 * The file is checked before anything is decoded: size of the file, format, and the size of
 * the raster its header announces, against MAX_SOURCE_PIXELS — a decompression bomb (say a
 * 30000 × 30000 header) is refused before a single pixel is allocated, with a sentence that
 * says what to do. A page over the working limit (`limits.maxPixels`, 40 megapixels) is read at
 * 1/k of its resolution, k the smallest whole factor that fits (an A3 page at 600 dpi, 69.6
 * megapixels, is read at 300 dpi), inside the decoder, so archive scans load in bounded memory;
 * the caller is told in one sentence (`onNote`). Its sheet units stay the file's pixels (the
 * raster's `scale` is below 1), so a take-off's anchors and guides keep their meaning, and
 * `readImageRegionNode` re-reads any region at full resolution. See imageDecode.ts for the decoders.
 */
import { createHash } from 'node:crypto';
import type { Box, RegionRaster, RegionReader } from '../closeTrace.ts';
import { sheetPoint } from '../points.ts';
import type { RasterImage } from '../raster.ts';
import { checkRasterSize, DEFAULT_SHEET_LIMITS, SheetError, type Sheet, type SheetLimits } from '../sheet.ts';
import { checkSourceHeader, damagedImage, reductionNote, workingSize, type ImageHeader } from './imageHeader.ts';
export { MAX_SOURCE_PIXELS, reductionNote, workingSize } from './imageHeader.ts';
import { imageSheet, reducedImageSheet } from './imageSheet.ts';
import { decodeNative, decodeNativeRegion, decodePng, PngNotStreamable, type DecodedImage } from './imageDecode.ts';

export interface ImageNodeOptions {
  limits?: SheetLimits;
  /** Name of the file for messages, e.g. 'scan.jpg'. */
  name?: string;
  /** Largest image accepted before reduction, pixels (default MAX_SOURCE_PIXELS). */
  maxSourcePixels?: number;
  /** Told one sentence when the page was read at a reduced resolution (see reductionNote). */
  onNote?: (sentence: string) => void;
}

/**
 * Decodes a PNG or JPEG file into RGBA pixels, at scale 1 or reduced to the working limit.
 * Throws SheetError for unusable files.
 */
export async function loadImageRasterNode(bytes: Uint8Array, options: ImageNodeOptions = {}): Promise<RasterImage> {
  return (await loadChecked(bytes, options)).image;
}

async function loadChecked(bytes: Uint8Array, options: ImageNodeOptions): Promise<{ header: ImageHeader; image: RasterImage }> {
  const limits = options.limits ?? DEFAULT_SHEET_LIMITS;
  const name = options.name ? `The image "${options.name}"` : 'The image';
  const header = checkSourceHeader(bytes, name, limits, options.maxSourcePixels);
  const size = workingSize(header.width, header.height, limits.maxPixels);
  let decoded: DecodedImage;
  try {
    if (header.format === 'png') {
      try {
        decoded = await decodePng(bytes, size.width, size.height);
      } catch (error) {
        if (!(error instanceof PngNotStreamable)) throw error;
        decoded = await decodeNative(bytes, header.width, header.height, size.width, size.height);
      }
    } else {
      // JPEG decoders round differently. The browser decodes with libjpeg-turbo, and so does
      // decodeNative here (the same pixels as the canvas library's decoder, checked by the tests),
      // so the workbench and the headless replay follow the same pixels and give the same curve
      // set (a JavaScript decoder differed by up to 1 % of a curve's domain on a sample scan).
      // The header was checked above; a damaged body is refused by the decoder with a sentence.
      decoded = await decodeNative(bytes, header.width, header.height, size.width, size.height);
    }
  } catch (error) {
    throw damagedImage(name, header.format, error);
  }
  if (decoded.width !== size.width || decoded.height !== size.height) {
    throw new SheetError(`${name} decodes to ${decoded.width} × ${decoded.height} pixels although its header says ${header.width} × ${header.height}; the file is damaged, so scan or export it again.`);
  }
  if (size.factor > 1) options.onNote?.(reductionNote(name, header, size));
  return { header, image: { width: decoded.width, height: decoded.height, data: decoded.data, scale: size.scale } };
}

/** Resamples a raster by `factor` (smoothing when it shrinks); the result has `scale` pixels per sheet unit. */
async function resample(image: RasterImage, factor: number, limits: SheetLimits, scale = factor): Promise<RasterImage> {
  const { createCanvas } = await import('@napi-rs/canvas');
  const w = Math.max(1, Math.round(image.width * factor));
  const h = Math.max(1, Math.round(image.height * factor));
  checkRasterSize(w, h, limits, 'The rendered image');
  const source = createCanvas(image.width, image.height);
  const sctx = source.getContext('2d');
  const pixels = sctx.createImageData(image.width, image.height);
  pixels.data.set(image.data);
  sctx.putImageData(pixels, 0, 0);
  const target = createCanvas(w, h);
  const tctx = target.getContext('2d');
  tctx.imageSmoothingEnabled = true;
  tctx.imageSmoothingQuality = 'high';
  tctx.drawImage(source, 0, 0, w, h);
  return { width: w, height: h, data: new Uint8ClampedArray(tctx.getImageData(0, 0, w, h).data), scale };
}

/**
 * Opens a PNG or JPEG scan as a Sheet of kind 'image'. Sheet units are the file's pixels, also
 * when the page was reduced on load: then `render(1)` answers with the working raster (its
 * `scale` below 1), and other scales are resampled from it.
 */
export async function loadImageSheetNode(bytes: Uint8Array, options: ImageNodeOptions = {}): Promise<Sheet> {
  const limits = options.limits ?? DEFAULT_SHEET_LIMITS;
  const { header, image } = await loadChecked(bytes, options);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const sheet = imageSheet(image, sha256, (scale) => resample(image, scale / image.scale, limits, scale));
  if (image.scale === 1) return sheet;
  return { ...reducedImageSheet(sheet, header, image, (scale) => resample(image, scale / image.scale, limits, scale)), region: regionReader(bytes, header, options) };
}

/**
 * The reduced page's `region`: a box of the file at its own resolution, clamped to the page.
 * The last box read is kept, so the traces of one panel (which ask for the panel's box) read
 * the file once; a box over the working limit is answered with a sentence instead.
 */
function regionReader(bytes: Uint8Array, header: ImageHeader, options: ImageNodeOptions): RegionReader {
  const limits = options.limits ?? DEFAULT_SHEET_LIMITS;
  let last: { key: string; region: Promise<RegionRaster> } | undefined;
  return async (box: Box) => {
    const left = Math.max(0, Math.floor(box[0]));
    const top = Math.max(0, Math.floor(box[1]));
    const right = Math.min(header.width, Math.ceil(box[2]));
    const bottom = Math.min(header.height, Math.ceil(box[3]));
    if (!(right > left && bottom > top)) return 'the part of the page asked for lies outside the image';
    const pixels = (right - left) * (bottom - top);
    if (pixels > limits.maxPixels) return `its panel spans ${(pixels / 1e6).toFixed(1)} megapixels at the file's resolution, over the ${(limits.maxPixels / 1e6).toFixed(1)} megapixel working limit; crop the file to the panel and take that off`;
    const key = `${left},${top},${right},${bottom}`;
    if (last?.key !== key) {
      last = undefined; // free the previous panel's pixels before reading the next
      last = { key, region: readImageRegionNode(bytes, { left, top, width: right - left, height: bottom - top }, options).then((image) => ({ image, origin: sheetPoint(left, top) })) };
    }
    return last.region;
  };
}

/** A rectangle of an image file in its own pixels (sheet units of an image sheet). */
export interface ImageRegion {
  left: number;
  top: number;
  width: number;
  height: number;
}

/**
 * Re-reads a region of a PNG or JPEG file at its full resolution, for a close trace of a page
 * that was reduced on load: the file is decoded again in strips down to the region's last row,
 * and only the region's pixels are kept. The answer's pixel (0, 0) is the file's pixel
 * (`region.left`, `region.top`); its `scale` is 1. The region must lie inside the file and stay
 * within the working limit. Throws SheetError with one sentence otherwise.
 */
export async function readImageRegionNode(bytes: Uint8Array, region: ImageRegion, options: ImageNodeOptions = {}): Promise<RasterImage> {
  const limits = options.limits ?? DEFAULT_SHEET_LIMITS;
  const name = options.name ? `The image "${options.name}"` : 'The image';
  const header = checkSourceHeader(bytes, name, limits, options.maxSourcePixels);
  const r = { left: Math.floor(region.left), top: Math.floor(region.top), width: Math.ceil(region.width), height: Math.ceil(region.height) };
  if (!(r.left >= 0 && r.top >= 0 && r.width >= 1 && r.height >= 1 && r.left + r.width <= header.width && r.top + r.height <= header.height)) {
    throw new SheetError(`The region ${r.width} × ${r.height} at (${r.left}, ${r.top}) is not inside ${name.replace(/^The/, 'the')} of ${header.width} × ${header.height} pixels; choose a region on the page.`);
  }
  checkRasterSize(r.width, r.height, limits, 'The region');
  try {
    const decoded = await decodeNativeRegion(bytes, header.width, header.height, r);
    return { ...decoded, scale: 1 };
  } catch (error) {
    throw damagedImage(name, header.format, error);
  }
}
