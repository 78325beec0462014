/**
 * Capturing one trace, whatever the sheet: explicit points are used as they are; guides are
 * followed on the vector paths of a vector page, or on a raster (a scan, an image, or a vector
 * page whose line is not drawn as a path). Pure: the sheet's content reaches it through the
 * lazy getters of `CaptureSource`, so the workbench and the headless replay share it.
 */
import { captureVector, CaptureError, type VectorCaptureOptions } from './vectorCapture.ts';
import { arcLengths, resampleEvenly } from './polyline.ts';
import { traceRaster, type LostStretch, type RasterTraceOptions, type TraceDoubt } from './rasterTrace.ts';
import type { SheetPoint } from './points.ts';
import type { RasterImage } from './raster.ts';
import type { SheetKind } from './sheet.ts';
import type { StrokeLine } from './strokeJoin.ts';
import { closeRetrace, type RegionReader } from './closeTrace.ts';

export type CaptureMethod = 'auto' | 'vector' | 'raster';

export interface CaptureRequest {
  guides?: readonly SheetPoint[] | undefined;
  points?: readonly SheetPoint[] | undefined;
  method?: CaptureMethod | undefined;
  /**
   * 'line': take the whole drawn line the guides sit on; 'guides': from the first guide to the
   * last. Unset: the whole line on a raster, from guide to guide on vector paths (whose
   * results are exact and kept as they were).
   */
  extent?: 'guides' | 'line' | undefined;
  /** The panel's plot frame [left, top, right, bottom], sheet units: a raster trace stops at it. */
  frame?: readonly [number, number, number, number] | undefined;
  /** The guides of the sheet's other traces: on vector paths they settle which of several near lines is this trace's. */
  siblings?: readonly (readonly SheetPoint[])[] | undefined;
  /** The guides of the same impeller's head trace (`companionGuides`): on a raster, a colour to try where this trace's guides sample lines run together. */
  companions?: readonly (readonly SheetPoint[])[] | undefined;
}

export interface CaptureSource {
  kind: SheetKind;
  /** Joined stroke lines of the page (vector pages only). */
  lines(): Promise<readonly StrokeLine[]>;
  /** A raster of the sheet for line following. */
  raster(): Promise<RasterImage>;
  /** Reads a part of the page at the file's own resolution, when the raster was reduced on load: traces are then re-traced close (closeTrace.ts). */
  closeRaster?: RegionReader | undefined;
}

export interface CaptureResult {
  points: SheetPoint[];
  how: 'points' | 'vector' | 'raster';
  /** Plain sentences worth showing beside the trace. */
  notes: string[];
  /** Stretches a raster capture could not see. */
  lost: LostStretch[];
  /** Stretches a raster capture followed but cannot vouch for (see `RasterTraceResult.doubts`). */
  doubts?: TraceDoubt[];
  /** Sentences on guides the raster capture read elsewhere than clicked (a guide on a label printed over its line). */
  moved?: string[];
  /** Width of the followed line, sheet units (raster captures only): tolerances near it are set in line widths. */
  lineWidth?: number;
}

export interface CaptureOptions {
  vector?: VectorCaptureOptions;
  raster?: RasterTraceOptions;
  /** Sheet units between resampled points (default 2 for a PDF page, 6 pixels for an image). */
  spacing?: number;
}

