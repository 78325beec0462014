/**
 * A frame whose tick labels do not all read as one evenly spaced axis because of one odd
 * label (a misprint, a stray number) is calibrated from the labels that agree, and the odd one
 * is named in a question. Linear axes only; with more odd labels on an axis than `consensus`
 * allows, or an odd label at an end of it, the frame is not calibrated at all (a question asks
 * for its anchors).
 * Labels printed with too few digits ("3" for 2.5) are no odd labels: when every label's value
 * rounds from one straight line that three or more of them meet exactly, those calibrate.
 */
import { numericLabels, straightSegments, type NumericLabel, type PanelProposal, type StraightSegment, type TickLabel } from '../autoCalibrate.ts';
import { calibrate, type AnchorInput } from '../calibration.ts';
import type { SheetText, VectorPath } from '../sheet.ts';
import type { Box } from './panels.ts';

export interface RobustProposal {
  proposal: PanelProposal;
  /** Labels left out, as printed, per axis. */
  outliers: string[];
  /** Labels printed rounded (consistent with the axis, not used as anchors). */
  rounded: string[];
}

/** The line a label names: the nearest parallel grid line or tick within half a text height that reaches the frame. */
function snapTo(label: NumericLabel, lines: readonly StraightSegment[], at: number, lo: number, hi: number): number | null {
  let best: number | null = null;
  let off = Infinity;
  for (const s of lines) {
    const d = Math.abs(s.at - at);
    if (d > 0.5 * label.size || d >= off) continue;
    if (s.to < lo - 1 || s.from > hi + 1) continue;
    best = s.at;
    off = d;
  }
  return best;
}

/** Calls `visit` with the value-at-position line through each pair of labels (and its slope). */
function forEachLine(labels: readonly TickLabel[], visit: (at: (l: TickLabel) => number, slope: number) => void): void {
  for (let i = 0; i < labels.length; i++) {
    for (let j = i + 1; j < labels.length; j++) {
      const a = labels[i] as TickLabel;
      const b = labels[j] as TickLabel;
      if (a.at === b.at || a.value === b.value) continue;
      const k = (b.value - a.value) / (b.at - a.at);
      visit((l) => a.value + k * (l.at - a.at), k);
    }
  }
}

/**
 * The largest set of labels on one straight value-position line, within 0.5 % of their value
 * span, and the labels off it. At most one odd label, and never one at either end of the axis:
 * a consensus of a few among many can line up by chance, and the ends fix the scale. Where five
 * labels or more agree, odd labels are looked at more closely (a scan in a serif face reads "200"
 * as "2" and "00", "500" also as a stray "4"): pieces lying within `FRAGMENT_SPACING` of the
 * labels' spacing of one another count as one odd label, and pieces that close to a label on the
 * line are `fragments` of it (a second reading of the same print, asked about by nobody); up to
 * a third as many odd labels as labels on the line are then allowed.
 */
