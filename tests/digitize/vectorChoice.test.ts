import { describe, expect, it } from 'vitest';
import { captureTrace, type CaptureSource } from '../../src/digitize/capture.ts';
import { captureVector, strokeLines } from '../../src/digitize/vectorCapture.ts';
import { distanceToPolyline } from '../../src/digitize/polyline.ts';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import type { PathSegment, VectorPath } from '../../src/digitize/sheet.ts';

const P = sheetPoint;
type XY = [number, number];

/**
 * An invented speed family's efficiency curves: one shape stretched along flow by n/n_rated
 * (η constant along Q/n), each its own stroked path in its own colour. They start together at
 * zero flow and cross near their peaks, where a hand-placed guide may lie nearer another path.
 */
const RATIOS = [1, 0.9, 0.8, 0.7];
const COLOURS = ['#d62728', '#1f5fbf', '#2ca02c', '#9467bd'];
function efficiencyCurve(ratio: number): XY[] {
  const out: XY[] = [];
  for (let i = 0; i <= 300; i++) {
    const x = i / 300; // fraction of this speed's own flow range
    out.push([50 + 400 * ratio * x, 400 - 300 * (1.9 * x - 0.95 * x * x)]);
  }
  return out;
}
const curves = RATIOS.map(efficiencyCurve);
function path(points: readonly XY[], stroke: string): VectorPath {
  const segments: PathSegment[] = points.map((p, i) => ({ kind: i === 0 ? 'move' : 'line', to: P(p[0], p[1]) }));
  return { segments, stroke, fill: null, lineWidth: 1, dashed: false };
}
const lines = strokeLines(curves.map((c, k) => path(c, COLOURS[k] as string)));

/** A guide on curve k at fraction f of its points, pushed `by` sheet units (or, below 0, that share of the gap) toward curve `toward`. */
function guideOn(k: number, f: number, toward: number, by: number): SheetPoint {
  const c = curves[k] as XY[];
  const p = c[Math.round(f * (c.length - 1))] as XY;
  // Nearest point of the other curve, and a step toward it.
  let q = p;
  let best = Infinity;
  for (const r of curves[toward] as XY[]) {
    const d = Math.hypot(r[0] - p[0], r[1] - p[1]);
    if (d < best) [best, q] = [d, r];
  }
  const step = by < 0 ? -by * best : by;
  return P(p[0] + ((q[0] - p[0]) / best) * step, p[1] + ((q[1] - p[1]) / best) * step);
}

/** Guides of the four traces: clear ones for the other curves, and one in the bunch for the slowest. */
function takeoffGuides(): SheetPoint[][] {
  return [
    [guideOn(0, 0.5, 1, 0.3), guideOn(0, 0.9, 1, 0.3)],
    [guideOn(1, 0.95, 0, 0.2)],
    [guideOn(2, 0.6, 3, 0.2), guideOn(2, 0.95, 3, 0.2)],
    // At 5 % of its range the slowest curve is within 2 points of the next one; the click lands 60 % of the way to it.
    [guideOn(3, 0.05, 2, -0.6)],
  ];
}

describe('choosing among near lines by the other traces', () => {
  const guides = takeoffGuides();
  const own = guides[3] as SheetPoint[];

  it('the bunch guide lies nearer another curve (the case being tested)', () => {
    const d = curves.map((c) => distanceToPolyline(c, own[0] as SheetPoint));
    expect(d[2]).toBeLessThan(d[3] as number);
    expect(d[3]).toBeLessThan(1.5); // still a fair click on its own curve, sheet units
  });

  it('without the other traces, the nearest path is taken, as before', () => {
    expect(captureVector(lines, own).stroke).toBe(COLOURS[2]);
  });

  it('with the other traces, the path no other trace claims is taken, and the choice says so', () => {
    const got = captureVector(lines, own, { wholeLine: true, siblings: guides.slice(0, 3) });
    expect(got.stroke).toBe(COLOURS[3]);
    expect(got.ambiguous).toEqual({ bySiblings: true, unresolved: 0 });
    // The whole slowest curve, exactly (vector geometry: no error beyond rounding).
    expect(Math.max(...got.points.map((p) => distanceToPolyline(curves[3] as XY[], p)))).toBeLessThan(1e-9);
  });

  it('does not depend on the order of the traces', () => {
    const reversed = [...guides.slice(0, 3)].reverse();
    expect(captureVector(lines, own, { siblings: reversed }).stroke).toBe(COLOURS[3]);
    // And every trace, each with the others as siblings, gets its own path.
    guides.forEach((g, k) => expect(captureVector(lines, g, { siblings: guides.filter((_, j) => j !== k) }).stroke).toBe(COLOURS[k]));
  });

  it('two traces on the same path with no other path near keep it (no forced move)', () => {
    const twice = [guideOn(0, 0.5, 1, 0.1)];
    expect(captureVector(lines, twice, { siblings: [[guideOn(0, 0.55, 1, 0.1)]] }).stroke).toBe(COLOURS[0]);
    expect(captureVector(lines, twice, { siblings: [[guideOn(0, 0.55, 1, 0.1)]] }).ambiguous).toBeUndefined();
  });

  it('a clear choice is not moved by siblings far away', () => {
    const clear = [guideOn(1, 0.5, 0, 0.1), guideOn(1, 0.8, 0, 0.1)];
    const got = captureVector(lines, clear, { siblings: guides.filter((_, j) => j !== 1) });
    expect(got.stroke).toBe(COLOURS[1]);
    expect(got.ambiguous).toBeUndefined();
  });

  it('a trace whose guides fit two paths that nothing settles carries a warning; the other traces lift it', async () => {
    const source: CaptureSource = { kind: 'vector-pdf', lines: async () => lines, raster: () => Promise.reject(new Error('no rendering in this test')) };
    const alone = await captureTrace({ guides: own, extent: 'line' }, source);
    expect(alone.doubts?.map((d) => d.code)).toEqual(['takeoff.guide-in-bunch']);
    expect(alone.doubts?.[0]?.message).toMatch(/2 other drawn lines pass about as near its guides as the line taken/);
    const settled = await captureTrace({ guides: own, extent: 'line', siblings: guides.slice(0, 3) }, source);
    expect(settled.doubts ?? []).toEqual([]);
  });
});
