/**
 * The drawn lines of a vector sheet that may be curves: every stroked path, the filled
 * outlines some renderers write for dashed strokes, and the rows of round dots they write for
 * dotted ones, flattened and joined into whole lines (vectorCapture.ts, strokeJoin.ts).
 * Grid lines, frames and ticks are level or upright and are left out; so are lines that lie
 * mostly outside a frame.
 */
import { flattenPath, DEFAULT_FLATNESS } from '../flatten.ts';
import { clipPolyline, distanceToPolyline } from '../polyline.ts';
import { sheetPoint, type SheetPoint } from '../points.ts';
import type { VectorPath } from '../sheet.ts';
import { joinPieces, type Piece, type StrokeLine } from '../strokeJoin.ts';
import { DEFAULT_JOIN_TOLERANCE, strokePieces } from '../vectorCapture.ts';
import type { Box } from './panels.ts';

/** Largest dot of a dotted line, in line widths (a round cap of a zero-length dash is one width across). */
const DOT_SIZE = 2.5;

/** A filled path made of many small rings (a dotted stroke written as its dots): the dots' centres, in drawing order. */
export function dotPiece(path: VectorPath, flatness = DEFAULT_FLATNESS): Piece | null {
  if (path.stroke !== null || path.fill === null) return null;
  const rings = flattenPath(path.segments, flatness);
  if (rings.length < 5) return null;
  const centres: SheetPoint[] = [];
  let size = 0;
  for (const ring of rings) {
    const xs = ring.points.map((p) => p[0]);
    const ys = ring.points.map((p) => p[1]);
    const w = Math.max(...xs) - Math.min(...xs);
    const h = Math.max(...ys) - Math.min(...ys);
    size = Math.max(size, w, h);
    if (w > DOT_SIZE * Math.max(1, path.lineWidth) + 1 || h > DOT_SIZE * Math.max(1, path.lineWidth) + 1) return null;
    // A round dot: width and height alike (a dash would be long one way).
    if (Math.abs(w - h) > 0.35 * Math.max(w, h) + 0.1) return null;
    centres.push(sheetPoint((Math.max(...xs) + Math.min(...xs)) / 2, (Math.max(...ys) + Math.min(...ys)) / 2));
  }
  const parts = path.clip ? clipPolyline(centres, path.clip) : [centres];
  const points = parts.sort((a, b) => b.length - a.length)[0] ?? [];
  return points.length >= 2 ? { points, closed: false, style: `${path.fill}|dots`, stroke: path.fill, lineWidth: size } : null;
}

/** Every joined line of the sheet, dotted ones included. */
export function sheetLines(paths: readonly VectorPath[]): StrokeLine[] {
  const dotted = new Set<VectorPath>();
  const pieces: Piece[] = [];
  for (const path of paths) {
    const dots = dotPiece(path);
    if (dots) {
      dotted.add(path);
      pieces.push(dots);
    }
  }
  pieces.push(...strokePieces(paths.filter((p) => !dotted.has(p))));
  return joinPieces(pieces, DEFAULT_JOIN_TOLERANCE);
}

/** Inside the box, with `margin` (a fraction of its size) to spare. */
export function inBox(p: readonly [number, number], box: Box, margin = 0.01): boolean {
  const mx = margin * (box[2] - box[0]);
  const my = margin * (box[3] - box[1]);
  return p[0] >= box[0] - mx && p[0] <= box[2] + mx && p[1] >= box[1] - my && p[1] <= box[3] + my;
}

/**
 * The lines of one frame that may be curves: not level or upright, not closed, at least 3 % of
 * the frame wide or high, most of their length inside the frame; clipped to the frame.
 */
