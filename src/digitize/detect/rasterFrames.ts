/**
 * Plot frames and grid lines of a level scan (ink.ts): long straight dark runs along rows
 * (horizontal rules) and columns (vertical rules); a frame is four rules that meet at their
 * ends; inside a frame, the grid lines are the columns and rows whose mean darkness stands
 * above their neighbourhood. Positions are continuous level coordinates (a pixel's centre at
 * index + 0.5), sub-pixel from the darkness profile across each rule.
 *
 * Pure.
 */
import { fitLine } from '../calibration.ts';
import type { InkMap } from './ink.ts';
import type { Box } from './panels.ts';

export interface Rule {
  /** Position across the rule (y of a horizontal rule, x of a vertical one), continuous. */
  at: number;
  from: number;
  to: number;
}

/** Horizontal rules: runs of ink of at least `minLength` pixels (gaps up to 2 px bridged), merged over neighbouring rows. */
export function horizontalRules(map: InkMap, threshold: number, minLength: number): Rule[] {
  const { width, height, ink } = map;
  const runsOf = (y: number): [number, number][] => {
    const runs: [number, number][] = [];
    let start = -1;
    let lastInk = -10;
    for (let x = 0; x <= width; x++) {
      const on = x < width && (ink[y * width + x] as number) >= threshold;
      if (on) {
        if (start < 0 || x - lastInk > 3) {
          if (start >= 0 && lastInk - start + 1 >= minLength) runs.push([start, lastInk + 1]);
          start = x;
        }
        lastInk = x;
      }
    }
    if (start >= 0 && lastInk - start + 1 >= minLength) runs.push([start, lastInk + 1]);
    return runs;
  };
  return mergedRules(height, runsOf, (first, last, from, to) => centreAcross(map, first, last, from, to));
}

/**
 * Vertical rules, as horizontalRules finds them on the map turned (rows and columns swapped,
 * `transpose`), without turning it: every column's runs are gathered in one pass down the rows.
 * Positions: `at` is a column, `from` and `to` rows.
 */
export function verticalRules(map: InkMap, threshold: number, minLength: number): Rule[] {
  const { width, height, ink } = map;
  const start = new Int32Array(width).fill(-1);
  const lastInk = new Int32Array(width).fill(-10);
  const runs: [number, number][][] = Array.from({ length: width }, () => []);
  for (let y = 0; y < height; y++) {
    const row = y * width;
    for (let x = 0; x < width; x++) {
      if ((ink[row + x] as number) < threshold) continue;
      const s = start[x] as number;
      const last = lastInk[x] as number;
      if (s < 0 || y - last > 3) {
        if (s >= 0 && last - s + 1 >= minLength) runs[x]!.push([s, last + 1]);
        start[x] = y;
      }
      lastInk[x] = y;
    }
  }
  for (let x = 0; x < width; x++) {
    const s = start[x] as number;
    const last = lastInk[x] as number;
    if (s >= 0 && last - s + 1 >= minLength) runs[x]!.push([s, last + 1]);
  }
  return mergedRules(width, (x) => runs[x] as [number, number][], (first, last, from, to) => centreAlong(map, first, last, from, to));
}

/**
 * Runs of lines 0 … count − 1 (rows, or columns) merged over neighbouring lines into rules: a run
 * overlapping an open rule by half the shorter joins it; rules more than 12 lines thick are text
 * or filled areas, not rules. `centre` gives a rule's position across.
 */
function mergedRules(count: number, runsOf: (line: number) => [number, number][], centre: (first: number, last: number, from: number, to: number) => number): Rule[] {
  interface Open { from: number; to: number; rows: number[]; last: number }
  const done: Open[] = [];
  let open: Open[] = [];
  for (let y = 0; y < count; y++) {
    const runs = runsOf(y);
    const next: Open[] = [];
    for (const [a, b] of runs) {
      const o = open.find((k) => Math.min(k.to, b) - Math.max(k.from, a) > 0.5 * Math.min(k.to - k.from, b - a));
      if (o) {
        o.from = Math.min(o.from, a);
        o.to = Math.max(o.to, b);
        o.rows.push(y);
        o.last = y;
        if (!next.includes(o)) next.push(o);
      } else next.push({ from: a, to: b, rows: [y], last: y });
    }
    for (const o of open) if (!next.includes(o)) done.push(o);
    open = next;
  }
  done.push(...open);
  const rules: Rule[] = [];
  for (const o of done) {
    // A rule is thin: a block of many rows is text or a filled area, not a line.
    if (o.rows.length > 12) continue;
    rules.push({ at: centre(o.rows[0] as number, o.last, o.from, o.to), from: o.from, to: o.to });
  }
  return rules;
}

