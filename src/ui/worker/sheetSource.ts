/**
 * The sheet document the worker holds open: a PDF (pages drawn by pdf.js) or an image
 * (one page, decoded once). Both answer the same questions: how many pages, how big,
 * draw this region at this scale, give me the pixels.
 */
import type { PDFDocumentProxy } from 'pdfjs-dist';
import { openPdf, pageSizes, rasterizePdfPage, renderPdfRegion, type PageSize } from './pdfPages.ts';

export type SheetKind = 'pdf' | 'image';

export interface Pixels {
  width: number;
  height: number;
  data: Uint8ClampedArray;
  /** Pixels per sheet unit. */
  scale: number;
}

export interface SheetSource {
  readonly kind: SheetKind;
  readonly pages: readonly PageSize[];
  render(page: number, scale: number, rect: readonly [number, number, number, number]): Promise<ImageBitmap>;
  pixels(page: number, scale: number): Promise<Pixels>;
  /** The pdf.js document, for vector content and text; null for an image. */
  readonly pdf: PDFDocumentProxy | null;
  close(): void;
}

/** Thrown for a file that is neither a readable PDF nor a readable PNG or JPEG. */
export class SheetFileError extends Error {
  override name = 'SheetError';
}

export function sniffKind(bytes: Uint8Array, mime: string, name: string): SheetKind | null {
  const head = Array.from(bytes.subarray(0, 8));
  if (head[0] === 0x25 && head[1] === 0x50 && head[2] === 0x44 && head[3] === 0x46) return 'pdf'; // %PDF
  if (head[0] === 0x89 && head[1] === 0x50 && head[2] === 0x4e && head[3] === 0x47) return 'image'; // PNG
  if (head[0] === 0xff && head[1] === 0xd8 && head[2] === 0xff) return 'image'; // JPEG
  if (mime === 'application/pdf' || /\.pdf$/i.test(name)) return 'pdf';
  return null;
}

export async function openSheetSource(bytes: Uint8Array, mime: string, name: string): Promise<SheetSource> {
  const kind = sniffKind(bytes, mime, name);
  if (kind === null) throw new SheetFileError(`"${name}" is not a PDF, PNG or JPEG file; open a performance sheet in one of those formats.`);
  if (kind === 'pdf') {
    let doc: PDFDocumentProxy;
    try {
      doc = await openPdf(bytes);
    } catch (error) {
      throw new SheetFileError(`"${name}" could not be read as a PDF (${(error as Error).message}); check that the file is complete and not password-protected.`);
    }
    return pdfSource(doc, await pageSizes(doc));
  }
  let bitmap: ImageBitmap;
  try {
    bitmap = await createImageBitmap(new Blob([bytes.slice()], { type: mime || 'image/png' }), { colorSpaceConversion: 'none', premultiplyAlpha: 'none' });
  } catch {
    throw new SheetFileError(`"${name}" could not be decoded as a PNG or JPEG image; check that the file is complete.`);
  }
  return imageSource(bitmap);
}

function pdfSource(doc: PDFDocumentProxy, pages: PageSize[]): SheetSource {
  const cache = new Map<string, Pixels>();
  return {
    kind: 'pdf',
    pages,
    pdf: doc,
    async render(page, scale, rect) {
      return renderPdfRegion(await doc.getPage(page), scale, rect);
    },
    async pixels(page, scale) {
      const key = `${page}@${scale}`;
      const hit = cache.get(key);
      if (hit) return hit;
      const raster = await rasterizePdfPage(await doc.getPage(page), scale);
      const px = { ...raster, scale };
      cache.clear();
      cache.set(key, px);
      return px;
    },
    close() {
      void doc.destroy();
    },
  };
}

function imageSource(bitmap: ImageBitmap): SheetSource {
  let pixelsCache: Pixels | null = null;
  return {
    kind: 'image',
    pages: [{ width: bitmap.width, height: bitmap.height }],
    pdf: null,
    async render(_page, scale, rect) {
      const [x, y, w, h] = rect;
      const width = Math.max(1, Math.round(w * scale));
      const height = Math.max(1, Math.round(h * scale));
      const canvas = new OffscreenCanvas(width, height);
      const context = canvas.getContext('2d') as OffscreenCanvasRenderingContext2D;
      context.fillStyle = '#ffffff';
      context.fillRect(0, 0, width, height);
      // Beyond one screen pixel per image pixel, show the pixels as they are.
      context.imageSmoothingEnabled = scale < 1;
      context.imageSmoothingQuality = 'high';
      context.drawImage(bitmap, x, y, w, h, 0, 0, width, height);
      return canvas.transferToImageBitmap();
    },
    async pixels() {
      if (pixelsCache) return pixelsCache;
      const canvas = new OffscreenCanvas(bitmap.width, bitmap.height);
      const context = canvas.getContext('2d', { willReadFrequently: true }) as OffscreenCanvasRenderingContext2D;
      context.drawImage(bitmap, 0, 0);
      const image = context.getImageData(0, 0, bitmap.width, bitmap.height);
      pixelsCache = { width: bitmap.width, height: bitmap.height, data: image.data, scale: 1 };
      return pixelsCache;
    },
    close() {
      bitmap.close();
    },
  };
}