function consensus(labels: readonly TickLabel[]): { inliers: TickLabel[]; outliers: TickLabel[]; fragments: TickLabel[] } | null {
  if (labels.length < 3) return null;
  const span = Math.max(...labels.map((l) => l.value)) - Math.min(...labels.map((l) => l.value));
  if (!(span > 0)) return null;
  let best: TickLabel[] = [];
  let line: (l: TickLabel) => number = () => NaN;
  forEachLine(labels, (at) => {
    const inliers = labels.filter((l) => Math.abs(at(l) - l.value) <= 0.005 * span);
    if (inliers.length > best.length) [best, line] = [inliers, at];
  });
  if (best.length < 3) return null;
  const ends = [...labels].sort((a, b) => a.at - b.at);
  if (!best.includes(ends[0] as TickLabel) || !best.includes(ends[ends.length - 1] as TickLabel)) return null;
  const outliers = labels.filter((l) => !best.includes(l));
  if (outliers.length === 0) return { inliers: best, outliers, fragments: [] };
  const onLine = [...best].sort((a, b) => a.at - b.at);
  const spacing = Math.min(...onLine.slice(1).map((l, i) => Math.abs(l.at - (onLine[i] as TickLabel).at)));
  const near = FRAGMENT_SPACING * spacing;
  const fragments = outliers.filter((o) => best.some((l) => Math.abs(l.at - o.at) <= near));
  const rest = outliers.filter((o) => !fragments.includes(o)).sort((a, b) => a.at - b.at);
  const clusters: TickLabel[][] = [];
  rest.forEach((o, i) => {
    if (i === 0 || Math.abs(o.at - (rest[i - 1] as TickLabel).at) > near) clusters.push([o]);
    else (clusters[clusters.length - 1] as TickLabel[]).push(o);
  });
  // Pieces that read as the number the line gives there once joined ("2" "00" for 200) are one
  // label read apart: no odd label (though not exact enough in place to calibrate).
  const odd = clusters.filter((c) => {
    if (c.length < 2) return true;
    const joined = Number(c.map((k) => k.text.trim()).join(''));
    const middle = c.reduce((sum, k) => sum + k.at, 0) / c.length;
    if (!Number.isFinite(joined) || Math.abs(line({ ...(c[0] as TickLabel), at: middle }) - joined) > 0.01 * span) return true;
    fragments.push(...c);
    return false;
  });
  if (best.length < 5) return outliers.length <= 1 ? { inliers: best, outliers, fragments: [] } : null;
  return odd.length <= Math.floor(best.length / 3) ? { inliers: best, outliers, fragments } : null;
}

/** Share of the spacing of the labels on the axis within which pieces read apart are one print. */
const FRAGMENT_SPACING = 0.3;

/** Half a unit of the last digit a label prints ("3" → 0.5, "2.5" → 0.05). */
function printedHalfUnit(text: string): number {
  const m = /[.,](\d+)%?$/.exec(text);
  return 0.5 * 10 ** -(m ? (m[1] as string).length : 0);
}

/**
 * Labels printed with too few digits ("3" and "8" for 2.5 and 7.5): a straight line through
 * three or more labels that it meets exactly, which every other label's value rounds from.
 * The exact ones calibrate; the rounded ones only confirm.
 */
function roundedConsensus(labels: readonly TickLabel[]): { inliers: TickLabel[]; rounded: TickLabel[] } | null {
  if (labels.length < 4) return null;
  const span = Math.max(...labels.map((l) => l.value)) - Math.min(...labels.map((l) => l.value));
  let best: TickLabel[] = [];
  // Every line that explains the labels this way; two different ones (0, 5, 10 exact with 3, 8
  // rounded, or 3, 8, 13 exact with 0, 5, 10 rounded) leave the axis unread.
  const lines: { k: number; at0: number; exact: TickLabel[] }[] = [];
  forEachLine(labels, (at, k) => {
    if (!labels.every((l) => Math.abs(at(l) - l.value) <= printedHalfUnit(l.text) + 1e-6 * span)) return;
    const exact = labels.filter((l) => Math.abs(at(l) - l.value) <= 1e-3 * span);
    if (exact.length < 3) return;
    lines.push({ k, at0: at(labels[0] as TickLabel), exact });
    if (exact.length > best.length) best = exact;
  });
  const distinct = lines.filter((l, n) => lines.findIndex((m) => Math.abs(m.k - l.k) <= 1e-9 * Math.abs(l.k) && Math.abs(m.at0 - l.at0) <= 1e-6 * span) === n);
  if (distinct.length !== 1) return null;
  if (best.length < 3 || best.length === labels.length) return null;
  return { inliers: best, rounded: labels.filter((l) => !best.includes(l)) };
}

/**
 * The labels of one axis read as one evenly spaced linear axis: those that calibrate (inliers),
 * the odd labels (one at most, or a third as many as agree where five or more do; never at an
 * end; `fragments` among them are pieces of a label read apart), and labels printed rounded;
 * null when they do not.
 */