/** Darkness-weighted centre of the columns [first − 2, last + 2] over the middle of the rows [from, to] (centreAcross on the map turned). */
function centreAlong(map: InkMap, first: number, last: number, from: number, to: number): number {
  const { width, ink } = map;
  const a = Math.round(from + 0.2 * (to - from));
  const b = Math.round(to - 0.2 * (to - from));
  let sw = 0;
  let sx = 0;
  for (let x = Math.max(0, first - 2); x <= Math.min(width - 1, last + 2); x++) {
    let s = 0;
    for (let y = a; y < b; y++) s += ink[y * width + x] as number;
    sw += s;
    sx += s * (x + 0.5);
  }
  return sw > 0 ? sx / sw : (first + last + 1) / 2;
}

/** Darkness-weighted centre of the rows [first − 2, last + 2] over the middle of [from, to]. */
function centreAcross(map: InkMap, first: number, last: number, from: number, to: number): number {
  const { width, height, ink } = map;
  const a = Math.round(from + 0.2 * (to - from));
  const b = Math.round(to - 0.2 * (to - from));
  let sw = 0;
  let sy = 0;
  for (let y = Math.max(0, first - 2); y <= Math.min(height - 1, last + 2); y++) {
    let s = 0;
    for (let x = a; x < b; x++) s += ink[y * width + x] as number;
    sw += s;
    sy += s * (y + 0.5);
  }
  return sw > 0 ? sy / sw : (first + last + 1) / 2;
}

/** The ink map with rows and columns swapped (vertical rules become horizontal ones). */
export function transpose(map: InkMap): InkMap {
  const { width, height, ink } = map;
  const out = new Uint8Array(width * height);
  // In tiles, so that both the rows read and the rows written stay in the cache.
  const TILE = 64;
  for (let y0 = 0; y0 < height; y0 += TILE) {
    const y1 = Math.min(height, y0 + TILE);
    for (let x0 = 0; x0 < width; x0 += TILE) {
      const x1 = Math.min(width, x0 + TILE);
      for (let y = y0; y < y1; y++) for (let x = x0; x < x1; x++) out[x * height + y] = ink[y * width + x] as number;
    }
  }
  return { width: height, height: width, ink: out };
}

/**
 * Frames: a top and a bottom rule of one width, with vertical rules down both ends. A side may
 * be broken (a curve label's paper box drawn over it), but not where another frame ends: a
 * break with a rule of the frame's width at its top is the gap between two frames stacked.
 * A frame inside another (grid lines closing a smaller rectangle with the frame's sides) is
 * dropped; frames narrower than `minSide` or lower than `minHeight` are not plots.
 */
export function findRasterFrames(horizontal: readonly Rule[], vertical: readonly Rule[], minSide: number, tol: number, minHeight = minSide): Box[] {
  const frames: Box[] = [];
  const near = (a: number, b: number) => Math.abs(a - b) <= tol;
  const sideHolds = (x: number, top: Rule, bottom: Rule): boolean => {
    const pieces = vertical.filter((v) => near(v.at, x) && v.to > top.at + tol && v.from < bottom.at - tol).map((v) => [Math.max(top.at, v.from), Math.min(bottom.at, v.to)] as const).sort((p, q) => p[0] - q[0]);
    const otherRuleAt = (y: number) => horizontal.some((h) => h !== top && h !== bottom && near(h.at, y) && near(h.from, top.from) && near(h.to, top.to));
    let covered = 0;
    let reach = top.at;
    for (const [a, b] of [...pieces, [bottom.at, bottom.at] as const]) {
      // A break: the gap between two stacked frames has a rule of this width at an end.
      if (a - reach > 2 * tol && (otherRuleAt(reach) || otherRuleAt(a))) return false;
      covered += Math.max(0, b - Math.max(a, reach));
      reach = Math.max(reach, b);
    }
    return covered >= 0.7 * (bottom.at - top.at);
  };
  for (const top of horizontal) {
    if (top.to - top.from < minSide) continue;
    for (const bottom of horizontal) {
      if (bottom.at - top.at < minHeight || !near(bottom.from, top.from) || !near(bottom.to, top.to)) continue;
      if (!sideHolds((top.from + bottom.from) / 2, top, bottom) || !sideHolds((top.to + bottom.to) / 2, top, bottom)) continue;
      const left = centreOf(vertical, (top.from + bottom.from) / 2, tol, top.at, bottom.at);
      const right = centreOf(vertical, (top.to + bottom.to) / 2, tol, top.at, bottom.at);
      frames.push([left, top.at, right, bottom.at]);
    }
  }
  const inside = (a: Box, b: Box) => a !== b && a[0] >= b[0] - tol && a[1] >= b[1] - tol && a[2] <= b[2] + tol && a[3] <= b[3] + tol;
  return frames.filter((f) => !frames.some((g) => inside(f, g))).sort((a, b) => a[1] - b[1] || a[0] - b[0]);
}

