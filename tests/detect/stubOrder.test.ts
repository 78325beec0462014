/**
 * Iso-line stubs without a "%" label on a vector sheet whose iso levels are given: a stub is read
 * as an iso-line only where it takes its place in the order of the panel's iso-lines without
 * moving any other line's level (`labelledStubs` in labels.ts). Nested iso-lines cross the head
 * curves left branches rising, right branches falling: 60 %, 63 %, 63 %, 60 % from left to right.
 */
import { describe, expect, it } from 'vitest';
import type { FoundCurve } from '../../src/digitize/detect/curves.ts';
import { labelledStubs } from '../../src/digitize/detect/labels.ts';
import { sheetPoint } from '../../src/digitize/points.ts';

const panel = { id: 'head', quantity: 'head', frame: [0, 0, 600, 400] } as unknown as FoundCurve['panel'];
/** A line rising to the right whose lower end (where it meets the smallest head curve) stands at `x`. */
const line = (id: number, x: number, rise = 100): FoundCurve => ({ id, panel, quantity: 'efficiency', kind: 'iso', points: [sheetPoint(x, 300), sheetPoint(x + 10, 300 - rise)] });

describe('labelledStubs with the levels given', () => {
  const isos = [line(1, 100), line(2, 200), line(3, 400)];

  // Three lines read 60, 63 and 63 % (the right branch of 60 % missing); a stub right of them, where
  // that branch clips the last head curve's end, is the right branch of 60 %.
  it("reads a stub that takes a level's missing branch, the other lines keeping theirs", () => {
    const stub = line(9, 500, 8);
    const { read, questions } = labelledStubs([stub], isos, [], [60, 63]);
    expect(read).toEqual([stub]);
    expect(questions).toEqual([]);
  });

  // Left of every line, the stub would take 60 % and move every other line's level along.
  it('asks about a stub that would move the other lines in the order', () => {
    const stub = line(9, 50, 8);
    const { read, questions } = labelledStubs([stub], isos, [], [60, 63]);
    expect(read).toEqual([]);
    expect(questions).toHaveLength(1);
    expect(questions[0]).toMatch(/^A short line on panel "head" from \[50, 300\] to \[60, 292\] meets a head curve/);
  });

  it('asks about a stub where the levels are not given', () => {
    expect(labelledStubs([line(9, 500, 8)], isos, []).read).toEqual([]);
  });

  // Both branches of both levels found: a fifth line has no place in the order.
  it('asks about a stub where every level has both its branches', () => {
    const full = [line(1, 100), line(2, 200), line(3, 400), line(4, 500)];
    expect(labelledStubs([line(9, 550, 8)], full, [], [60, 63]).read).toEqual([]);
  });
});
