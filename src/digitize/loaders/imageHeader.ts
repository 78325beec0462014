/**
 * What an image file claims to be, read from its first bytes before anything is decoded,
 * so that an oversized raster is refused without spending the memory to decode it.
 * Pure: no Node and no DOM imports.
 */
import { checkFileSize, checkRasterSize, DEFAULT_SHEET_LIMITS, SheetError, type SheetLimits } from '../sheet.ts';

export type ImageFormat = 'png' | 'jpeg';

export interface ImageHeader {
  format: ImageFormat;
  width: number;
  height: number;
}

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

export function sniffFormat(bytes: Uint8Array): ImageFormat | undefined {
  if (PNG_SIGNATURE.every((b, i) => bytes[i] === b)) return 'png';
  if (bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return 'jpeg';
  return undefined;
}

function u16(bytes: Uint8Array, at: number): number {
  return ((bytes[at] ?? 0) << 8) | (bytes[at + 1] ?? 0);
}

function u32(bytes: Uint8Array, at: number): number {
  return (((bytes[at] ?? 0) << 24) >>> 0) + ((bytes[at + 1] ?? 0) << 16) + ((bytes[at + 2] ?? 0) << 8) + (bytes[at + 3] ?? 0);
}

/** Size from the PNG IHDR chunk, or undefined when the chunk is missing. */
function pngSize(bytes: Uint8Array): [number, number] | undefined {
  if (bytes.length < 24) return undefined;
  const type = String.fromCharCode(...bytes.subarray(12, 16));
  if (type !== 'IHDR') return undefined;
  return [u32(bytes, 16), u32(bytes, 20)];
}

/**
 * Walks the marker segments of a JPEG up to its first start of scan: the frame size and where
 * the compressed data begins. Segment lengths are followed, so thumbnails inside APP segments
 * are skipped rather than mistaken for the image.
 */
function jpegLayout(bytes: Uint8Array): { size?: [number, number]; scan?: number } {
  let at = 2;
  let size: [number, number] | undefined;
  while (at + 4 <= bytes.length) {
    if (bytes[at] !== 0xff) {
      at++; // stray bytes between segments: decoders skip them (with a warning), so do we
      continue;
    }
    const marker = bytes[at + 1] as number;
    if (marker === 0xff) {
      at++;
      continue;
    }
    if (marker === 0xd8 || (marker >= 0xd0 && marker <= 0xd7) || marker === 0x01) {
      at += 2;
      continue;
    }
    if (marker === 0xd9) return { size };
    const length = u16(bytes, at + 2);
    if (length < 2) return { size };
    const isFrame = marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc;
    if (isFrame && !size && at + 9 <= bytes.length) size = [u16(bytes, at + 7), u16(bytes, at + 5)];
    if (marker === 0xda) return { size, scan: at + 2 + length };
    at += 2 + length;
  }
  return { size };
}

function jpegSize(bytes: Uint8Array): [number, number] | undefined {
  return jpegLayout(bytes).size;
}

/**
 * Checks an image file before decoding: size of the file, format, and size of the raster it
 * announces. Throws SheetError with one sentence saying what is wrong and what to do.
 */
export function readImageHeader(bytes: Uint8Array, name = 'The image', limits: SheetLimits = DEFAULT_SHEET_LIMITS): ImageHeader {
  checkFileSize(bytes.byteLength, limits, name);
  const format = sniffFormat(bytes);
  if (!format) throw new SheetError(`${name} is neither a PNG nor a JPEG image; save the scan as PNG or JPEG, or load it as a PDF.`);
  const size = format === 'png' ? pngSize(bytes) : jpegSize(bytes);
  if (!size || size[0] < 1 || size[1] < 1) {
    throw new SheetError(`${name} is a damaged ${format.toUpperCase()} file (its header gives no image size); scan or export it again.`);
  }
  checkRasterSize(size[0], size[1], limits, name);
  const complete = format === 'png' ? pngComplete(bytes) : jpegComplete(bytes);
  if (!complete) throw new SheetError(`${name} is a cut-off ${format.toUpperCase()} file (its end is missing); copy, scan or export it again.`);
  return { format, width: size[0], height: size[1] };
}

/** True when the PNG's chunks run whole from the signature to an IEND chunk. */
function pngComplete(bytes: Uint8Array): boolean {
  let at = 8;
  let sawData = false;
  while (at + 12 <= bytes.length) {
    const length = u32(bytes, at);
    const type = String.fromCharCode(...bytes.subarray(at + 4, at + 8));
    const next = at + 12 + length;
    if (next > bytes.length) return false;
    if (type === 'IDAT') sawData = true;
    if (type === 'IEND') return sawData;
    at = next;
  }
  return false;
}

/**
 * True when the JPEG's compressed data ends with an end-of-image marker. Inside the
 * compressed data every 0xFF byte is followed by 0x00 or a restart marker, so the first
 * FF D9 after the start of scan is the end of the image.
 */
function jpegComplete(bytes: Uint8Array): boolean {
  const { scan } = jpegLayout(bytes);
  if (scan === undefined) return false;
  // Search for the D9 byte natively, then look at the byte before it (a 1 MB scan in under a millisecond).
  for (let i = bytes.indexOf(0xd9, scan + 1); i > 0; i = bytes.indexOf(0xd9, i + 1)) {
    if (bytes[i - 1] === 0xff) return true;
  }
  return false;
}

/** The sentence for an image that passed the header check but would not decode. */
export function damagedImage(name: string, format: ImageFormat, cause: unknown): SheetError {
  const detail = cause instanceof Error && cause.message ? ` (${cause.message.replace(/\.$/, '')})` : '';
  return new SheetError(`${name} is a damaged ${format.toUpperCase()} file and cannot be decoded${detail}; scan or export it again.`);
}

/** Largest image accepted at all (pixels of the file, before reduction): about A3 at 900 dpi, or A2 at 600 dpi. */
export const MAX_SOURCE_PIXELS = 150_000_000;

/**
 * The working size of an image: its own, or reduced by the smallest whole factor k (2, 3, …)
 * that brings it within `maxPixels`. A whole factor keeps k × k file pixels in each working
 * pixel, so an archive scan at 600 dpi is read at 300 dpi (A3: 69.6 → 17.4 megapixels), a
 * resolution that resolves a 0.25 mm drawn line (3 pixels) and is what scans are taken at anyway.
 */
export function workingSize(width: number, height: number, maxPixels: number): { width: number; height: number; scale: number; factor: number } {
  if (width * height <= maxPixels) return { width, height, scale: 1, factor: 1 };
  let k = Math.max(2, Math.ceil(Math.sqrt((width * height) / maxPixels)));
  while (Math.ceil(width / k) * Math.ceil(height / k) > maxPixels) k++;
  const w = Math.ceil(width / k);
  const h = Math.ceil(height / k);
  return { width: w, height: h, scale: w / width, factor: k };
}

/** The sentence that tells the user a page was read at a reduced resolution, and what follows from it. */
export function reductionNote(name: string, header: { width: number; height: number }, size: { width: number; height: number; factor: number }): string {
  const mp = (w: number, h: number) => ((w * h) / 1e6).toFixed(1);
  return (
    `${name} is ${header.width} × ${header.height} pixels (${mp(header.width, header.height)} megapixels), over the working limit, so it was read at 1/${size.factor} of its resolution ` +
    `(${size.width} × ${size.height}, ${mp(size.width, size.height)} megapixels; a 600-dpi scan is read at ${Math.round(600 / size.factor)} dpi); ` +
    `anchors, guides and points stay in the file's own pixels; for a finer trace, crop the file to the chart and take that off.`
  );
}

/**
 * The header check of a file that may be reduced on load: the file's raster is held to
 * `maxSourcePixels` (default MAX_SOURCE_PIXELS, or the working limit when that is larger), and
 * the refusal says what to do.
 */
export function checkSourceHeader(bytes: Uint8Array, name: string, limits: SheetLimits, maxSourcePixels?: number): ImageHeader {
  try {
    return readImageHeader(bytes, name, { ...limits, maxPixels: maxSourcePixels ?? Math.max(MAX_SOURCE_PIXELS, limits.maxPixels) });
  } catch (error) {
    if (error instanceof SheetError && /megapixel limit/.test(error.message)) {
      throw new SheetError(error.message.replace(/; use a smaller scale or a smaller image\.$/, '; scan the page again at 300 to 600 dpi, or split it into parts, and load that.'));
    }
    throw error;
  }
}