/** Length-weighted position of the vertical rules near x between top and bottom. */
function centreOf(vertical: readonly Rule[], x: number, tol: number, top: number, bottom: number): number {
  let sw = 0;
  let sx = 0;
  for (const v of vertical) {
    if (Math.abs(v.at - x) > tol) continue;
    const w = Math.max(0, Math.min(bottom, v.to) - Math.max(top, v.from));
    sw += w;
    sx += w * v.at;
  }
  return sw > 0 ? sx / sw : x;
}

/**
 * Grid lines across a frame: positions (continuous level coordinates) along x (`'x'`: vertical
 * lines) or y. A grid line is darker than the paper three pixels to either side along most of
 * its length, so the median of that contrast along the line stands above `minRise`; a curve
 * crossing the same row or column darkens only a short stretch and leaves the median at zero.
 * The position is the darkness-weighted centre of the mean profile around the peak.
 */
export function gridLines(map: InkMap, frame: Box, along: 'x' | 'y', minRise = 3): number[] {
  const { width, ink } = map;
  const [l, t, r, b] = frame;
  const inset = 4;
  const a0 = Math.ceil((along === 'x' ? l : t) + inset);
  const a1 = Math.floor((along === 'x' ? r : b) - inset);
  const c0 = Math.ceil((along === 'x' ? t : l) + inset);
  const c1 = Math.floor((along === 'x' ? b : r) - inset);
  if (a1 - a0 < 10 || c1 - c0 < 10) return [];
  const n = a1 - a0;
  const mean = new Float64Array(n);
  const contrast = new Float64Array(n);
  const count = Math.ceil((c1 - c0) / 2);
  // Per position along the frame: the darkness summed and a histogram of the contrast (the pixel
  // against the mean of the pixels three to either side across the line), every other pixel along
  // the line: the median needs no more. Positions are taken `BLOCK` at a time, each row of
  // the image read once per block, so that upright lines do not walk down columns.
  const BLOCK = along === 'x' ? 64 : 1;
  const hist = new Uint32Array(512 * BLOCK);
  const sums = new Float64Array(BLOCK);
  for (let i0 = 3; i0 < n - 3; i0 += BLOCK) {
    const i1 = Math.min(n - 3, i0 + BLOCK);
    hist.fill(0);
    sums.fill(0);
    if (along === 'x') {
      for (let c = c0; c < c1; c += 2) {
        const row = c * width + a0;
        for (let i = i0; i < i1; i++) {
          const v = ink[row + i] as number;
          sums[i - i0] = (sums[i - i0] as number) + v;
          const d = v - (((ink[row + i - 3] as number) + (ink[row + i + 3] as number)) >> 1);
          hist[(i - i0) * 512 + Math.max(0, Math.min(511, d + 256))]!++;
        }
      }
    } else {
      const p = (a0 + i0) * width;
      for (let c = c0; c < c1; c += 2) {
        const v = ink[p + c] as number;
        sums[0] = (sums[0] as number) + v;
        const d = v - (((ink[p - 3 * width + c] as number) + (ink[p + 3 * width + c] as number)) >> 1);
        hist[Math.max(0, Math.min(511, d + 256))]!++;
      }
    }
    for (let i = i0; i < i1; i++) {
      mean[i] = (sums[i - i0] as number) / count;
      let seen = 0;
      const h0 = (i - i0) * 512;
      for (let k = 0; k < 512; k++) {
        seen += hist[h0 + k] as number;
        if (seen >= count / 2) {
          contrast[i] = k - 256;
          break;
        }
      }
    }
  }
  const lines: number[] = [];
  for (let i = 4; i < n - 4; i++) {
    const v = contrast[i] as number;
    if (v < minRise || v < (contrast[i - 1] as number) || v <= (contrast[i + 1] as number)) continue;
    // Centre: the mean darkness above the lower of its two shoulders, over the peak ± 2.
    const base = Math.min(mean[i - 3] as number, mean[i + 3] as number);
    let sw = 0;
    let sp = 0;
    for (let k = i - 2; k <= i + 2; k++) {
      const w = Math.max(0, (mean[k] as number) - base);
      sw += w;
      sp += w * (a0 + k + 0.5);
    }
    lines.push(sw > 0 ? sp / sw : a0 + i + 0.5);
  }
  return lines;
}

/**
 * How far a frame is from a rectangle on the level page, pixels: each side's position measured
 * near its two ends (a fifth to two fifths of the way along), the largest difference. A scan
 * turned level gives a few tenths; a photo taken at an angle, or a bent page, gives more, and
 * then the grid crossings are not where a rectangle puts them.
 */
