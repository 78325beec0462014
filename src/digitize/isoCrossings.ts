/**
 * Iso-traces: a line of constant efficiency (or power) drawn across the head curves. Where it
 * crosses the head trace of a diameter, that diameter has that efficiency (or power) at that
 * flow. Crossings are found in sheet coordinates, on the captured polylines, so that they are
 * exact for vector captures; the caller turns each crossing into data through the panel.
 *
 * An iso-line often ends right on the outermost head curve; an end within `touchTolerance` of a
 * head trace that has no crossing nearby counts as a crossing at the nearest point of that trace.
 */
import { intersections, nearestOnPolyline } from './polyline.ts';
import type { SheetPoint } from './points.ts';

export interface CrossingTarget<K> {
  key: K;
  points: readonly SheetPoint[];
}

export interface IsoCrossing<K> {
  key: K;
  at: SheetPoint;
  /** True when found by an iso-line end touching the trace rather than by a crossing. */
  touching: boolean;
}

export const DEFAULT_TOUCH_TOLERANCE = 2;
/** Crossings closer than this (sheet units) are one crossing. */
const MERGE_DISTANCE = 0.05;

export function isoCrossings<K>(iso: readonly SheetPoint[], targets: readonly CrossingTarget<K>[], touchTolerance = DEFAULT_TOUCH_TOLERANCE): IsoCrossing<K>[] {
  const out: IsoCrossing<K>[] = [];
  if (iso.length < 2) return out;
  for (const target of targets) {
    if (target.points.length < 2) continue;
    const found: IsoCrossing<K>[] = [];
    for (const c of intersections(iso, target.points)) {
      // A crossing through a vertex of either line can be reported by both of its segments.
      if (found.some((f) => Math.hypot(f.at[0] - c.point[0], f.at[1] - c.point[1]) < MERGE_DISTANCE)) continue;
      found.push({ key: target.key, at: c.point, touching: false });
    }
    for (const end of [iso[0] as SheetPoint, iso[iso.length - 1] as SheetPoint]) {
      const near = nearestOnPolyline(target.points, end);
      if (near.distance > touchTolerance) continue;
      const already = found.some((f) => Math.hypot(f.at[0] - near.point[0], f.at[1] - near.point[1]) <= 2 * touchTolerance);
      if (!already) found.push({ key: target.key, at: near.point, touching: true });
    }
    out.push(...found);
  }
  return out;
}
