/**
 * Vector capture: from the user's guide clicks on a vector page to the exact geometry of the
 * drawn line they sit on. No rasterising, so no pixel error:
 * 1. every stroked path is flattened (Béziers within a small chord tolerance);
 * 2. pieces of the same stroke (same colour, width and dash) whose ends coincide within a small
 *    tolerance are joined, preferring the straightest continuation where several ends meet;
 * 3. the joined line that passes near ALL guides wins; straight horizontal or vertical lines and
 *    closed outlines (grid lines, frames) only win when nothing else passes near the guides;
 *    where several lines pass about equally near (a bunch), the other traces' guides settle
 *    which line is this trace's (vectorChoice.ts);
 * 4. the line is cut between the first and the last guide (a single guide, or `wholeLine`, takes
 *    it whole);
 * 5. a line the drawing interrupts (for an inline label) is stitched across the gap when no
 *    single line passes near all guides (stitch.ts).
 */
import { UserError } from '../model/errors.ts';
import { DEFAULT_FLATNESS, flattenPath } from './flatten.ts';
import { arcLengthAt, arcLengths, clipPolyline, dedupe, nearestOnPolyline, slice, type PolylinePosition } from './polyline.ts';
import { sheetPoint, type SheetPoint } from './points.ts';
import type { VectorPath } from './sheet.ts';
import { joinPieces, type Piece, type StrokeLine } from './strokeJoin.ts';
import { centrelineOf, MAX_OUTLINE_WIDTH } from './outlines.ts';
import { chooseLine, linesNearGuides } from './vectorChoice.ts';
import { stitchAlongGuides } from './stitch.ts';

/** Thrown when no drawn line fits the guides; the message says what to do. */
export class CaptureError extends UserError {
  override name = 'CaptureError';
}

export interface VectorCaptureOptions {
  /** Chord tolerance for Béziers, sheet units. */
  flatness?: number;
  /** Largest gap between the ends of two pieces that continue one stroke, sheet units. */
  joinTolerance?: number;
  /** Largest distance between a guide and the line it is meant to sit on, sheet units. */
  maxGuideDistance?: number;
  /** Take the whole line the guides sit on instead of the stretch from the first guide to the last. */
  wholeLine?: boolean;
  /**
   * The guides of the page's other traces. Where several drawn lines pass about equally near
   * this trace's guides (a bunch), the line the others do not claim is taken (vectorChoice.ts).
   */
  siblings?: readonly (readonly SheetPoint[])[];
  /** Sheet units within which two lines' guide distances count as equal (default DEFAULT_AMBIGUITY). */
  ambiguity?: number;
}

export interface VectorCapture {
  /** The captured points, from the first guide towards the last. */
  points: SheetPoint[];
  /** Distance of each guide from the chosen line, sheet units. */
  guideDistances: number[];
  stroke: string | null;
  lineWidth: number;
  /** How many drawn pieces were joined into the chosen line. */
  pieces: number;
  /** True when the chosen line is straight and level or upright, or a closed outline. */
  gridLike: boolean;
  /**
   * Set when another drawn line passed about as near the guides: `bySiblings` when the other
   * traces' guides settled the choice, `unresolved` the near lines nothing settled.
   */
  ambiguous?: { bySiblings: boolean; unresolved: number };
}

export const DEFAULT_JOIN_TOLERANCE = 0.5;
export const DEFAULT_MAX_GUIDE_DISTANCE = 8;

/** Flattened, style-keyed pieces of all stroked paths of a page (compute once, capture many). */
export function strokePieces(paths: readonly VectorPath[], flatness = DEFAULT_FLATNESS): Piece[] {
  const pieces: Piece[] = [];
  paths.forEach((path, index) => {
    if (path.stroke === null) {
      if (path.fill !== null) pieces.push(...outlinePieces(path, flatness, index));
      return;
    }
    const style = `${path.stroke}|${path.lineWidth.toFixed(3)}|${path.dashed ? 'dash' : 'solid'}`;
    for (const line of flattenPath(path.segments, flatness)) {
      // Only what the clipping area lets the page show was drawn.
      const parts = path.clip ? clipPolyline(line.points, path.clip) : [line.points];
      const whole = parts.length === 1 && parts[0]!.length === line.points.length;
      for (const points of parts) pieces.push({ points, closed: line.closed && whole, style, stroke: path.stroke, lineWidth: path.lineWidth, path: index });
    }
  });
  return dotsOfSlivers(pieces);
}

