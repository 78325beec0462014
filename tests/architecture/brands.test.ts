/**
 * Branded coordinate spaces guard their conversions: a data point cannot be handed to a function
 * that wants sheet coordinates, nor the other way round. The `@ts-expect-error` lines are checked
 * by `npm run typecheck` (tsconfig.json covers tests/): if a brand stopped guarding, the expected
 * error would vanish and the type check would fail.
 */
import { describe, expect, it } from 'vitest';
import { calibrate } from '../../src/digitize/calibration.ts';
import { dataPoint, pixelPoint, sheetPoint, type DataPoint, type SheetPoint } from '../../src/digitize/points.ts';
import { toPixel, toSheet as pixelToSheet } from '../../src/digitize/raster.ts';

const cal = calibrate([{ at: [0, 100], x: 0, y: 0 }, { at: [100, 100], x: 50, y: 0 }, { at: [0, 0], x: 0, y: 80 }]);

describe('sheet and data points do not mix', () => {
  it('toData takes sheet coordinates only, and toSheet data values only', () => {
    const s: SheetPoint = sheetPoint(20, 60);
    const d: DataPoint = cal.toData(s);
    // @ts-expect-error a data point is not a sheet point
    cal.toData(d);
    // @ts-expect-error a sheet point is not a data point
    cal.toSheet(s);
    // @ts-expect-error a data point cannot be assigned to a sheet point
    const wrong: SheetPoint = d;
    void wrong;
    // Plain pairs read from a file are accepted: the file says which space they are in.
    expect(cal.toData([20, 60])).toEqual(d);
    expect(cal.toSheet([10, 32])[0]).toBeCloseTo(20, 12);
  });

  it('toSheet(toData(p)) gives p back (tolerance 1e-9 sheet units)', () => {
    for (const [x, y] of [[0, 0], [20, 60], [99.5, 0.25]] as const) {
      const back = cal.toSheet(cal.toData(sheetPoint(x, y)));
      expect(back[0]).toBeCloseTo(x, 9);
      expect(back[1]).toBeCloseTo(y, 9);
    }
    expect(cal.toData(cal.toSheet(dataPoint(25, 40)))[1]).toBeCloseTo(40, 9);
  });

  it('pixels and sheet points convert only through the raster scale', () => {
    const image = { scale: 2 };
    const px = toPixel(image, sheetPoint(10, 20));
    expect([px[0], px[1]]).toEqual([20, 40]);
    expect(pixelToSheet(image, px)).toEqual(sheetPoint(10, 20));
    // @ts-expect-error a data point is not a sheet point
    toPixel(image, dataPoint(1, 2));
    // @ts-expect-error a sheet point is not a pixel point
    pixelToSheet(image, sheetPoint(1, 2));
    void pixelPoint;
  });
});
