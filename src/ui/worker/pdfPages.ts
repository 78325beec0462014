/**
 * PDF pages inside the sheet worker: pdf.js runs here, off the main thread, and draws
 * into OffscreenCanvas. pdf.js is imported lazily so that it lands in its own chunk.
 *
 * pdf.js expects a document for canvases and fonts; a worker has none, so a small
 * stand-in hands it OffscreenCanvas and the worker's font set, and glyphs are drawn
 * as paths (disableFontFace) so that no CSS font loading is needed.
 */
import type { PDFDocumentProxy, PDFPageProxy } from 'pdfjs-dist';
import pdfWorkerUrl from 'pdfjs-dist/build/pdf.worker.min.mjs?url';

type PdfJs = typeof import('pdfjs-dist');
let pdfjsPromise: Promise<PdfJs> | null = null;

export function loadPdfJs(): Promise<PdfJs> {
  pdfjsPromise ??= import('pdfjs-dist').then((pdfjs) => {
    // pdf.js looks for `window` to start its parser worker; inside a worker there is none,
    // so the parser's worker is started here and handed over as a port.
    pdfjs.GlobalWorkerOptions.workerPort = new Worker(new URL(pdfWorkerUrl, self.location.href).href, { type: 'module', name: 'pdf-parser' });
    return pdfjs;
  });
  return pdfjsPromise;
}

/** The few members of a document pdf.js touches when it draws pages. */
const workerDocument = {
  createElement(tag: string): unknown {
    if (tag === 'canvas') return new OffscreenCanvas(1, 1);
    throw new Error(`The sheet worker cannot create a <${tag}> element.`);
  },
  get fonts(): unknown {
    return (self as unknown as { fonts?: unknown }).fonts;
  },
};

/** Filters (transfer functions, high-contrast mode) need SVG in a document; sheets do without. */
class NoFilters {
  addFilter(): string { return 'none'; }
  addHCMFilter(): string { return 'none'; }
  addAlphaFilter(): string { return 'none'; }
  addLuminosityFilter(): string { return 'none'; }
  addHighlightHCMFilter(): string { return 'none'; }
  destroy(): void {}
}

export interface PageSize {
  /** Page width and height in PDF points at scale 1 (the sheet units of a PDF page). */
  width: number;
  height: number;
}

/** Options for pdf.js's getDocument that make it work inside a worker. */
export function pdfDocumentOptions(): Record<string, unknown> {
  return {
    ownerDocument: workerDocument,
    FilterFactory: NoFilters,
    disableFontFace: true,
    useSystemFonts: false,
    useWorkerFetch: true,
    standardFontDataUrl: new URL('pdfjs/standard_fonts/', new URL('../', self.location.href)).href,
    isOffscreenCanvasSupported: true,
    isEvalSupported: false,
    verbosity: 0,
  };
}

export async function openPdf(bytes: Uint8Array): Promise<PDFDocumentProxy> {
  const pdfjs = await loadPdfJs();
  return pdfjs.getDocument({ data: bytes.slice(), ...pdfDocumentOptions() }).promise;
}

export async function pageSizes(doc: PDFDocumentProxy): Promise<PageSize[]> {
  const sizes: PageSize[] = [];
  for (let n = 1; n <= doc.numPages; n++) {
    const page = await doc.getPage(n);
    const vp = page.getViewport({ scale: 1 });
    sizes.push({ width: vp.width, height: vp.height });
  }
  return sizes;
}

/**
 * A white canvas for the region [x, y, w, h] (sheet units) at `scale` pixels per sheet unit,
 * round(w·scale) × round(h·scale) pixels, at least one.
 */
export function whiteCanvas(rect: readonly [number, number, number, number], scale: number): { canvas: OffscreenCanvas; context: OffscreenCanvasRenderingContext2D } {
  const width = Math.max(1, Math.round(rect[2] * scale));
  const height = Math.max(1, Math.round(rect[3] * scale));
  const canvas = new OffscreenCanvas(width, height);
  const context = canvas.getContext('2d') as OffscreenCanvasRenderingContext2D;
  context.fillStyle = '#ffffff';
  context.fillRect(0, 0, width, height);
  return { canvas, context };
}

/** Draws a region [x, y, w, h] of a page (sheet units, PDF points, y down) at `scale` pixels per sheet unit. */
export async function renderPdfRegion(page: PDFPageProxy, scale: number, rect: readonly [number, number, number, number]): Promise<ImageBitmap> {
  const { canvas, context } = whiteCanvas(rect, scale);
  const viewport = page.getViewport({ scale, offsetX: -rect[0] * scale, offsetY: -rect[1] * scale });
  await page.render({ canvas: canvas as unknown as HTMLCanvasElement, canvasContext: context as unknown as CanvasRenderingContext2D, viewport, background: '#ffffff' }).promise;
  return canvas.transferToImageBitmap();
}
