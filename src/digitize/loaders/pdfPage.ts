/**
 * The part of PDF loading that is the same in Node and in the browser: opening a document
 * with a given pdf.js module, picking the page, and wrapping it as a Sheet. Each environment
 * hands in its pdf.js module, its document options and a way to make a 2D canvas.
 * No Node and no DOM imports here.
 */
import type * as PdfJs from 'pdfjs-dist';
import { operatorCodesFrom, readOperatorList, type Matrix, type PageContent } from '../operatorPaths.ts';
import { sheetPoint } from '../points.ts';
import type { RasterImage } from '../raster.ts';
import {
  checkFileSize,
  checkRasterSize,
  classifyPdfPage,
  DEFAULT_SHEET_LIMITS,
  SheetError,
  type Sheet,
  type SheetLimits,
  type SheetText,
  type VectorPath,
} from '../sheet.ts';

type PdfJsModule = Pick<typeof PdfJs, 'getDocument' | 'OPS'>;

/** A 2D canvas as both @napi-rs/canvas and the DOM provide it. */
export interface CanvasLike {
  getContext(kind: '2d'): unknown;
}

/** The part of a 2D context read back after rendering (the DOM and @napi-rs/canvas both have it). */
interface PixelReader {
  getImageData(x: number, y: number, width: number, height: number): { data: Uint8ClampedArray };
}

export interface OpenPdfOptions {
  page?: number;
  limits?: SheetLimits;
  /** Extra options for `getDocument` (font data paths, worker settings). */
  documentOptions?: Record<string, unknown>;
  /** Makes a canvas of the given size in pixels. */
  createCanvas(width: number, height: number): CanvasLike;
  /** SHA-256 of `bytes`, lowercase hex. */
  sha256: string;
  /** Name of the file for messages. */
  name?: string;
  /** Frees a canvas's pixels at once, not at some later garbage collection. */
  releaseCanvas?(canvas: CanvasLike): void;
  /** Drops pdf.js's decoded images of the page after each rendering (a command renders a page once). */
  cleanupAfterRender?: boolean;
}

/**
 * The scale a page is rendered at when `wanted` pixels per sheet unit are asked for. A scan
 * inside a PDF holds no detail finer than its picture's own pixels: it is rendered at most at
 * the picture's resolution (a 200-dpi scan asked for at 4 px/pt, 288 dpi, is rendered at 200 dpi,
 * half the pixels), as an image sheet is read at its own pixels. A coarser picture is still
 * rendered at `MIN_SCAN_RENDER_SCALE` (200 dpi, the coarsest scans the line following is tried
 * on) or `wanted` if that is less. The raster's `scale` says which scale was used.
 */
export function renderScale(kind: Sheet['kind'], wanted: number, pictureScale: number | undefined): number {
  if (kind !== 'raster-pdf' || pictureScale === undefined || !(pictureScale > 0)) return wanted;
  return Math.min(wanted, Math.max(pictureScale, MIN_SCAN_RENDER_SCALE));
}

/** 200 dpi in pixels per pt: a scan inside a PDF is never rendered coarser than this (unless asked). */
export const MIN_SCAN_RENDER_SCALE = 200 / 72;

/** True when the bytes start like a PDF (the header may follow up to 1 KB of junk). */
export function looksLikePdf(bytes: Uint8Array): boolean {
  const head = new TextDecoder('latin1').decode(bytes.subarray(0, 1024));
  return head.includes('%PDF-');
}

