import { describe, expect, it } from 'vitest';
import type { SKRSContext2D } from '@napi-rs/canvas';
import { inkModel } from '../../src/digitize/colour.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { brokenWhereUncovered, chromaticInk, onGridLine } from '../../src/digitize/rasterFaint.ts';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { picture, stroke } from './rasterPictures.ts';

// A pale red curve drawn over a denser, darker grey grid on tinted paper, as on a faded scan: the
// grid is stronger than the curve, and where they cross the ink is mostly the grid's grey.
const PAPER = '#f6eae2';
const GRID = '#d8cbc3';
const MAJOR = '#c4b7af';
const FAINT_RED = '#f8d2cf';
const curve = (x: number) => 190 - 0.9 * (x - 20) + 0.0018 * (x - 20) ** 2;

function faintOnGrid(line = FAINT_RED, lineWidth = 1.1): ReturnType<typeof picture> {
  return picture(320, 220, (ctx: SKRSContext2D) => {
    ctx.fillStyle = PAPER;
    ctx.fillRect(0, 0, 320, 220);
    ctx.lineCap = 'butt';
    for (let k = 0; k <= 22; k++) {
      ctx.fillStyle = k % 5 === 0 ? MAJOR : GRID;
      ctx.fillRect(0, 10 * k, 320, k % 5 === 0 ? 2 : 1);
    }
    for (let k = 0; k <= 32; k++) {
      ctx.fillStyle = k % 5 === 0 ? MAJOR : GRID;
      ctx.fillRect(10 * k, 0, k % 5 === 0 ? 2 : 1, 220);
    }
    // Printed ink over ink darkens: the crossing is the grid's grey with a little red in it.
    ctx.globalCompositeOperation = 'multiply';
    stroke(ctx, curve, 20, 300, line, lineWidth);
    ctx.globalCompositeOperation = 'source-over';
  });
}

/** Where the curve crosses the grid row y = 150 (its pixels 150…151). */
const crossingX = 20 + (0.9 - Math.sqrt(0.81 - 4 * 0.0018 * (190 - 150.5))) / (2 * 0.0018);

/** Distance from (x, y) to the drawn curve, pixels (nearest of its points 0.05 px apart). */
function offCurve(x: number, y: number): number {
  let best = Infinity;
  for (let u = 15; u <= 305; u += 0.05) best = Math.min(best, Math.hypot(u - x, curve(u) - y));
  return best;
}

describe('a faint coloured line clicked where it crosses a grey grid line', () => {
  it('onGridLine: grey ink on a grid line is grid; the same grey off any straight run is not', () => {
    const image = faintOnGrid();
    const grey = inkModel([216, 203, 195], [246, 234, 226]);
    // On a horizontal grid line between two vertical ones, and on a vertical one.
    expect(onGridLine(image, grey, [125, 150.5])).toBe(true);
    expect(onGridLine(image, grey, [160.5, 95])).toBe(true);
    // A grey curve alone (no grid): straight runs are absent.
    const plain = picture(320, 220, (ctx) => stroke(ctx, curve, 20, 300, '#808080', 1.2));
    expect(onGridLine(plain, inkModel([128, 128, 128], [255, 255, 255]), [crossingX, curve(crossingX)])).toBe(false);
  });

  it('onGridLine: a straight level grey line with no parallel twin is not grid', () => {
    const image = picture(320, 220, (ctx) => {
      ctx.fillStyle = '#909090';
      ctx.fillRect(10, 100, 300, 1);
    });
    expect(onGridLine(image, inkModel([144, 144, 144], [255, 255, 255]), [160, 100.5])).toBe(false);
  });

  it('chromaticInk: beside a grey sample, takes the red of the line of the sample\'s hue, not the grey', () => {
    const image = faintOnGrid();
    const at: [number, number] = [crossingX, 150.5];
    const red = chromaticInk(image, [246, 234, 226], [206, 181, 177], at, 6);
    expect(red).toBeDefined();
    const [r, g, b] = red as [number, number, number];
    // Red: more red than green and blue by a clear margin (the drawn #f8d2cf, darkened over the grid).
    expect(r - g).toBeGreaterThan(15);
    expect(r - b).toBeGreaterThan(15);
  });

  it('chromaticInk: no coloured ink near a guide on a grey grid gives no colour', () => {
    const grid = picture(120, 120, (ctx) => {
      ctx.fillStyle = PAPER;
      ctx.fillRect(0, 0, 120, 120);
      ctx.fillStyle = GRID;
      for (let k = 0; k < 12; k++) ctx.fillRect(0, 10 * k, 120, 1);
    });
    expect(chromaticInk(grid, [246, 234, 226], [216, 203, 195], [60, 50.5], 6)).toBeUndefined();
  });

  it('traceRaster: a single guide on the crossing follows the red line, not the grid line', () => {
    const image = faintOnGrid();
    const got = traceRaster(image, [sheetPoint(crossingX, 150.5)]);
    // Every traced point within 1.5 px of the drawn curve (a grid line would leave it by tens of pixels).
    const worst = Math.max(...got.points.map((p) => offCurve(p[0], p[1])));
    expect(worst).toBeLessThan(1.5);
    // And the trace covers most of the curve's flow range, 20…300 px, not a stretch near the guide.
    const xs = got.points.map((p) => p[0]);
    expect(Math.min(...xs)).toBeLessThan(60);
    expect(Math.max(...xs)).toBeGreaterThan(240);
    // The model is a red one.
    expect(got.line.colour[0] - got.line.colour[1]).toBeGreaterThan(15);
  });
});

describe('brokenWhereUncovered: a dash pattern is gaps that show paper', () => {
  // A faint red level line across a dense grey grid of upright lines 8 px apart: the grid covers the
  // line at each crossing (the red is lost there), which a dash test that reads only the line's
  // colour takes for gaps.
  const level = (dash: number[]) =>
    picture(240, 60, (ctx: SKRSContext2D) => {
      ctx.fillStyle = PAPER;
      ctx.fillRect(0, 0, 240, 60);
      ctx.lineCap = 'butt';
      ctx.setLineDash(dash);
      ctx.strokeStyle = '#f29c94';
      ctx.lineWidth = 1.2;
      ctx.beginPath();
      ctx.moveTo(0, 30.5);
      ctx.lineTo(240, 30.5);
      ctx.stroke();
      // The grid printed over the line: its grey replaces the red where they cross.
      ctx.fillStyle = '#b8aca4';
      for (let x = 4; x < 240; x += 8) ctx.fillRect(x, 0, 2, 60);
    });
  const red = inkModel([242, 156, 148], [246, 234, 226]);

  it('a solid line whose only breaks are grid crossings is not broken', () => {
    expect(brokenWhereUncovered(level([]), red, [121, 30.5], 1.2, [1, 0], 0.4)).toBeUndefined();
  });

  it('a dashed line with gaps of paper between the grid lines is still broken', () => {
    // Dashes of 5 px and gaps of 3 px: most gaps fall on paper, and the pattern shows.
    expect(brokenWhereUncovered(level([5, 3]), red, [121, 30.5], 1.2, [1, 0], 0.4)).toBeDefined();
  });
});
