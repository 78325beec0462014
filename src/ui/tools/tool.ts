/**
 * A pointer tool: a small state machine that turns pointer events on the sheet into edits.
 * Each tool says, at any moment, what the next click will do (for the status line), and
 * what to preview on the overlay. Geometry lives in pure helpers; the host does the I/O.
 */
import type { SheetXY } from '../../model/takeoff.ts';
import type { Quantity } from '../../model/curveset.ts';
import type { CanvasPointer } from '../canvas/sheetCanvas.ts';
import type { Preview } from '../canvas/overlay.ts';
import type { Snap } from '../geometry/snap.ts';
import type { Store } from '../store/store.ts';
import type { View } from '../canvas/view.ts';
import type { TraceSpec } from '../store/actions/traces.ts';

export interface ToolHost {
  readonly store: Store;
  view(): View;
  /** Where a click at `at` should land; null when nothing to snap to is near. */
  snap(at: SheetXY): Promise<Snap | null>;
  /** Asks where `at` snaps, on its own (not throttled with the hover). */
  snapOnce(at: SheetXY, radius?: number): Promise<Snap | null>;
  /** The last snap answer for a point near `at`, without waiting. */
  snapNow(at: SheetXY): Snap | null;
  setPreview(preview: Preview | null): void;
  /** Guides placed and waiting for their capture. */
  setPending(guides: readonly SheetXY[]): void;
  /** Captures the line under the guides; resolves to the points or rejects with a sentence. */
  /**
   * `panel` names the trace's panel, whose frame stops a raster trace as in the headless replay;
   * `traceId` the trace captured again, or `curve` what a new trace is (its quantity and label), so
   * that it gets the same impeller's head trace as the replay gives it.
   */
  capture(guides: readonly SheetXY[], method: 'auto' | 'vector' | 'raster', extent?: 'guides' | 'line', panel?: string, traceId?: string, curve?: TraceSpec): Promise<{ points: SheetXY[]; gaps: string[]; moved: string[] }>;
  /**
   * After head trace `headId` was traced or its guides moved: the same impeller's other traces with
   * guides are traced again with its colour, as the replay traces them (a raster sheet only).
   */
  retraceLeaning(headId: string): Promise<void>;
  /** Shows the magnifier at the pointer, marking where the click will land. */
  magnify(p: CanvasPointer, mark: SheetXY | null, snapped: boolean): void;
  /** The flow a calibrated panel reads at a sheet point, or null when the panel is not calibrated. */
  flowAt(panelId: string, at: SheetXY): number | null;
  /** What a frame plots, read from a title beside it on the sheet; null when nothing says. */
  guessPlots(frame: readonly [number, number, number, number]): Quantity | null;
  /** Called after a new panel frame is drawn, to propose anchors from the text layer. */
  afterFrame(panelId: string): void;
  /** Puts the keyboard focus on the value field of an anchor. */
  focusAnchorValue(panelId: string, index: number): void;
}

export interface Tool {
  readonly name: string;
  /** One sentence: what the next click (or drag) does. */
  status(): string;
  down(p: CanvasPointer): void;
  move(p: CanvasPointer): void;
  up(p: CanvasPointer): void;
  leave(): void;
  /** Keys the tool handles itself (Escape, Delete); true when handled. */
  key(event: KeyboardEvent): boolean;
  readonly cursor: string;
}

/** Distance in screen pixels between two sheet points under a view. */
export function screenDistance(view: View, a: SheetXY, b: SheetXY): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1]) * view.zoom;
}

/** The snap radius in sheet units: about 10 screen pixels. */
export function snapRadius(view: View): number {
  return 10 / view.zoom;
}
