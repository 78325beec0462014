/**
 * Letters printed over a solid line are not its dash pattern. A guide clicked on a diameter label
 * printed on its head curve ("256 mm") reads the glyphs as dashes, wider than the line and darker;
 * of two samples the guides vouch for equally a dash pattern used to win, and the trace followed
 * the label's model off the line. A dash pattern read under one guide, clearly wider than a clean
 * solid sample of the same ink (or a fainter reading of it) under another, now counts only where
 * the line's own band shows it at that solid sample too: a line is dashed all along or nowhere.
 * Invented sheets of the random bed (scripts/randomSheets).
 */
import { describe, expect, it } from 'vitest';
import { bedLineTrace, distanceToLine } from './fixtures/bedTrace.ts';

describe('a guide on a label printed over a solid line', () => {
  it.each([
    // Scan 84, hurried guides: one guide on the "2" of "256 mm"; 2.33 % of span off, half the line.
    { seed: 84, id: 'head-256', careful: false },
    // Scan 117, careful guides: the middle guide on the label; 5.28 % of span off.
    { seed: 117, id: 'head-9.25', careful: true },
  ])('leaves the line solid and follows it end to end (random bed scan $seed, $id)', async ({ seed, id, careful }) => {
    const { got, line, width } = await bedLineTrace(seed, id, { careful });
    expect(got.line.dashed).toBeUndefined();
    expect(got.points.filter((p) => distanceToLine(line, p) > Math.max(2, width))).toEqual([]);
  });
});
