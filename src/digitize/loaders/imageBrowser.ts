/**
 * Loads a PNG or JPEG scan as a RasterImage and as a Sheet in the browser, with
 * createImageBitmap and an OffscreenCanvas. The same header checks as in Node run first, so
 * an oversized raster is refused before the browser spends memory decoding it, and a page over
 * the working limit is read at the same reduced size as in Node (workingSize: 1/k of its
 * resolution, the browser scaling it while it decodes), with the same sheet units (the file's pixels).
 */
import type { RasterImage } from '../raster.ts';
import { checkRasterSize, DEFAULT_SHEET_LIMITS, SheetError, type Sheet, type SheetLimits } from '../sheet.ts';
import { checkSourceHeader, damagedImage, reductionNote, workingSize, type ImageHeader } from './imageHeader.ts';
import { imageSheet, reducedImageSheet } from './imageSheet.ts';

export interface ImageBrowserOptions {
  limits?: SheetLimits;
  /** Name of the file for messages. */
  name?: string;
  /** Told one sentence when the page was read at a reduced resolution. */
  onNote?: (sentence: string) => void;
}

function drawToRaster(source: CanvasImageSource, width: number, height: number, scale: number): RasterImage {
  const canvas = new OffscreenCanvas(width, height);
  const ctx = canvas.getContext('2d');
  if (!ctx) throw new SheetError('This browser cannot draw into an off-screen canvas; use a current browser to load scans.');
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, width, height);
  ctx.imageSmoothingQuality = 'high';
  ctx.drawImage(source, 0, 0, width, height);
  return { width, height, data: ctx.getImageData(0, 0, width, height).data, scale };
}

/** Decodes a PNG or JPEG file into RGBA pixels, at scale 1 or reduced to the working limit. Throws SheetError for unusable files. */
export async function loadImageRasterBrowser(bytes: Uint8Array, options: ImageBrowserOptions = {}): Promise<RasterImage> {
  return (await loadChecked(bytes, options)).image;
}

async function loadChecked(bytes: Uint8Array, options: ImageBrowserOptions): Promise<{ header: ImageHeader; image: RasterImage }> {
  const limits = options.limits ?? DEFAULT_SHEET_LIMITS;
  const name = options.name ? `The image "${options.name}"` : 'The image';
  const header = checkSourceHeader(bytes, name, limits);
  const size = workingSize(header.width, header.height, limits.maxPixels);
  let bitmap: ImageBitmap;
  try {
    const blob = new Blob([bytes.slice()], { type: header.format === 'png' ? 'image/png' : 'image/jpeg' });
    bitmap = await createImageBitmap(blob, size.factor > 1 ? { resizeWidth: size.width, resizeHeight: size.height, resizeQuality: 'high' } : {});
  } catch (error) {
    throw damagedImage(name, header.format, error);
  }
  try {
    if (size.factor > 1) options.onNote?.(reductionNote(name, header, size));
    return { header, image: drawToRaster(bitmap, bitmap.width, bitmap.height, size.scale) };
  } finally {
    bitmap.close();
  }
}

async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', bytes.slice());
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, '0')).join('');
}

/** Opens a PNG or JPEG scan as a Sheet of kind 'image' (sheet units are the image's pixels). */
export async function loadImageSheetBrowser(bytes: Uint8Array, options: ImageBrowserOptions = {}): Promise<Sheet> {
  const limits = options.limits ?? DEFAULT_SHEET_LIMITS;
  const { header, image } = await loadChecked(bytes, options);
  const sha256 = await sha256Hex(bytes);
  const resample = async (scale: number): Promise<RasterImage> => {
    const w = Math.max(1, Math.round(header.width * scale));
    const h = Math.max(1, Math.round(header.height * scale));
    checkRasterSize(w, h, limits, 'The rendered image');
    const bitmap = await createImageBitmap(new ImageData(new Uint8ClampedArray(image.data), image.width, image.height));
    try {
      return drawToRaster(bitmap, w, h, scale);
    } finally {
      bitmap.close();
    }
  };
  const sheet = imageSheet(image, sha256, resample);
  return image.scale === 1 ? sheet : reducedImageSheet(sheet, header, image, resample);
}
