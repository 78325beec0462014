/**
 * The sheet document the worker holds open for display: a PDF (pages drawn by pdf.js) or an
 * image (one page, decoded once). Both answer the same questions: how many pages, how big,
 * draw this region at this scale. What the take-off reads from the chosen page (paths, text,
 * pixels) comes from the project's loaders instead, in pageSession.ts.
 */
import { UserError } from '../../model/errors.ts';
import type { PDFDocumentProxy } from 'pdfjs-dist';
import { openPdf, pageSizes, renderPdfRegion, whiteCanvas, type PageSize } from './pdfPages.ts';

export type SheetKind = 'pdf' | 'image';

export interface SheetSource {
  readonly kind: SheetKind;
  readonly pages: readonly PageSize[];
  render(page: number, scale: number, rect: readonly [number, number, number, number]): Promise<ImageBitmap>;
  close(): void;
}

/** Thrown for a file that is neither a readable PDF nor a readable PNG or JPEG. */
export class SheetFileError extends UserError {
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
  return {
    kind: 'pdf',
    pages,
    async render(page, scale, rect) {
      return renderPdfRegion(await doc.getPage(page), scale, rect);
    },
    close() {
      void doc.destroy();
    },
  };
}

function imageSource(bitmap: ImageBitmap): SheetSource {
  return {
    kind: 'image',
    pages: [{ width: bitmap.width, height: bitmap.height }],
    async render(_page, scale, rect) {
      const { canvas, context } = whiteCanvas(rect, scale);
      // Beyond one screen pixel per image pixel, show the pixels as they are.
      context.imageSmoothingEnabled = scale < 1;
      context.imageSmoothingQuality = 'high';
      context.drawImage(bitmap, rect[0], rect[1], rect[2], rect[3], 0, 0, canvas.width, canvas.height);
      return canvas.transferToImageBitmap();
    },
    close() {
      bitmap.close();
    },
  };
}
