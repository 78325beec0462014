import { describe, expect, it } from 'vitest';
import { centrelineOf } from '../../src/digitize/outlines.ts';
import { captureVector, strokeLines } from '../../src/digitize/vectorCapture.ts';
import { distanceToPolyline, resampleEvenly } from '../../src/digitize/polyline.ts';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import type { PathSegment, VectorPath } from '../../src/digitize/sheet.ts';

const P = sheetPoint;

/** The filled outlines of a dashed stroke along `line` (butt caps), as some programs write dashed lines. */
function dashOutlines(line: SheetPoint[], width: number, dash: number, gap: number): PathSegment[] {
  const fine = resampleEvenly(line, 4000);
  const segs: PathSegment[] = [];
  let s = 0;
  const step = Math.hypot(fine[1]![0] - fine[0]![0], fine[1]![1] - fine[0]![1]);
  let i = 0;
  while (i < fine.length - 1) {
    const start = i;
    while (i < fine.length - 1 && (i - start) * step < dash) i++;
    const part = fine.slice(start, i + 1);
    const left: SheetPoint[] = [];
    const right: SheetPoint[] = [];
    part.forEach((p, k) => {
      const a = part[Math.max(0, k - 1)]!;
      const b = part[Math.min(part.length - 1, k + 1)]!;
      const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
      const nx = -(b[1] - a[1]) / len;
      const ny = (b[0] - a[0]) / len;
      left.push(P(p[0] + (nx * width) / 2, p[1] + (ny * width) / 2));
      right.push(P(p[0] - (nx * width) / 2, p[1] - (ny * width) / 2));
    });
    const ring = [...left, ...right.reverse()];
    segs.push({ kind: 'move', to: ring[0]! }, ...ring.slice(1).map((to) => ({ kind: 'line' as const, to })), { kind: 'close' });
    s = i * step + gap;
    i = Math.min(fine.length - 1, Math.ceil(s / step));
  }
  return segs;
}

const filled = (segments: PathSegment[]): VectorPath => ({ segments, stroke: null, fill: '#208020', lineWidth: 0, dashed: false });

describe('lines drawn as filled outlines', () => {
  it('turns a thin closed outline back into its centre line', () => {
    // A 10 × 1 strip along y = 5 from x = 0 to 10 (butt caps), listed from a corner.
    const c = centrelineOf([P(0, 4.5), P(10, 4.5), P(10, 5.5), P(0, 5.5)])!;
    expect(c.width).toBeCloseTo(1, 9);
    expect(c.points[0]![0]).toBeCloseTo(0, 9);
    expect(c.points.at(-1)![0]).toBeCloseTo(10, 9);
    for (const p of c.points) expect(p[1]).toBeCloseTo(5, 9);
  });

  it('leaves shapes that are not thin strips alone', () => {
    expect(centrelineOf([P(0, 0), P(10, 0), P(10, 8), P(0, 8)])).toBeNull();
  });

  it('follows the right one of two dashed curves that cross at a shallow angle', () => {
    const a = Array.from({ length: 200 }, (_, k) => P(100 + k, 300 - 0.6 * k + 0.0008 * k * k));
    const b = Array.from({ length: 200 }, (_, k) => P(100 + k, 290 - 0.5 * k + 0.0006 * k * k));
    const lines = strokeLines([filled(dashOutlines(a, 0.9, 4.5, 2.25)), filled(dashOutlines(b, 0.9, 4.5, 2.25))]);
    for (const truth of [a, b]) {
      const got = captureVector(lines, [truth[3]!, truth[100]!, truth[196]!]);
      // Every captured point on the drawn centre line (0.02 sheet units: outline polygons of a fine polyline).
      expect(Math.max(...got.points.map((p) => distanceToPolyline(truth, p)))).toBeLessThan(0.02);
      expect(got.points.at(-1)![0] - got.points[0]![0]).toBeGreaterThan(190);
    }
  });
});
