/**
 * Flattening paths into polylines: lines stay exact, cubic Béziers are split by de Casteljau
 * until each piece's control points lie within `tolerance` of its chord, which keeps the
 * polyline within ¾·tolerance of the true curve (the curve lies in the control hull).
 */
import { sheetPoint, type SheetPoint } from './points.ts';
import type { PathSegment } from './sheet.ts';

export interface Polyline {
  readonly points: SheetPoint[];
  /** True when the subpath was closed by a close segment. */
  readonly closed: boolean;
}

/** Default chord tolerance, sheet units: 0.01 pt is far below any reading accuracy. */
export const DEFAULT_FLATNESS = 0.01;

const MAX_DEPTH = 18;

/** Appends the flattened cubic p0→p3 to `out` (p0 itself is not appended). */
export function flattenCubic(p0: SheetPoint, c1: SheetPoint, c2: SheetPoint, p3: SheetPoint, tolerance: number, out: SheetPoint[], depth = 0): void {
  if (depth >= MAX_DEPTH || (distanceToChord(c1, p0, p3) <= tolerance && distanceToChord(c2, p0, p3) <= tolerance)) {
    out.push(p3);
    return;
  }
  const mid = (a: SheetPoint, b: SheetPoint) => sheetPoint((a[0] + b[0]) / 2, (a[1] + b[1]) / 2);
  const p01 = mid(p0, c1);
  const p12 = mid(c1, c2);
  const p23 = mid(c2, p3);
  const p012 = mid(p01, p12);
  const p123 = mid(p12, p23);
  const m = mid(p012, p123);
  flattenCubic(p0, p01, p012, m, tolerance, out, depth + 1);
  flattenCubic(m, p123, p23, p3, tolerance, out, depth + 1);
}

function distanceToChord(p: SheetPoint, a: SheetPoint, b: SheetPoint): number {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const len2 = dx * dx + dy * dy;
  if (len2 === 0) return Math.hypot(p[0] - a[0], p[1] - a[1]);
  const t = Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2));
  return Math.hypot(p[0] - (a[0] + t * dx), p[1] - (a[1] + t * dy));
}

/** Splits a path into its subpaths, each flattened; subpaths of fewer than 2 points are dropped. */
export function flattenPath(segments: readonly PathSegment[], tolerance = DEFAULT_FLATNESS): Polyline[] {
  const out: Polyline[] = [];
  let current: SheetPoint[] = [];
  let closed = false;
  const flush = () => {
    if (current.length >= 2) out.push({ points: current, closed });
    current = [];
    closed = false;
  };
  for (const s of segments) {
    switch (s.kind) {
      case 'move':
        flush();
        current.push(s.to);
        break;
      case 'line':
        current.push(s.to);
        break;
      case 'cubic': {
        const start = current.at(-1);
        if (!start) {
          current.push(s.to);
          break;
        }
        flattenCubic(start, s.c1, s.c2, s.to, tolerance, current);
        break;
      }
      case 'close': {
        const first = current[0];
        const last = current.at(-1);
        if (first && last && (first[0] !== last[0] || first[1] !== last[1])) current.push(first);
        closed = current.length >= 2;
        const start = first;
        flush();
        // Drawing may go on from the start point of the closed subpath.
        if (start) current.push(start);
        break;
      }
    }
  }
  flush();
  return out;
}
