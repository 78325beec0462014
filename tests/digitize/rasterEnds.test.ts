import { describe, expect, it } from 'vitest';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import { dashReach, inkOrGap, restyleAhead, restyleAlong, solidFrom } from '../../src/digitize/rasterEnds.ts';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { inkModel } from '../../src/digitize/colour.ts';
import { picture, stroke } from './rasterPictures.ts';

const head = (x: number) => 80 + 0.0006 * (x - 40) ** 2; // a falling head curve, y down

function worstOff(points: readonly SheetPoint[], f: (x: number) => number): number {
  return Math.max(...points.map((p) => Math.abs(p[1] - f(p[0]))));
}

/** A row of samples along a line: `on` px of ink, `off` px of paper, repeated, at 0.5 px spacing. */
function row(on: number, off: number, length: number): boolean[] {
  const out: boolean[] = [];
  for (let t = 0; t < length; t += 0.5) out.push(t % (on + off) < on);
  return out;
}

describe('the line\'s look along its followed stretch', () => {
  it('reads a dash pattern from a row of samples, and no pattern from a solid line or a single break', () => {
    expect(dashReach(row(8, 4, 80), 0.5, 2)).toBeCloseTo(3, 1); // half the 4 px gap plus a pixel
    expect(dashReach(row(1, 5, 80), 0.5, 2)).toBeCloseTo(3.5, 1);
    expect(dashReach(row(80, 0, 80), 0.5, 2)).toBeUndefined();
    const oneBreak = [...row(30, 0, 30), ...row(0, 10, 10), ...row(30, 0, 30)];
    expect(dashReach(oneBreak, 0.5, 2)).toBeUndefined();
    // Gaps far longer than the line's width are not a pattern but breaks (labels, crossings).
    expect(dashReach(row(20, 30, 300), 0.5, 2)).toBeUndefined();
  });

  it('tells the dots of a blurred dotted line from its gaps, where some colour stays in the gaps', () => {
    // Peaks along a soft dotted line: 0.9 on each dot, 0.55 between dots, 3 px apart.
    const peaks: number[] = [];
    for (let t = 0; t < 80; t += 0.5) peaks.push(t % 3 < 1.5 ? 0.9 : 0.55);
    // At the line's own threshold (0.4) every position is ink: no pattern shows.
    expect(dashReach(peaks.map((p) => p >= 0.4), 0.5, 2)).toBeUndefined();
    const row = inkOrGap(peaks, 0.4);
    expect(row.filter(Boolean).length).toBeGreaterThan(0.4 * row.length);
    expect(row.filter(Boolean).length).toBeLessThan(0.6 * row.length);
    expect(dashReach(row, 0.5, 2)).toBeCloseTo(1.75, 1);
    // A solid line whose peaks only flicker keeps the line's threshold.
    const flicker = peaks.map((_, i) => (i % 7 === 0 ? 0.75 : 0.9));
    expect(inkOrGap(flicker, 0.4).every(Boolean)).toBe(true);
  });

  it('finds the pattern of a blurred dotted line along the stretch followed', () => {
    const image = picture(640, 300, (ctx) => {
      ctx.filter = 'blur(1px)';
      ctx.setLineDash([0.01, 4]);
      ctx.lineCap = 'round';
      stroke(ctx, head, 20, 620, '#222222', 2.5);
    });
    const guide = traceRaster(image, [sheetPoint(200, head(200))]);
    const model = inkModel(guide.line.colour, guide.line.paper);
    const path: [number, number][] = [];
    for (let x = 100; x <= 200; x += 2) path.push([x, head(x)]);
    const solid = { model, width: guide.line.widthPx, threshold: 0.4, massRange: [0.8, 1.35] as const };
    const again = restyleAlong(image, solid, path, { reads: 0 });
    expect(again?.reach).toBeGreaterThan(1.5);
    expect(again?.reach).toBeLessThan(3.5);
    expect(again?.width).toBeCloseTo(guide.line.widthPx, 1);
  });

  it('measures a narrower width along a followed stretch than the model taken under a guide', () => {
    const image = picture(400, 200, (ctx) => stroke(ctx, head, 20, 380, '#1f5fbf', 2));
    const model = inkModel([31, 95, 191], [255, 255, 255]);
    const path: [number, number][] = [];
    for (let x = 100; x <= 200; x += 2) path.push([x, head(x)]);
    const wide = { model, width: 5, threshold: 0.4, massRange: [0.55, 1.5] as const };
    const again = restyleAlong(image, wide, path, { reads: 0 });
    expect(again?.width).toBeGreaterThan(1.5);
    expect(again?.width).toBeLessThan(2.6);
    expect(again?.reach ?? 0).toBe(0);
    // A model that already fits is left as it is.
    expect(restyleAlong(image, { ...wide, width: 2 }, path, { reads: 0 })).toBeUndefined();
  });

  it('follows a line to its ends when the width taken under the guides is too wide for the line elsewhere', () => {
    const image = picture(640, 300, (ctx) => stroke(ctx, head, 20, 620, '#1f5fbf', 2));
    // As where a guide sat on the line where it touched a grid line or a neighbour.
    const result = traceRaster(image, [sheetPoint(200, head(200)), sheetPoint(300, head(300))], { widthPx: 4.5 });
    expect(Math.min(...result.points.map((p) => p[0]))).toBeLessThan(30);
    expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(605);
    expect(worstOff(result.points, head)).toBeLessThan(1);
  });
});

