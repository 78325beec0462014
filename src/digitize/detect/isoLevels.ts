/**
 * The levels of iso-lines a sheet does not label, from the ones it does (inferIsoLevels) or
 * from the full list of levels the engineer gives (levelsByOrder). Both rest on the order of
 * the lines along the flow axis; see each function for what it takes as certain.
 */
import type { SheetPoint } from '../points.ts';
/** What the order needs of a line: its points, sheet units (a found vector path, or a scan's tracer's line). */
export interface IsoShape {
  points: readonly SheetPoint[];
}

/**
 * Levels of unlabelled iso-lines from the labelled ones of the same panel. Along the flow axis
 * efficiency rises to the best point and falls again, so iso-lines ordered by flow carry rising
 * levels on the left branch and falling ones on the right, and sheets draw them at one even
 * step. Only what these facts make certain is inferred:
 * - a labelled line is surely on the left branch when a line right of it has a higher level or
 *   the same level (the other branch of that level), and on the right branch the other way round;
 * - the step comes from neighbouring lines both surely on one branch, and all such pairs agree;
 * - an unlabelled line takes a level only between two sure lines of one branch (and the count
 *   of lines between them fits the step), or beyond the outermost sure line of a branch, away
 *   from the peak. Lines near the peak, where the branch is unclear, stay questions.
 * With `adjacent` (a scan, where every level inferred is unsure anyway), a labelled line next to a
 * surely left one (no line between) with a higher level is on the left branch too, and one next
 * to a surely right one with a higher level on the right branch: were it on the other branch, its
 * twin of the same level would lie between them. This holds only when no line between was
 * missed, which is why it is not taken on a vector sheet, where order gives a level held sure.
 */
export function inferIsoLevels<C extends IsoShape>(lines: readonly C[], known: ReadonlyMap<C, number>, options: { adjacent?: boolean } = {}): Map<C, number> {
  const out = new Map<C, number>();
  const order = byFlow(lines);
  const marks = order.map((c, i) => ({ i, v: known.get(c) })).filter((m): m is { i: number; v: number } => m.v !== undefined);
  const isLeft = (m: { i: number; v: number }) => marks.some((o) => o.i > m.i && o.v >= m.v);
  const isRight = (m: { i: number; v: number }) => marks.some((o) => o.i < m.i && o.v >= m.v);
  const sureLeft = new Set(marks.filter((m) => isLeft(m) && !isRight(m)));
  const sureRight = new Set(marks.filter((m) => isRight(m) && !isLeft(m)));
  for (let grew = options.adjacent === true; grew; ) {
    grew = false;
    for (const m of marks) {
      if (sureLeft.has(m) || sureRight.has(m)) continue;
      const before = marks.find((o) => o.i === m.i - 1);
      const after = marks.find((o) => o.i === m.i + 1);
      const toLeft = before !== undefined && sureLeft.has(before) && before.v < m.v;
      const toRight = after !== undefined && sureRight.has(after) && after.v < m.v;
      if (toLeft === toRight) continue;
      (toLeft ? sureLeft : sureRight).add(m);
      grew = true;
    }
  }
  const left = marks.filter((m) => sureLeft.has(m));
  const right = marks.filter((m) => sureRight.has(m));
  // Levels must rise along the left branch and fall along the right one.
  if (left.some((m, k) => k > 0 && m.v <= left[k - 1]!.v) || right.some((m, k) => k > 0 && m.v >= right[k - 1]!.v)) return out;
  const steps: number[] = [];
  for (const branch of [left, right]) for (let k = 1; k < branch.length; k++) if (branch[k]!.i === branch[k - 1]!.i + 1) steps.push(Math.abs(branch[k]!.v - branch[k - 1]!.v));
  const step = steps[0];
  if (step === undefined || !(step > 0) || steps.some((s) => Math.abs(s - step) > 1e-6 * step)) return out;
  const fits = (a: { i: number; v: number }, b: { i: number; v: number }) => Math.abs(Math.abs(b.v - a.v) - step * (b.i - a.i)) <= 1e-6 * step;
  order.forEach((c, i) => {
    if (known.has(c)) return;
    let v: number | null = null;
    const l0 = left[0];
    const rN = right[right.length - 1];
    const la = [...left].reverse().find((m) => m.i < i);
    const lb = left.find((m) => m.i > i);
    const ra = [...right].reverse().find((m) => m.i < i);
    const rb = right.find((m) => m.i > i);
    if (la && lb && fits(la, lb) && !marks.some((m) => m.i > la.i && m.i < lb.i)) v = la.v + step * (i - la.i);
    else if (ra && rb && fits(ra, rb) && !marks.some((m) => m.i > ra.i && m.i < rb.i)) v = ra.v - step * (i - ra.i);
    else if (l0 && i < l0.i && !marks.some((m) => m.i < l0.i)) v = l0.v - step * (l0.i - i);
    else if (rN && i > rN.i && !marks.some((m) => m.i > rN.i)) v = rN.v - step * (i - rN.i);
    if (v !== null && v > 0 && v < 100) out.set(c, Math.round(v * 1e6) / 1e6);
  });
  return out;
}