export function curvesInFrame(lines: readonly StrokeLine[], frame: Box, stubs?: SheetPoint[][]): SheetPoint[][] {
  const out: { points: SheetPoint[]; style: string }[] = [];
  const w = frame[2] - frame[0];
  const h = frame[3] - frame[1];
  const clip: Box = [frame[0] - 0.005 * w, frame[1] - 0.005 * h, frame[2] + 0.005 * w, frame[3] + 0.005 * h];
  for (const line of lines) {
    if (line.gridLike || line.closed) continue;
    const [x0, y0, x1, y1] = line.box;
    if (x1 < frame[0] || x0 > frame[2] || y1 < frame[1] || y0 > frame[3]) continue;
    const inside = line.points.filter((p) => inBox(p, frame)).length;
    if (inside < 0.7 * line.points.length) continue;
    const parts = clipPolyline(line.points, clip).filter((p) => p.length >= 2);
    for (const part of parts) {
      const xs = part.map((p) => p[0]);
      const ys = part.map((p) => p[1]);
      const spanX = Math.max(...xs) - Math.min(...xs);
      const spanY = Math.max(...ys) - Math.min(...ys);
      if (spanX < 0.03 * w && spanY < 0.03 * h) {
        // Too short to be read as a curve; handed back (when asked) so that a stub of an
        // iso-line crossing a head curve is not passed over in silence.
        stubs?.push(part);
        continue;
      }
      // Left to right, as curves are read.
      const clean = dropSpikes(part);
      out.push({ points: (clean[0] as SheetPoint)[0] <= (clean[clean.length - 1] as SheetPoint)[0] ? clean : [...clean].reverse(), style: line.style });
    }
  }
  return mergeBroken(out, frame);
}

/**
 * Joins pieces of one curve that the stroke joining left apart (a dashed line whose dashes
 * did not all meet): pieces of one style where one ends and the next begins a little to its
 * right, running on in the same direction. Only pairs that choose each other are joined, so
 * where curves of one style bunch together nothing is joined by chance.
 */
export function mergeBroken(pieces: readonly { points: SheetPoint[]; style: string }[], frame: Box): SheetPoint[][] {
  const list = pieces.map((p) => ({ ...p, alive: true }));
  const reach = Math.max(12, 0.02 * (frame[2] - frame[0]));
  for (let round = 0; round < 50; round++) {
    const best = new Map<number, { j: number; cost: number }>();
    const bestBack = new Map<number, { i: number; cost: number }>();
    list.forEach((a, i) => {
      if (!a.alive) return;
      list.forEach((b, j) => {
        if (i === j || !b.alive || a.style !== b.style) return;
        const end = a.points[a.points.length - 1] as SheetPoint;
        const start = b.points[0] as SheetPoint;
        const gx = start[0] - end[0];
        const gy = start[1] - end[1];
        const gap = Math.hypot(gx, gy);
        const da = direction(a.points, false);
        const db = direction(b.points, true);
        if (da[0] * db[0] + da[1] * db[1] < Math.cos((25 * Math.PI) / 180)) return;
        // Or overlapping, each lying on the other where they overlap: a dotted line whose dots
        // were shared out between two pieces over a short stretch (vector bed seed 539: a power
        // curve's dots along a grid line, in two pieces 8 units over one another).
        const overlap = gx < -0.5 && -gx <= reach && Math.abs(da[0]) >= STEEP_OVERLAP && distanceToPolyline(a.points, start) <= ON_EACH_OTHER && distanceToPolyline(b.points, end) <= ON_EACH_OTHER;
        if ((gx < -0.5 && !overlap) || gap > reach) return;
        // The gap itself runs on along both ends.
        if (!overlap && gap > 1 && (da[0] * gx + da[1] * gy) / gap < Math.cos((30 * Math.PI) / 180)) return;
        const cost = overlap ? 0 : gap;
        if (!best.has(i) || cost < best.get(i)!.cost) best.set(i, { j, cost });
        if (!bestBack.has(j) || cost < bestBack.get(j)!.cost) bestBack.set(j, { i, cost });
      });
    });
    let merged = false;
    for (const [i, { j }] of best) {
      if (bestBack.get(j)?.i !== i || !list[i]!.alive || !list[j]!.alive) continue;
      list[i]!.points = joinInOrder(list[i]!.points, list[j]!.points);
      list[j]!.alive = false;
      merged = true;
    }
    if (!merged) break;
  }
  return list.filter((p) => p.alive).map((p) => p.points);
}