describe('a trace whose guides sit in a bunch', () => {
  // Three lines of one colour run side by side, touching, up to x = 120 (as NPSHr curves of
  // several diameters run together at low flow), then fan out either side of the middle one; y down.
  const base = (x: number) => 280 - 0.0004 * x * x;
  const line = (k: number) => (x: number) => base(x) - k * (1.8 + 0.0002 * Math.max(0, x - 120) ** 2);
  const bunch = () =>
    picture(640, 300, (ctx) => {
      for (const k of [-1, 0, 1]) stroke(ctx, line(k), 20, 600, '#222222', 2);
    });

  it('measures the line\'s own width ahead, where the bunch has fanned out, and none where it has not', () => {
    const image = bunch();
    const model = inkModel([34, 34, 34], [255, 255, 255]);
    const wide = { model, width: 5.5, threshold: 0.4, massRange: [0.8, 1.35] as const };
    const course = (f: (x: number) => number, from: number, to: number) => {
      const out: { at: [number, number]; tangent: [number, number]; allowed: number }[] = [];
      for (let x = from; x <= to; x += 3) {
        const d = Math.hypot(1, f(x + 0.5) - f(x - 0.5));
        out.push({ at: [x, f(x)], tangent: [1 / d, (f(x + 0.5) - f(x - 0.5)) / d], allowed: 1.5 });
      }
      return out;
    };
    const again = restyleAhead(image, wide, course(line(1), 250, 400), { reads: 0 });
    expect(again?.width).toBeGreaterThan(1.5);
    expect(again?.width).toBeLessThan(2.8);
    // Inside the bunch every section shows the lines run together: no narrower width.
    expect(restyleAhead(image, wide, course(line(0), 30, 110), { reads: 0 })).toBeUndefined();
    // A model of the line's own width is left as it is.
    expect(restyleAhead(image, { ...wide, width: 2 }, course(line(1), 250, 400), { reads: 0 })).toBeUndefined();
  });

  it('follows the line on its course out of the bunch to its end, and says the end came out of a bunch', () => {
    const image = bunch();
    const result = traceRaster(image, [sheetPoint(60, line(0)(60))]);
    // The width under the guide is the bunch's, not the line's.
    expect(result.line.widthPx).toBeGreaterThan(3.5);
    expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(580);
    expect(worstOff(result.points.filter((p) => p[0] > 200), line(0))).toBeLessThan(1.5);
    expect(result.doubts.map((d) => d.code)).toContain('takeoff.end-through-bunch');
  });
});

describe('a trace whose guides sit where the line is solid', () => {
  it('reads the dash pattern on the course ahead where the line turns dashed, and follows it to its end', () => {
    // Solid up to x = 150, then dashes of 4 px with gaps of 10 px (wider than the solid model
    // bridges at once), softly blurred; both guides on the solid part.
    const image = picture(640, 300, (ctx) => {
      ctx.filter = 'blur(0.8px)';
      stroke(ctx, head, 20, 150, '#222222', 2);
      ctx.setLineDash([4, 10]);
      stroke(ctx, head, 150, 620, '#222222', 2);
    });
    const result = traceRaster(image, [sheetPoint(60, head(60)), sheetPoint(146, head(146))]);
    expect(result.line.dashed).toBeUndefined(); // the model under the guides is solid
    expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(600);
    expect(worstOff(result.points, head)).toBeLessThan(1.5);
  });
});

describe('a dotted line that ends on a grid line of its grey', () => {
  // A dotted curve starts at x = 100 tangent to a solid horizontal grid line of the same grey,
  // which runs on to the frame's left edge, and runs to the frame's right edge; softly blurred,
  // as in a scan. The follower of the dotted line's left end can take up the grid line there.
  const curve = (x: number) => 200 - 0.0006 * (x - 100) ** 2;
  const frame = [20, 20, 620, 280] as const;
  const image = picture(640, 300, (ctx) => {
    ctx.filter = 'blur(0.8px)';
    stroke(ctx, () => 200, 20, 620, '#555555', 2);
    ctx.lineCap = 'round';
    ctx.setLineDash([0.01, 5]);
    stroke(ctx, curve, 100, 618, '#555555', 2.5);
  });

  it('cuts the extension that ran on along the grid line to the frame, and keeps the dotted end at the frame', () => {
    const result = traceRaster(image, [sheetPoint(300, curve(300)), sheetPoint(450, curve(450))], { frame });
    // Not along the grid line to the frame's left edge (x = 20).
    expect(Math.min(...result.points.map((p) => p[0]))).toBeGreaterThan(70);
    // The dotted end at the right frame edge stays.
    expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(590);
    expect(worstOff(result.points.filter((p) => p[0] > 130), curve)).toBeLessThan(2);
  });

  it('reads no solid stretch where the extension keeps to the dots', () => {
    const path: [number, number][] = [];
    for (let x = 250; x <= 450; x += 2) path.push([x, curve(x)]);
    const ahead: [number, number][] = [];
    for (let x = 450; x <= 560; x += 2) ahead.push([x, curve(x)]);
    const grid: [number, number][] = [];
    for (let x = 100; x >= 30; x -= 2) grid.push([x, 200]);
    const guide = traceRaster(image, [sheetPoint(300, curve(300))]);
    const style = { model: inkModel(guide.line.colour, guide.line.paper), width: guide.line.widthPx, threshold: 0.4, massRange: [0.8, 1.35] as const };
    expect(solidFrom(image, style, path, ahead, { reads: 0 })).toBeUndefined();
    // Along the grid line beyond the dotted line's start, solid from the first window on.
    const back = [...path].reverse();
    expect(solidFrom(image, style, back, grid, { reads: 0 })).toBe(0);
  });
});
