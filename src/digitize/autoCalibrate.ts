/**
 * Proposing panel calibrations on a vector page: numeric tick labels of the text layer that
 * line up with tick marks or grid lines become axis anchors. A row of labels under vertical
 * lines is a flow axis; a column of labels beside horizontal lines is a value axis. Each label
 * is moved onto its line, so the anchor is as exact as the drawing. Values that space evenly
 * make a linear axis, values whose log10 spaces evenly a log axis.
 *
 * The result is a proposal for the user to confirm (and name), never applied silently.
 */
import { calibrate, type AnchorInput, type Calibration } from './calibration.ts';
import { flattenPath } from './flatten.ts';
import type { SheetText, VectorPath } from './sheet.ts';
import type { AxisScaleType } from '../model/takeoff.ts';

export interface TickLabel {
  value: number;
  /** Where the label's line (tick or grid line) sits: x for a flow label, y for a value label. */
  at: number;
  text: string;
}

export interface AxisProposal {
  scale: AxisScaleType;
  labels: TickLabel[];
}

export interface PanelProposal {
  /** [left, top, right, bottom] of the labelled range, sheet units. */
  frame: [number, number, number, number];
  x: AxisProposal;
  y: AxisProposal;
  /** Axis anchors: x-only ones along the flow axis, y-only ones along the value axis. */
  anchors: AnchorInput[];
  xScale: AxisScaleType;
  yScale: AxisScaleType;
  calibration: Calibration;
  /** The placement error the anchors share, sheet units (see `CalibrateOptions.anchorBias`); absent where the anchors are exact (a vector page's text and paths). */
  anchorBias?: number;
}

export interface NumericLabel {
  value: number;
  text: string;
  cx: number;
  cy: number;
  left: number;
  right: number;
  top: number;
  bottom: number;
  size: number;
  baseline: number;
}

export interface StraightSegment {
  /** Position across the line (x of a vertical line, y of a horizontal one). */
  at: number;
  from: number;
  to: number;
}

const NUMBER = /^[-−]?(\d{1,3}(,\d{3})+|\d+)(\.\d+)?%?$/;

/**
 * Numeric labels of the text layer, level text only; a run like "0 200 400" is split into its
 * numbers, and a "10" with a small raised number after it (a log axis's 10²) reads as the power.
 */
export function numericLabels(text: readonly SheetText[]): NumericLabel[] {
  const level = mergeFragments(text.filter((t) => Math.abs(Math.sin(t.angle)) <= 0.02 && t.size > 0));
  const used = new Set<SheetText>();
  const out: NumericLabel[] = [];
  for (const base of level) {
    if (base.text.trim() !== '10') continue;
    const right = base.at[0] + base.width;
    const exponent = level.find(
      (t) =>
        t !== base &&
        /^[-−]?\d+$/.test(t.text.trim()) &&
        t.size < 0.9 * base.size &&
        Math.abs(t.at[0] - right) <= 0.3 * base.size &&
        base.at[1] - t.at[1] >= 0.2 * base.size &&
        base.at[1] - t.at[1] <= 0.9 * base.size,
    );
    if (!exponent) continue;
    used.add(base).add(exponent);
    const power = Number(exponent.text.trim().replace('−', '-'));
    const left = base.at[0];
    const r = exponent.at[0] + exponent.width;
    // The digits of the base stand for the label's place: its middle is the middle of the whole.
    out.push({ value: 10 ** power, text: `10^${power}`, cx: (left + r) / 2, cy: base.at[1] - 0.35 * base.size, left, right: r, top: base.at[1] - 0.7 * base.size, bottom: base.at[1], size: base.size, baseline: base.at[1] });
  }
  for (const t of level) {
    if (used.has(t)) continue;
    const raw = t.text.trim();
    const tokens = raw.split(/\s+/);
    if (!tokens.every((k) => NUMBER.test(k))) continue;
    const perChar = t.width / Math.max(1, raw.length);
    let offset = 0;
    for (const token of tokens) {
      const start = raw.indexOf(token, offset);
      offset = start + token.length;
      const value = Number(token.replace(/[,%]/g, '').replace('−', '-'));
      if (!Number.isFinite(value)) continue;
      const left = t.at[0] + start * perChar;
      const right = left + token.length * perChar;
      const baseline = t.at[1];
      // Digits stand about 0.7 em tall on the baseline; their middle is 0.35 em above it.
      out.push({ value, text: token, cx: (left + right) / 2, cy: baseline - 0.35 * t.size, left, right, top: baseline - 0.7 * t.size, bottom: baseline, size: t.size, baseline });
    }
  }
  return out;
}