/** Two pieces of one line, `b` after `a`; where they overlap, the points of both over the overlap in order along the flow axis. */
function joinInOrder(a: readonly SheetPoint[], b: readonly SheetPoint[]): SheetPoint[] {
  const from = (b[0] as SheetPoint)[0];
  const to = (a[a.length - 1] as SheetPoint)[0];
  if (from >= to) return [...a, ...b];
  const overlap = [...a.filter((p) => p[0] >= from), ...b.filter((p) => p[0] <= to)].sort((p, q) => p[0] - q[0]);
  return [...a.filter((p) => p[0] < from), ...overlap, ...b.filter((p) => p[0] > to)];
}

/** Overlapping pieces are one line only where each lies within this of the other, sheet units (a vector line is exact to a hundredth). */
const ON_EACH_OTHER = 0.5;
/** Least share of an overlap's direction along the flow axis (its points are put in order along it). */
const STEEP_OVERLAP = 0.5;

/** Unit direction of a left-to-right polyline at its start (or end), over about 6 units. */
function direction(points: readonly SheetPoint[], atStart: boolean): [number, number] {
  const n = points.length;
  const a = (atStart ? points[0] : points[n - 1]) as SheetPoint;
  let b = a;
  for (let k = 1; k < n; k++) {
    b = (atStart ? points[k] : points[n - 1 - k]) as SheetPoint;
    if (Math.hypot(b[0] - a[0], b[1] - a[1]) >= 6) break;
  }
  const dx = atStart ? b[0] - a[0] : a[0] - b[0];
  const dy = atStart ? b[1] - a[1] : a[1] - b[1];
  const len = Math.hypot(dx, dy);
  return len > 0 ? [dx / len, dy / len] : [1, 0];
}

/** Distance of p from the (unbounded) line through a and b. */
function offLine(a: SheetPoint, b: SheetPoint, p: SheetPoint): number {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const len = Math.hypot(dx, dy);
  return len > 0 ? Math.abs(dx * (p[1] - a[1]) - dy * (p[0] - a[0])) / len : Math.hypot(p[0] - a[0], p[1] - a[1]);
}

/** Distance of b from the chord a–c. */
function offChord(a: SheetPoint, b: SheetPoint, c: SheetPoint): number {
  const dx = c[0] - a[0];
  const dy = c[1] - a[1];
  const len = Math.hypot(dx, dy);
  return len > 0 ? Math.abs(dx * (b[1] - a[1]) - dy * (b[0] - a[0])) / len : Math.hypot(b[0] - a[0], b[1] - a[1]);
}

/**
 * Drops lone points that jump off a smooth line: a dash written as an outline can give one
 * centre point off by a fraction of the stroke width where the dash turns a corner of the
 * path. A point is dropped when it lies more than 0.2 units off the chord of its neighbours
 * and at least five times further off than either neighbour lies off its own chord.
 */
export function dropSpikes(points: readonly SheetPoint[]): SheetPoint[] {
  if (points.length < 5) return [...points];
  const off = points.map((p, i) => (i === 0 || i === points.length - 1 ? 0 : offChord(points[i - 1] as SheetPoint, p, points[i + 1] as SheetPoint)));
  // An end point is held against the line through its next two neighbours.
  const n = points.length;
  const offEnd = (i: number, j: number, k: number) => offLine(points[j] as SheetPoint, points[k] as SheetPoint, points[i] as SheetPoint);
  const firstOff = offEnd(0, 1, 2);
  const lastOff = offEnd(n - 1, n - 2, n - 3);
  return points.filter((_, i) => {
    if (i === 0) return !(firstOff > 0.2 && firstOff > 5 * Math.max(off[2] as number, off[3] as number, 0.02));
    if (i === n - 1) return !(lastOff > 0.2 && lastOff > 5 * Math.max(off[n - 3] as number, off[n - 4] as number, 0.02));
    if (i < 2 || i > n - 3) return true;
    const d = off[i] as number;
    return !(d > 0.2 && d > 5 * Math.max(off[i - 2] as number, off[i + 2] as number));
  });
}
