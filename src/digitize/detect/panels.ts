/**
 * Panels found on a vector sheet: the plot frames (stroked rectangles), each with the tick
 * labels that calibrate it and the axis title that says what it plots. Tick labels and their
 * lines come from the proposals of autoCalibrate.ts; a proposal is kept only where it belongs
 * to a frame (its labels span the frame and stand beside it), so rows and columns of numbers
 * that are not an axis (curve labels, a table) make no panel. One frame may carry two panels:
 * a value axis on the left and another on the right (head and efficiency, say).
 */
import { proposePanels, type PanelProposal } from '../autoCalibrate.ts';
import { flattenPath } from '../flatten.ts';
import type { SheetText, VectorPath } from '../sheet.ts';
import type { Quantity } from '../../model/curveset.ts';
import { isFlowTitle, quantityOfTitle, unitOfTitle } from './words.ts';
import { robustProposal } from './robustAxis.ts';

export type Box = readonly [number, number, number, number];

export interface FoundPanel {
  id: string;
  quantity: Quantity | null;
  /** Plot frame [left, top, right, bottom], sheet units. */
  frame: Box;
  /** Where the value axis is written. */
  side: 'left' | 'right';
  proposal: PanelProposal;
  /** Axis title of the value axis, and of the flow axis, when found. */
  title: string | null;
  flowTitle: string | null;
  /** Unit tokens as the titles write them (null when the title names none). */
  yUnit: string | null;
  xUnit: string | null;
  confidence: number;
}

export interface PanelsFound {
  panels: FoundPanel[];
  /** Proposals of tick labels that belong to no frame (dropped). */
  dropped: number;
  questions: string[];
}

const MIN_FRAME = 40;

/** Stroked axis-aligned rectangles at least 40 units on each side: the plot frames. */
export function findFrames(paths: readonly VectorPath[]): Box[] {
  const frames: Box[] = [];
  for (const path of paths) {
    if (path.stroke === null) continue;
    for (const line of flattenPath(path.segments, 0.05)) {
      const pts = line.points;
      if (pts.length < 4 || pts.length > 6) continue;
      const first = pts[0] as readonly [number, number];
      const last = pts[pts.length - 1] as readonly [number, number];
      if (!line.closed && Math.hypot(first[0] - last[0], first[1] - last[1]) > 0.5) continue;
      const xs = pts.map((p) => p[0]);
      const ys = pts.map((p) => p[1]);
      const [l, r, t, b] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
      if (r - l < MIN_FRAME || b - t < MIN_FRAME) continue;
      const onEdge = pts.every((p) => (Math.abs(p[0] - l) < 0.5 || Math.abs(p[0] - r) < 0.5) && (Math.abs(p[1] - t) < 0.5 || Math.abs(p[1] - b) < 0.5));
      if (!onEdge) continue;
      if (frames.some((f) => Math.abs(f[0] - l) < 1 && Math.abs(f[1] - t) < 1 && Math.abs(f[2] - r) < 1 && Math.abs(f[3] - b) < 1)) continue;
      frames.push([l, t, r, b]);
    }
  }
  // A frame inside another (a legend box inside a plot) is not a plot frame of its own when it holds no axis.
  return frames.sort((a, b) => a[1] - b[1] || a[0] - b[0]);
}

/** Where the proposal's value labels stand: the x of its value anchors. */
function valueColumn(p: PanelProposal): number {
  const a = p.anchors.find((k) => k.y !== undefined && k.x === undefined);
  return a ? a.at[0] : p.frame[0];
}

function fits(p: PanelProposal, f: Box): boolean {
  const [l, t, r, b] = f;
  const w = r - l;
  const h = b - t;
  const [pl, pt, pr, pb] = p.frame;
  // The value labels lie within the frame's height and span most of it; the flow labels span most of its width.
  if (pt < t - 0.02 * h || pb > b + 0.02 * h) return false;
  if (pb - pt < 0.5 * h || pr - pl < 0.5 * w) return false;
  if (pl < l - 0.02 * w || pr > r + 0.02 * w) return false;
  return true;
}