/**
 * Some programs place a number glyph by glyph; fragments of digits on one baseline, of one size,
 * that touch (gap under 0.2 em) are one label again.
 */
function mergeFragments(items: readonly SheetText[]): SheetText[] {
  const numeric = /^[-−\d.,%]+$/;
  const sorted = [...items].sort((a, b) => a.at[1] - b.at[1] || a.at[0] - b.at[0]);
  const out: SheetText[] = [];
  for (const t of sorted) {
    const last = out.at(-1);
    const text = t.text.trim();
    if (
      last &&
      numeric.test(last.text) &&
      numeric.test(text) &&
      Math.abs(last.at[1] - t.at[1]) <= 0.1 * t.size &&
      Math.abs(last.size - t.size) <= 0.05 * t.size &&
      t.at[0] - (last.at[0] + last.width) >= -0.1 * t.size &&
      t.at[0] - (last.at[0] + last.width) <= 0.2 * t.size
    ) {
      out[out.length - 1] = { ...last, text: last.text + text, width: t.at[0] + t.width - last.at[0] };
    } else {
      out.push({ ...t, text });
    }
  }
  return out;
}

/** Level and upright straight pieces of the page's lines (thin filled bars count as lines). */
export function straightSegments(paths: readonly VectorPath[]): { vertical: StraightSegment[]; horizontal: StraightSegment[] } {
  const vertical: StraightSegment[] = [];
  const horizontal: StraightSegment[] = [];
  for (const path of paths) {
    const lines = flattenPath(path.segments, 0.05);
    if (path.stroke === null) {
      // A filled bar one or two units thick is how some programs draw grid lines.
      for (const l of lines) {
        const xs = l.points.map((p) => p[0]);
        const ys = l.points.map((p) => p[1]);
        const w = Math.max(...xs) - Math.min(...xs);
        const h = Math.max(...ys) - Math.min(...ys);
        if (!l.closed || l.points.length > 6) continue;
        if (w <= 2 && h > 4 * w) vertical.push({ at: (Math.max(...xs) + Math.min(...xs)) / 2, from: Math.min(...ys), to: Math.max(...ys) });
        if (h <= 2 && w > 4 * h) horizontal.push({ at: (Math.max(...ys) + Math.min(...ys)) / 2, from: Math.min(...xs), to: Math.max(...xs) });
      }
      continue;
    }
    for (const l of lines) {
      for (let i = 1; i < l.points.length; i++) {
        const a = l.points[i - 1] as readonly [number, number];
        const b = l.points[i] as readonly [number, number];
        const dx = Math.abs(b[0] - a[0]);
        const dy = Math.abs(b[1] - a[1]);
        if (dx <= 0.01 * dy && dy > 0) vertical.push({ at: (a[0] + b[0]) / 2, from: Math.min(a[1], b[1]), to: Math.max(a[1], b[1]) });
        else if (dy <= 0.01 * dx && dx > 0) horizontal.push({ at: (a[1] + b[1]) / 2, from: Math.min(a[0], b[0]), to: Math.max(a[0], b[0]) });
      }
    }
  }
  return { vertical, horizontal };
}

