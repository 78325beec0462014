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
  const endA = capAt(ring, ia, width);
  const endB = capAt(ring, ib, width);
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

/** The corner(s) of one end: the corner and its neighbour across a cap edge, or the corner alone (a tip). */
function capAt(ring: readonly SheetPoint[], i: number, width: number): number[] {
  const n = ring.length;
  const prev = (i - 1 + n) % n;
  const next = (i + 1) % n;
  const d = (a: number, b: number) => Math.hypot((ring[a] as SheetPoint)[0] - (ring[b] as SheetPoint)[0], (ring[a] as SheetPoint)[1] - (ring[b] as SheetPoint)[1]);
  const capLike = (len: number) => len >= 0.7 * width && len <= 1.3 * width;
  const toNext = d(i, next);
  const toPrev = d(i, prev);
  const nextCap = capLike(toNext);
  const prevCap = capLike(toPrev);
  if (nextCap && (!prevCap || Math.abs(toNext - width) <= Math.abs(toPrev - width))) return [i, next];
  if (prevCap) return [prev, i];
  return [i];
}

/** The ring without a repeated closing point. */
function openRing(points: readonly SheetPoint[]): SheetPoint[] {
  const out = [...points];
  while (out.length > 1) {
    const first = out[0] as SheetPoint;
    const last = out[out.length - 1] as SheetPoint;
    if (first[0] === last[0] && first[1] === last[1]) out.pop();
    else break;
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