/** Opens one page of a PDF as a Sheet. Throws SheetError with one clear sentence for unusable files. */
export async function openPdfSheet(pdfjs: PdfJsModule, bytes: Uint8Array, options: OpenPdfOptions): Promise<Sheet> {
  const limits = options.limits ?? DEFAULT_SHEET_LIMITS;
  const name = options.name ?? 'The PDF';
  checkFileSize(bytes.byteLength, limits, name);
  if (!looksLikePdf(bytes)) throw new SheetError(`${name} is not a PDF (no %PDF header); check the file or export it again.`);

  // pdf.js detaches the buffer it is given, so it gets a copy.
  const task = pdfjs.getDocument({ data: bytes.slice(), verbosity: 0, isEvalSupported: false, ...options.documentOptions });
  let doc: PdfJs.PDFDocumentProxy;
  try {
    doc = await task.promise;
  } catch (error) {
    await task.destroy().catch(() => undefined);
    throw describePdfError(error, name);
  }
  const pageNumber = options.page ?? 1;
  if (!Number.isInteger(pageNumber) || pageNumber < 1 || pageNumber > doc.numPages) {
    await doc.destroy();
    throw new SheetError(`${name} has ${doc.numPages} page${doc.numPages === 1 ? '' : 's'}; page ${pageNumber} does not exist.`);
  }
  let page: PdfJs.PDFPageProxy;
  let content: PageContent;
  try {
    page = await doc.getPage(pageNumber);
    const viewport = page.getViewport({ scale: 1 });
    const list = await page.getOperatorList();
    content = readOperatorList(list, operatorCodesFrom(pdfjs.OPS as unknown as Record<string, number>), viewport.transform as unknown as Matrix, viewport.width, viewport.height);
  } catch (error) {
    await doc.destroy().catch(() => undefined);
    throw describePdfError(error, name);
  }
  const viewport = page.getViewport({ scale: 1 });
  const strokedPaths = content.paths.filter((p) => p.stroke !== null).length;
  const kind = classifyPdfPage({ width: viewport.width, height: viewport.height, imageCoverage: content.imageCoverage, strokedPaths });
  let textCache: SheetText[] | null = null;

  return {
    kind,
    width: viewport.width,
    height: viewport.height,
    sha256: options.sha256,
    page: pageNumber,
    async paths(): Promise<VectorPath[]> {
      return content.paths;
    },
    async text(): Promise<SheetText[]> {
      if (textCache) return textCache;
      try {
        const tc = await page.getTextContent();
        textCache = textItemsFrom(tc.items, viewport.transform as unknown as Matrix);
      } catch (error) {
        throw describePdfError(error, name);
      }
      return textCache;
    },
    async render(wanted: number): Promise<RasterImage> {
      if (!(wanted > 0 && Number.isFinite(wanted))) throw new SheetError(`The render scale must be a positive number, not ${wanted}.`);
      const scale = renderScale(kind, wanted, content.pictureScale);
      const vp = page.getViewport({ scale });
      const width = Math.ceil(vp.width);
      const height = Math.ceil(vp.height);
      checkRasterSize(width, height, limits, `Rendering ${name} at scale ${scale}`);
      const canvas = options.createCanvas(width, height);
      const context = canvas.getContext('2d') as PixelReader;
      let image: { data: Uint8ClampedArray };
      try {
        await page.render({ canvas: null, canvasContext: context as Parameters<typeof page.render>[0]['canvasContext'], viewport: vp }).promise;
        image = context.getImageData(0, 0, width, height);
      } catch (error) {
        throw describePdfError(error, name);
      } finally {
        // The raster holds the page now: the canvas's pixels go back before the trace allocates its own,
        options.releaseCanvas?.(canvas);
        // and so do pdf.js's decoded pictures of the page (a later rendering decodes them again).
        if (options.cleanupAfterRender) page.cleanup();
      }
      return { width, height, data: new Uint8ClampedArray(image.data.buffer, image.data.byteOffset, image.data.byteLength), scale };
    },
    async close(): Promise<void> {
      await doc.destroy();
    },
  };
}

interface TextItemLike {
  str?: string;
  transform?: number[];
  width?: number;
}

/** Text items of pdf.js's text layer in sheet coordinates; blank fillers are skipped. */
export function textItemsFrom(items: readonly unknown[], viewport: Matrix): SheetText[] {
  const out: SheetText[] = [];
  const vScale = Math.sqrt(Math.abs(viewport[0] * viewport[3] - viewport[1] * viewport[2]));
  for (const raw of items) {
    const item = raw as TextItemLike;
    if (typeof item.str !== 'string' || item.str.trim() === '' || !item.transform || item.transform.length < 6) continue;
    const [a, b, c, d, e, f] = item.transform as [number, number, number, number, number, number];
    const x = viewport[0] * e + viewport[2] * f + viewport[4];
    const y = viewport[1] * e + viewport[3] * f + viewport[5];
    const dx = viewport[0] * a + viewport[2] * b;
    const dy = viewport[1] * a + viewport[3] * b;
    out.push({
      text: item.str,
      at: sheetPoint(x, y),
      size: Math.hypot(c, d) * vScale,
      width: (item.width ?? 0) * vScale,
      angle: Math.atan2(dy, dx),
    });
  }
  return out;
}

/** One sentence for whatever pdf.js threw. */
export function describePdfError(error: unknown, name: string): SheetError {
  if (error instanceof SheetError) return error;
  const kind = (error as { name?: string } | null)?.name ?? '';
  const message = (error as { message?: string } | null)?.message ?? String(error);
  if (kind === 'PasswordException' || /password/i.test(message)) {
    return new SheetError(`${name} is encrypted with a password; save an unprotected copy and load that.`);
  }
  if (kind === 'InvalidPDFException' || kind === 'FormatError' || /invalid pdf|xref|trailer|bad xref|formaterror/i.test(message)) {
    return new SheetError(`${name} is damaged and cannot be read as a PDF (${message.replace(/\.$/, '')}); export or download it again.`);
  }
  return new SheetError(`${name} could not be read as a PDF (${message.replace(/\.$/, '')}); export or download it again.`);
}