/**
 * A filled piece no longer than this many times its style's usual width is a dot: a sliver cut
 * from the end of a dash can be half as long as the line is wide, and its own centre line then
 * runs across the line.
 */
const DOT_LENGTH_IN_WIDTHS = 1.5;

/** Outline pieces of a style no longer than `DOT_LENGTH_IN_WIDTHS` of the style's median width, turned into dots. */
function dotsOfSlivers(pieces: Piece[]): Piece[] {
  const widths = new Map<string, number[]>();
  for (const p of pieces) if (p.style.endsWith('|outline') && p.points.length >= 2) widths.set(p.style, [...(widths.get(p.style) ?? []), p.lineWidth]);
  const median = new Map([...widths].map(([style, w]) => [style, [...w].sort((a, b) => a - b)[Math.floor(w.length / 2)] as number]));
  return pieces.map((p) => {
    const usual = median.get(p.style);
    if (usual === undefined || p.points.length < 2) return p;
    const length = arcLengths(p.points).at(-1) as number;
    if (length > DOT_LENGTH_IN_WIDTHS * usual) return p;
    const xs = p.points.map((q) => q[0]);
    const ys = p.points.map((q) => q[1]);
    return { ...p, points: [sheetPoint((Math.min(...xs) + Math.max(...xs)) / 2, (Math.min(...ys) + Math.max(...ys)) / 2)], extent: p.extent ?? p.points };
  });
}

/** Centre lines of the thin filled outlines of a path (strokes some programs write as fills). */
function outlinePieces(path: VectorPath, flatness: number, index: number): Piece[] {
  const out: Piece[] = [];
  const style = `${path.fill}|outline`;
  for (const ring of flattenPath(path.segments, flatness)) {
    if (!ring.closed) continue;
    const centre = centrelineOf(ring.points) ?? dotOf(ring.points);
    if (!centre) continue;
    const parts = path.clip ? clipPolyline(centre.points, path.clip) : [centre.points];
    // The outline is kept: should the piece turn out a dot (here or in dotsOfSlivers), a line it
    // ends runs to the outline's far edge (strokeJoin.ts).
    for (const points of parts) out.push({ points, closed: false, style, stroke: path.fill, lineWidth: centre.width, extent: ring.points, path: index });
  }
  return out;
}

/**
 * A filled sliver too short for `centrelineOf` (less than twice as long as wide), no larger than a
 * line is wide: typically the last dash of a dashed line written as filled dashes, cut short where
 * the line ends, or the dot of a dash-dot line. Its own axis cannot be trusted (a sliver shorter
 * than the line is wide lies across the line), so it is a dot, one point at the middle of its
 * box, which only ends or bridges a line that has a direction (strokeJoin.ts); a line it ends
 * runs on to the sliver's far edge. Without it a dashed curve stops one dash early (up to 1.7 %
 * of its flow range on the speed sheets).
 */
function dotOf(outline: readonly SheetPoint[], maxWidth = MAX_OUTLINE_WIDTH): { points: SheetPoint[]; width: number } | null {
  if (outline.length < 3) return null;
  const xs = outline.map((p) => p[0]);
  const ys = outline.map((p) => p[1]);
  const [x0, x1, y0, y1] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
  if (Math.hypot(x1 - x0, y1 - y0) > maxWidth) return null;
  return { points: [sheetPoint((x0 + x1) / 2, (y0 + y1) / 2)], width: Math.min(x1 - x0, y1 - y0) };
}

/** The joined lines of a page, ready for repeated captures. */
export function strokeLines(paths: readonly VectorPath[], options: VectorCaptureOptions = {}): StrokeLine[] {
  return joinPieces(strokePieces(paths, options.flatness ?? DEFAULT_FLATNESS), options.joinTolerance ?? DEFAULT_JOIN_TOLERANCE);
}

