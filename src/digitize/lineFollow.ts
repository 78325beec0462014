/**
 * Following one line through a raster, step by step, from a start point towards a target.
 * At each step the next position is predicted from the current direction and turning rate;
 * a cross-section perpendicular to that direction is sampled, and the run of line-coloured
 * samples nearest the prediction, with the line's width, gives the new centre (sub-pixel).
 * Where the section is ambiguous (a crossing curve, a grid line lying along the section, a
 * label) or empty (a gap), the follower coasts on the prediction and re-acquires the line
 * beyond. Only pixels near the path are read.
 * Pure: pixel coordinates in, pixel coordinates out.
 */
import type { InkModel } from './colour.ts';
import { findRuns, sampleLongSection, sampleSection, type ReadCounter, type Run } from './lineProfile.ts';
import type { RasterImage } from './raster.ts';

export interface LineStyle {
  model: InkModel;
  /** Cross-section mass of the line (≈ its width) in pixels. */
  width: number;
  /** Membership at which a sample counts as line. */
  threshold: number;
  /**
   * Range of cross-section mass, as fractions of `width`, that counts as this line. Black
   * lines keep their mass within a few per cent through noise and compression, so a tight
   * range rejects the thinner strokes of text; coloured lines lose some chroma to the
   * compression and need a wider range.
   */
  massRange: readonly [number, number];
  /**
   * For a dashed or dotted line: half the longest gap between its dashes plus a pixel. Each
   * section then takes the most line-like sample within this reach along the line, so the
   * follower sees the line across its own gaps and does not coast (and drift) at each one.
   * Absent or 0 for a solid line.
   */
  reach?: number;
}

export interface FollowLimits {
  /** Longest stretch bridged on the prediction alone, pixels. */
  maxGap: number;
  /**
   * How close passing the target counts as reaching it, pixels. Small when the target was put
   * onto the line's centre (a path that passes farther off is on another line); larger for
   * a guide that could not be put onto the line.
   */
  passRadius?: number;
  /** Travel after which the follower gives up reaching its target, pixels. */
  maxTravel: number;
}

export interface FollowResult {
  /** Accepted line centres, pixels, starting with the start point. */
  points: number[];
  /** Direction of travel at the end (unit vector). */
  dx: number;
  dy: number;
  reached: boolean;
  /** When the follower ran into another pass (see `PathIndex`), the index of the track position it met. */
  met?: number;
  /**
   * Every position the follower stood on, seen or coasted, as flat x, y pairs, with the number
   * of accepted points at each: what a pass from the other side checks for a meeting.
   */
  track: number[];
  trackPoints: number[];
  /**
   * Stretches where the line ran together with other ink of its colour for more than six line
   * widths (a shallow crossing or a bundle of curves), as the number of accepted points when
   * each began. Beyond such a stretch the follower may have come out on the wrong line.
   */
  merges: number[];
  /** Why the follower stopped before its target (undefined when it reached it). */
  reason?: string;
}

/**
 * Points of an earlier pass, bucketed on a grid, so that a pass coming the other way can
 * tell in constant time when it runs into it.
 */
export interface PathIndex {
  points: number[];
  cell: number;
  buckets: Map<number, number[]>;
  reach: number;
}

const bucketKey = (cx: number, cy: number) => cx * 100003 + cy;

export function indexPath(points: number[], reach: number): PathIndex {
  const cell = Math.max(2, 2 * reach);
  const buckets = new Map<number, number[]>();
  for (let i = 0; i < points.length / 2; i++) {
    const key = bucketKey(Math.floor((points[i * 2] as number) / cell), Math.floor((points[i * 2 + 1] as number) / cell));
    const list = buckets.get(key);
    if (list) list.push(i);
    else buckets.set(key, [i]);
  }
  return { points, cell, buckets, reach };
}

/** Index of the nearest point of the indexed path within its reach of (x, y), or -1. */
export function nearestOnPath(index: PathIndex, x: number, y: number): number {
  const cx = Math.floor(x / index.cell);
  const cy = Math.floor(y / index.cell);
  let best = -1;
  let bestD = index.reach;
  for (let i = -1; i <= 1; i++) {
    for (let j = -1; j <= 1; j++) {
      const list = index.buckets.get(bucketKey(cx + i, cy + j));
      if (!list) continue;
      for (const k of list) {
        const d = Math.hypot((index.points[k * 2] as number) - x, (index.points[k * 2 + 1] as number) - y);
        if (d <= bestD) {
          bestD = d;
          best = k;
        }
      }
    }
  }
  return best;
}

