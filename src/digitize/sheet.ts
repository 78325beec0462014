/**
 * A sheet: one page of a source document (a PDF page or an image) as the take-off sees it.
 * Loaders (Node or browser) produce this interface; everything after them is pure.
 *
 * All geometry is in sheet coordinates (see points.ts): PDF points at scale 1 for a PDF page,
 * pixels for an image; origin top-left, y down.
 */
import { UserError } from '../model/errors.ts';
import type { SheetPoint } from './points.ts';
import type { RegionReader } from './closeTrace.ts';
import type { RasterImage } from './raster.ts';

export type SheetKind = 'vector-pdf' | 'raster-pdf' | 'image';

/** One drawing step of a path, already in sheet coordinates. */
export type PathSegment =
  | { readonly kind: 'move'; readonly to: SheetPoint }
  | { readonly kind: 'line'; readonly to: SheetPoint }
  | { readonly kind: 'cubic'; readonly c1: SheetPoint; readonly c2: SheetPoint; readonly to: SheetPoint }
  | { readonly kind: 'close' };

/** A painted path of a vector page. */
export interface VectorPath {
  readonly segments: readonly PathSegment[];
  /** Stroke colour as '#rrggbb', or null when the path is not stroked. */
  readonly stroke: string | null;
  /** Fill colour as '#rrggbb', or null when the path is not filled. */
  readonly fill: string | null;
  /** Stroke width in sheet units (the user-space width scaled by the transform). */
  readonly lineWidth: number;
  /** True when a dash pattern was in force. */
  readonly dashed: boolean;
  /** Bounding box [left, top, right, bottom] of the clipping area in force, when there was one. */
  readonly clip?: readonly [number, number, number, number];
}

/** A run of text of the text layer. */
export interface SheetText {
  readonly text: string;
  /** Origin of the baseline, sheet coordinates. */
  readonly at: SheetPoint;
  /** Font size (height of the em) in sheet units. */
  readonly size: number;
  /** Advance width along the baseline, sheet units. */
  readonly width: number;
  /** Direction of the baseline in radians, measured in sheet space (0 = left to right, y down). */
  readonly angle: number;
}

export interface Sheet {
  readonly kind: SheetKind;
  /** Size in sheet units. */
  readonly width: number;
  readonly height: number;
  /** SHA-256 of the file's bytes, lowercase hex. */
  readonly sha256: string;
  /** 1-based page number for a PDF; 1 for an image. */
  readonly page: number;
  /** Renders the sheet at `scale` pixels per sheet unit. */
  render(scale: number): Promise<RasterImage>;
  /** Painted vector paths (empty for an image). */
  paths(): Promise<VectorPath[]>;
  /** Text layer (empty for an image). */
  text(): Promise<SheetText[]>;
  /** Frees the loader's resources. */
  close(): Promise<void>;
  /** A part of the page at the file's own resolution, for a page read reduced on load (closeTrace.ts); absent otherwise. */
  region?: RegionReader;
}

/** Thrown for a sheet that cannot be read; the message says what was wrong and what to do. */
export class SheetError extends UserError {
  override name = 'SheetError';
}

/** Limits that protect the machine from unusable files. */
export interface SheetLimits {
  /** Largest file accepted, bytes. */
  readonly maxBytes: number;
  /** Largest raster accepted (decoded image or rendering), pixels. */
  readonly maxPixels: number;
}

export const DEFAULT_SHEET_LIMITS: SheetLimits = { maxBytes: 50 * 1024 * 1024, maxPixels: 40_000_000 };

/** Refuses a file larger than the limit, before any parsing. */
export function checkFileSize(byteLength: number, limits: SheetLimits = DEFAULT_SHEET_LIMITS, what = 'The sheet file'): void {
  if (byteLength > limits.maxBytes) {
    throw new SheetError(
      `${what} is ${(byteLength / 1048576).toFixed(1)} MB, over the ${(limits.maxBytes / 1048576).toFixed(0)} MB limit; export the page alone or reduce the file.`,
    );
  }
}

/** Refuses a raster larger than the limit. */
export function checkRasterSize(width: number, height: number, limits: SheetLimits = DEFAULT_SHEET_LIMITS, what = 'The raster'): void {
  const pixels = width * height;
  if (!(pixels <= limits.maxPixels)) {
    throw new SheetError(
      `${what} would be ${Math.round(width)} × ${Math.round(height)} pixels (${(pixels / 1e6).toFixed(1)} megapixels), over the ${(limits.maxPixels / 1e6).toFixed(0)} megapixel limit; use a smaller scale or a smaller image.`,
    );
  }
}

/** The largest render scale that keeps a sheet within the pixel limit, capped at `wanted`. */
export function safeScale(sheet: Pick<Sheet, 'width' | 'height'>, wanted: number, limits: SheetLimits = DEFAULT_SHEET_LIMITS): number {
  const fit = Math.sqrt(limits.maxPixels / Math.max(1, sheet.width * sheet.height));
  return Math.min(wanted, Math.floor(fit * 1000) / 1000);
}

/** What kind of PDF page this is, from what it paints. */
export function classifyPdfPage(args: { width: number; height: number; imageCoverage: number; strokedPaths: number }): 'vector-pdf' | 'raster-pdf' {
  // An embedded scan: one picture covers most of the page and little is drawn as vectors.
  const mostOfPage = args.imageCoverage >= 0.6;
  const fewVectors = args.strokedPaths < 20;
  return mostOfPage && fewVectors ? 'raster-pdf' : 'vector-pdf';
}