export function frameSkew(map: InkMap, frame: Box): number {
  const [l, t, r, b] = frame;
  const w = r - l;
  const h = b - t;
  const across = (pos: number, from: number, to: number, vertical: boolean): number => {
    let sw = 0;
    let sp = 0;
    for (let k = Math.round(pos) - 4; k <= Math.round(pos) + 4; k++) {
      let s = 0;
      for (let a = Math.round(from); a < Math.round(to); a++) s += (vertical ? map.ink[a * map.width + k] : map.ink[k * map.width + a]) as number;
      sw += s;
      sp += s * (k + 0.5);
    }
    return sw > 0 ? sp / sw : pos;
  };
  const diffs = [
    across(l, t + 0.2 * h, t + 0.4 * h, true) - across(l, b - 0.4 * h, b - 0.2 * h, true),
    across(r, t + 0.2 * h, t + 0.4 * h, true) - across(r, b - 0.4 * h, b - 0.2 * h, true),
    across(t, l + 0.2 * w, l + 0.4 * w, false) - across(t, r - 0.4 * w, r - 0.2 * w, false),
    across(b, l + 0.2 * w, l + 0.4 * w, false) - across(b, r - 0.4 * w, r - 0.2 * w, false),
  ];
  return Math.max(...diffs.map(Math.abs));
}

/** Half-height of the window read across a frame's rule for its centre, pixels. */
const TURN_WINDOW = 3;
/** A column's centre farther than this off its rule's fitted line is left out (a curve or a label touching the rule), pixels. */
const TURN_OUTLIER_PX = 0.6;
/** Least share of a rule's length whose centres are read for its slope to count. */
const TURN_SEEN = 0.4;

/**
 * The turn left on a level page, radians (as `Level.angle`: positive leans down to the right),
 * read from the frames' own rules: each rule's centre across it, column by column (the ink's
 * darkness-weighted centre, where the window's ends are paper), fitted by a straight line, and
 * fitted again without the columns far off it. The page's angle is found by piling up thresholded
 * ink (ink.ts), which a line's staircase on the pixel grid pulls toward level: a scan turned by
 * 0.12° read 0.045°, and its grid crossings came out a pixel off at the panel's far side (scan
 * detection bed seed 32, power calibrated 0.38 % of span off). The slopes of horizontal rules
 * and of upright ones (negated) are averaged by the columns read; undefined with no rule read.
 * Held to within 0.003° for a turn left of up to 0.12° (the window across a rule is fixed, so a
 * rule leaning more runs out of it at its ends: 0.3° reads 0.006° off).
 */
export function framesTurn(map: InkMap, frames: readonly Box[]): number | undefined {
  const { width, height, ink } = map;
  let sum = 0;
  let weight = 0;
  for (const [l, t, r, b] of frames) {
    for (const [horizontal, at, from, to] of [[true, t, l, r], [true, b, l, r], [false, l, t, b], [false, r, t, b]] as const) {
      const margin = 0.05 * (to - from) + 2 * TURN_WINDOW;
      const base = Math.floor(at) - TURN_WINDOW;
      if (base < 0 || base + 2 * TURN_WINDOW >= (horizontal ? height : width)) continue;
      const pts: [number, number][] = [];
      for (let s = Math.ceil(from + margin); s < to - margin; s += 2) {
        const value = (k: number) => ink[horizontal ? (base + k) * width + s : s * width + base + k] as number;
        const ends = Math.max(value(0), value(2 * TURN_WINDOW));
        let peak = 0;
        for (let k = 1; k < 2 * TURN_WINDOW; k++) peak = Math.max(peak, value(k));
        if (peak === 0 || ends > 0.25 * peak) continue;
        let m = 0;
        let w = 0;
        for (let k = 1; k < 2 * TURN_WINDOW; k++) {
          const v = Math.max(0, value(k) - ends);
          m += v * (base + k + 0.5);
          w += v;
        }
        if (w > 0) pts.push([s + 0.5, m / w]);
      }
      if (pts.length < (TURN_SEEN * (to - from)) / 2) continue;
      const [a0, b0] = fitLine(pts.map((p) => p[0]), pts.map((p) => p[1]));
      const kept = pts.filter(([s, c]) => Math.abs(c - a0 - b0 * s) <= TURN_OUTLIER_PX);
      if (kept.length < (TURN_SEEN * (to - from)) / 2) continue;
      const [, slope] = fitLine(kept.map((p) => p[0]), kept.map((p) => p[1]));
      sum += (horizontal ? slope : -slope) * kept.length;
      weight += kept.length;
    }
  }
  return weight > 0 ? Math.atan(sum / weight) : undefined;
}
