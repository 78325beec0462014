/**
 * Loads a PDF page as a Sheet in the browser: plain pdfjs-dist with its worker served by Vite,
 * and a DOM or off-screen canvas for rendering. Everything else is shared with Node through
 * pdfPage.ts (opening, paths from the operator list, text, errors).
 */
import pdfWorkerUrl from 'pdfjs-dist/build/pdf.worker.min.mjs?url';
import { openPdfSheet, type CanvasLike } from './pdfPage.ts';
import type { Sheet, SheetLimits } from '../sheet.ts';

export interface PdfBrowserOptions {
  page?: number;
  limits?: SheetLimits;
  /** Name of the file for messages. */
  name?: string;
  /** Extra getDocument options (for instance those a Web Worker needs). */
  documentOptions?: Record<string, unknown>;
}

type PdfJs = typeof import('pdfjs-dist');
let pdfjsPromise: Promise<PdfJs> | null = null;

function loadPdfJs(): Promise<PdfJs> {
  pdfjsPromise ??= import('pdfjs-dist').then((pdfjs) => {
    if (!pdfjs.GlobalWorkerOptions.workerPort && !pdfjs.GlobalWorkerOptions.workerSrc) pdfjs.GlobalWorkerOptions.workerSrc = pdfWorkerUrl;
    return pdfjs;
  });
  return pdfjsPromise;
}

async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', bytes.slice());
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, '0')).join('');
}

function createCanvas(width: number, height: number): CanvasLike {
  if (typeof OffscreenCanvas !== 'undefined') return new OffscreenCanvas(width, height) as unknown as CanvasLike;
  const canvas = document.createElement('canvas');
  canvas.width = width;
  canvas.height = height;
  return canvas as unknown as CanvasLike;
}

/** Opens page `options.page` (default 1) of the PDF in `bytes`. Throws SheetError for unusable files. */
export async function loadPdfSheetBrowser(bytes: Uint8Array, options: PdfBrowserOptions = {}): Promise<Sheet> {
  const pdfjs = await loadPdfJs();
  return openPdfSheet(pdfjs, bytes, {
    ...(options.page !== undefined ? { page: options.page } : {}),
    ...(options.limits ? { limits: options.limits } : {}),
    name: options.name ? `The PDF "${options.name}"` : 'The PDF',
    sha256: await sha256Hex(bytes),
    documentOptions: { isEvalSupported: false, ...options.documentOptions },
    createCanvas,
  });
}
