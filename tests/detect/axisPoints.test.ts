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

describe('tick labels read apart or misread on a scan in a serif face', () => {
  // As read from random-bed scan 21 (192 dpi): positions in level pixels.
  const at = (list: [string, number][]) => list.map(([text, p]) => ({ text, value: Number(text), at: p }));

  it('reads an axis with two misread labels where six agree, both ends among them, and names the two', () => {
    // "25" read as "29", "5" as "2": the head axis 0 … 35.
    const axis = readAxis(at([['30', 261], ['35', 188], ['15', 478], ['10', 551], ['20', 406], ['0', 696], ['29', 333], ['2', 624]]));
    expect(axis!.inliers.map((l) => l.value).sort((a, b) => a - b)).toEqual([0, 10, 15, 20, 30, 35]);
    expect(axis!.outliers.map((l) => l.text).sort()).toEqual(['2', '29']);
    expect(axis!.fragments).toEqual([]);
  });

  it('counts pieces of one print as one odd label, and pieces that join into the line\'s number or lie on a label as fragments', () => {
    // "200" read as "2" and "00"; "500" as "4", "2", "00"; a stray "4" read beside "500" on another axis.
    const flow = readAxis(at([['0', 211], ['100', 343], ['2', 465], ['00', 481], ['300', 606], ['400', 738], ['4', 858], ['2', 860], ['00', 877], ['600', 1002], ['700', 1134], ['800', 1267]]));
    expect(flow!.inliers.map((l) => l.value)).toEqual([0, 100, 300, 400, 600, 700, 800]);
    expect(flow!.fragments!.map((l) => `${l.text}@${l.at}`).sort()).toEqual(['00@481', '2@465']);
    const beside = readAxis(at([['0', 211], ['100', 342], ['200', 474], ['300', 606], ['400', 738], ['4', 858], ['500', 870], ['600', 1002], ['700', 1134], ['800', 1266]]));
    expect(beside!.outliers.map((l) => l.text)).toEqual(['4']);
    expect(beside!.fragments!.map((l) => l.text)).toEqual(['4']);
  });

  it('still leaves an axis unread with two odd labels among fewer than five that agree, or more odd labels than a third of those', () => {
    expect(readAxis(at([['0', 700], ['10', 600], ['20', 500], ['30', 400], ['7', 550], ['9', 450]]))).toBeNull();
    // Seven agree, three odd prints apart from one another: more than a third of seven is too many.
    expect(readAxis(at([['0', 0], ['10', 100], ['20', 200], ['30', 300], ['40', 400], ['50', 500], ['60', 600], ['8', 150], ['3', 350], ['9', 550]]))).toBeNull();
  });
});
