/**
 * Sorting the lines of each frame into curves: which panel of a frame a line belongs to, and
 * whether a line on a head panel is a diameter's curve or an iso-line. A diameter's head
 * curve starts at the flow axis (zero flow); an efficiency curve drawn against a second axis
 * in the same frame starts at zero efficiency; what else crosses the head curves is an
 * iso-line. A line none of these rules places is left out with a question.
 */
import { distanceToPolyline } from '../polyline.ts';
import type { SheetPoint } from '../points.ts';
import type { StrokeLine } from '../strokeJoin.ts';
import type { Quantity } from '../../model/curveset.ts';
import type { Box, FoundPanel } from './panels.ts';
import { curvesInFrame } from './lines.ts';

export interface FoundCurve {
  id: number;
  panel: FoundPanel;
  quantity: Quantity;
  kind: 'curve' | 'iso';
  /** Sheet points, left to right. */
  points: SheetPoint[];
}

const startsAtFlowAxis = (pts: readonly SheetPoint[], f: Box) => (pts[0] as SheetPoint)[0] - f[0] <= 0.02 * (f[2] - f[0]);
const startsAtBottom = (pts: readonly SheetPoint[], f: Box) => f[3] - (pts[0] as SheetPoint)[1] <= 0.04 * (f[3] - f[1]);

/**
 * The curves of the panels' frames, sorted into head curves, other curves and iso-lines, and
 * `stubs`: lines too short to be read as curves that meet a head curve on a panel with iso-lines
 * (the end of an iso-line clipping a head curve's end; `labelledStubs` in labels.ts reads those
 * that carry a "%" label, and the others are asked about).
 */
export function sortCurves(panels: readonly FoundPanel[], lines: readonly StrokeLine[]): { curves: FoundCurve[]; stubs: FoundCurve[]; questions: string[] } {
  const curves: FoundCurve[] = [];
  const stubs: FoundCurve[] = [];
  const questions: string[] = [];
  const frames = [...new Set(panels.map((p) => p.frame))];
  let id = 0;
  for (const frame of frames) {
    const here = panels.filter((p) => p.frame === frame && p.quantity !== null);
    if (here.length === 0) continue;
    const head = here.find((p) => p.quantity === 'head');
    const eff = here.find((p) => p.quantity === 'efficiency');
    const isoCandidates: SheetPoint[][] = [];
    const short: SheetPoint[][] = [];
    for (const points of curvesInFrame(lines, frame, short)) {
      const add = (panel: FoundPanel, kind: 'curve' | 'iso') => curves.push({ id: id++, panel, quantity: kind === 'iso' ? 'efficiency' : (panel.quantity as Quantity), kind, points });
      if (here.length === 1 && !head) {
        add(here[0] as FoundPanel, 'curve');
      } else if (head && startsAtFlowAxis(points, frame)) {
        if (eff && eff !== head && startsAtBottom(points, frame)) add(eff, 'curve');
        else add(head, 'curve');
      } else if (head) {
        isoCandidates.push(points);
      } else {
        questions.push(`A line in the frame of panels ${here.map((p) => `"${p.id}"`).join(' and ')} could not be given to one of them; trace it by hand.`);
      }
    }
    if (!head) continue;
    const heads = curves.filter((c) => c.panel === head && c.kind === 'curve');
    for (const points of isoCandidates) {
      // An iso-line meets at least one head curve (its ends lie on the outer ones).
      const touches = heads.filter((h) => Math.min(distanceToPolyline(h.points, points[0] as SheetPoint), distanceToPolyline(h.points, points[points.length - 1] as SheetPoint)) <= 0.02 * (frame[3] - frame[1]) || crosses(h.points, points)).length;
      if (touches >= 1) curves.push({ id: id++, panel: head, quantity: 'efficiency', kind: 'iso', points });
      else questions.push(`A line on panel "${head.id}" from [${fmtPt(points[0] as SheetPoint)}] to [${fmtPt(points[points.length - 1] as SheetPoint)}] is neither a head curve nor an iso-line crossing them; trace it by hand if it matters.`);
    }
    // Where iso-lines cross the head curves, a line too short to read that meets a head curve is
    // likely an iso-line's end clipping that curve: its crossing is an efficiency point.
    if (curves.some((c) => c.panel === head && c.kind === 'iso')) {
      const near = 0.01 * (frame[3] - frame[1]);
      for (const points of short) {
        if (heads.some((h) => crosses(h.points, points) || points.some((p) => distanceToPolyline(h.points, p) <= near) || distanceToPolyline(points, h.points[h.points.length - 1] as SheetPoint) <= near)) {
          stubs.push({ id: id++, panel: head, quantity: 'efficiency', kind: 'iso', points });
        }
      }
    }
  }
  return { curves, stubs, questions };
}

function fmtPt(p: SheetPoint): string {
  return `${p[0].toFixed(0)}, ${p[1].toFixed(0)}`;
}

/** True when the two polylines cross (their y difference changes sign over their common x range). */
function crosses(a: readonly SheetPoint[], b: readonly SheetPoint[]): boolean {
  let sign = 0;
  for (const p of b) {
    const y = yAt(a, p[0]);
    if (y === null) continue;
    const s = Math.sign(p[1] - y);
    if (s !== 0 && sign !== 0 && s !== sign) return true;
    if (s !== 0) sign = s;
  }
  return false;
}

/** The y of a left-to-right polyline at x, or null outside its x range. */
export function yAt(points: readonly SheetPoint[], x: number): number | null {
  for (let i = 1; i < points.length; i++) {
    const p = points[i - 1] as SheetPoint;
    const q = points[i] as SheetPoint;
    if ((p[0] <= x && x <= q[0]) || (q[0] <= x && x <= p[0])) {
      const t = q[0] === p[0] ? 0 : (x - p[0]) / (q[0] - p[0]);
      return p[1] + t * (q[1] - p[1]);
    }
  }
  return null;
}