/** Step length, section spacing and section half-width derived from the line width. */
export function stepping(width: number): { step: number; spacing: number; half: number; accept: number } {
  const step = Math.min(3, Math.max(1.5, 0.8 * width));
  const spacing = width < 2.5 ? 0.5 : 1;
  const half = Math.max(2 * width + 2, 5);
  const accept = Math.max(0.6 * width, 1.5);
  return { step, spacing, half, accept };
}

/** Largest turning per step (rad): a radius of about seven steps, tighter than any plotted curve. */
const MAX_TURN = 0.15;
const TURN_SMOOTHING = 0.35;

/**
 * Where the line continues in a section, as an offset from the prediction; 'ambiguous' when
 * other ink covers the prediction or two candidates fit about equally well; undefined when
 * nothing of the line's colour and width is near.
 * A run of the line's width counts at its centroid. A run up to about two widths is two
 * lines merging at a shallow crossing: the followed line lies one half-width inside one of
 * its edges, so both edges offer a candidate. The nearest candidate wins only if the next
 * one is clearly farther; otherwise the follower coasts until the lines have parted.
 *
 * At a fork (two candidates or more in the section: lines of a bunch that run together and
 * part), the step's prediction is checked against the line's own course where `course` gives it
 * (see `courseOffset`): the turning rate behind the prediction is smoothed over a few steps and
 * lags where lines part at a shallow angle, while the parabola through the line so far carries
 * its direction and bending on. When the course lies clearly nearer another candidate than the
 * one the prediction chose, the two disagree about which line this is, and the section counts as
 * ambiguous: the follower coasts on until the lines have parted far enough to tell.
 */
export interface Pick {
  offset: number;
  /** True when the offset is the centroid of a run of the line's own width, not an edge of a merge. */
  clean: boolean;
}

/** Candidate offsets of one section and whether each is a clean centroid (scratch, reused: the follower is synchronous). */
const candidateOffsets: number[] = [];
const candidateClean: boolean[] = [];

export function chooseOffset(runs: readonly Run[], style: LineStyle, allowed: number, pick: Pick, course?: () => number | undefined): 'found' | 'ambiguous' | undefined {
  let covered = false;
  const lo = style.massRange[0] * style.width;
  const hi = style.massRange[1] * style.width;
  const cleanHi = Math.min(hi, 1.2 * style.width);
  const half = style.width / 2;
  // Emptied only when not empty already (setting the length goes through a slow path even when it does not change it).
  if (candidateOffsets.length !== 0) candidateOffsets.length = 0;
  if (candidateClean.length !== 0) candidateClean.length = 0;
  // Up to two candidates a run: its centroid, or the two edge-derived positions of a merge.
  for (const run of runs) {
    if (run.mass < lo) continue;
    if (run.mass > hi) {
      if (run.start - allowed <= 0 && run.end + allowed >= 0) covered = true;
      if (run.mass > 2.2 * style.width) continue;
      candidateOffsets.push(run.lowEdge + half, run.highEdge - half);
      candidateClean.push(false, false);
    } else {
      candidateOffsets.push(run.centre);
      candidateClean.push(run.mass <= cleanHi);
    }
  }
  let first = Infinity;
  let firstIndex = -1;
  let second = Infinity;
  for (let k = 0; k < candidateOffsets.length; k++) {
    const d = Math.abs(candidateOffsets[k] as number);
    if (d < first) {
      second = first;
      first = d;
      firstIndex = k;
    } else if (d < second) {
      second = d;
    }
  }
  // Ink of the line's kind in view but away from the prediction (a neighbouring line of a
  // bundle) counts as other ink too, not as an empty gap.
  if (first > allowed) return covered || first < Infinity ? 'ambiguous' : undefined;
  if (second < first + 0.75 * style.width) return 'ambiguous';
  const offset = candidateOffsets[firstIndex] as number;
  if (course && candidateOffsets.length >= 2) {
    const c = course();
    if (c !== undefined) {
      let other = Infinity;
      for (let k = 0; k < candidateOffsets.length; k++) if (k !== firstIndex) other = Math.min(other, Math.abs((candidateOffsets[k] as number) - c));
      if (Math.abs(offset - c) > other + 0.75 * style.width) return 'ambiguous';
    }
  }
  pick.offset = offset;
  pick.clean = candidateClean[firstIndex] as boolean;
  return 'found';
}

