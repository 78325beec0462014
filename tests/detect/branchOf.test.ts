/**
 * Efficiency curves drawn against a right-hand axis rise from the origin as one bunch and part
 * near their peaks (`branchOf` in src/digitize/detect/rasterCurves.ts). The line finder follows the
 * bunch as one line, and each curve that leaves it starts mid-frame, where it was sorted as an
 * iso-line with no level and left out (scan bed seed 72: five efficiency curves, none found).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { branchOf } from '../../src/digitize/detect/rasterCurves.ts';
import { closeTextReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { detectBedScan } from '../../scripts/detectSheets/scanBed.ts';
import { rowsTrack } from './trackOf.ts';

afterAll(async () => closeTextReaderNode());

/** The bunch's line: rising from the bottom of a 1000-px frame, flattening towards a peak near u = 375. */
const rise = (u: number) => 900 - 3 * u + 0.004 * u * u;
const fw = 1000;

describe('branchOf', () => {
  it('gives a line that leaves the trunk on its course the trunk up to there, with a join where it leaves', () => {
    const trunk = rowsTrack(0, 400, rise);
    const leaving = rowsTrack(200, 500, (u) => rise(u) + 0.002 * (u - 200) ** 2);
    const got = branchOf(leaving, [trunk], 3, fw);
    expect(got).not.toBeNull();
    expect(got!.u[0]).toBe(0);
    expect(got!.u.at(-1)).toBe(500);
    // The trunk's columns before 200, then the line's own.
    expect(got!.joins).toContain(200);
    expect(got!.v[100]).toBeCloseTo(rise(100), 9);
    expect(got!.v[350]).toBeCloseTo(rise(350) + 0.002 * 150 ** 2, 9);
  });

  it('keeps a line that starts beside the steep bunch, rising with it, as it was found', () => {
    const trunk = rowsTrack(0, 400, rise);
    // Seven rows below the trunk where its slope is near −2.2 rows per column: about 3 px across.
    const hidden = rowsTrack(100, 450, (u) => rise(u) + 7 + 0.01 * (u - 100));
    expect(branchOf(hidden, [trunk], 3, fw)).toBe(hidden);
  });

  it('leaves a falling line that starts on the trunk (a head curve broken at a crossing) alone', () => {
    const trunk = rowsTrack(0, 400, rise);
    const head = rowsTrack(150, 600, (u) => rise(150) + 0.4 * (u - 150));
    expect(branchOf(head, [trunk], 3, fw)).toBeNull();
  });

  it('leaves a line that starts away from every trunk alone (an iso-line, or a curve of its own)', () => {
    const trunk = rowsTrack(0, 400, rise);
    const far = rowsTrack(150, 500, (u) => rise(u) - 60);
    expect(branchOf(far, [trunk], 3, fw)).toBeNull();
    // Nor is a line starting at the trunk's own start a branch of it.
    expect(branchOf(rowsTrack(2, 300, rise), [trunk], 3, fw)).toBeNull();
  });
});

describe('a scan of the random bed with efficiency curves against the head panel\'s right-hand axis', () => {
  it('seed 72: every diameter gets its efficiency curve, and no iso level is asked for', { timeout: 180_000 }, async () => {
    const { plan, found } = await detectBedScan(72);
    const efficiency = found.takeoff.traces.filter((t) => t.quantity === 'efficiency');
    expect(efficiency.map((t) => t.diameter).sort()).toEqual([...plan.family.diameters].sort());
    expect(found.questions.join(' ')).not.toMatch(/no level|iso_levels/);
  });
});
