/**
 * The chosen page as the take-off reads it, held in the worker: the Sheet from the same
 * loaders the command line uses, with what capture and snapping need computed once
 * (joined vector strokes, straight pieces, the raster).
 */
import { openPdfSheet } from '../../digitize/loaders/pdfPage.ts';
import { loadImageSheetBrowser } from '../../digitize/loaders/imageBrowser.ts';
import { safeScale, type Sheet } from '../../digitize/sheet.ts';
import type { RasterImage } from '../../digitize/raster.ts';
import { strokeLines } from '../../digitize/vectorCapture.ts';
import { straightPieces, type Straight } from '../geometry/snap.ts';
import { loadPdfJs, pdfDocumentOptions } from './pdfPages.ts';

type StrokeLines = ReturnType<typeof strokeLines>;

export interface PageSession {
  readonly sheet: Sheet;
  /** The same sheet, with its rendering for line following kept between replays. */
  readonly replaySheet: Sheet;
  lines(): Promise<StrokeLines>;
  straights(): Promise<Straight[]>;
  raster(): Promise<RasterImage>;
  /** What the loader said of the page in one sentence each, e.g. that a big scan was read at a reduced resolution. */
  readonly notes: readonly string[];
  close(): Promise<void>;
}

export async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', bytes.slice());
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, '0')).join('');
}

/**
 * Pixels per sheet unit at which a PDF page is read as a picture; the headless replay uses
 * the same default, so that a scan inside a PDF traces to the same points in both.
 */
export const PDF_TRACE_SCALE = 4;

export async function openPageSession(bytes: Uint8Array, kind: 'pdf' | 'image', page: number, name: string, sha256: string): Promise<PageSession> {
  let sheet: Sheet;
  const notes: string[] = [];
  if (kind === 'pdf') {
    const pdfjs = await loadPdfJs();
    sheet = await openPdfSheet(pdfjs, bytes, {
      page,
      name: `"${name}"`,
      sha256,
      documentOptions: pdfDocumentOptions(),
      createCanvas: (w, h) => new OffscreenCanvas(w, h) as unknown as { getContext(kind: '2d'): unknown },
    });
  } else {
    sheet = await loadImageSheetBrowser(bytes, { name, onNote: (sentence) => notes.push(sentence) });
  }
  let lines: Promise<StrokeLines> | null = null;
  let straights: Promise<Straight[]> | null = null;
  let raster: Promise<RasterImage> | null = null;
  const traceScale = sheet.kind === 'image' ? 1 : safeScale(sheet, PDF_TRACE_SCALE);
  const cachedRaster = () => (raster ??= sheet.render(traceScale));
  const replaySheet: Sheet = {
    kind: sheet.kind,
    width: sheet.width,
    height: sheet.height,
    sha256: sheet.sha256,
    page: sheet.page,
    render: (scale) => (scale === traceScale ? cachedRaster() : sheet.render(scale)),
    paths: () => sheet.paths(),
    text: () => sheet.text(),
    close: async () => undefined,
  };
  return {
    sheet,
    replaySheet,
    notes,
    lines: () => (lines ??= sheet.paths().then((p) => strokeLines(p))),
    straights: () => (straights ??= sheet.paths().then((p) => straightPieces(p))),
    raster: cachedRaster,
    close: () => sheet.close(),
  };
}
