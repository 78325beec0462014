/**
 * Loads a PNG or JPEG scan as a RasterImage (scale 1: the sheet unit of an image is its pixel)
 * and as a Sheet, in Node.
 *
 * The file is checked before decoding (size of the file, format, size of the raster its
 * header announces). Decoding then runs in a short-lived child process: the native decoder
 * can bring its whole process down on some damaged files, and a damaged scan must end in
 * a sentence, never in a crash that loses the user's work.
 */
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { createRequire } from 'node:module';
import { createCanvas } from '@napi-rs/canvas';
import type { RasterImage } from '../raster.ts';
import { checkRasterSize, DEFAULT_SHEET_LIMITS, SheetError, type Sheet, type SheetLimits } from '../sheet.ts';
import { damagedImage, readImageHeader } from './imageHeader.ts';
import { imageSheet } from './imageSheet.ts';

export interface ImageNodeOptions {
  limits?: SheetLimits;
  /** Name of the file for messages, e.g. 'scan.jpg'. */
  name?: string;
  /** Longest time the decoder may take, milliseconds (default 60 s). */
  timeoutMs?: number;
}

/**
 * Runs in the child: reads the file from stdin, decodes it onto white paper (so transparent
 * areas read as paper), writes width and height (two little-endian 32-bit words) and the RGBA bytes.
 */
const CHILD = `
const { createRequire } = await import('node:module');
const canvas = createRequire(process.argv[1])(process.argv[1]);
const chunks = [];
for await (const c of process.stdin) chunks.push(c);
try {
  const image = await canvas.loadImage(Buffer.concat(chunks));
  const c = canvas.createCanvas(image.width, image.height);
  const ctx = c.getContext('2d');
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, image.width, image.height);
  ctx.drawImage(image, 0, 0);
  const data = ctx.getImageData(0, 0, image.width, image.height).data;
  const head = Buffer.alloc(8);
  head.writeUInt32LE(image.width, 0);
  head.writeUInt32LE(image.height, 4);
  process.stdout.write(head);
  process.stdout.write(Buffer.from(data.buffer, data.byteOffset, data.byteLength));
} catch (error) {
  process.stderr.write(String(error && error.message ? error.message : error));
  process.exitCode = 3;
}
`;

function canvasEntry(): string {
  return createRequire(import.meta.url).resolve('@napi-rs/canvas');
}

function decodeInChild(bytes: Uint8Array, timeoutMs: number): Promise<{ width: number; height: number; data: Uint8ClampedArray }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--input-type=module', '-e', CHILD, canvasEntry()], { stdio: ['pipe', 'pipe', 'pipe'] });
    const out: Buffer[] = [];
    const err: Buffer[] = [];
    const timer = setTimeout(() => child.kill('SIGKILL'), timeoutMs);
    child.stdout.on('data', (c: Buffer) => out.push(c));
    child.stderr.on('data', (c: Buffer) => err.push(c));
    child.on('error', (e) => {
      clearTimeout(timer);
      reject(e);
    });
    child.on('close', (code, signal) => {
      clearTimeout(timer);
      const all = Buffer.concat(out);
      if (code !== 0 || all.length < 8) {
        const why = Buffer.concat(err).toString('utf8').trim().split('\n')[0] || (signal ? `the decoder stopped on ${signal}` : `the decoder failed with code ${code}`);
        reject(new Error(why));
        return;
      }
      const width = all.readUInt32LE(0);
      const height = all.readUInt32LE(4);
      if (all.length !== 8 + width * height * 4) {
        reject(new Error('the decoder returned an incomplete image'));
        return;
      }
      const data = new Uint8ClampedArray(width * height * 4);
      data.set(all.subarray(8));
      resolve({ width, height, data });
    });
    child.stdin.on('error', () => undefined);
    child.stdin.end(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength));
  });
}

/** Decodes a PNG or JPEG file into RGBA pixels at scale 1. Throws SheetError for unusable files. */
export async function loadImageRasterNode(bytes: Uint8Array, options: ImageNodeOptions = {}): Promise<RasterImage> {
  const limits = options.limits ?? DEFAULT_SHEET_LIMITS;
  const name = options.name ? `The image "${options.name}"` : 'The image';
  const header = readImageHeader(bytes, name, limits);
  let decoded: Awaited<ReturnType<typeof decodeInChild>>;
  try {
    decoded = await decodeInChild(bytes, options.timeoutMs ?? 60_000);
  } catch (error) {
    throw damagedImage(name, header.format, error);
  }
  if (decoded.width !== header.width || decoded.height !== header.height) {
    throw new SheetError(`${name} decodes to ${decoded.width} × ${decoded.height} pixels although its header says ${header.width} × ${header.height}; the file is damaged, so scan or export it again.`);
  }
  return { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
}

/** Resamples a raster to `scale` pixels per sheet unit (smoothing when it shrinks). */
function resample(image: RasterImage, scale: number, limits: SheetLimits): RasterImage {
  const w = Math.max(1, Math.round(image.width * scale));
  const h = Math.max(1, Math.round(image.height * scale));
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

/** Opens a PNG or JPEG scan as a Sheet of kind 'image' (sheet units are the image's pixels). */
export async function loadImageSheetNode(bytes: Uint8Array, options: ImageNodeOptions = {}): Promise<Sheet> {
  const limits = options.limits ?? DEFAULT_SHEET_LIMITS;
  const image = await loadImageRasterNode(bytes, options);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  return imageSheet(image, sha256, (scale) => resample(image, scale, limits));
}
