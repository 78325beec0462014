/**
 * Stitching a line that the drawing interrupts (for an inline label such as "250 mm" or "75 %"):
 * when no single drawn line passes near every guide, the guides may still each sit on a line of
 * one style, and those lines may follow on from one another across short gaps. They are chained
 * in guide order when each gap runs on in the direction of both ends it joins.
 */
import { nearestOnPolyline } from './polyline.ts';
import type { SheetPoint } from './points.ts';
import type { StrokeLine } from './strokeJoin.ts';

/** Longest interruption bridged, sheet units (a label a few characters wide). */
export const MAX_STITCH_GAP = 40;
const ALIGN = Math.cos((35 * Math.PI) / 180);

export interface Stitched {
  points: SheetPoint[];
  lines: StrokeLine[];
}

export function stitchAlongGuides(lines: readonly StrokeLine[], guides: readonly SheetPoint[], reach: number, maxGap = MAX_STITCH_GAP): Stitched | null {
  if (guides.length < 2) return null;
  const near = guides.map((g) =>
    lines
      .filter((l) => !l.gridLike && g[0] >= l.box[0] - reach && g[0] <= l.box[2] + reach && g[1] >= l.box[1] - reach && g[1] <= l.box[3] + reach)
      .map((l) => ({ line: l, distance: nearestOnPolyline(l.points, g).distance }))
      .filter((c) => c.distance <= reach)
      .sort((a, b) => a.distance - b.distance),
  );
  if (near.some((n) => n.length === 0)) return null;
  // One style for the whole line: the style most guides sit nearest to.
  const votes = new Map<string, number>();
  for (const n of near) votes.set(n[0]!.line.style, (votes.get(n[0]!.line.style) ?? 0) + 1);
  const style = [...votes.entries()].sort((a, b) => b[1] - a[1])[0]![0];
  const chosen: StrokeLine[] = [];
  for (const n of near) {
    const pick = n.find((c) => c.line.style === style)?.line;
    if (!pick) return null;
    if (chosen.at(-1) !== pick) {
      if (chosen.includes(pick)) return null; // the guides wander back to a line already used
      chosen.push(pick);
    }
  }
  if (chosen.length < 2) return null;

  // Orient each line so that it runs on towards the next one, and check every gap.
  const out: SheetPoint[] = [];
  for (let i = 0; i < chosen.length; i++) {
    let pts = [...chosen[i]!.points];
    if (i === 0) {
      const next = chosen[1]!.points;
      if (endGap(pts[0]!, next) < endGap(pts.at(-1)!, next)) pts.reverse();
    } else {
      const last = out.at(-1)!;
      if (dist(pts.at(-1)!, last) < dist(pts[0]!, last)) pts.reverse();
      const gap = dist(last, pts[0]!);
      if (gap > maxGap || !runsOn(out, pts, gap)) return null;
    }
    out.push(...pts);
  }
  return { points: out, lines: chosen };
}

function dist(a: SheetPoint, b: SheetPoint): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1]);
}

function endGap(p: SheetPoint, line: readonly SheetPoint[]): number {
  return Math.min(dist(p, line[0]!), dist(p, line.at(-1)!));
}

/** The gap from the end of `before` to the start of `after` continues both lines' directions. */
function runsOn(before: readonly SheetPoint[], after: readonly SheetPoint[], gap: number): boolean {
  if (gap === 0) return true;
  const a = before.at(-1)!;
  const b = after[0]!;
  const inwardBefore = direction(before, before.length - 1, -1);
  const into = direction(after, 0, 1);
  const gx = (b[0] - a[0]) / gap;
  const gy = (b[1] - a[1]) / gap;
  return -(inwardBefore[0] * gx + inwardBefore[1] * gy) >= ALIGN && into[0] * gx + into[1] * gy >= ALIGN;
}

/** Unit direction from the end at index `at` towards a point about 3 units inside the line (walking by `step`). */
function direction(points: readonly SheetPoint[], at: number, step: 1 | -1): [number, number] {
  const end = points[at]!;
  let ref = end;
  for (let k = at + step; k >= 0 && k < points.length; k += step) {
    ref = points[k]!;
    if (dist(ref, end) >= 3) break;
  }
  const dx = ref[0] - end[0];
  const dy = ref[1] - end[1];
  const len = Math.hypot(dx, dy);
  return len > 0 ? [dx / len, dy / len] : [0, 0];
}