/** Length of the followed line, pixels and line widths (the larger), through which its course at a fork is fitted. */
const FORK_HISTORY_PX = 40;
const FORK_HISTORY_WIDTHS = 15;

/**
 * Where the followed line's own course crosses the section through (qx, qy) along the unit
 * normal (nx, ny), as an offset along that normal: the least-squares parabola through the clean
 * points (centroids of runs of the line's own width, not edges of merges) of the last `history`
 * pixels of the line, in the frame of their chord, carried on to the section. Undefined when
 * fewer than six clean points or too short a chord make the parabola meaningless.
 */
export function courseOffset(points: readonly number[], clean: readonly boolean[], history: number, qx: number, qy: number, nx: number, ny: number): number | undefined {
  // The last clean point, and the first point of the stretch of `history` pixels that ends there.
  const end = clean.lastIndexOf(true);
  if (end < 5) return undefined;
  const ex = points[2 * end] as number;
  const ey = points[2 * end + 1] as number;
  let from = end;
  for (let along = 0; from > 0 && along < history; from--) along += Math.hypot((points[2 * from] as number) - (points[2 * from - 2] as number), (points[2 * from + 1] as number) - (points[2 * from - 1] as number));
  const chord = Math.hypot(ex - (points[2 * from] as number), ey - (points[2 * from + 1] as number));
  if (chord < 0.5 * history) return undefined;
  const ax = points[2 * from] as number;
  const ay = points[2 * from + 1] as number;
  const ux = (ex - ax) / chord;
  const uy = (ey - ay) / chord;
  // y = c0 + c1·t + c2·t², t = along / chord, y across (v = (−uy, ux)), by least squares.
  const powers = [0, 0, 0, 0, 0];
  const moments = [0, 0, 0];
  for (let i = from; i <= end; i++) {
    if (!clean[i]) continue;
    const dx = (points[i * 2] as number) - ex;
    const dy = (points[i * 2 + 1] as number) - ey;
    const t = (dx * ux + dy * uy) / chord;
    const y = dy * ux - dx * uy;
    let tp = 1;
    for (let p = 0; p < 5; p++) {
      powers[p] = (powers[p] as number) + tp;
      if (p < 3) moments[p] = (moments[p] as number) + tp * y;
      tp *= t;
    }
  }
  if ((powers[0] as number) < 6) return undefined;
  const fit = solveNormal3(powers, moments);
  if (!fit) return undefined;
  const [a, b, c] = fit;
  // The section's point along the chord, and the parabola's point there.
  const s = (qx - ex) * ux + (qy - ey) * uy;
  const t = s / chord;
  const y = a + b * t + c * t * t;
  const px = ex + s * ux - y * uy;
  const py = ey + s * uy + y * ux;
  return (px - qx) * nx + (py - qy) * ny;
}

/**
 * Solves the normal equations of a least-squares parabola, [Σt⁰ Σt¹ Σt²; Σt¹ Σt² Σt³; Σt² Σt³ Σt⁴]·c =
 * [Σy Σty Σt²y], by Cramer's rule; undefined when the points cannot fix a parabola.
 */
function solveNormal3(powers: readonly number[], moments: readonly number[]): [number, number, number] | undefined {
  const [p0, p1, p2, p3, p4] = powers as [number, number, number, number, number];
  const [m0, m1, m2] = moments as [number, number, number];
  // Determinant of the symmetric Hankel matrix with one column replaced by the moments.
  const det = (a: number, b: number, c: number, d: number, e: number, f: number, g: number, h: number, i: number) => a * (e * i - f * h) - b * (d * i - f * g) + c * (d * h - e * g);
  const whole = det(p0, p1, p2, p1, p2, p3, p2, p3, p4);
  if (Math.abs(whole) < 1e-12) return undefined;
  return [det(m0, p1, p2, m1, p2, p3, m2, p3, p4) / whole, det(p0, m0, p2, p1, m1, p3, p2, m2, p4) / whole, det(p0, p1, m0, p1, p2, m1, p2, p3, m2) / whole];
}

