import { describe, expect, it } from 'vitest';
import { clipPolyline, resampleEvenly, slice, nearestOnPolyline, intersections, distanceToPolyline } from '../../src/digitize/polyline.ts';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';

const line = (pts: [number, number][]): SheetPoint[] => pts.map(([x, y]) => sheetPoint(x, y));

describe('polyline geometry', () => {
  const zig = line([[0, 0], [10, 0], [10, 10], [20, 10]]);

  it('finds the nearest point and its position along the line', () => {
    const pos = nearestOnPolyline(zig, [12, 4]);
    expect(pos.segment).toBe(1);
    expect(pos.t).toBeCloseTo(0.4, 12);
    expect(pos.distance).toBeCloseTo(2, 12);
  });

  it('slices between two positions in either order', () => {
    const a = nearestOnPolyline(zig, [5, -1]);
    const b = nearestOnPolyline(zig, [15, 11]);
    expect(slice(zig, a, b)).toEqual([[5, 0], [10, 0], [10, 10], [15, 10]]);
    expect(slice(zig, b, a)).toEqual([[15, 10], [10, 10], [10, 0], [5, 0]]);
  });

  it('resamples evenly by arc length with every point on the line', () => {
    const out = resampleEvenly(zig, 7); // length 30: a point every 5 units
    expect(out).toHaveLength(7);
    expect(out[1]).toEqual([5, 0]);
    expect(out[3]).toEqual([10, 5]);
    expect(out[6]).toEqual([20, 10]);
    for (const p of out) expect(distanceToPolyline(zig, p)).toBeLessThan(1e-12);
  });

  it('clips to a box, splitting where the line leaves and comes back', () => {
    const wave = line([[0, 5], [10, 5], [10, 20], [20, 20], [20, 5], [30, 5]]);
    const parts = clipPolyline(wave, [5, 0, 25, 10]);
    expect(parts).toEqual([
      [[5, 5], [10, 5], [10, 10]],
      [[20, 10], [20, 5], [25, 5]],
    ]);
  });

  it('finds each crossing of two polylines once, even through a shared vertex', () => {
    const v = line([[5, -5], [5, 5]]);
    expect(intersections(zig, v).map((c) => c.point)).toEqual([[5, 0]]);
    const throughVertex = line([[8, 2], [10, 0], [12, -2]]);
    expect(intersections(zig, throughVertex)).toHaveLength(1);
  });
});
