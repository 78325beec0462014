/**
 * Lines drawn as filled outlines. Some programs write a stroke (often a dashed one, dash by
 * dash) as the filled outline of the stroke instead of as a stroked path. A thin closed outline
 * is turned back into its centre line: its two farthest-apart corners split it into the two
 * sides, and points at the same fraction of each side's length are averaged. On a bend the
 * inner side is shorter than the outer one, so equal fractions meet across the stroke.
 */
import { arcLengths } from './polyline.ts';
import { sheetPoint, type SheetPoint } from './points.ts';

export interface Centreline {
  points: SheetPoint[];
  /** Mean width of the outline, sheet units. */
  width: number;
}

/** Outlines wider than this (sheet units) are shapes, not lines. */
export const MAX_OUTLINE_WIDTH = 3;

/** The centre line of a thin closed outline, or null when the outline is not a thin strip. */
export function centrelineOf(outline: readonly SheetPoint[], maxWidth = MAX_OUTLINE_WIDTH): Centreline | null {
  const ring = openRing(outline);
  const n = ring.length;
  if (n < 3) return null;
  const area = Math.abs(shoelace(ring));
  const perimeter = (arcLengths([...ring, ring[0] as SheetPoint]).at(-1) as number) || 0;
  if (perimeter === 0) return null;
  // A strip of length ℓ and width w has area ℓ·w and perimeter 2(ℓ + w).
  const half = perimeter / 2;
  const disc = half * half - 4 * area;
  if (disc < 0) return null;
  const width = (half - Math.sqrt(disc)) / 2;
  const length = half - width;
  if (width > maxWidth || length < 2 * width) return null;

  let ia = 0;
  let ib = 0;
  let far = -1;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const d = Math.hypot((ring[i] as SheetPoint)[0] - (ring[j] as SheetPoint)[0], (ring[i] as SheetPoint)[1] - (ring[j] as SheetPoint)[1]);
      if (d > far) {
        far = d;
        ia = i;
        ib = j;
      }
    }
  }
  // The two farthest corners lie at the two ends. A butt or square cap is an edge about as long
  // as the stroke is wide, and the end of the centre line is its middle; a round cap ends in a tip.
  const axis: [number, number] = [(ring[ib] as SheetPoint)[0] - (ring[ia] as SheetPoint)[0], (ring[ib] as SheetPoint)[1] - (ring[ia] as SheetPoint)[1]];
  const endA = capAt(ring, ia, width, axis);
  const endB = capAt(ring, ib, width, axis);
  const inB = (k: number) => endB.includes(k);
  const walk = (from: number, step: 1 | -1): SheetPoint[] => {
    const side: SheetPoint[] = [];
    let k = from;
    for (let guard = 0; guard <= n; guard++) {
      side.push(ring[k] as SheetPoint);
      if (inB(k)) return side;
      k = (k + step + n) % n;
    }
    return side;
  };
  // Along the ring one way from one corner of end A, the other way from its other corner.
  const forwardStart = endA.length === 2 && endA[1] === (endA[0]! + 1) % n ? endA[1]! : endA[0]!;
  const backwardStart = endA.length === 2 ? (forwardStart === endA[0] ? endA[1]! : endA[0]!) : endA[0]!;
  const sideA = walk(forwardStart, 1);
  const sideB = walk(backwardStart, -1);
  if (sideA.length < 2 || sideB.length < 2) return null;
  const count = Math.max(2, Math.min(200, Math.ceil(length / 1) + 1));
  const a = atFractions(sideA, count);
  const b = atFractions(sideB, count);
  const points = a.map((p, i) => sheetPoint((p[0] + (b[i] as SheetPoint)[0]) / 2, (p[1] + (b[i] as SheetPoint)[1]) / 2));
  return { points, width };
}

/**
 * The corner(s) of one end: the corner and its neighbour across a cap edge, or the corner alone
 * (a tip). A cap edge lies across the strip, `axis` its way from one end to the other, and is
 * about as long as the strip is wide; of two such edges the one squarer to the axis is the cap
 * (the side's first edge can be as short as the cap where the outline turns at a join).
 */