/** Panels of a vector sheet, from its text layer and paths. */
export function findPanels(text: readonly SheetText[], paths: readonly VectorPath[]): PanelsFound {
  const proposals = proposePanels(text, paths);
  const frames = findFrames(paths);
  const questions: string[] = [];
  const chosen: { frame: Box; side: 'left' | 'right'; proposal: PanelProposal }[] = [];
  let dropped = 0;
  if (frames.length > 0) {
    for (const p of proposals) {
      const frame = frames.find((f) => fits(p, f));
      if (!frame) {
        dropped++;
        continue;
      }
      const col = valueColumn(p);
      const side = Math.abs(col - frame[0]) <= Math.abs(col - frame[2]) ? 'left' : 'right';
      const same = chosen.findIndex((c) => c.frame === frame && c.side === side);
      if (same < 0) chosen.push({ frame, side, proposal: p });
      else if (p.anchors.length > chosen[same]!.proposal.anchors.length) chosen[same] = { frame, side, proposal: p };
      else dropped++;
    }
  } else {
    // No frames drawn: a proposal whose labelled range lies inside a larger one's is not a panel.
    const sorted = [...proposals].sort((a, b) => b.anchors.length - a.anchors.length);
    for (const p of sorted) {
      const inside = chosen.some((c) => overlap(c.frame, p.frame) > 0.5);
      if (inside) dropped++;
      else chosen.push({ frame: p.frame, side: 'left', proposal: p });
    }
  }
  const doubtful = new Map<PanelProposal, string[]>();
  const rounded = new Set<PanelProposal>();
  for (const f of frames) {
    if (chosen.some((c) => c.frame === f)) continue;
    // A frame is a plot only when it is large; small boxes (legends, title blocks) are not asked about.
    if (f[2] - f[0] < 0.25 * Math.max(...frames.map((g) => g[2] - g[0]))) continue;
    const robust = robustProposal(text, paths, f);
    if (robust) {
      chosen.push({ frame: f, side: 'left', proposal: robust.proposal });
      if (robust.outliers.length > 0) doubtful.set(robust.proposal, robust.outliers);
      else rounded.add(robust.proposal);
    } else {
      questions.push(`The frame at [${f.map((v) => v.toFixed(0)).join(', ')}] has no tick labels that read as an evenly spaced linear or log axis; place its anchors by hand.`);
    }
  }
  const titles = text.filter((t) => /[a-z]{3}/i.test(t.text));
  const panels: FoundPanel[] = [];
  const used = new Map<string, number>();
  for (const c of chosen.sort((a, b) => a.frame[1] - b.frame[1] || (a.side === 'left' ? -1 : 1))) {
    const twoSided = chosen.filter((o) => o.frame === c.frame).length > 1;
    const title = valueTitle(titles, c.frame, c.side, valueColumn(c.proposal), twoSided);
    const quantity = title ? quantityOfTitle(title.text) : null;
    const flow = flowTitle(titles, c.frame);
    const base = quantity ?? 'panel';
    const n = (used.get(base) ?? 0) + 1;
    used.set(base, n);
    const id = n === 1 ? base : `${base}${n}`;
    const labels = Math.min(c.proposal.x.labels.length, c.proposal.y.labels.length);
    const residual = c.proposal.calibration.maxPercentOfSpan;
    let confidence = Math.min(1, 0.5 + 0.1 * labels) * (residual <= 0.05 ? 1 : residual <= 0.3 ? 0.8 : 0.5);
    // Rounded tick labels agree with the axis, but the anchors are fewer: a little less sure.
    if (rounded.has(c.proposal)) confidence *= 0.85;
    const odd = doubtful.get(c.proposal);
    if (odd) {
      confidence *= 0.6;
      questions.push(`Panel "${id}": the tick label${odd.length === 1 ? '' : 's'} ${odd.map((k) => `"${k}"`).join(', ')} do${odd.length === 1 ? 'es' : ''} not fit the evenly spaced axis the other labels make; the panel is calibrated from the others. Is the axis read right?`);
    }
    if (!quantity) {
      confidence *= 0.5;
      questions.push(`What does the panel at [${c.frame.map((v) => v.toFixed(0)).join(', ')}] plot (its ${c.side} axis title was not read)? Set its quantity (head, efficiency, power or NPSHr) on the panel.`);
    }
    panels.push({
      id,
      quantity,
      frame: c.frame,
      side: c.side,
      proposal: c.proposal,
      title: title?.text ?? null,
      flowTitle: flow?.text ?? null,
      yUnit: title ? unitOfTitle(title.text) : null,
      xUnit: flow ? unitOfTitle(flow.text) : null,
      confidence: Math.round(confidence * 100) / 100,
    });
  }
  return { panels, dropped, questions };
}

function overlap(a: Box, b: Box): number {
  const w = Math.max(0, Math.min(a[2], b[2]) - Math.max(a[0], b[0]));
  const h = Math.max(0, Math.min(a[3], b[3]) - Math.max(a[1], b[1]));
  const area = Math.min((a[2] - a[0]) * (a[3] - a[1]), (b[2] - b[0]) * (b[3] - b[1]));
  return area > 0 ? (w * h) / area : 0;
}

const upright = (t: SheetText) => Math.abs(Math.abs(t.angle) - Math.PI / 2) < 0.2;
const level = (t: SheetText) => Math.abs(Math.sin(t.angle)) < 0.2;

/**
 * The value axis title: upright text beyond the value labels on the panel's side, within the
 * frame's height; or level text just above the frame (left-aligned titles, for the left axis).
 */
function valueTitle(items: readonly SheetText[], frame: Box, side: 'left' | 'right', column: number, twoSided: boolean): SheetText | null {
  const [l, t, r, b] = frame;
  let best: { item: SheetText; d: number } | null = null;
  for (const item of items) {
    if (!quantityOfTitle(item.text)) continue;
    const [x, y] = item.at;
    let d: number | null = null;
    if (upright(item)) {
      // The baseline of an upright title runs along x = at[0] (± its size).
      const mid = item.angle < 0 ? y - item.width / 2 : y + item.width / 2;
      if (mid < t - item.size || mid > b + item.size) continue;
      if (side === 'left' && x < Math.min(column, l) && x > l - 12 * item.size) d = l - x;
      if (side === 'right' && x > Math.max(column, r) && x < r + 12 * item.size) d = x - r;
    } else if (level(item) && (side === 'left' || !twoSided)) {
      if (y <= t + item.size && y >= t - 3 * item.size - 4 && x >= l - 0.1 * (r - l) && x <= r) d = t - y;
    }
    if (d !== null && (!best || d < best.d)) best = { item, d };
  }
  return best?.item ?? null;
}

/** The flow axis title: the nearest level flow title below the frame, over its width. */
function flowTitle(items: readonly SheetText[], frame: Box): SheetText | null {
  const [l, , r, b] = frame;
  let best: { item: SheetText; d: number } | null = null;
  for (const item of items) {
    if (!level(item) || !isFlowTitle(item.text)) continue;
    const cx = item.at[0] + item.width / 2;
    if (cx < l || cx > r || item.at[1] < b) continue;
    const d = item.at[1] - b;
    if (!best || d < best.d) best = { item, d };
  }
  return best?.item ?? null;
}
