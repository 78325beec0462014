import { describe, expect, it } from 'vitest';
import { flattenCubic, flattenPath } from '../../src/digitize/flatten.ts';
import { captureVector, CaptureError, strokeLines } from '../../src/digitize/vectorCapture.ts';
import { distanceToPolyline } from '../../src/digitize/polyline.ts';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import type { PathSegment, VectorPath } from '../../src/digitize/sheet.ts';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import { drawPdf, rgb } from './fixtures/pdfBytes.ts';
import { pushGraphicsState, popGraphicsState, rectangle, clip, endPath } from 'pdf-lib';

const P = sheetPoint;
type XY = [number, number];

function bezier(p0: XY, c1: XY, c2: XY, p3: XY, t: number): XY {
  const s = 1 - t;
  return [
    s * s * s * p0[0] + 3 * s * s * t * c1[0] + 3 * s * t * t * c2[0] + t * t * t * p3[0],
    s * s * s * p0[1] + 3 * s * s * t * c1[1] + 3 * s * t * t * c2[1] + t * t * t * p3[1],
  ];
}

function path(segments: PathSegment[], stroke = '#000000', lineWidth = 1): VectorPath {
  return { segments, stroke, fill: null, lineWidth, dashed: false };
}
const move = (x: number, y: number): PathSegment => ({ kind: 'move', to: P(x, y) });
const line = (x: number, y: number): PathSegment => ({ kind: 'line', to: P(x, y) });
const cubic = (c1: XY, c2: XY, to: XY): PathSegment => ({ kind: 'cubic', c1: P(...c1), c2: P(...c2), to: P(...to) });

/** A frame and a 5 × 4 grid of separate line paths in light grey, as sheets draw them. */
function frameAndGrid(): VectorPath[] {
  const out: VectorPath[] = [path([move(50, 50), line(550, 50), line(550, 450), line(50, 450), { kind: 'close' }])];
  for (let x = 150; x < 550; x += 100) out.push(path([move(x, 50), line(x, 450)], '#bbbbbb', 0.5));
  for (let y = 150; y < 450; y += 100) out.push(path([move(50, y), line(550, y)], '#bbbbbb', 0.5));
  return out;
}

const curve: [XY, XY, XY, XY][] = [
  [[50, 100], [150, 100], [250, 120], [320, 180]],
  [[320, 180], [390, 240], [460, 330], [540, 420]],
];

function maxDeviation(points: readonly SheetPoint[], truth: readonly XY[]): number {
  return Math.max(...points.map((p) => distanceToPolyline(truth, p)));
}

function denseTruth(): XY[] {
  const out: XY[] = [];
  for (const seg of curve) for (let i = 0; i <= 4000; i++) out.push(bezier(...seg, i / 4000));
  return out;
}

describe('flattening Béziers', () => {
  it('keeps every point of the curve within the chord tolerance of the polyline', () => {
    const [p0, c1, c2, p3] = curve[0]!;
    const out: SheetPoint[] = [P(...p0)];
    flattenCubic(P(...p0), P(...c1), P(...c2), P(...p3), 0.01, out);
    let worst = 0;
    for (let i = 0; i <= 2000; i++) worst = Math.max(worst, distanceToPolyline(out, bezier(p0, c1, c2, p3, i / 2000)));
    expect(worst).toBeLessThanOrEqual(0.01); // the tolerance asked for, sheet units
    expect(out.length).toBeLessThan(200);
  });

  it('splits subpaths at moves and closes closed ones', () => {
    const lines = flattenPath([move(0, 0), line(10, 0), line(10, 10), { kind: 'close' }, move(20, 20), line(30, 20)]);
    expect(lines).toHaveLength(2);
    expect(lines[0]!.closed).toBe(true);
    expect(lines[0]!.points.at(-1)).toEqual([0, 0]);
    expect(lines[1]!.closed).toBe(false);
  });
});

