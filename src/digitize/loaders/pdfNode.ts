/**
 * Loads a PDF page as a Sheet in Node: pdf.js's legacy build for parsing, @napi-rs/canvas
 * for rendering. pdf.js is imported lazily so that commands that never read a PDF start fast.
 */
import { createHash } from 'node:crypto';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { openPdfSheet, type CanvasLike } from './pdfPage.ts';
import type { Sheet, SheetLimits } from '../sheet.ts';

export interface PdfNodeOptions {
  page?: number;
  limits?: SheetLimits;
  /** Name of the file for messages, e.g. 'sheet.pdf'. */
  name?: string;
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

type PdfJs = typeof import('pdfjs-dist/legacy/build/pdf.mjs');
let pdfjsPromise: Promise<PdfJs> | null = null;

/**
 * pdf.js and its worker module (run in this thread, as pdf.js does in Node). Each module patches
 * `Response.prototype.bytes` as it loads, and in Node 20 the first touch of `Response` loads the
 * whole fetch implementation (undici): 25–60 ms of every PDF command, for a method pdf.js uses only
 * when it writes PDFs. So both load beside a stand-in `Response`, and Node's own (still unloaded)
 * is put back at once; the worker module is handed to pdf.js (`globalThis.pdfjsWorker`), which
 * would otherwise import it later, outside the stand-in.
 */
async function importPdfJs(): Promise<PdfJs> {
  const real = Object.getOwnPropertyDescriptor(globalThis, 'Response');
  const standIn = real?.configurable === true && typeof real.get === 'function';
  if (standIn) Object.defineProperty(globalThis, 'Response', { value: class Response {}, configurable: true, writable: true });
  try {
    // The minified builds of the same release: Node compiles ES modules afresh on every run (no code
    // cache for them in Node 20), and half the text compiles in about 60 % of the time, with less memory.
    const [pdfjs, worker] = await Promise.all([import('pdfjs-dist/legacy/build/pdf.min.mjs'), import('pdfjs-dist/legacy/build/pdf.worker.min.mjs')]);
    (globalThis as { pdfjsWorker?: unknown }).pdfjsWorker ??= worker;
    return pdfjs;
  } finally {
    if (standIn) Object.defineProperty(globalThis, 'Response', real);
  }
}

function pdfjsDistRoot(): string {
  const require = createRequire(import.meta.url);
  return dirname(require.resolve('pdfjs-dist/package.json'));
}

/** Opens page `options.page` (default 1) of the PDF in `bytes`. Throws SheetError for unusable files. */
export async function loadPdfSheetNode(bytes: Uint8Array, options: PdfNodeOptions = {}): Promise<Sheet> {
  pdfjsPromise ??= importPdfJs();
  const [pdfjs, { createCanvas }] = await Promise.all([pdfjsPromise, import('@napi-rs/canvas')]);
  const root = pdfjsDistRoot();
  // pdf.js wants these as directory paths ending in '/', not as URLs, when it runs in Node.
  const standardFontDataUrl = `${join(root, 'standard_fonts')}/`;
  const cMapUrl = `${join(root, 'cmaps')}/`;
  const name = options.name ? `The PDF "${options.name}"` : 'The PDF';
  return openPdfSheet(pdfjs, bytes, {
    ...(options.page !== undefined ? { page: options.page } : {}),
    ...(options.limits ? { limits: options.limits } : {}),
    name,
    sha256: sha256Hex(bytes),
    documentOptions: { standardFontDataUrl, cMapUrl, cMapPacked: true, useSystemFonts: false },
    createCanvas: (w, h) => createCanvas(w, h) as unknown as CanvasLike,
    // A canvas of zero size gives its pixel memory back at once.
    releaseCanvas: (canvas) => Object.assign(canvas, { width: 0, height: 0 }),
    cleanupAfterRender: true,
  });
}

