/**
 * Iso-traces: a line of constant efficiency (or power) drawn across the head curves. Where it
 * crosses the head trace of a diameter, that diameter has that efficiency (or power) at that
 * flow. Crossings are found in sheet coordinates, on the captured polylines, so that they are
 * exact for vector captures; the caller turns each crossing into data through the panel.
 *
 * An iso-line often ends right on the outermost head curve, and a followed iso-line stops a
 * little short of it (the thick head curve hides its last pixels). Each end is therefore
 * extended along the iso-line's own direction by `reach` sheet units (the caller sets it from
 * a tolerance in data units and line widths); where the extension meets a head trace with no
 * crossing nearby, that is a crossing. A head curve that ends on an iso-line is met the same
 * way: each end of a head trace is extended along its own direction by the same reach. Failing that, an end within `touchTolerance` of a head
 * trace counts as a crossing at the nearest point of that trace.
 */
import { intersections, nearestOnPolyline } from './polyline.ts';
import type { SheetPoint } from './points.ts';

export interface CrossingTarget<K> {
  key: K;
  points: readonly SheetPoint[];
  /** Width of the drawn line, sheet units, when known (followed on a raster): the tolerances grow with it. */
  width?: number | undefined;
}

export interface IsoCrossing<K> {
  key: K;
  at: SheetPoint;
  /** True when found by an iso-line end touching the trace rather than by a crossing. */
  touching: boolean;
}

export const DEFAULT_TOUCH_TOLERANCE = 2;
/**
 * How far short of a head curve a followed iso-line may stop, in line widths: the thick head
 * curve hides the iso-line's last pixels (about half a head width and an iso width of blur), and
 * a guide clicked on the crossing is moved three head widths and a few pixels along the
 * iso-line (isoGuides.ts), where a trace may stop. Four head widths and two iso widths, plus a
 * pixel or so of scatter, cover both.
 */
export const REACH_HEAD_WIDTHS = 4;
export const REACH_ISO_WIDTHS = 2;
export const REACH_SLACK = 4;
/** Crossings closer than this (sheet units) are one crossing. */
const MERGE_DISTANCE = 0.05;

/** Unit direction of a polyline leaving through its end (`fromEnd` true) or its start, over about `span` sheet units. */
export function endDirection(points: readonly SheetPoint[], fromEnd: boolean, span: number): [number, number] | undefined {
  const n = points.length;
  const end = (fromEnd ? points[n - 1] : points[0]) as SheetPoint;
  let k = fromEnd ? n - 2 : 1;
  while (k > 0 && k < n - 1 && Math.hypot((points[k] as SheetPoint)[0] - end[0], (points[k] as SheetPoint)[1] - end[1]) < span) k += fromEnd ? -1 : 1;
  const from = points[k] as SheetPoint;
  const d = Math.hypot(end[0] - from[0], end[1] - from[1]);
  return d > 0 ? [(end[0] - from[0]) / d, (end[1] - from[1]) / d] : undefined;
}

export function isoCrossings<K>(iso: readonly SheetPoint[], targets: readonly CrossingTarget<K>[], touchTolerance = DEFAULT_TOUCH_TOLERANCE, reach = 0, isoWidth = 0): IsoCrossing<K>[] {
  const out: IsoCrossing<K>[] = [];
  if (iso.length < 2) return out;
  for (const target of targets) {
    if (target.points.length < 2) continue;
    // Tolerances in line widths where the widths are known, never below those in data units.
    const w = target.width ?? 0;
    const touch = Math.max(touchTolerance, w > 0 ? 0.5 * w + isoWidth + 1 : 0);
    const far = reach > 0 || w > 0 ? Math.max(reach, w > 0 ? REACH_HEAD_WIDTHS * w + REACH_ISO_WIDTHS * isoWidth + REACH_SLACK : 0) : 0;
    const rays: SheetPoint[][] = [];
    if (far > 0) {
      for (const fromEnd of [false, true]) {
        const end = (fromEnd ? iso[iso.length - 1] : iso[0]) as SheetPoint;
        const dir = endDirection(iso, fromEnd, Math.max(3 * far, 6 * isoWidth));
        if (dir) rays.push([end, [end[0] + far * dir[0], end[1] + far * dir[1]] as unknown as SheetPoint]);
      }
    }
    const found: IsoCrossing<K>[] = [];
    for (const c of intersections(iso, target.points)) {
      // A crossing through a vertex of either line can be reported by both of its segments.
      if (found.some((f) => Math.hypot(f.at[0] - c.point[0], f.at[1] - c.point[1]) < MERGE_DISTANCE)) continue;
      found.push({ key: target.key, at: c.point, touching: false });
    }
    for (const ray of rays) {
      for (const c of intersections(ray, target.points)) {
        if (found.some((f) => Math.hypot(f.at[0] - c.point[0], f.at[1] - c.point[1]) <= 2 * Math.max(touch, 0.25 * far))) continue;
        found.push({ key: target.key, at: c.point, touching: true });
        break;
      }
    }
    // A head curve often ends on an iso-line (the maker stops the curve at its last iso level),
    // and a followed head curve stops a little short of it: its ends are extended the same way.
    if (far > 0) {
      for (const fromEnd of [false, true]) {
        const end = (fromEnd ? target.points[target.points.length - 1] : target.points[0]) as SheetPoint;
        const dir = endDirection(target.points, fromEnd, Math.max(far, 6 * w));
        if (!dir) continue;
        const ray = [end, [end[0] + far * dir[0], end[1] + far * dir[1]] as unknown as SheetPoint];
        const c = intersections(ray, iso)[0];
        if (!c || found.some((f) => Math.hypot(f.at[0] - c.point[0], f.at[1] - c.point[1]) <= 2 * Math.max(touch, 0.25 * far))) continue;
        found.push({ key: target.key, at: c.point, touching: true });
      }
    }
    for (const end of [iso[0] as SheetPoint, iso[iso.length - 1] as SheetPoint]) {
      const near = nearestOnPolyline(target.points, end);
      if (near.distance > touch) continue;
      const already = found.some((f) => Math.hypot(f.at[0] - near.point[0], f.at[1] - near.point[1]) <= 2 * touch);
      if (!already) found.push({ key: target.key, at: near.point, touching: true });
    }
    out.push(...found);
  }
  return out;
}

/**
 * The crossings of one iso trace that are readings: one iso-line meets a head curve at most
 * twice, so more crossings with one head trace are a trace that ran along that head curve, and
 * none of them is used (the audit names them, `auditIsoCrossings` in traceAudit.ts).
 */
export function readableCrossings<K>(crossings: readonly IsoCrossing<K>[]): IsoCrossing<K>[] {
  const perHead = new Map<K, number>();
  for (const c of crossings) perHead.set(c.key, (perHead.get(c.key) ?? 0) + 1);
  return crossings.filter((c) => (perHead.get(c.key) ?? 0) <= 2);
}