describe('capturing a drawn line from guides', () => {
  const curvePaths = curve.map((seg) => path([move(...seg[0]), cubic(seg[1], seg[2], seg[3])], '#c00000', 1.2));
  const lines = strokeLines([...frameAndGrid(), ...curvePaths]);
  const truth = denseTruth();

  it('joins the continuation pieces of one stroke and takes the whole line for a single guide', () => {
    const got = captureVector(lines, [P(320.3, 180.2)]);
    expect(got.pieces).toBe(2);
    expect(got.stroke).toBe('#c00000');
    expect(got.points[0]).toEqual([50, 100]);
    expect(got.points.at(-1)).toEqual([540, 420]);
    expect(maxDeviation(got.points, truth)).toBeLessThan(0.01); // chord tolerance, sheet units
  });

  it('prefers the line that passes near all guides over a grid line under one of them', () => {
    // The first guide sits where the curve crosses the grid line x = 150 … almost; the grid line is closer to it.
    const atGrid = bezier(...curve[0]!, 0.38);
    const got = captureVector(lines, [P(150.2, atGrid[1]), P(...bezier(...curve[1]!, 0.5))]);
    expect(got.stroke).toBe('#c00000');
    expect(got.gridLike).toBe(false);
  });

  it('prefers the curve to a grid line with one guide on their crossing', () => {
    const crossing = truth.reduce((best, p) => (Math.abs(p[0] - 250) < Math.abs(best[0] - 250) ? p : best));
    const got = captureVector(lines, [P(crossing[0], crossing[1])]);
    expect(got.stroke).toBe('#c00000');
  });

  it('cuts between the first and last guide, running from the first towards the last', () => {
    const a = bezier(...curve[0]!, 0.3);
    const b = bezier(...curve[1]!, 0.7);
    const got = captureVector(lines, [P(a[0] + 0.5, a[1] - 0.5), P(...bezier(...curve[1]!, 0.1)), P(b[0], b[1] + 1)]);
    const first = got.points[0]!;
    const last = got.points.at(-1)!;
    expect(Math.hypot(first[0] - a[0], first[1] - a[1])).toBeLessThan(1);
    expect(Math.hypot(last[0] - b[0], last[1] - b[1])).toBeLessThan(1.5);
    expect(maxDeviation(got.points, truth)).toBeLessThan(0.01);
    const reversed = captureVector(lines, [P(b[0], b[1]), P(a[0], a[1])]);
    expect(reversed.points[0]![0]).toBeGreaterThan(reversed.points.at(-1)![0]);
  });

  it('takes the whole line the guides sit on when asked, running from the first guide towards the last', () => {
    const a = bezier(...curve[0]!, 0.3);
    const b = bezier(...curve[1]!, 0.7);
    const got = captureVector(lines, [P(b[0], b[1]), P(a[0], a[1])], { wholeLine: true });
    expect(got.points[0]).toEqual([540, 420]);
    expect(got.points.at(-1)).toEqual([50, 100]);
  });

  it('takes a dashed line written as filled dashes to its last sliver, and a lone sliver is no line', () => {
    // A line along y = 0.25·x, drawn as filled dashes 4.5 long and 0.84 wide with gaps of 2,
    // ending in a sliver 0.42 long: shorter than the line is wide, so its own axis runs across it.
    const [ux, uy] = [1 / Math.hypot(1, 0.25), 0.25 / Math.hypot(1, 0.25)];
    const w = 0.42;
    const dash = (s0: number, s1: number): VectorPath => {
      const at = (s: number, side: number): XY => [s * ux - side * w * uy, s * uy + side * w * ux];
      const corners = [at(s0, -1), at(s1, -1), at(s1, 1), at(s0, 1)];
      return { segments: [move(...corners[0]!), ...corners.slice(1).map((c) => line(...c)), { kind: 'close' }], stroke: null, fill: '#1f5fbf', lineWidth: 0, dashed: false };
    };
    const dashes = [0, 6.5, 13, 19.5, 26].map((s) => dash(s, s + 4.5));
    const lines = strokeLines([...dashes, dash(32.5, 32.92)]);
    const got = captureVector(lines, [P(10 * ux, 10 * uy)]);
    // Ends at the far edge of the last sliver (32.92 along the line, the drawn line's own end),
    // not at the last whole dash (30.5), nor at the sliver's middle (32.71).
    const end = got.points.at(-1)!;
    expect(Math.hypot(end[0] - 32.92 * ux, end[1] - 32.92 * uy)).toBeLessThan(0.01);
    expect(got.pieces).toBe(6);
    // A sliver that starts the line is its start, at the sliver's far edge (−6.92 along the line).
    const both = captureVector(strokeLines([dash(-6.92, -6.5), ...dashes, dash(32.5, 32.92)]), [P(10 * ux, 10 * uy)]);
    const ends = [both.points[0]!, both.points.at(-1)!].sort((a, b) => a[0] - b[0]);
    expect(Math.hypot(ends[0]![0] + 6.92 * ux, ends[0]![1] + 6.92 * uy)).toBeLessThan(0.01);
    expect(Math.hypot(ends[1]![0] - 32.92 * ux, ends[1]![1] - 32.92 * uy)).toBeLessThan(0.01);
    // The sliver alone makes no line of one point.
    expect(strokeLines([dash(32.5, 32.92)])).toEqual([]);
  });

  it('does not join pieces of different colour', () => {
    const split = strokeLines([
      path([move(0, 0), line(100, 50)], '#ff0000'),
      path([move(100, 50), line(200, 60)], '#0000ff'),
    ]);
    const got = captureVector(split, [P(50, 25)]);
    expect(got.pieces).toBe(1);
    expect(got.points.at(-1)).toEqual([100, 50]);
  });

  it('takes the way round a closed iso-line that holds the middle guide', () => {
    const loop: PathSegment[] = [move(100, 100), line(200, 100), line(200, 200), line(100, 200), { kind: 'close' }];
    // Slightly off level so that it is not taken for a frame.
    const tilted = loop.map((s) => (s.kind === 'close' ? s : { ...s, to: P(s.to[0] + s.to[1] * 0.05, s.to[1]) })) as PathSegment[];
    const ls = strokeLines([path(tilted, '#008000')]);
    const got = captureVector(ls, [P(105, 100), P(105 + 0.05 * 150 + 95, 150), P(105, 200)]);
    // Goes through the right-hand side (x ≈ 200 + 0.05·y), not the left.
    expect(Math.max(...got.points.map((p) => p[0]))).toBeGreaterThan(200);
    expect(Math.min(...got.points.map((p) => p[0]))).toBeGreaterThan(104);
  });

  it('stitches a line that the drawing interrupts for an inline label, and not two unrelated lines', () => {
    const f = (x: number) => 400 - 0.5 * x + 0.0004 * x * x;
    const left: XY[] = Array.from({ length: 31 }, (_, i) => [100 + 5 * i, f(100 + 5 * i)]);
    const right: XY[] = Array.from({ length: 31 }, (_, i) => [275 + 5 * i, f(275 + 5 * i)]);
    const other: XY[] = Array.from({ length: 41 }, (_, i) => [100 + 10 * i, 200 + 0.1 * i]);
    const polyPath = (pts: XY[]) => path([move(...pts[0]!), ...pts.slice(1).map((p) => line(...p))], '#0000ff', 1);
    const ls = strokeLines([polyPath(left), polyPath(right), polyPath(other)]);
    const got = captureVector(ls, [P(...left[2]!), P(...right[28]!)]);
    expect(got.points[0]![0]).toBeCloseTo(110, 6);
    expect(got.points.at(-1)![0]).toBeCloseTo(415, 6);
    // Both pieces are taken whole; the 25-unit gap is crossed by a chord of the curve.
    const drawn = [...left, ...right];
    expect(got.points.filter((p) => p[0] <= 250 || p[0] >= 275).every((p) => distanceToPolyline(drawn, p) < 1e-9)).toBe(true);
    // A guide on an unrelated line of the same style is not stitched to the curve.
    expect(() => captureVector(ls, [P(...left[2]!), P(...other[30]!)])).toThrow(CaptureError);
  });

  it('says so when no drawn line passes near every guide', () => {
    expect(() => captureVector(lines, [P(320, 180), P(300, 400)])).toThrow(CaptureError);
    expect(() => captureVector(lines, [P(320, 180), P(300, 400)])).toThrow(/No drawn line passes within 8 sheet units of every guide/);
  });
});