/**
 * Levels of a panel's iso-lines from the full list of levels drawn (the engineer's answer):
 * ordered by flow, the first lines are the rising branch, one per level, lowest first; the
 * rest are the falling branch from the highest level down (a falling branch of a low level may
 * run past the end of the curves and be missing, never one of a high level). Null when the
 * count of lines does not fit the list, or a level read from a label disagrees.
 */
export function levelsByOrder<C extends IsoShape>(lines: readonly C[], levels: readonly number[], known: ReadonlyMap<C, number>): Map<C, number> | null {
  const list = [...new Set(levels)].sort((a, b) => a - b);
  const order = byFlow(lines);
  if (order.length < list.length || order.length > 2 * list.length) return null;
  const out = new Map<C, number>();
  order.forEach((c, i) => out.set(c, i < list.length ? (list[i] as number) : (list[list.length - 1 - (i - list.length)] as number)));
  for (const [c, v] of known) if (out.has(c) && out.get(c) !== v) return null;
  return out;
}

/**
 * Levels from the full list given (levelsByOrder), and whether the lines are all there (`full`:
 * both branches of every level, twice as many lines as levels). On a scan the finder may miss a
 * line, which shifts the lines after it in the order; labels read that still agree do not prove
 * none was missed (past the best point the levels fall again, and a shifted line can land on its
 * own level's twin), so only a full count vouches for the order.
 */
export function levelsFromList<C extends IsoShape>(lines: readonly C[], levels: readonly number[], known: ReadonlyMap<C, number>): { levels: Map<C, number>; full: boolean } | null {
  const byList = levelsByOrder(lines, levels, known);
  return byList ? { levels: byList, full: lines.length === 2 * new Set(levels).size } : null;
}

/**
 * Iso-lines in the order they cross the smallest head curve, left to right: each line's end
 * lower on the sheet (less head) is where it meets the smallest impeller's curve, which every
 * iso-line reaches, while a falling branch may stop short of the largest impeller's curve at
 * the end of the curves. Two lines that reach common heights are put in the order they stand
 * side by side there (iso-lines of one panel never cross), so a line that stops short of the
 * smallest curve, or a scan's line that wanders off at its end, does not move in the order.
 */
function byFlow<C extends IsoShape>(lines: readonly C[]): C[] {
  const low = (c: C) => {
    const a = c.points[0] as SheetPoint;
    const b = c.points[c.points.length - 1] as SheetPoint;
    return a[1] >= b[1] ? a[0] : b[0];
  };
  const out = [...lines].sort((a, b) => low(a) - low(b));
  // Neighbours standing the other way round at their common heights change places (a few passes).
  for (let pass = 0; pass < out.length; pass++) {
    let moved = false;
    for (let k = 1; k < out.length; k++) {
      if (sideBySide((out[k - 1] as C).points, (out[k] as C).points) < 0) {
        [out[k - 1], out[k]] = [out[k] as C, out[k - 1] as C];
        moved = true;
      }
    }
    if (!moved) break;
  }
  return out;
}

/**
 * Which of two lines stands left at the heights both reach (looked at in 12 steps over their
 * common heights): 1 when `a` is left of `b` at most of them, −1 when right, 0 when they reach no
 * common height or stand even.
 */
export function sideBySide(a: readonly SheetPoint[], b: readonly SheetPoint[]): number {
  const span = (p: readonly SheetPoint[]) => [Math.min(...p.map((q) => q[1])), Math.max(...p.map((q) => q[1]))] as const;
  const [a0, a1] = span(a);
  const [b0, b1] = span(b);
  const lo = Math.max(a0, b0);
  const hi = Math.min(a1, b1);
  if (!(hi > lo)) return 0;
  let left = 0;
  let right = 0;
  for (let i = 0; i <= 12; i++) {
    const y = lo + ((hi - lo) * i) / 12;
    const xa = xAtHeight(a, y);
    const xb = xAtHeight(b, y);
    if (xa === null || xb === null) continue;
    if (xa < xb) left++;
    else if (xa > xb) right++;
  }
  return left > right ? 1 : right > left ? -1 : 0;
}

/** Where a line first reaches height y (sheet units), by straight pieces between its points; null when it never does. */
function xAtHeight(points: readonly SheetPoint[], y: number): number | null {
  for (let i = 1; i < points.length; i++) {
    const [x0, y0] = points[i - 1] as SheetPoint;
    const [x1, y1] = points[i] as SheetPoint;
    if ((y0 <= y && y <= y1) || (y1 <= y && y <= y0)) return y1 === y0 ? x0 : x0 + ((x1 - x0) * (y - y0)) / (y1 - y0);
  }
  return null;
}
