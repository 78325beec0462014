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
import { findRuns, sampleSection, type ReadCounter, type Run } from './lineProfile.ts';
import type { RasterImage } from './raster.ts';

export interface LineStyle {
  model: InkModel;
  /** Cross-section mass of the line (≈ its width) in pixels. */
  width: number;
  /** Membership at which a sample counts as line. */
  threshold: number;
}

export interface FollowLimits {
  /** Longest stretch bridged on the prediction alone, pixels. */
  maxGap: number;
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
  /** Why the follower stopped before its target (undefined when it reached it). */
  reason?: string;
}

/** Step length, section spacing and section half-width derived from the line width. */
export function stepping(width: number): { step: number; spacing: number; half: number; accept: number } {
  const step = Math.min(3, Math.max(1.5, 0.8 * width));
  const spacing = width < 2.5 ? 0.5 : 1;
  const half = Math.max(2 * width + 2, 5);
  const accept = Math.max(0.6 * width, 1.5);
  return { step, spacing, half, accept };
}

const MAX_TURN = 0.35;
const TURN_SMOOTHING = 0.35;

/** The run that continues the line, or 'ambiguous' when a too-wide run covers the prediction. */
function chooseRun(runs: Run[], style: LineStyle, allowed: number): Run | 'ambiguous' | undefined {
  let best: Run | undefined;
  let bestOff = Infinity;
  let covered = false;
  const lo = 0.45 * style.width;
  const hi = 1.45 * style.width;
  for (const run of runs) {
    if (run.mass < lo) continue;
    if (run.mass > hi) {
      if (run.start - allowed <= 0 && run.end + allowed >= 0) covered = true;
      continue;
    }
    const off = Math.abs(run.centre);
    if (off <= allowed && off < bestOff) {
      best = run;
      bestOff = off;
    }
  }
  if (best) return best;
  return covered ? 'ambiguous' : undefined;
}

/**
 * Follows the line from (x0, y0) heading (dx, dy) until it comes to `target` (when given),
 * loses the line for longer than `limits.maxGap`, leaves the image or travels too far.
 */
export function followLine(
  image: RasterImage,
  style: LineStyle,
  start: readonly [number, number],
  heading: readonly [number, number],
  target: readonly [number, number] | undefined,
  limits: FollowLimits,
  counter?: ReadCounter,
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
  const lookback = Math.max(2, Math.ceil(Math.max(6, 2 * style.width) / step));
  const maxN = Math.ceil((half + limits.maxGap * 0.12) / spacing) + 1;
  const section = new Float64Array(2 * maxN + 1);
  const arrive = Math.max(1.5 * step, 0.75 * style.width);
  const pass = Math.max(4 * step, 3 * style.width, 8);
  let closest = Infinity;
  let lastDx = dx;
  let lastDy = dy;

  for (;;) {
    const c = Math.cos(turn);
    const s = Math.sin(turn);
    const pdx = dx * c - dy * s;
    const pdy = dx * s + dy * c;
    const qx = x + step * pdx;
    const qy = y + step * pdy;
    travelled += step;
    if (qx < 0 || qy < 0 || qx > image.width || qy > image.height) {
      return { points, dx, dy, reached: false, reason: 'the line runs off the image' };
    }
    const nx = -pdy;
    const ny = pdx;
    const extra = coast * 0.12;
    const n = Math.min(maxN, Math.ceil((half + extra) / spacing));
    sampleSection(image, style.model, qx, qy, nx, ny, n, spacing, section, counter);
    const runs = findRuns(section, n, spacing, style.threshold);
    const choice = chooseRun(runs, style, accept + extra);
    dx = pdx;
    dy = pdy;
    if (typeof choice === 'object') {
      x = qx + nx * choice.centre;
      y = qy + ny * choice.centre;
      points.push(x, y);
      coast = 0;
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
        if (back >= lookback) turn = Math.max(-MAX_TURN, Math.min(MAX_TURN, (1 - TURN_SMOOTHING) * turn + TURN_SMOOTHING * delta));
        dx = ndx;
        dy = ndy;
        lastDx = ndx;
        lastDy = ndy;
      }
    } else {
      x = qx;
      y = qy;
      coast += step;
      turn *= 0.97;
      if (coast > limits.maxGap) {
        const what = choice === 'ambiguous' ? 'the line merges with other ink (a crossing line, a label or a dense grid)' : 'no ink of the line\u2019s colour and width lies near its predicted path';
        return { points, dx: lastDx, dy: lastDy, reached: false, reason: `${what} for more than ${Math.round(limits.maxGap)} px` };
      }
    }
    if (target) {
      const d = Math.hypot(target[0] - x, target[1] - y);
      if (d < arrive || (closest < pass && d > closest + 2 * step)) {
        return { points, dx: lastDx, dy: lastDy, reached: true };
      }
      if (d < closest) closest = d;
    }
    if (travelled > limits.maxTravel) {
      return {
        points,
        dx: lastDx,
        dy: lastDy,
        reached: false,
        reason: target ? `the line was followed for ${Math.round(travelled)} px without reaching the next guide` : `the line was followed for ${Math.round(travelled)} px`,
      };
    }
  }
}