describe('capturing from a real vector PDF', () => {
  it('reproduces Bézier and polyline curves exactly (error far below 0.1 % of a 500-unit span)', async () => {
    const poly: XY[] = Array.from({ length: 25 }, (_, i) => [60 + i * 20, 300 - 0.0004 * (i * 20) ** 2]);
    const bytes = await drawPdf(612, 500, (d) => {
      for (let x = 60; x <= 540; x += 40) d.stroke(`M ${x} 40 L ${x} 460`, rgb(0.7, 0.7, 0.7), 0.4);
      for (let y = 40; y <= 460; y += 40) d.stroke(`M 60 ${y} L 540 ${y}`, rgb(0.7, 0.7, 0.7), 0.4);
      d.stroke(`M ${curve[0]![0].join(' ')} C ${curve[0]!.slice(1).map((p) => p.join(' ')).join(' ')}`, rgb(0, 0, 0.8), 1);
      d.stroke(`M ${curve[1]![0].join(' ')} C ${curve[1]!.slice(1).map((p) => p.join(' ')).join(' ')}`, rgb(0, 0, 0.8), 1);
      d.stroke(poly.map((p, i) => `${i ? 'L' : 'M'} ${p[0]} ${p[1]}`).join(' '), rgb(0, 0.5, 0), 0.8);
    });
    const sheet = await loadPdfSheetNode(bytes);
    const ls = strokeLines(await sheet.paths());
    const bez = captureVector(ls, [P(...bezier(...curve[0]!, 0.2)), P(...bezier(...curve[1]!, 0.9))]);
    expect(maxDeviation(bez.points, truth())).toBeLessThan(0.02); // sheet units: chord tolerance + 32-bit floats
    const pl = captureVector(ls, [P(...poly[2]!), P(...poly[20]!)]);
    expect(maxDeviation(pl.points, poly)).toBeLessThan(1e-3);
    expect(pl.points[0]![0]).toBeCloseTo(poly[2]![0], 3);
    expect(pl.points.at(-1)![0]).toBeCloseTo(poly[20]![0], 3);
    await sheet.close();
    function truth() {
      return denseTruth();
    }
  });
});