/** Accepted steps in a row needed before a line found again after a gap is trusted. */
const CONFIRM_STEPS = 4;

/**
 * A line found again after a gap that lies off the line's course before the gap by more than
 * this angle (rad), seen from the last clean point, may be another line crossing there.
 */
const GAP_EXIT_TURN = 0.2;
/**
 * ... and is one when its own direction is turned from that course by more than this (rad): a
 * plotted curve comes out of a gap close to where its course carried it and along it; a line of
 * the same colour crossing it there (a head curve across an efficiency curve of the same
 * diameter) leaves at the crossing's angle.
 */
const GAP_CROSS_TURN = 0.25;

/**
 * True when a line found again after a gap (its first point at `before`, its next point
 * (px, py)) is another line crossing where this one was lost. The line's course before the gap
 * is the chord of its clean points over the last `history` pixels up to the last clean point,
 * carried on straight (the points at the edges of a crossing lean towards the other line, and so
 * does the heading the follower coasted on; the clean points before it do not). The line found
 * must lie off that course by more than a line width and by more than `GAP_EXIT_TURN` seen from
 * the last clean point, no farther from it than twice the length the course was measured over,
 * and run across it: its own direction over the steps taken since it was found turned from the
 * course's by more than `GAP_CROSS_TURN`. A neighbour of a bunch, found where the line ran into
 * it, runs along the course and is left to the follower's other rules.
 */
function leavesCourse(points: readonly number[], clean: readonly boolean[], before: number, history: number, px: number, py: number, width: number): boolean {
  const end = clean.lastIndexOf(true, before - 1);
  if (end < 1) return false;
  const ex = points[2 * end] as number;
  const ey = points[2 * end + 1] as number;
  let from = end;
  while (from > 0 && Math.hypot(ex - (points[2 * from - 2] as number), ey - (points[2 * from - 1] as number)) <= history) from--;
  const chord = Math.hypot(ex - (points[2 * from] as number), ey - (points[2 * from + 1] as number));
  if (chord < 0.5 * history) return false;
  const hx = (ex - (points[2 * from] as number)) / chord;
  const hy = (ey - (points[2 * from + 1] as number)) / chord;
  const along = (px - ex) * hx + (py - ey) * hy;
  const side = Math.abs((py - ey) * hx - (px - ex) * hy);
  // Carried on straight, the course is trusted over about twice the length it was measured on.
  if (along > 2 * history || side <= Math.max(width, 1) || side <= Math.tan(GAP_EXIT_TURN) * Math.max(along, 0)) return false;
  const fx = px - (points[2 * before] as number);
  const fy = py - (points[2 * before + 1] as number);
  const angle = Math.abs(Math.atan2(hx * fy - hy * fx, hx * fx + hy * fy));
  return angle > GAP_CROSS_TURN;
}

/**
 * Heading and turning rate for bridging a gap, from a longer stretch of the followed line
 * than the step-to-step estimate uses: a least-squares parabola, in the frame of the
 * stretch's chord, through the clean points of the last `history` pixels (points taken at
 * an edge of a merge are left out, as they lean towards the merging line). The short
 * estimate is good enough to follow a visible line, but its noise, carried over a long gap,
 * would swing the prediction off the line.
 */
