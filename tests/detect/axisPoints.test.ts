/**
 * Tick labels whose decimal point was lost in reading a scan ("75" beside "10.0"): restored only
 * when the labels then make one evenly spaced axis; anything else stays unread.
 */
import { describe, expect, it } from 'vitest';
import { pointsRestored, readAxis } from '../../src/digitize/detect/robustAxis.ts';

const labels = (texts: string[], at0 = 1000, step = -80) => texts.map((text, i) => ({ text, value: Number(text), at: at0 + i * step }));

describe('tick labels with a lost decimal point', () => {
  it('reads "0.0 25 50 75 10.0" as 0, 2.5, 5, 7.5, 10', () => {
    const axis = readAxis(labels(['0.0', '25', '50', '75', '10.0']));
    expect(axis).not.toBeNull();
    expect(axis!.inliers.map((l) => l.value)).toEqual([0, 2.5, 5, 7.5, 10]);
    expect(axis!.outliers).toEqual([]);
  });

  it('leaves an axis whose labels do not fall on one line even then', () => {
    // "0.0 25 50 80 10.0": 8 is no tick of this axis, and an odd label is not restored into one.
    expect(readAxis(labels(['0.0', '25', '50', '80', '10.0']))).toBeNull();
  });

  it('restores nothing without a label that prints a point, or with two kinds of decimals', () => {
    expect(pointsRestored(labels(['0', '25', '50', '75', '100']))).toBeNull();
    expect(pointsRestored(labels(['0.0', '0.25', '50', '75']))).toBeNull();
  });

  it('restores the points where two labels print one and the axis needs an odd label without them', () => {
    // "0.0 25 5.0 75": read as printed, 0, 25, 75 make an axis with "5.0" odd; restored, every label fits.
    const axis = readAxis(labels(['0.0', '25', '5.0', '75']));
    expect(axis!.inliers.map((l) => l.value)).toEqual([0, 2.5, 5, 7.5]);
    expect(axis!.outliers).toEqual([]);
    // One label with a point is not enough to overrule the others: "5.0" stays the odd one.
    const one = readAxis(labels(['0', '25', '5.0', '75']));
    expect(one!.inliers.map((l) => l.value)).toEqual([0, 25, 75]);
    expect(one!.outliers.map((l) => l.text)).toEqual(['5.0']);
  });

  it('keeps an axis that reads right as it is', () => {
    const axis = readAxis(labels(['0', '25', '50', '75', '100']));
    expect(axis!.inliers.map((l) => l.value)).toEqual([0, 25, 50, 75, 100]);
  });
});
