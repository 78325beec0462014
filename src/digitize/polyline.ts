/**
 * Geometry on polylines in sheet coordinates: nearest point, arc-length position, cutting out
 * the stretch between two positions, and intersections. Pure and allocation-light, because
 * capture runs it against every path of a page.
 */
import { sheetPoint, type SheetPoint } from './points.ts';

type XY = readonly [number, number];

/**
 * The points' centre, second moments about it and principal axis: the direction of the straight
 * line through them by total least squares, angle = ½·atan2(2·sxy, sxx − syy), radians from the
 * x axis in (−π/2, π/2].
 */
export function principalAxis(points: readonly XY[]): { centre: [number, number]; sxx: number; sxy: number; syy: number; angle: number } {
  const n = points.length;
  const mx = points.reduce((s, p) => s + p[0], 0) / n;
  const my = points.reduce((s, p) => s + p[1], 0) / n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (const p of points) {
    sxx += (p[0] - mx) ** 2;
    sxy += (p[0] - mx) * (p[1] - my);
    syy += (p[1] - my) ** 2;
  }
  return { centre: [mx, my], sxx, sxy, syy, angle: 0.5 * Math.atan2(2 * sxy, sxx - syy) };
}

/** A position on a polyline: segment index i (from point i to i+1) and fraction t along it. */
export interface PolylinePosition {
  readonly segment: number;
  readonly t: number;
  /** The point itself. */
  readonly point: SheetPoint;
  /** Distance from the query point, sheet units. */
  readonly distance: number;
}

/** Nearest point of the polyline to p. The polyline must have at least one point. */
export function nearestOnPolyline(points: readonly XY[], p: XY): PolylinePosition {
  let best: PolylinePosition = { segment: 0, t: 0, point: sheetPoint(points[0]![0], points[0]![1]), distance: Math.hypot(p[0] - points[0]![0], p[1] - points[0]![1]) };
  for (let i = 0; i + 1 < points.length; i++) {
    const a = points[i] as XY;
    const b = points[i + 1] as XY;
    const dx = b[0] - a[0];
    const dy = b[1] - a[1];
    const len2 = dx * dx + dy * dy;
    const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2));
    const x = a[0] + t * dx;
    const y = a[1] + t * dy;
    const d = Math.hypot(p[0] - x, p[1] - y);
    if (d < best.distance) best = { segment: i, t, point: sheetPoint(x, y), distance: d };
  }
  return best;
}

/** Distance from p to the polyline. */
export function distanceToPolyline(points: readonly XY[], p: XY): number {
  return nearestOnPolyline(points, p).distance;
}

/** Cumulative arc length at each vertex. */
export function arcLengths(points: readonly XY[]): number[] {
  const out = [0];
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1] as XY;
    const b = points[i] as XY;
    out.push((out[i - 1] as number) + Math.hypot(b[0] - a[0], b[1] - a[1]));
  }
  return out;
}

/** Arc length of a position. */
export function arcLengthAt(cumulative: readonly number[], pos: Pick<PolylinePosition, 'segment' | 't'>): number {
  const a = cumulative[pos.segment] ?? 0;
  const b = cumulative[pos.segment + 1] ?? a;
  return a + pos.t * (b - a);
}

/** The stretch of the polyline from position `from` to position `to` (either order; output runs from → to). */
export function slice(points: readonly XY[], from: PolylinePosition, to: PolylinePosition): SheetPoint[] {
  const forward = from.segment < to.segment || (from.segment === to.segment && from.t <= to.t);
  const [a, b] = forward ? [from, to] : [to, from];
  const out: SheetPoint[] = [a.point];
  for (let i = a.segment + 1; i <= b.segment; i++) {
    const q = points[i] as XY;
    out.push(sheetPoint(q[0], q[1]));
  }
  out.push(b.point);
  const clean = dedupe(out);
  return forward ? clean : clean.reverse();
}

/** Drops consecutive duplicate points. */
export function dedupe(points: readonly SheetPoint[]): SheetPoint[] {
  const out: SheetPoint[] = [];
  for (const p of points) {
    const last = out.at(-1);
    if (!last || last[0] !== p[0] || last[1] !== p[1]) out.push(p);
  }
  return out;
}

export interface Crossing {
  readonly point: SheetPoint;
  /** Segment index and fraction on the first polyline. */
  readonly a: { segment: number; t: number };
  /** Segment index and fraction on the second polyline. */
  readonly b: { segment: number; t: number };
}

/** Proper crossings of two polylines (touching ends included), in order along the first. */
export function intersections(pa: readonly XY[], pb: readonly XY[]): Crossing[] {
  const out: Crossing[] = [];
  const boxesB = segmentBoxes(pb);
  for (let i = 0; i + 1 < pa.length; i++) {
    const a0 = pa[i] as XY;
    const a1 = pa[i + 1] as XY;
    const minX = Math.min(a0[0], a1[0]);
    const maxX = Math.max(a0[0], a1[0]);
    const minY = Math.min(a0[1], a1[1]);
    const maxY = Math.max(a0[1], a1[1]);
    for (let j = 0; j + 1 < pb.length; j++) {
      const box = boxesB[j] as [number, number, number, number];
      if (box[0] > maxX || box[2] < minX || box[1] > maxY || box[3] < minY) continue;
      const hit = segmentIntersection(a0, a1, pb[j] as XY, pb[j + 1] as XY);
      if (!hit) continue;
      const [t, u] = hit;
      // A crossing exactly at a shared vertex would be found twice; keep the first.
      const point = sheetPoint(a0[0] + t * (a1[0] - a0[0]), a0[1] + t * (a1[1] - a0[1]));
      const previous = out.at(-1);
      if (previous && Math.hypot(previous.point[0] - point[0], previous.point[1] - point[1]) < 1e-9) continue;
      out.push({ point, a: { segment: i, t }, b: { segment: j, t: u } });
    }
  }
  return out;
}