function gapHeading(points: number[], clean: boolean[], history: number, step: number): { dx: number; dy: number; turn: number; length: number } | undefined {
  const count = points.length / 2;
  let last = count - 1;
  while (last >= 0 && !clean[last]) last--;
  if (last < 4) return undefined;
  const ex = points[last * 2] as number;
  const ey = points[last * 2 + 1] as number;
  let k = last;
  let length = 0;
  while (k > 0 && length < history) {
    length += Math.hypot((points[k * 2] as number) - (points[(k - 1) * 2] as number), (points[k * 2 + 1] as number) - (points[(k - 1) * 2 + 1] as number));
    k--;
  }
  if (length < 4 * step) return undefined;
  const ax = points[k * 2] as number;
  const ay = points[k * 2 + 1] as number;
  const chord = Math.hypot(ex - ax, ey - ay);
  if (chord < 2 * step) return undefined;
  const ux = (ex - ax) / chord;
  const uy = (ey - ay) / chord;
  // y = a + b·t + c·t², t = s / chord (scaled for conditioning), s along u, y along v = (−uy, ux).
  let n = 0;
  let st = 0;
  let st2 = 0;
  let st3 = 0;
  let st4 = 0;
  let sy = 0;
  let sty = 0;
  let st2y = 0;
  for (let i = k; i <= last; i++) {
    if (!clean[i]) continue;
    const px = (points[i * 2] as number) - ex;
    const py = (points[i * 2 + 1] as number) - ey;
    const t = (px * ux + py * uy) / chord;
    const y = -px * uy + py * ux;
    n++;
    st += t;
    st2 += t * t;
    st3 += t * t * t;
    st4 += t * t * t * t;
    sy += y;
    sty += t * y;
    st2y += t * t * y;
  }
  if (n < 5) return undefined;
  // Normal equations of the 3-parameter fit, solved by Cramer's rule.
  const det3 = (a: number, b: number, c: number, d: number, e: number, f: number, g: number, h: number, i: number) => a * (e * i - f * h) - b * (d * i - f * g) + c * (d * h - e * g);
  const D = det3(n, st, st2, st, st2, st3, st2, st3, st4);
  if (Math.abs(D) < 1e-12) return undefined;
  const b = det3(n, sy, st2, st, sty, st3, st2, st2y, st4) / D;
  const c = det3(n, st, sy, st, st2, sty, st2, st3, st2y) / D;
  const slope = b / chord;
  const curvature = (2 * c) / (chord * chord) / (1 + slope * slope) ** 1.5;
  const norm = Math.hypot(1, slope);
  const dx = (ux - uy * slope) / norm;
  const dy = (uy + ux * slope) / norm;
  // A curvature measured on a short stretch is mostly noise: trust it in proportion.
  const trust = Math.min(1, length / history) ** 2;
  return { dx, dy, turn: trust * Math.max(-MAX_TURN, Math.min(MAX_TURN, curvature * step)), length };
}

/**
 * Follows the line from `start` along `heading` until it comes to `target` (when given) or
 * runs into the path `meet` (when given), loses the line for longer than `limits.maxGap`,
 * leaves the image or travels too far.
 */
