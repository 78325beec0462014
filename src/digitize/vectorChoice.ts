/**
 * Which drawn line a trace's guides mean, when several pass near them. On a vector page every
 * curve is its own stroked path, so a line is an identity, not a place: where the curves of a
 * family bunch (efficiency curves of a speed family near zero flow, curves crossing near their
 * peaks, an iso-line crossing a head curve), a guide may lie nearer another curve's path than
 * its own. Distance alone then picks the wrong path. What settles it is that each drawn curve is
 * one trace's: the other traces of the take-off (their guides) claim their own paths, and of the
 * paths that fit this trace's guides about equally well, the one no other trace needs is taken.
 *
 * The choice is made jointly for the traces whose near-equal paths overlap (exhaustively, the
 * groups are small), so it does not depend on the order of the traces, and the workbench and the
 * replay choose alike when both hand in the other traces' guides.
 */
import { nearestOnPolyline, type PolylinePosition } from './polyline.ts';
import { sheetPoint, type SheetPoint } from './points.ts';
import type { StrokeLine } from './strokeJoin.ts';

/**
 * Paths whose worst guide distance is within this many sheet units of the best path's are
 * equally plausible: a guide clicked by hand at page zoom lands 1–2 points off the line it is
 * meant for (common practice: a click is good to about ±1 screen pixel, ±1.5 points at 100 %).
 */
export const DEFAULT_AMBIGUITY = 2;
/**
 * The guides the other traces hand in, one list per trace, as the replay and the workbench both
 * pass them to a capture: a trace given by explicit points claims no path (an empty list).
 */
export function siblingGuides(traces: readonly { points?: readonly unknown[] | undefined; guides?: readonly (readonly [number, number])[] | undefined }[]): SheetPoint[][] {
  return traces.map((t) => ((t.points?.length ?? 0) > 0 ? [] : (t.guides ?? []).map(([x, y]) => sheetPoint(x, y))));
}

/** Above this many joint choices the group is not searched and each trace keeps its nearest path. */
const MAX_COMBINATIONS = 50_000;

export interface LineFit {
  line: StrokeLine;
  positions: PolylinePosition[];
  /** Worst guide distance, sheet units. */
  worst: number;
  /** Worst distance, plus `reach` for a grid-like line (only taken when nothing else fits). */
  score: number;
  /** Sum of guide distances (breaks ties). */
  tie: number;
}

function nearBox(box: readonly [number, number, number, number], guides: readonly SheetPoint[], reach: number): boolean {
  return guides.every((g) => g[0] >= box[0] - reach && g[0] <= box[2] + reach && g[1] >= box[1] - reach && g[1] <= box[3] + reach);
}

const better = (a: LineFit, b: LineFit) => a.score < b.score - 1e-9 || (Math.abs(a.score - b.score) <= 1e-9 && a.tie < b.tie);

/** Every line within `reach` of all guides, best first; `closest` is the smallest worst distance seen (for the error sentence). */
export function linesNearGuides(lines: readonly StrokeLine[], guides: readonly SheetPoint[], reach: number): { fits: LineFit[]; closest: number } {
  const fits: LineFit[] = [];
  let closest = Infinity;
  for (const line of lines) {
    if (!nearBox(line.box, guides, reach)) continue;
    const positions = guides.map((g) => nearestOnPolyline(line.points, g));
    const worst = Math.max(...positions.map((p) => p.distance));
    closest = Math.min(closest, worst);
    if (worst > reach) continue;
    fits.push({ line, positions, worst, score: worst + (line.gridLike ? reach : 0), tie: positions.reduce((s, p) => s + p.distance, 0) });
  }
  fits.sort((a, b) => (better(a, b) ? -1 : better(b, a) ? 1 : 0));
  return { fits, closest };
}

/** The paths that fit about as well as the best one (the best first). */
function plausible(fits: readonly LineFit[], ambiguity: number): LineFit[] {
  const best = fits[0];
  return best ? fits.filter((f) => f.score <= best.score + ambiguity) : [];
}

export interface Choice {
  fit: LineFit;
  /** True when another path fitted the guides about as well and the other traces' guides settled it. */
  bySiblings: boolean;
  /** Paths that fitted about as well and that no other trace claims (0 when the choice is clear). */
  unresolved: number;
}

/**
 * Chooses among `fits` (from linesNearGuides, best first) using the other traces' guides.
 * Without siblings, or when only one path fits about as well as the best, the best is taken.
 */
export function chooseLine(fits: readonly LineFit[], lines: readonly StrokeLine[], siblings: readonly (readonly SheetPoint[])[], reach: number, ambiguity = DEFAULT_AMBIGUITY): Choice {
  const own = plausible(fits, ambiguity);
  const first = own[0] as LineFit;
  if (own.length < 2 || siblings.length === 0) return { fit: first, bySiblings: false, unresolved: own.length - 1 };
  // The other traces' plausible paths; the group is every trace linked to this one through shared paths.
  const options: LineFit[][] = [own];
  const others = siblings.filter((g) => g.length > 0).map((g) => plausible(linesNearGuides(lines, g, reach).fits, ambiguity));
  const inGroup = new Set<StrokeLine>(own.map((f) => f.line));
  let grew = true;
  const taken = new Set<number>();
  while (grew) {
    grew = false;
    others.forEach((o, k) => {
      if (taken.has(k) || !o.some((f) => inGroup.has(f.line))) return;
      taken.add(k);
      options.push(o);
      for (const f of o) inGroup.add(f.line);
      grew = true;
    });
  }
  if (options.length === 1) return { fit: first, bySiblings: false, unresolved: own.length - 1 };
  const combinations = options.reduce((n, o) => n * o.length, 1);
  if (combinations > MAX_COMBINATIONS) return { fit: first, bySiblings: false, unresolved: own.length - 1 };

  // Fewest traces sharing a path first, then the smallest sum of scores.
  let bestPicks: number[] = [];
  let bestShared = Infinity;
  let bestCost = Infinity;
  const pick = new Array<number>(options.length).fill(0);
  const use = new Map<StrokeLine, number>();
  const search = (k: number, shared: number, cost: number) => {
    if (shared > bestShared || (shared === bestShared && cost >= bestCost - 1e-9)) return;
    if (k === options.length) {
      bestShared = shared;
      bestCost = cost;
      bestPicks = [...pick];
      return;
    }
    (options[k] as LineFit[]).forEach((f, i) => {
      const n = use.get(f.line) ?? 0;
      use.set(f.line, n + 1);
      pick[k] = i;
      search(k + 1, shared + (n > 0 ? 1 : 0), cost + f.score);
      use.set(f.line, n);
    });
  };
  search(0, 0, 0);
  const fit = own[bestPicks[0] as number] as LineFit;
  const claimed = new Set<StrokeLine>(options.slice(1).map((o, k) => (o[bestPicks[k + 1] as number] as LineFit).line));
  const unresolved = own.filter((f) => f.line !== fit.line && !claimed.has(f.line)).length;
  return { fit, bySiblings: fit !== first, unresolved };
}