export function readAxis(list: readonly TickLabel[]): { inliers: TickLabel[]; outliers: TickLabel[]; rounded: TickLabel[]; fragments?: TickLabel[] } | null {
  const c = consensus(list);
  // An axis read whole only with an odd label out, where two or more labels print a decimal point
  // and restoring the points lost on the others puts every label on it ("0.0 25 5.0 75": 0, 2.5,
  // 5, 7.5, not 0, 25, 75 with "5.0" odd): two printed points outweigh one odd label.
  if (c && c.outliers.length > 0 && list.filter((l) => /^-?\d+[.,]\d+$/.test(l.text.trim())).length >= 2) {
    const restored = pointsRestored(list);
    const p = restored ? consensus(restored) : null;
    if (p && p.outliers.length === 0) return { ...p, rounded: [] };
  }
  if (c) return { ...c, rounded: [] };
  const r = roundedConsensus(list);
  if (r) return { inliers: r.inliers, outliers: [], rounded: r.rounded };
  const restored = pointsRestored(list);
  const p = restored ? consensus(restored) : null;
  // Only when every label then lies on one evenly spaced axis: a restored point is a reading, not a print.
  return p && p.outliers.length === 0 ? { ...p, rounded: [] } : null;
}

/**
 * Labels whose decimal point the reader lost on a scan ("75" for 7.5 beside "10.0"): when some
 * labels of the axis print d decimals, a label read as d + 1 or more digits without a point is
 * taken as that number over 10^d. Null when no label prints a point, or none lost one. The
 * caller accepts the result only when every label then lies on one evenly spaced axis.
 */
export function pointsRestored(labels: readonly TickLabel[]): TickLabel[] | null {
  const decimals = new Set(labels.map((l) => /^-?\d+[.,](\d+)$/.exec(l.text.trim())?.[1]?.length).filter((d): d is number => d !== undefined));
  if (decimals.size !== 1) return null;
  const d = [...decimals][0] as number;
  let changed = false;
  const out = labels.map((l) => {
    if (!new RegExp(`^-?\\d{${d + 1},}$`).test(l.text.trim())) return l;
    changed = true;
    return { ...l, value: l.value / 10 ** d };
  });
  return changed ? out : null;
}

export function robustProposal(text: readonly SheetText[], paths: readonly VectorPath[], frame: Box): RobustProposal | null {
  const [l, t, r, b] = frame;
  const labels = numericLabels(text);
  const { vertical, horizontal } = straightSegments(paths);
  const xs: TickLabel[] = [];
  const ys: TickLabel[] = [];
  for (const label of labels) {
    if (label.top >= b && label.top <= b + 2.5 * label.size && label.cx >= l - label.size && label.cx <= r + label.size) {
      const at = snapTo(label, vertical, label.cx, t, b);
      if (at !== null) xs.push({ value: label.value, at, text: label.text });
    } else if (label.right <= l + 0.2 * label.size && label.right >= l - 5 * label.size && label.cy >= t - label.size && label.cy <= b + label.size) {
      const at = snapTo(label, horizontal, label.cy, l, r);
      if (at !== null) ys.push({ value: label.value, at, text: label.text });
    }
  }
  const x = readAxis(xs);
  const y = readAxis(ys);
  if (!x || !y) return null;
  const anchors: AnchorInput[] = [...x.inliers.map((k) => ({ at: [k.at, b] as [number, number], x: k.value })), ...y.inliers.map((k) => ({ at: [l, k.at] as [number, number], y: k.value }))];
  try {
    const calibration = calibrate(anchors, { xScale: 'linear', yScale: 'linear' });
    const proposal: PanelProposal = {
      frame: [Math.min(...x.inliers.map((k) => k.at)), Math.min(...y.inliers.map((k) => k.at)), Math.max(...x.inliers.map((k) => k.at)), Math.max(...y.inliers.map((k) => k.at))],
      x: { scale: 'linear', labels: x.inliers },
      y: { scale: 'linear', labels: y.inliers },
      anchors,
      xScale: 'linear',
      yScale: 'linear',
      calibration,
    };
    return { proposal, outliers: [...x.outliers, ...y.outliers].map((k) => k.text), rounded: [...x.rounded, ...y.rounded].map((k) => k.text) };
  } catch {
    return null;
  }
}