describe('capturing only what the page shows', () => {
  it('cuts a line drawn beyond its clipping rectangle at the rectangle', async () => {
    const bytes = await drawPdf(400, 400, (d) => {
      // Clip to sheet x 50…350, y 100…300 (PDF y up: 100…300 on a 400-high page).
      d.page.pushOperators(pushGraphicsState(), rectangle(50, 100, 300, 200), clip(), endPath());
      d.stroke('M 0 350 C 100 300 250 150 400 20', rgb(0.8, 0, 0), 1);
      d.page.pushOperators(popGraphicsState());
    });
    const sheet = await loadPdfSheetNode(bytes);
    const paths = await sheet.paths();
    expect(paths[0]!.clip).toEqual([50, 100, 350, 300]);
    const got = captureVector(strokeLines(paths), [P(200, 200)], { maxGuideDistance: 50 });
    const xs = got.points.map((p) => p[0]);
    const ys = got.points.map((p) => p[1]);
    // Every point inside the clip box (1e-9 for rounding), and the ends on its edges.
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(50 - 1e-9);
    expect(Math.max(...xs)).toBeLessThanOrEqual(350 + 1e-9);
    expect(Math.min(...ys)).toBeGreaterThanOrEqual(100 - 1e-9);
    expect(Math.max(...ys)).toBeLessThanOrEqual(300 + 1e-9);
    const onEdge = (p: SheetPoint) => [Math.abs(p[0] - 50), Math.abs(p[0] - 350), Math.abs(p[1] - 100), Math.abs(p[1] - 300)].some((e) => e < 1e-6);
    expect(onEdge(got.points[0]!)).toBe(true);
    expect(onEdge(got.points.at(-1)!)).toBe(true);
    await sheet.close();
  });
});
