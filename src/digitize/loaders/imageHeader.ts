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
