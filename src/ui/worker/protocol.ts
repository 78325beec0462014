/**
 * What the page may ask the sheet worker, and what each request answers.
 * Sheet rectangles are [x, y, w, h] in sheet units (PDF points or image pixels, y down).
 */
import type { SheetKind as LoadedKind } from '../../digitize/sheet.ts';
import type { CurveSet } from '../../model/curveset.ts';
import type { ReplayResult } from '../../digitize/takeoff.ts';
import type { Panel, Takeoff, Trace } from '../../model/takeoff.ts';
import type { Snap } from '../geometry/snap.ts';
import type { TextItem } from '../geometry/hints.ts';
import type { PageSize } from './pdfPages.ts';
import type { SheetKind } from './sheetSource.ts';
import type { SheetUnits } from '../../digitize/detect/detect.ts';

export type Rect = readonly [number, number, number, number];
export type XY = [number, number];

export interface CaptureRequest {
  guides: XY[];
  method: 'auto' | 'vector' | 'raster';
  /** The trace's extent, as in the take-off file: from the first guide to the last, or the whole drawn line. */
  extent?: 'guides' | 'line';
  /** The panel's plot frame, as in the take-off file: a raster trace stops at it, as in the headless replay. */
  frame?: Rect;
  /** The other traces' guides (vectorChoice.siblingGuides), so that a capture in a bunch takes the path the replay takes. */
  siblings?: XY[][];
  /** The guides of the same impeller's head trace (companions.companionGuidesOf): a colour a raster trace tries where its guides sample lines run together. */
  companions?: XY[][];
}

export interface CaptureAnswer {
  points: XY[];
  /** How the points were found. */
  used: 'vector' | 'raster';
  /** Sentences about stretches the tracer could not see, empty when it followed the line throughout. */
  gaps: string[];
  /** Sentences about a choice the capture cannot vouch for (another drawn line as near its guides), empty when none. */
  doubts: string[];
  /** Sentences about guides read elsewhere than clicked (on a label printed over the line), empty when none. */
  moved: string[];
}

/** A panel calibration read from the text layer (without the calibration's functions). */
export interface AnchorProposal {
  frame: [number, number, number, number];
  anchors: { at: XY; x?: number; y?: number }[];
  xScale: 'linear' | 'log';
  yScale: 'linear' | 'log';
  /** Largest anchor residual, % of span. */
  residual: number;
}

/** What the automatic take-off found on the chosen page, as take-off records (see src/digitize/detect). */
export interface DetectAnswer {
  /** Panels and traces found, each with origin "detected" and a confidence; empty when nothing could be named. */
  panels: Panel[];
  traces: Trace[];
  /** What the detector could not decide and asks the engineer. */
  questions: string[];
  /** What found them, with its version. */
  by: string;
  /** Why nothing was added, when nothing was (one sentence), else null. */
  refused: string | null;
  /** The pump's speed as the sheet prints it (a vector page's text, a scan's title or footer), when one was read. */
  speedRead?: { rpm: number; text: string };
  /** The units the sheet prints, where its titles and labels say so (flow, head, power, npsh, diameter). */
  sheetUnits?: SheetUnits;
}

export interface Requests {
  open: { args: { bytes: ArrayBuffer; mime: string; name: string }; result: { kind: SheetKind; pages: PageSize[]; sha256: string } };
  render: { args: { page: number; scale: number; rect: Rect }; result: { bitmap: ImageBitmap; scale: number; rect: Rect } };
  thumbnail: { args: { page: number; size: number }; result: { bitmap: ImageBitmap } };
  /** Reads the chosen page for the take-off: vector strokes, text, or pixels. */
  prepare: { args: { page: number }; result: { kind: LoadedKind; width: number; height: number; texts: number; strokes: number; notes: readonly string[] } };
  capture: { args: CaptureRequest; result: CaptureAnswer };
  snap: { args: { at: XY; radius: number }; result: Snap | null };
  /** The text layer of the chosen page (empty for scans). */
  words: { args: Record<string, never>; result: TextItem[] };
  /** Panel calibrations proposed from the text layer of a vector page (none for scans). */
  propose: { args: Record<string, never>; result: AnchorProposal[] };
  /**
   * Runs the automatic take-off on the chosen page (a vector page, or a scan). `document` is a take-off without
   * panels and traces (sheet, page, pump, units, and the engineer's answers: diameters, speeds,
   * iso_levels). On a scan the tick labels are read by tesseract.js from the files under `ocr`
   * (an absolute URL of the workbench's own folder ocr/, see vite.config.ts).
   */
  detect: { args: { document: Record<string, unknown>; ocr: string }; result: DetectAnswer };
  /** Fits and checks the take-off into a curve set with the saved captures (the headless replay's own code). */
  replay: { args: { takeoff: Takeoff; sheetFile: string; takeoffName: string }; result: { curveSet: CurveSet; traces: { id: string; how: string; notes: string[] }[]; traceMembers: ReadonlyMap<string, readonly number[]>; crossings: ReplayResult['crossings'] } };
}

export type RequestName = keyof Requests;
export type Request = { [K in RequestName]: { op: K; args: Requests[K]['args'] } }[RequestName];