function segmentBoxes(points: readonly XY[]): [number, number, number, number][] {
  const out: [number, number, number, number][] = [];
  for (let j = 0; j + 1 < points.length; j++) {
    const p = points[j] as XY;
    const q = points[j + 1] as XY;
    out.push([Math.min(p[0], q[0]), Math.min(p[1], q[1]), Math.max(p[0], q[0]), Math.max(p[1], q[1])]);
  }
  return out;
}

/** Fractions (t on p0p1, u on q0q1) where two segments meet, or null if they do not (parallel ones never do). */
export function segmentIntersection(p0: XY, p1: XY, q0: XY, q1: XY): [number, number] | null {
  const rx = p1[0] - p0[0];
  const ry = p1[1] - p0[1];
  const sx = q1[0] - q0[0];
  const sy = q1[1] - q0[1];
  const denom = rx * sy - ry * sx;
  if (denom === 0) return null;
  const qpx = q0[0] - p0[0];
  const qpy = q0[1] - p0[1];
  const t = (qpx * sy - qpy * sx) / denom;
  const u = (qpx * ry - qpy * rx) / denom;
  const eps = 1e-12;
  if (t < -eps || t > 1 + eps || u < -eps || u > 1 + eps) return null;
  return [Math.max(0, Math.min(1, t)), Math.max(0, Math.min(1, u))];
}

/**
 * `count` points spaced evenly by arc length along the polyline, ends included. The points lie
 * on the polyline itself, so a resampled vector capture keeps the drawn geometry exactly.
 */
export function resampleEvenly(points: readonly SheetPoint[], count: number): SheetPoint[] {
  if (points.length < 2 || count < 2) return [...points];
  const cumulative = arcLengths(points);
  const total = cumulative[cumulative.length - 1] as number;
  if (total === 0) return [points[0] as SheetPoint];
  const out: SheetPoint[] = [];
  let seg = 0;
  for (let k = 0; k < count; k++) {
    const s = (total * k) / (count - 1);
    while (seg < points.length - 2 && (cumulative[seg + 1] as number) < s) seg++;
    const a = points[seg] as SheetPoint;
    const b = points[seg + 1] as SheetPoint;
    const len = (cumulative[seg + 1] as number) - (cumulative[seg] as number);
    const t = len > 0 ? Math.max(0, Math.min(1, (s - (cumulative[seg] as number)) / len)) : 0;
    out.push(sheetPoint(a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])));
  }
  return out;
}

/**
 * The parts of a polyline inside the box [left, top, right, bottom] (edges included), each a
 * polyline of its own: what a clipping rectangle lets the page show.
 */
export function clipPolyline(points: readonly SheetPoint[], box: readonly [number, number, number, number]): SheetPoint[][] {
  const [x0, y0, x1, y1] = box;
  const inside = (p: SheetPoint) => p[0] >= x0 && p[0] <= x1 && p[1] >= y0 && p[1] <= y1;
  if (points.every(inside)) return [[...points]];
  const out: SheetPoint[][] = [];
  let run: SheetPoint[] = [];
  for (let i = 0; i + 1 < points.length; i++) {
    const a = points[i] as SheetPoint;
    const b = points[i + 1] as SheetPoint;
    const cut = clipSegment(a, b, box);
    if (!cut) {
      if (run.length >= 2) out.push(run);
      run = [];
      continue;
    }
    const [p, q] = cut;
    const last = run.at(-1);
    if (!last || last[0] !== p[0] || last[1] !== p[1]) {
      if (run.length >= 2) out.push(run);
      run = [p];
    }
    run.push(q);
    if (q !== b) {
      // Left the box: this part ends here.
      if (run.length >= 2) out.push(run);
      run = [];
    }
  }
  if (run.length >= 2) out.push(run);
  return out;
}

/**
 * Liang–Barsky clipping: the parameters [t0, t1] (0 ≤ t0 ≤ t1 ≤ 1) of the part of segment a→b
 * inside the box [left, top, right, bottom] (edges included), or null when none of it is. Plain
 * coordinates, so that sheet points and screen pixels share it.
 */
export function segmentInBox(a: readonly [number, number], b: readonly [number, number], box: readonly [number, number, number, number]): [number, number] | null {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  let t0 = 0;
  let t1 = 1;
  const edges: [number, number][] = [
    [-dx, a[0] - box[0]],
    [dx, box[2] - a[0]],
    [-dy, a[1] - box[1]],
    [dy, box[3] - a[1]],
  ];
  for (const [p, q] of edges) {
    if (p === 0) {
      if (q < 0) return null;
      continue;
    }
    const r = q / p;
    if (p < 0) t0 = Math.max(t0, r);
    else t1 = Math.min(t1, r);
    if (t0 > t1) return null;
  }
  return [t0, t1];
}

/** The part of segment a→b inside the box, or null. Unclipped ends are returned as the same objects. */
function clipSegment(a: SheetPoint, b: SheetPoint, box: readonly [number, number, number, number]): [SheetPoint, SheetPoint] | null {
  const t = segmentInBox(a, b, box);
  if (!t) return null;
  const [t0, t1] = t;
  const p = t0 === 0 ? a : sheetPoint(a[0] + t0 * (b[0] - a[0]), a[1] + t0 * (b[1] - a[1]));
  const q = t1 === 1 ? b : sheetPoint(a[0] + t1 * (b[0] - a[0]), a[1] + t1 * (b[1] - a[1]));
  return [p, q];
}