export async function captureTrace(request: CaptureRequest, source: CaptureSource, options: CaptureOptions = {}): Promise<CaptureResult> {
  if (request.points && request.points.length > 0) return { points: [...request.points], how: 'points', notes: [], lost: [] };
  const guides = request.guides ?? [];
  if (guides.length === 0) throw new CaptureError('A trace needs guides on its line or explicit points.');
  const method = request.method ?? 'auto';
  const vectorPage = source.kind === 'vector-pdf';
  if (method === 'vector' && !vectorPage) {
    throw new CaptureError(`The sheet is ${source.kind === 'image' ? 'an image' : 'a scanned PDF page'} without drawn paths; capture this trace from the picture (method "raster" or "auto").`);
  }
  const notes: string[] = [];
  // Thinned raster polylines and vector paths alike are resampled evenly, so a fit weighs
  // every part of the curve the same and does not drop to a lower degree for want of points.
  const spacing = options.spacing ?? (source.kind === 'image' ? 6 : 2);
  if (vectorPage && method !== 'raster') {
    try {
      const got = captureVector(await source.lines(), guides, { ...options.vector, wholeLine: request.extent === 'line', ...(request.siblings ? { siblings: request.siblings } : {}) });
      const vector: CaptureResult = { points: evenly(got.points, spacing), how: 'vector', notes, lost: [], ...(got.ambiguous?.unresolved ? { doubts: [bunchDoubt(got.ambiguous.unresolved)] } : {}) };
      if (!got.gridLike || method === 'vector') return vector;
      // Pump curves are never level or upright straight lines: the guides more likely sit on a
      // curve inside a picture, drawn over by the page's grid. Follow it on a rendering.
      try {
        const traced = traceRaster(await source.raster(), guides, rasterOptions(request, options));
        if (traced.lost.length === 0 && traced.points.length >= 2) {
          notes.push('The only drawn path near the guides was a grid or frame line; the line was followed on a rendering instead.');
          return { points: evenly(traced.points, spacing), how: 'raster', notes, lost: [] };
        }
      } catch {
        // Nothing better on the rendering: keep the drawn line.
      }
      notes.push('The captured line is a level or upright straight line (a grid or frame line?); check the guides.');
      return vector;
    } catch (error) {
      if (!(error instanceof CaptureError) || method === 'vector') throw error;
      notes.push(`No drawn path fitted the guides (${error.message.replace(/;.*$/, '')}); the line was followed on a rendering instead.`);
    }
  }
  const image = await source.raster();
  let traced = traceRaster(image, guides, rasterOptions(request, options));
  let scale = image.scale;
  if (source.closeRaster && image.scale < 1) {
    const close = await closeRetrace(traced, image.scale, guides, rasterOptions(request, options), source.closeRaster);
    if (close.kind === 'close') ({ traced, scale } = close);
    notes.push(close.note);
  }
  for (const l of traced.lost) notes.push(`The line was lost near (${l.at[0].toFixed(1)}, ${l.at[1].toFixed(1)}) between guides ${l.between[0]} and ${l.between[1]}: ${l.reason}.`);
  const moved = (traced.offLabels ?? []).map((m) => `Guide ${m.guide} sat on a label printed over the line; the line was taken up where it leaves the label, near ${m.at.map((q) => `(${q[0].toFixed(1)}, ${q[1].toFixed(1)})`).join(' and ')}.`);
  return {
    points: traced.lost.length ? traced.points : evenly(traced.points, spacing),
    how: 'raster',
    notes,
    lost: traced.lost,
    doubts: traced.doubts,
    ...(moved.length > 0 ? { moved } : {}),
    ...(traced.line.widthPx > 0 ? { lineWidth: traced.line.widthPx / scale } : {}),
  };
}

/** Another drawn line fits the guides about as well, and no other trace claims it: the choice is a guess. */
function bunchDoubt(others: number): TraceDoubt {
  const lines = others === 1 ? 'another drawn line passes' : `${others} other drawn lines pass`;
  return { code: 'takeoff.guide-in-bunch', message: `${lines} about as near its guides as the line taken, and no other trace claims ${others === 1 ? 'it' : 'them'}; add a guide where the lines part, or trace the neighbouring curves too` };
}

function rasterOptions(request: CaptureRequest, options: CaptureOptions): RasterTraceOptions {
  return { ...options.raster, ...(request.extent ? { extent: request.extent } : {}), ...(request.frame ? { frame: request.frame } : {}), ...(request.siblings ? { siblings: request.siblings } : {}), ...(request.companions && request.companions.length > 0 ? { companions: request.companions } : {}) };
}

/** Resamples a capture evenly (a point every `spacing` sheet units, at least 30), so fits weigh the curve evenly. */
function evenly(points: SheetPoint[], spacing: number): SheetPoint[] {
  if (points.length < 2) return points;
  const length = arcLengths(points).at(-1) as number;
  const count = Math.max(30, Math.min(400, Math.round(length / spacing) + 1));
  return resampleEvenly(points, count);
}
