/**
 * Head and power lines the finder cut short (at a label, or at a crossing with an iso-line or an
 * efficiency curve) are followed by the tracer to their drawn ends. Its stretch past the cut counts
 * as the line's own rest when it carries the line's course on step by step as the line bends
 * (`carriesOnAsItBends` in src/digitize/detect/rasterLines.ts); before, only a stretch within
 * twice 15 % of the frame past the cut could count, and the curves were proposed unsure (scan bed
 * seed 76: four head curves right within 0.03 % of span, all asked about).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { carriesOnAsItBends, continuesCourse } from '../../src/digitize/detect/rasterLines.ts';
import { closeTextReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { detectBedScan } from '../../scripts/detectSheets/scanBed.ts';
import { rowsTrack } from './trackOf.ts';

afterAll(async () => closeTextReaderNode());

/** Points every `step` columns from a to b (inclusive of a), as the tracer gives them. */
const points = (a: number, b: number, v: (u: number) => number, step = 12): [number, number][] => {
  const out: [number, number][] = [];
  for (let u = a; step > 0 ? u <= b : u >= b; u += step) out.push([u, v(u)]);
  return out;
};
/** A falling head curve in a 1000-px frame (rows grow downwards): level at shut-off, steeper towards run-out. */
const head = (u: number) => 300 + 0.0004 * u * u;
const fw = 1000;
const reach = 0.15 * fw;
const tol = 3;

describe('carriesOnAsItBends', () => {
  it('takes the rest of a bending line far past the cut, where the fixed course does not', () => {
    const t = rowsTrack(0, 400, head);
    const rest = points(412, 1000, head);
    expect(carriesOnAsItBends(t, rest, 'end', tol, reach)).toBe(true);
    expect(continuesCourse(t, rest, 'end', tol, reach)).toBe(false);
  });

  it('refuses a tracer that turns off onto a steep iso-line at a crossing', () => {
    const t = rowsTrack(0, 400, head);
    const turn = (u: number) => (u <= 550 ? head(u) : head(550) - 1.5 * (u - 550));
    expect(carriesOnAsItBends(t, points(412, 900, turn), 'end', tol, reach)).toBe(false);
  });

  it('refuses a tracer that jumps to a neighbour line running beside it', () => {
    const t = rowsTrack(0, 400, head);
    const jump = (u: number) => (u <= 600 ? head(u) : head(u) + 15);
    expect(carriesOnAsItBends(t, points(412, 900, jump), 'end', tol, reach)).toBe(false);
  });

  it('works towards the start as towards the end', () => {
    const t = rowsTrack(600, 1000, head);
    expect(carriesOnAsItBends(t, points(588, 0, head, -12), 'start', tol, reach)).toBe(true);
    const jump = (u: number) => (u >= 300 ? head(u) : head(u) - 15);
    expect(carriesOnAsItBends(t, points(588, 0, jump, -12), 'start', tol, reach)).toBe(false);
  });

  it('judges nothing without points', () => {
    expect(carriesOnAsItBends(rowsTrack(0, 400, head), [], 'end', tol, reach)).toBe(false);
  });

  it('on bed scan 27, the larger head curve cut short is sure, and its power curve is found', async () => {
    const { found } = await detectBedScan(27);
    const heads = found.takeoff.traces.filter((t) => t.quantity === 'head');
    expect(heads.map((t) => t.diameter).sort()).toEqual([194, 240]);
    for (const t of heads) expect(t.confidence ?? 0).toBeGreaterThanOrEqual(0.5);
    expect(found.takeoff.traces.filter((t) => t.quantity === 'power').map((t) => t.diameter).sort()).toEqual([194, 240]);
  }, 60_000);
});