/** Gap between the interval [a0, a1] and [b0, b1] (0 when they overlap). */
function gap(a0: number, a1: number, b0: number, b1: number): number {
  return Math.max(0, b0 - a1, a0 - b1);
}

function snap(label: NumericLabel, segments: readonly StraightSegment[], along: 'x' | 'y'): number | null {
  let best: number | null = null;
  let bestOff = Infinity;
  const tol = 0.5 * label.size;
  for (const s of segments) {
    const off = Math.abs(s.at - (along === 'x' ? label.cx : label.cy));
    if (off > tol || off >= bestOff) continue;
    const reach = along === 'x' ? gap(label.top, label.bottom, s.from, s.to) : gap(label.left, label.right, s.from, s.to);
    if (reach > 3 * label.size) continue;
    best = s.at;
    bestOff = off;
  }
  return best;
}

/** Splits labels (sorted along the axis) into runs of steadily rising or falling values with even-ish gaps. */
function runs(labels: readonly NumericLabel[], pos: (l: NumericLabel) => number): NumericLabel[][] {
  const out: NumericLabel[][] = [];
  let run: NumericLabel[] = [];
  for (const l of labels) {
    const prev = run.at(-1);
    const prev2 = run.at(-2);
    if (prev && prev2) {
      const rising = prev.value > prev2.value;
      const keeps = rising ? l.value > prev.value : l.value < prev.value;
      const step = Math.abs(pos(prev) - pos(prev2));
      if (!keeps || Math.abs(pos(l) - pos(prev)) > 2.5 * step) {
        out.push(run);
        run = [];
      }
    } else if (prev && l.value === prev.value) {
      out.push(run);
      run = [];
    }
    run.push(l);
  }
  if (run.length) out.push(run);
  return out;
}

/** Linear or log axis from labels already on their lines; null when neither fits within 0.5 % of the span. */
function axisFrom(labels: readonly TickLabel[]): AxisProposal | null {
  if (labels.length < 3) return null;
  const check = (f: (v: number) => number): boolean => {
    const t = labels.map((l) => l.at);
    const v = labels.map((l) => f(l.value));
    const n = t.length;
    const mt = t.reduce((s, x) => s + x, 0) / n;
    const mv = v.reduce((s, x) => s + x, 0) / n;
    let stt = 0;
    let stv = 0;
    t.forEach((x, i) => {
      stt += (x - mt) ** 2;
      stv += (x - mt) * ((v[i] as number) - mv);
    });
    if (stt === 0) return false;
    const b = stv / stt;
    const span = Math.max(...v) - Math.min(...v);
    return span > 0 && v.every((y, i) => Math.abs(y - (mv + b * ((t[i] as number) - mt))) <= 0.005 * span);
  };
  if (check((v) => v)) return { scale: 'linear', labels: [...labels] };
  if (labels.every((l) => l.value > 0) && check(Math.log10)) return { scale: 'log', labels: [...labels] };
  return null;
}

interface Found {
  axis: AxisProposal;
  /** Where the labels sit across the axis: the row's y for a flow axis, the column's x for a value axis. */
  across: number;
  from: number;
  to: number;
}