function capAt(ring: readonly SheetPoint[], i: number, width: number, axis: readonly [number, number]): number[] {
  const n = ring.length;
  const prev = (i - 1 + n) % n;
  const next = (i + 1) % n;
  const d = (a: number, b: number) => Math.hypot((ring[a] as SheetPoint)[0] - (ring[b] as SheetPoint)[0], (ring[a] as SheetPoint)[1] - (ring[b] as SheetPoint)[1]);
  const along = Math.hypot(axis[0], axis[1]) || 1;
  /** |cos| of the edge i→k against the axis: 0 square across, 1 along. */
  const slant = (k: number) => Math.abs(((ring[k] as SheetPoint)[0] - (ring[i] as SheetPoint)[0]) * axis[0] + ((ring[k] as SheetPoint)[1] - (ring[i] as SheetPoint)[1]) * axis[1]) / (along * (d(i, k) || 1));
  const capLike = (k: number) => d(i, k) >= 0.7 * width && d(i, k) <= CAP_LONGEST * width && slant(k) <= CAP_SLANT;
  const nextCap = capLike(next);
  const prevCap = capLike(prev);
  if (nextCap && (!prevCap || slant(next) <= slant(prev))) return [i, next];
  if (prevCap) return [prev, i];
  return [i];
}

/**
 * A cap edge may be this many times the strip's width (estimated from its area and perimeter,
 * which a join inside the outline makes small), and lies across the strip's end-to-end way
 * within this |cos| (a short strip's farthest corners lie on a diagonal, off its axis).
 */
const CAP_LONGEST = 1.6;
const CAP_SLANT = 0.6;

/** Corners closer than this (sheet units) are one corner: a ring closed a hair off its start. */
const SAME_CORNER = 1e-3;

/** A corner where the outline turns by less than this sine lies on a straight edge. */
const STRAIGHT_SINE = 1e-3;

/**
 * The ring's corners: without a repeated closing point, nor one a hair off its start, nor
 * corners on a straight edge (a cap edge written in two halves). Either would hide a butt cap,
 * and the centre line would then start at the cap's corner instead of its middle.
 */
function openRing(points: readonly SheetPoint[]): SheetPoint[] {
  const out: SheetPoint[] = [];
  for (const p of points) {
    const last = out[out.length - 1];
    if (!last || Math.hypot(p[0] - last[0], p[1] - last[1]) > SAME_CORNER) out.push(p);
  }
  while (out.length > 1) {
    const first = out[0] as SheetPoint;
    const last = out[out.length - 1] as SheetPoint;
    if (Math.hypot(first[0] - last[0], first[1] - last[1]) <= SAME_CORNER) out.pop();
    else break;
  }
  for (let k = 0; out.length > 3 && k < out.length; ) {
    const a = out[(k - 1 + out.length) % out.length] as SheetPoint;
    const b = out[k] as SheetPoint;
    const c = out[(k + 1) % out.length] as SheetPoint;
    const ux = b[0] - a[0];
    const uy = b[1] - a[1];
    const vx = c[0] - b[0];
    const vy = c[1] - b[1];
    const straight = Math.abs(ux * vy - uy * vx) <= STRAIGHT_SINE * Math.hypot(ux, uy) * Math.hypot(vx, vy) && ux * vx + uy * vy > 0;
    if (straight) out.splice(k, 1);
    else k++;
  }
  return out;
}

function shoelace(ring: readonly SheetPoint[]): number {
  let s = 0;
  for (let i = 0; i < ring.length; i++) {
    const p = ring[i] as SheetPoint;
    const q = ring[(i + 1) % ring.length] as SheetPoint;
    s += p[0] * q[1] - q[0] * p[1];
  }
  return s / 2;
}

/** Points at `count` equal fractions of the polyline's length, ends included. */
function atFractions(points: readonly SheetPoint[], count: number): SheetPoint[] {
  const cumulative = arcLengths(points);
  const total = cumulative.at(-1) as number;
  const out: SheetPoint[] = [];
  let seg = 0;
  for (let k = 0; k < count; k++) {
    const s = (total * k) / (count - 1);
    while (seg < points.length - 2 && (cumulative[seg + 1] as number) < s) seg++;
    const p = points[seg] as SheetPoint;
    const q = points[Math.min(seg + 1, points.length - 1)] as SheetPoint;
    const len = (cumulative[seg + 1] ?? cumulative[seg] ?? 0) - (cumulative[seg] as number);
    const t = len > 0 ? Math.max(0, Math.min(1, (s - (cumulative[seg] as number)) / len)) : 0;
    out.push(sheetPoint(p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])));
  }
  return out;
}
