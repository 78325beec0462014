/**
 * A line's last stretch past a label printed over it is kept by the scan line finder though it is
 * shorter than a line (`frameLines` in src/digitize/detect/rasterLines.ts). Scan bed seed 42: a
 * label's box cut the two largest NPSHr lines of a bunch where they end, the stretches past it
 * (about 9 % of the frame's width) were dropped as too short for lines, and those two NPSHr curves
 * were never found.
 */
import { describe, expect, it } from 'vitest';
import { frameLines } from '../../src/digitize/detect/rasterLines.ts';
import type { InkMap } from '../../src/digitize/detect/ink.ts';
import { inkPicture } from './inkPicture.ts';

/** A 1000 × 400 page with straight lines of ink 3 px wide drawn from point to point. */
const picture = (lines: [number, number, number, number][]): InkMap => inkPicture(1000, 400, lines);
const frame = [0, 0, 1000, 400] as const;
const grid = { x: [], y: [] };
/** A stretch 90 columns long (9 % of the frame's width), rising to the right. */
const stretch: [number, number, number, number] = [820, 200, 910, 170];

describe('the stretch of a line past a label', () => {
  it('is kept where it starts by a label\'s box', () => {
    const label = [730, 190, 810, 215] as const;
    const found = frameLines(picture([stretch]), frame, { grid, holes: [label], pastLabels: true });
    // Not in a head frame, where the stretch of an iso-line past its "%" label would count as a line.
    expect(frameLines(picture([stretch]), frame, { grid, holes: [label] })).toHaveLength(0);
    expect(found).toHaveLength(1);
    expect(found[0]!.u[0]).toBeLessThan(825);
  });

  it('is dropped, as a speck too short for a line, where no label stands by it', () => {
    expect(frameLines(picture([stretch]), frame, { grid, pastLabels: true })).toHaveLength(0);
    // Nor does a label far from it keep it.
    expect(frameLines(picture([stretch]), frame, { grid, holes: [[300, 50, 380, 75]], pastLabels: true })).toHaveLength(0);
  });
});