/** Proposes one calibration per panel found; an empty list when the page has no usable tick labels. */
export function proposePanels(text: readonly SheetText[], paths: readonly VectorPath[]): PanelProposal[] {
  const labels = numericLabels(text);
  const { vertical, horizontal } = straightSegments(paths);

  // Rows of labels (same baseline) under or over vertical lines: flow axes.
  const xAxes: Found[] = [];
  const byBaseline = [...labels].sort((a, b) => a.baseline - b.baseline || a.cx - b.cx);
  for (const row of groupBy(byBaseline, (a, b) => Math.abs(a.baseline - b.baseline) <= 0.3 * Math.min(a.size, b.size))) {
    const sorted = row.sort((a, b) => a.cx - b.cx);
    for (const run of runs(sorted, (l) => l.cx)) {
      const snapped = run.flatMap((l) => {
        const at = snap(l, vertical, 'x');
        return at === null ? [] : [{ value: l.value, at, text: l.text }];
      });
      const axis = axisFrom(snapped);
      if (axis) xAxes.push({ axis, across: run[0]!.top, from: Math.min(...snapped.map((s) => s.at)), to: Math.max(...snapped.map((s) => s.at)) });
    }
  }

  // Columns of labels beside horizontal lines: value axes. Labels left of a panel align on their
  // right edges, labels right of it on their left edges, some sheets centre them.
  const yAxes: Found[] = [];
  const seen = new Set<string>();
  const alignments: ((l: NumericLabel) => number)[] = [(l) => l.right, (l) => l.left, (l) => (l.left + l.right) / 2];
  for (const key of alignments) {
    const sorted = [...labels].sort((a, b) => key(a) - key(b) || a.cy - b.cy);
    for (const column of groupBy(sorted, (a, b) => Math.abs(key(a) - key(b)) <= 0.6 * Math.min(a.size, b.size))) {
      const byY = column.sort((a, b) => a.cy - b.cy);
      for (const run of runs(byY, (l) => l.cy)) {
        const snapped = run.flatMap((l) => {
          const at = snap(l, horizontal, 'y');
          return at === null ? [] : [{ value: l.value, at, text: l.text }];
        });
        const axis = axisFrom(snapped);
        if (!axis) continue;
        // The same column found by two alignments is one axis; the same numbers in another column
        // (a right-hand axis matching the left one) are another.
        const middle = run.reduce((sum, l) => sum + (l.left + l.right) / 2, 0) / run.length;
        const signature = `${Math.round(middle / 10)}:${snapped.map((t) => `${t.value}@${t.at.toFixed(3)}`).join('|')}`;
        if (seen.has(signature)) continue;
        seen.add(signature);
        yAxes.push({ axis, across: middle, from: Math.min(...snapped.map((t) => t.at)), to: Math.max(...snapped.map((t) => t.at)) });
      }
    }
  }

  const proposals: PanelProposal[] = [];
  for (const y of yAxes.sort((a, b) => a.from - b.from)) {
    // The flow axis of a panel is the nearest row of flow labels below its lowest value label,
    // beside the value labels on either side (a shared flow axis may serve several panels).
    const beside = (x: Found) => y.across >= x.from - 0.15 * (x.to - x.from) && y.across <= x.to + 0.15 * (x.to - x.from);
    const below = xAxes.filter((x) => x.across >= y.to - 1 && beside(x)).sort((a, b) => a.across - b.across);
    const x = below[0];
    if (!x) continue;
    // Axis anchors need only lie on lines parallel to their axis: the value labels' lines are
    // read at one x, the flow labels' lines at one y.
    const left = Math.abs(y.across - x.from) <= Math.abs(y.across - x.to) ? x.from : x.to;
    const bottom = y.to;
    const anchors: AnchorInput[] = [
      ...x.axis.labels.map((l) => ({ at: [l.at, bottom] as [number, number], x: l.value })),
      ...y.axis.labels.map((l) => ({ at: [left, l.at] as [number, number], y: l.value })),
    ];
    try {
      const calibration = calibrate(anchors, { xScale: x.axis.scale, yScale: y.axis.scale });
      proposals.push({ frame: [x.from, y.from, x.to, y.to], x: x.axis, y: y.axis, anchors, xScale: x.axis.scale, yScale: y.axis.scale, calibration });
    } catch {
      // Labels that do not make a calibration are not a panel; nothing to propose.
    }
  }
  return proposals;
}

/** Groups a sorted list into runs of neighbours that `same` joins. */
function groupBy<T>(sorted: readonly T[], same: (a: T, b: T) => boolean): T[][] {
  const out: T[][] = [];
  for (const item of sorted) {
    const group = out.at(-1);
    const last = group?.at(-1);
    if (group && last !== undefined && same(last, item)) group.push(item);
    else out.push([item]);
  }
  return out;
}
