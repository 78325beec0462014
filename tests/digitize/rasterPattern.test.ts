/**
 * Dashed and dotted lines whose pattern the window around a guide hides: a dashed line between
 * two others drawn parallel a few widths away (their ink makes the window look isotropic, and no
 * dash pattern was looked for), and a dotted line blurred so that its dots touch (its ink never
 * drops to paper, and it swells and thins along the line). Each came back empty from one guide:
 * followed as solid, the line was lost at its first gap or its first thinning.
 */
import { describe, expect, it } from 'vitest';
import { sheetPoint } from '../../src/digitize/points.ts';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { picture, stroke } from './rasterPictures.ts';

const line = (offset: number) => (x: number) => 150 + offset - 0.12 * (x - 20);

/** Distance from (x, y) to the line y = f(x), pixels (nearest of its points 0.05 px apart). */
function off(p: readonly [number, number], f: (x: number) => number): number {
  let best = Infinity;
  for (let x = p[0] - 5; x <= p[0] + 5; x += 0.05) best = Math.min(best, Math.hypot(p[0] - x, p[1] - f(x)));
  return best;
}

/** Three dashed grey lines 13 px apart, blurred a little as a scan blurs them. */
function threeDashed(): ReturnType<typeof picture> {
  return picture(640, 300, (ctx) => {
    ctx.fillStyle = '#efeee8';
    ctx.fillRect(0, 0, 640, 300);
    ctx.filter = 'blur(0.8px)';
    ctx.lineCap = 'butt';
    ctx.setLineDash([7, 4]);
    for (const offset of [-13, 0, 13]) stroke(ctx, line(offset), 20, 620, '#5f605a', 2.6);
  });
}

/** The drawn line is covered end to end (20 to 620 px) and the trace keeps within 1 px of it. */
function expectWhole(points: readonly (readonly [number, number])[], f: (x: number) => number): void {
  expect(Math.min(...points.map((p) => p[0]))).toBeLessThan(40);
  expect(Math.max(...points.map((p) => p[0]))).toBeGreaterThan(600);
  expect(Math.max(...points.map((p) => off(p, f)))).toBeLessThan(1);
}

describe('dash patterns hidden around the guide', () => {
  it('follows a dashed line between two parallel dashed lines 13 px away from one guide', () => {
    const image = threeDashed();
    const middle = line(0);
    const result = traceRaster(image, [sheetPoint(300, middle(300))]);
    expect(result.line.dashed).toBe(true);
    expectWhole(result.points, middle);
  });

  it('follows the same dashed line from guide to guide when two guides are given', () => {
    const image = threeDashed();
    const middle = line(0);
    const result = traceRaster(image, [sheetPoint(120, middle(120)), sheetPoint(500, middle(500))]);
    expect(result.line.dashed).toBe(true);
    expect(result.lost).toEqual([]);
    expectWhole(result.points, middle);
  });

  it('follows a faint dotted line whose dots the scan blurred together', () => {
    const image = picture(640, 300, (ctx) => {
      ctx.fillStyle = '#ecebe5';
      ctx.fillRect(0, 0, 640, 300);
      ctx.filter = 'blur(0.9px)';
      ctx.lineCap = 'round';
      ctx.setLineDash([0.01, 4.2]);
      stroke(ctx, line(0), 20, 620, '#a8a9a2', 2.2);
    });
    const f = line(0);
    const result = traceRaster(image, [sheetPoint(300, f(300))]);
    expect(result.line.dashed).toBe(true);
    expectWhole(result.points, f);
  });
});
