/**
 * A line lost where a line of its own colour crosses it must not be found again on that line.
 * An efficiency curve crossed by the head curve of its own diameter (one colour for both), just
 * where it runs into a bunch of efficiency curves of other colours, is hidden beyond the crossing
 * while the head curve goes on in plain view. Coasting through the crossing on a heading the
 * crossing's edges had bent towards the head curve, the follower found the head curve near its
 * prediction and took it for the line. The line found again after a gap is now held against the
 * course of the line's own clean points before the gap (`leavesCourse` in lineFollow.ts), and one
 * that runs across that course is passed over.
 */
import { describe, expect, it } from 'vitest';
import { bedLineTrace, distanceToLine as distance } from './fixtures/bedTrace.ts';

const carefulTrace = (seed: number, id: string) => bedLineTrace(seed, id, { careful: true });

describe('a line found again after a crossing of its own colour', () => {
  it('is not the crossing head curve (random bed scan 61, efficiency 11.5 in, careful guides)', async () => {
    // Invented sheet: pink head and efficiency curves of one diameter cross where the efficiency
    // curves of the other diameters bunch; the trace ran 6 px down the head curve and back, 3.0
    // points of efficiency off.
    const { got, line, width } = await carefulTrace(61, 'efficiency-11.5');
    const off = got.points.filter((p) => distance(line, p) > Math.max(2, width));
    expect(off.length).toBeLessThanOrEqual(3);
    expect(Math.max(...got.points.map((p) => distance(line, p)))).toBeLessThan(4);
  });

  it('is not the crossing head curve (random bed scan 82, efficiency 12.75 in, careful guides)', async () => {
    // The same on another sheet: the trace 16.7 points of efficiency off. Since the faint olive
    // line takes its head curve's colour (read dashed there), the trace runs the whole line with no
    // stretch lost (0.15 points off against 0.53), a few points 2-3 px off where it crosses the bunch.
    const { got, line, width } = await carefulTrace(82, 'efficiency-12.75');
    expect(got.points.filter((p) => distance(line, p) > Math.max(2, width)).length).toBeLessThanOrEqual(6);
    expect(Math.max(...got.points.map((p) => distance(line, p)))).toBeLessThan(4);
  });
});
