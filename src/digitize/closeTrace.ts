/**
 * A close re-trace at the file's own resolution, for a page that was read at a reduced
 * resolution on load (an archive scan at 600 dpi is followed at 300 dpi; see
 * loaders/imageHeader.ts, `workingSize`). The working trace says which line and where it
 * ends; the close re-trace follows the same guides on the file's pixels of the panel, read
 * again from the file (`RegionReader`), and its points are kept only when it agrees with the
 * working trace: no stretch lost, the same doubts, and its points near the working line
 * (`AGREE_P95_WORKING_PX`, `AGREE_MAX_WORKING_PX`). Otherwise the working trace stays and
 * a note says why, so a close re-trace can refine a trace but never change which line it is.
 *
 * Pure: the file is read by the reader the caller hands in (Node: `readImageRegionNode`).
 */
import { distanceToPolyline } from './polyline.ts';
import { sheetPoint, type SheetPoint } from './points.ts';
import type { RasterImage } from './raster.ts';
import { traceRaster, type RasterTraceOptions, type RasterTraceResult } from './rasterTrace.ts';

/** [left, top, right, bottom], sheet units. */
export type Box = readonly [number, number, number, number];

/** A part of the page at its own resolution: pixel (0, 0) of `image` sits at `origin` (sheet units), `image.scale` pixels per sheet unit. */
export interface RegionRaster {
  image: RasterImage;
  origin: SheetPoint;
}

/** Reads a box of the page at the file's resolution, or says in one sentence why it cannot. */
export type RegionReader = (box: Box) => Promise<RegionRaster | string>;

/**
 * How far the close trace may lie from the working line, in working pixels: 95 % of its points
 * within `AGREE_P95_WORKING_PX` (each trace reads a line's centre to about a pixel of its own
 * raster), and none beyond `AGREE_MAX_WORKING_PX` (a neighbouring line lies further off: lines
 * nearer than that run together and are doubted by the follower anyway).
 */
export const AGREE_P95_WORKING_PX = 1.5;
export const AGREE_MAX_WORKING_PX = 3;

/** Margin around the panel frame (or the trace's extent) read for the re-trace, as a share of its size: room for a line's end on the frame. */
const MARGIN_SHARE = 0.03;

export type CloseOutcome = { kind: 'close'; traced: RasterTraceResult; scale: number; note: string } | { kind: 'kept'; note: string };

/**
 * Re-traces `working` (followed on a raster of `workingScale` < 1 pixels per sheet unit) on the
 * file's own pixels. `options` are the working trace's, `frame` included (sheet units).
 */
export async function closeRetrace(working: RasterTraceResult, workingScale: number, guides: readonly SheetPoint[], options: RasterTraceOptions, read: RegionReader): Promise<CloseOutcome> {
  if (working.points.length < 2 || working.lost.length > 0) return { kind: 'kept', note: 'The trace was not re-traced at full resolution, because the working trace is incomplete; add guides where the line was lost.' };
  let region: RegionRaster | string;
  try {
    region = await read(regionBox(working.points, guides, options.frame));
  } catch (error) {
    // The working trace stands on its own: a file that cannot be read again costs only the refinement.
    const said = (error as Error).message || 'the file could not be read again';
    region = said.charAt(0).toLowerCase() + said.slice(1);
  }
  if (typeof region === 'string') return { kind: 'kept', note: `The trace was not re-traced at full resolution: ${region.replace(/\.$/, '')}.` };
  const [ox, oy] = region.origin;
  const shift = (p: SheetPoint, sign: 1 | -1) => sheetPoint(p[0] + sign * ox, p[1] + sign * oy);
  const frame = options.frame;
  // Everything the follower is given in sheet units moves with the region's origin: the frame and the other traces' guides (companions on other panels then fall outside the region and are passed over).
  const shifted: RasterTraceOptions = {
    ...options,
    ...(frame ? { frame: [frame[0] - ox, frame[1] - oy, frame[2] - ox, frame[3] - oy] as const } : {}),
    ...(options.siblings ? { siblings: options.siblings.map((guides) => guides.map((g) => shift(g, -1))) } : {}),
    ...(options.companions ? { companions: options.companions.map((guides) => guides.map((g) => shift(g, -1))) } : {}),
  };
  let close: RasterTraceResult;
  try {
    close = traceRaster(region.image, guides.map((g) => shift(g, -1)), shifted);
  } catch (error) {
    return { kind: 'kept', note: `The full-resolution re-trace failed (${(error as Error).message.replace(/\.$/, '')}); the working trace is kept.` };
  }
  const kept = (why: string): CloseOutcome => ({ kind: 'kept', note: `The full-resolution re-trace ${why}; the working trace is kept, so check this trace on the sheet.` });
  if (close.lost.length > 0 || close.points.length < 2) return kept('lost the line');
  const codes = (r: RasterTraceResult) => r.doubts.map((d) => d.code).sort().join(',');
  if (codes(close) !== codes(working)) return kept('raised other doubts than the working trace');
  const points = close.points.map((p) => shift(p, 1));
  // Both ways: every close point near the working line, and the working line's ends near the close trace.
  const gaps = [...points.map((p) => distanceToPolyline(working.points, p)), ...[working.points[0], working.points.at(-1)].map((p) => distanceToPolyline(points, p as SheetPoint))]
    .map((d) => d * workingScale)
    .sort((a, b) => a - b);
  const p95 = gaps[Math.floor(0.95 * (gaps.length - 1))] as number;
  const max = gaps.at(-1) as number;
  if (p95 > AGREE_P95_WORKING_PX || max > AGREE_MAX_WORKING_PX) return kept(`runs up to ${max.toFixed(1)} working pixels (95 % within ${p95.toFixed(1)}) from the working trace`);
  return {
    kind: 'close',
    // The doubts keep the working trace's sentences: they are the same doubts, and name places in sheet units.
    traced: { ...close, points, doubts: working.doubts },
    scale: region.image.scale,
    note: `Re-traced at the file's full resolution (95 % of it within ${p95.toFixed(1)}, all within ${max.toFixed(1)} working pixels of the working trace).`,
  };
}

/** The panel's frame, or the extent of the trace and its guides, with a margin. */
export function regionBox(points: readonly SheetPoint[], guides: readonly SheetPoint[], frame: RasterTraceOptions['frame']): Box {
  const all = [...points, ...guides];
  const [l, t, r, b] = frame ?? [Math.min(...all.map((p) => p[0])), Math.min(...all.map((p) => p[1])), Math.max(...all.map((p) => p[0])), Math.max(...all.map((p) => p[1]))];
  const mx = Math.max(8, MARGIN_SHARE * (r - l));
  const my = Math.max(8, MARGIN_SHARE * (b - t));
  return [l - mx, t - my, r + mx, b + my];
}