/** Captures the drawn line under the guides. Throws CaptureError when no line passes near all of them. */
export function captureVector(lines: readonly StrokeLine[], guides: readonly SheetPoint[], options: VectorCaptureOptions = {}): VectorCapture {
  if (guides.length === 0) throw new CaptureError('A vector capture needs at least one guide on the line.');
  const reach = options.maxGuideDistance ?? DEFAULT_MAX_GUIDE_DISTANCE;
  const { fits, closest } = linesNearGuides(lines, guides, reach);
  const choice = fits.length > 0 ? chooseLine(fits, lines, options.siblings ?? [], reach, options.ambiguity) : null;
  const best = choice?.fit;
  if (!best) {
    const stitched = stitchAlongGuides(lines, guides, reach);
    if (stitched) {
      const positions = guides.map((g) => nearestOnPolyline(stitched.points, g));
      const first = stitched.lines[0]!;
      return {
        points: options.wholeLine ? dedupe(stitched.points) : slice(stitched.points, positions[0]!, positions[positions.length - 1]!),
        guideDistances: positions.map((p) => p.distance),
        stroke: first.stroke,
        lineWidth: first.lineWidth,
        pieces: stitched.lines.reduce((n, l) => n + l.pieces, 0),
        gridLike: false,
      };
    }
    const near = Number.isFinite(closest) ? ` (the nearest line misses a guide by ${closest.toFixed(1)} sheet units)` : '';
    throw new CaptureError(
      `No drawn line passes within ${reach} sheet units of every guide${near}; place the guides on the line itself, or capture it from the picture instead.`,
    );
  }
  const { line, positions } = best;
  const points = guides.length === 1 || options.wholeLine ? whole(line, positions) : cut(line, positions);
  return {
    points,
    guideDistances: positions.map((p) => p.distance),
    stroke: line.stroke,
    lineWidth: line.lineWidth,
    pieces: line.pieces,
    gridLike: line.gridLike,
    ...(choice && (choice.bySiblings || choice.unresolved > 0) ? { ambiguous: { bySiblings: choice.bySiblings, unresolved: choice.unresolved } } : {}),
  };
}

/** The whole line, running the way the guides run (first guide towards the last). */
function whole(line: StrokeLine, positions: readonly PolylinePosition[]): SheetPoint[] {
  const points = dedupe(line.points);
  if (positions.length < 2 || line.closed) return points;
  const cumulative = arcLengths(line.points);
  const first = arcLengthAt(cumulative, positions[0]!);
  const last = arcLengthAt(cumulative, positions[positions.length - 1]!);
  return first <= last ? points : points.reverse();
}

/** The stretch between the first and the last guide; on a closed line, the way round that holds the middle guides. */
function cut(line: StrokeLine, positions: readonly PolylinePosition[]): SheetPoint[] {
  const first = positions[0] as PolylinePosition;
  const last = positions[positions.length - 1] as PolylinePosition;
  const direct = slice(line.points, first, last);
  if (!line.closed) return direct;
  const cumulative = arcLengths(line.points);
  const total = cumulative[cumulative.length - 1] as number;
  const s0 = arcLengthAt(cumulative, first);
  const s1 = arcLengthAt(cumulative, last);
  const lo = Math.min(s0, s1);
  const hi = Math.max(s0, s1);
  const middle = positions.slice(1, -1).map((p) => arcLengthAt(cumulative, p));
  const inside = middle.filter((s) => s >= lo && s <= hi).length;
  const outside = middle.length - inside;
  const useDirect = inside > outside || (inside === outside && hi - lo <= total - (hi - lo));
  if (useDirect) return direct;
  // The other way round: from `first` away from `last`, through the closing point.
  const n = line.points.length;
  const startIndex = { segment: 0, t: 0, point: line.points[0] as SheetPoint, distance: 0 };
  const endIndex = { segment: n - 2, t: 1, point: line.points[n - 1] as SheetPoint, distance: 0 };
  const lowPos = s0 <= s1 ? first : last;
  const highPos = s0 <= s1 ? last : first;
  const tail = slice(line.points, highPos, endIndex);
  const head = slice(line.points, startIndex, lowPos);
  const around = dedupe([...tail, ...head]);
  return s0 <= s1 ? around.reverse() : around;
}