export function followLine(
  image: RasterImage,
  style: LineStyle,
  start: readonly [number, number],
  heading: readonly [number, number],
  target: readonly [number, number] | undefined,
  limits: FollowLimits,
  counter?: ReadCounter,
  meet?: PathIndex,
): FollowResult {
  const { step, spacing, half, accept } = stepping(style.width);
  const norm = Math.hypot(heading[0], heading[1]) || 1;
  let dx = heading[0] / norm;
  let dy = heading[1] / norm;
  let x = start[0];
  let y = start[1];
  let turn = 0;
  let coast = 0;
  let travelled = 0;
  const points = [x, y];
  const clean = [true];
  const pick: Pick = { offset: 0, clean: false };
  const runs: Run[] = [];
  const track = [x, y];
  const trackPoints = [1];
  const merges: number[] = [];
  let disturbedAt = -1;
  let disturbedFrom = 0;
  let cleanRun = 0;
  const mergeLength = 6 * style.width;
  const finish = () => {
    closeMerge();
    return merges;
  };
  const closeMerge = () => {
    if (disturbedAt >= 0 && travelled - disturbedFrom >= mergeLength) merges.push(disturbedAt);
    disturbedAt = -1;
  };
  const lookback = Math.max(2, Math.ceil(Math.max(6, 2 * style.width) / step));
  const history = Math.max(60, 20 * style.width);
  const forkHistory = Math.max(FORK_HISTORY_PX, FORK_HISTORY_WIDTHS * style.width);
  const maxN = Math.ceil((half + limits.maxGap * 0.12) / spacing) + 1;
  const section = new Float64Array(2 * maxN + 1);
  const arrive = Math.max(1.5 * step, 0.75 * style.width);
  const pass = limits.passRadius ?? Math.max(4 * step, 3 * style.width, 8);
  let closest = Infinity;
  let lastDx = dx;
  let lastDy = dy;

  // After a gap, a line found again stays tentative until it has held for CONFIRM_STEPS steps;
  // a fragment of a label or a crossing line that fits once and then vanishes is dropped,
  // and the follower goes on coasting from where the gap began.
  let tentative: { x: number; y: number; dx: number; dy: number; turn: number; coast: number; travelled: number; count: number; steps: number; trackLength: number } | undefined;
  let skip = 0;
  let trusted = 0;
  let lastGap: { dx: number; dy: number; turn: number; trusted: number; at: number } | undefined;

  for (;;) {
    const c = Math.cos(turn);
    const s = Math.sin(turn);
    const pdx = dx * c - dy * s;
    const pdy = dx * s + dy * c;
    const qx = x + step * pdx;
    const qy = y + step * pdy;
    travelled += step;
    if (qx < 0 || qy < 0 || qx > image.width || qy > image.height) {
      if (tentative) {
        points.length = tentative.count * 2;
        clean.length = tentative.count;
      }
      return { points, dx: lastDx, dy: lastDy, reached: false, reason: 'the line runs off the image', track, trackPoints, merges: finish() };
    }
    const nx = -pdy;
    const ny = pdx;
    const extra = coast * 0.12;
    let choice: 'found' | 'ambiguous' | undefined;
    if (skip > 0) {
      skip--;
      choice = undefined;
    } else {
      const n = Math.min(maxN, Math.ceil((half + extra) / spacing));
      if (style.reach) sampleLongSection(image, style.model, qx, qy, nx, ny, n, spacing, style.reach, section, counter);
      else sampleSection(image, style.model, qx, qy, nx, ny, n, spacing, section, counter);
      choice = chooseOffset(findRuns(section, n, spacing, style.threshold, runs), style, accept + extra, pick, () => courseOffset(points, clean, forkHistory, qx, qy, nx, ny));
    }
    if (choice === 'ambiguous' || (choice === 'found' && !pick.clean)) {
      if (disturbedAt < 0) {
        disturbedAt = points.length / 2;
        disturbedFrom = travelled;
      }
      cleanRun = 0;
    } else if (choice === 'found' && ++cleanRun >= CONFIRM_STEPS && disturbedAt >= 0) {
      travelled -= CONFIRM_STEPS * step;
      closeMerge();
      travelled += CONFIRM_STEPS * step;
    }
    // A line found again after a gap that, once it has held for its tentative steps, runs across
    // the line's own course is another line crossing there: dropped as a fragment that did not hold.
    if (choice === 'found' && tentative && tentative.steps + 1 >= CONFIRM_STEPS && leavesCourse(points, clean, tentative.count, forkHistory, qx + nx * pick.offset, qy + ny * pick.offset, style.width)) choice = undefined;
    dx = pdx;
    dy = pdy;
    if (choice === 'found') {
      if (coast > 0 && !tentative) {
        tentative = { x, y, dx: lastDx, dy: lastDy, turn, coast, travelled: travelled - step, count: points.length / 2, steps: 0, trackLength: track.length };
      }
      x = qx + nx * pick.offset;
      y = qy + ny * pick.offset;
      points.push(x, y);
      clean.push(pick.clean);
      if (coast > 0) lastGap = { dx: pdx, dy: pdy, turn, trusted, at: points.length / 2 };
      coast = 0;
      if (tentative && ++tentative.steps >= CONFIRM_STEPS) tentative = undefined;

      const count = points.length / 2;
      const back = Math.min(lookback, count - 1);
      const bx = points[(count - 1 - back) * 2] as number;
      const by = points[(count - 1 - back) * 2 + 1] as number;
      const cx = x - bx;
      const cy = y - by;
      const chord = Math.hypot(cx, cy);
      if (chord > 0.5 * step * back) {
        // The chord lags the tangent by half the turning over its length.
        const lag = (turn * back) / 2;
        const ux = cx / chord;
        const uy = cy / chord;
        const ndx = ux * Math.cos(lag) - uy * Math.sin(lag);
        const ndy = ux * Math.sin(lag) + uy * Math.cos(lag);
        const delta = Math.atan2(lastDx * ndy - lastDy * ndx, lastDx * ndx + lastDy * ndy);
        if (back >= lookback && !tentative) turn = Math.max(-MAX_TURN, Math.min(MAX_TURN, (1 - TURN_SMOOTHING) * turn + TURN_SMOOTHING * delta));
        dx = ndx;
        dy = ndy;
        lastDx = ndx;
        lastDy = ndy;
      }
    } else {
      if (coast === 0 && !tentative) {
        const seenSince = lastGap ? (points.length / 2 - lastGap.at) * step : Infinity;
        let g = gapHeading(points, clean, history, step);
        if (lastGap && seenSince < history / 2) {
          // Seen again only briefly since the last gap (a merge seldom lets go cleanly at once):
          // the estimate from before that gap is still the better one. Carry it forward.
          const steps = points.length / 2 - lastGap.at;
          const a = lastGap.turn * steps;
          g = {
            dx: lastGap.dx * Math.cos(a) - lastGap.dy * Math.sin(a),
            dy: lastGap.dx * Math.sin(a) + lastGap.dy * Math.cos(a),
            turn: lastGap.turn,
            length: lastGap.trusted,
          };
        }
        if (g) {
          // Re-predict this step from the longer history, from the last point on the line.
          dx = g.dx * Math.cos(g.turn) - g.dy * Math.sin(g.turn);
          dy = g.dx * Math.sin(g.turn) + g.dy * Math.cos(g.turn);
          turn = g.turn;
          trusted = g.length;
          x = (points[points.length - 2] as number) + step * dx;
          y = (points[points.length - 1] as number) + step * dy;
          coast = step;
          continue;
        }
        // Too little of the line seen to know its curvature: bridge the gap straight.
        turn = 0;
        trusted = 0;
      }
      if (tentative) {
        // The fragment did not hold: back to the gap, coasting past the steps it took.
        points.length = tentative.count * 2;
        clean.length = tentative.count;
        track.length = tentative.trackLength;
        trackPoints.length = tentative.trackLength / 2;
        while (merges.length > 0 && (merges[merges.length - 1] as number) > tentative.count) merges.pop();
        if (disturbedAt > tentative.count) disturbedAt = -1;
        ({ x, y, turn, coast, travelled } = tentative);
        dx = tentative.dx;
        dy = tentative.dy;
        lastDx = dx;
        lastDy = dy;
        skip = tentative.steps + 1;
        tentative = undefined;
        continue;
      }
      x = qx;
      y = qy;
      coast += step;
      // Curvature is trusted over about the length it was measured on, then fades out.
      if (coast > trusted) turn *= trusted > 0 ? Math.exp(-step / trusted) : 0;
      if (coast > limits.maxGap) {
        const what = choice === 'ambiguous' ? 'the line merges with other ink (a crossing line, a label or a dense grid)' : 'no ink of the line\u2019s colour and width lies near its predicted path';
        return { points, dx: lastDx, dy: lastDy, reached: false, reason: `${what} for more than ${Math.round(limits.maxGap)} px`, track, trackPoints, merges: finish() };
      }
    }
    track.push(x, y);
    trackPoints.push(points.length / 2);
    if (meet && !tentative) {
      const met = nearestOnPath(meet, x, y);
      if (met >= 0) return { points, dx: lastDx, dy: lastDy, reached: true, met, track, trackPoints, merges: finish() };
    }
    if (target) {
      const d = Math.hypot(target[0] - x, target[1] - y);
      if (d < arrive || (closest < pass && d > closest + 2 * step)) {
        return { points, dx: lastDx, dy: lastDy, reached: true, track, trackPoints, merges: finish() };
      }
      if (d < closest) closest = d;
    }
    if (travelled > limits.maxTravel) {
      return {
        points,
        track,
        trackPoints,
        merges: finish(),
        dx: lastDx,
        dy: lastDy,
        reached: false,
        reason: target ? `the line was followed for ${Math.round(travelled)} px without reaching the next guide` : `the line was followed for ${Math.round(travelled)} px`,
      };
    }
  }
}
