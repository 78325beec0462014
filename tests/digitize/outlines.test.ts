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

describe('the ends of a filled dash', () => {
  // A straight dash 6 long and 1 wide at −20°, butt caps: its centre line starts and ends at the
  // middles of its caps, however the outline's corners are written.
  const ang = -0.35;
  const [ux, uy, nx, ny] = [Math.cos(ang), Math.sin(ang), -Math.sin(ang), Math.cos(ang)];
  const corners = [P(0, 0), P(6 * ux, 6 * uy), P(6 * ux + nx, 6 * uy + ny), P(nx, ny)];
  const start = P(nx / 2, ny / 2);
  const end = P(6 * ux + nx / 2, 6 * uy + ny / 2);
  const near = (a: SheetPoint | undefined, b: SheetPoint) => Math.hypot(a![0] - b[0], a![1] - b[1]);

  it('starts at the middle of the cap when the ring is closed a hair off its first corner', () => {
    const line = centrelineOf([...corners, P(1e-4, 0)])!;
    expect(near(line.points[0], start)).toBeLessThan(1e-9);
    expect(near(line.points.at(-1), end)).toBeLessThan(1e-9);
  });

  it('ends at the middle of a cap edge written in two halves', () => {
    const half = P((corners[1]![0] + corners[2]![0]) / 2, (corners[1]![1] + corners[2]![1]) / 2);
    const line = centrelineOf([corners[0]!, corners[1]!, half, corners[2]!, corners[3]!])!;
    expect(near(line.points[0], start)).toBeLessThan(1e-9);
    expect(near(line.points.at(-1), end)).toBeLessThan(1e-9);
  });

  it('tells the cap from a side edge as short as it, where the outline turns at a join', () => {
    // The outline of one dash of an invented test sheet's dashed NPSHr curve, a join of the
    // drawn polyline inside it (seed 133 of the vector bed): its first side edge (1.05 long) is
    // nearer the width its area gives (1.27) than its cap (1.54). The centre line used to start
    // at the cap's corner, 0.8 off the line; it starts at the cap's middle.
    const ring = [
      [469.04775572489734, 843.7943679180717], [470.02979608925244, 843.433467054203], [471.2799028486881, 842.9692947102623], [472.523509364254, 842.5048477081299],
      [473.7774155620079, 842.0393020732307], [474.04497841707035, 842.7600051682014], [473.61857157448577, 842.1203262397765], [473.6187089035816, 842.120234687046],
      [474.4715225887508, 843.3995925438957], [474.471385259655, 843.3996840966263], [474.3125412721329, 843.4807082631721], [473.0614732090263, 843.9451552653045],
      [471.8150285588131, 844.4107009002037], [470.5601610573883, 844.8765211932945], [469.5781206930332, 845.2374220571633], [469.04775572489734, 843.7943679180717],
    ].map(([x, y]) => P(x!, y!));
    const line = centrelineOf(ring)!;
    expect(near(line.points[0], P((469.04775572489734 + 469.5781206930332) / 2, (843.7943679180717 + 845.2374220571633) / 2))).toBeLessThan(1e-9);
  });
});
