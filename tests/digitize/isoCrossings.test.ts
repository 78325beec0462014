import { describe, expect, it } from 'vitest';
import { isoCrossings } from '../../src/digitize/isoCrossings.ts';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';

const line = (pts: [number, number][]): SheetPoint[] => pts.map(([x, y]) => sheetPoint(x, y));

describe('crossing an iso-trace with the head traces of its panel', () => {
  const head13 = line(Array.from({ length: 51 }, (_, i) => [100 + 8 * i, 100 + 0.0006 * (8 * i) ** 2] as [number, number]));
  const head11 = line(Array.from({ length: 51 }, (_, i) => [100 + 8 * i, 200 + 0.0008 * (8 * i) ** 2] as [number, number]));

  it('finds one crossing per head trace for an iso-line running across them', () => {
    const iso = line([[300, 80], [300, 400]]);
    const got = isoCrossings(iso, [{ key: 13, points: head13 }, { key: 11, points: head11 }]);
    expect(got.map((c) => c.key)).toEqual([13, 11]);
    // Head traces are polylines with vertices on y = y0 + k·(x−100)²; at x = 300 (a vertex) exactly.
    expect(got[0]!.at[0]).toBeCloseTo(300, 9);
    expect(got[0]!.at[1]).toBeCloseTo(100 + 0.0006 * 200 ** 2, 9);
    expect(got[1]!.at[1]).toBeCloseTo(200 + 0.0008 * 200 ** 2, 9);
  });

  it('finds both branches of an efficiency island crossing the same trace twice', () => {
    const island = line([[200, 60], [250, 160], [350, 160], [400, 60]]);
    const got = isoCrossings(island, [{ key: 13, points: head13 }]);
    expect(got).toHaveLength(2);
    expect(got[0]!.at[0]).toBeLessThan(got[1]!.at[0]);
  });

  it('counts an iso-line that ends on a head trace as crossing it there', () => {
    const y = 100 + 0.0006 * 150 ** 2;
    const iso = line([[250, y + 0.5], [260, y + 80]]); // ends 0.5 units below the curve, drawn up to it
    const got = isoCrossings(iso, [{ key: 13, points: head13 }]);
    expect(got).toHaveLength(1);
    expect(got[0]!.touching).toBe(true);
    expect(got[0]!.at[0]).toBeCloseTo(250, 0);
  });

  it('extends an iso-line that stops short of a head curve along its own direction to meet it', () => {
    const y = 100 + 0.0006 * 150 ** 2;
    const iso = line([[262, y + 80], [256, y + 12]]); // heading up towards the curve, 12 units short
    expect(isoCrossings(iso, [{ key: 13, points: head13 }])).toEqual([]); // 2-unit touch alone misses it
    const got = isoCrossings(iso, [{ key: 13, points: head13 }], 2, 20);
    expect(got).toHaveLength(1);
    expect(got[0]!.touching).toBe(true);
    // The extension continues the line's slope (−6 in x per 68 in y): it meets the curve 12 units on, near x = 255.
    expect(got[0]!.at[0]).toBeCloseTo(255, 0);
  });

  it('finds nothing for an iso-line that misses the traces', () => {
    expect(isoCrossings(line([[50, 50], [60, 60]]), [{ key: 13, points: head13 }])).toEqual([]);
  });
});

describe('iso crossings with tolerances in line widths', () => {
  const head = line(Array.from({ length: 51 }, (_, i) => [100 + 8 * i, 100 + 0.0006 * (8 * i) ** 2] as [number, number]));
  const y = 100 + 0.0006 * 150 ** 2;

  it('extends an iso-trace that stops a few head widths short of a thick head curve', () => {
    // Stops 14 units below the curve: beyond the 2-unit touch and a 5-unit data reach, within 4 widths of a 3-unit line.
    const iso = line([[250, y + 80], [250, y + 14]]);
    expect(isoCrossings(iso, [{ key: 13, points: head }], 2, 5)).toEqual([]);
    const got = isoCrossings(iso, [{ key: 13, points: head, width: 3 }], 2, 5, 1);
    expect(got).toHaveLength(1);
    expect(got[0]!.at[0]).toBeCloseTo(250, 6);
    expect(got[0]!.at[1]).toBeCloseTo(y, 1);
  });

  it('does not reach a head curve farther than the widths allow', () => {
    const iso = line([[250, y + 80], [250, y + 30]]);
    expect(isoCrossings(iso, [{ key: 13, points: head, width: 3 }], 2, 5, 1)).toEqual([]);
  });
});

describe('a head curve that ends on an iso-line', () => {
  // A head trace heading right and down that stops 6 units short of an iso-line at x = 300
  // (the maker ended the curve on the iso-line; the follower lost its last pixels there).
  const head = line(Array.from({ length: 25 }, (_, i) => [102 + 8 * i, 100 + 0.0006 * (8 * i) ** 2] as [number, number]));
  const end = head[head.length - 1]!;
  const iso = line([[end[0] + 6, 40], [end[0] + 6, 400]]);

  it('extends the head trace along its own direction to meet the iso-line', () => {
    expect(isoCrossings(iso, [{ key: 13, points: head }])).toEqual([]);
    const got = isoCrossings(iso, [{ key: 13, points: head, width: 2 }], 2, 0, 1);
    expect(got).toHaveLength(1);
    expect(got[0]!.touching).toBe(true);
    expect(got[0]!.at[0]).toBeCloseTo(end[0] + 6, 6);
    // On the head curve's own continuation: y = 100 + 0.0006·(x − 102)², within its curvature over 6 units.
    expect(got[0]!.at[1]).toBeCloseTo(100 + 0.0006 * (end[0] + 6 - 102) ** 2, 0);
  });

  it('does not reach an iso-line farther off than the widths allow', () => {
    const far = line([[end[0] + 40, 40], [end[0] + 40, 400]]);
    expect(isoCrossings(far, [{ key: 13, points: head, width: 2 }], 2, 0, 1)).toEqual([]);
  });
});
