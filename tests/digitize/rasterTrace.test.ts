import type { SKRSContext2D } from '@napi-rs/canvas';
import { describe, expect, it } from 'vitest';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';
import { captureRasterTrace, traceRaster, TraceInputError } from '../../src/digitize/rasterTrace.ts';
import { picture, stroke } from './rasterPictures.ts';

function grid(ctx: SKRSContext2D, width: number, height: number, every: number): void {
  ctx.strokeStyle = '#c8c8c8';
  ctx.lineWidth = 1;
  for (let x = every; x < width; x += every) {
    ctx.beginPath();
    ctx.moveTo(x, 0);
    ctx.lineTo(x, height);
    ctx.stroke();
  }
  for (let y = every; y < height; y += every) {
    ctx.beginPath();
    ctx.moveTo(0, y);
    ctx.lineTo(width, y);
    ctx.stroke();
  }
}

/** A label written over the line y = f(x) from x0 to x1: the line knocked out (with `margin` px above and below), the text in `colour`. */
function labelOver(ctx: SKRSContext2D, f: (x: number) => number, x0: number, x1: number, margin: number, colour: string, size: number, text: string): void {
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(x0, Math.min(f(x0), f(x1)) - margin, x1 - x0, Math.abs(f(x1) - f(x0)) + 2 * margin);
  ctx.fillStyle = colour;
  ctx.font = `${size}px "Liberation Sans"`;
  ctx.fillText(text, x0 + 5, (f(x0) + f(x1)) / 2 + size / 3);
}

/** Largest vertical distance of the points from y = f(x). */
function worstOff(points: readonly SheetPoint[], f: (x: number) => number): number {
  return Math.max(...points.map((p) => Math.abs(p[1] - f(p[0]))));
}

const head = (x: number) => 80 + 0.0006 * (x - 40) ** 2; // a falling head curve, y down

describe('raster line following', () => {
  it('follows an anti-aliased line from guide to guide, taking the sub-pixel centre of its cross-section', () => {
    const image = picture(640, 360, (ctx) => stroke(ctx, head, 20, 620, '#000000', 3));
    const result = traceRaster(image, [sheetPoint(40, head(40)), sheetPoint(330, head(330)), sheetPoint(600, head(600))]);
    expect(result.lost).toEqual([]);
    expect(worstOff(result.points, head)).toBeLessThan(0.3); // px: centroid of a 3-px line, plus the 0.3 px thinning tolerance
    expect(result.line.widthPx).toBeGreaterThan(2.5); // measured cross-section of the 3-px line, ± anti-aliasing
    expect(result.line.widthPx).toBeLessThan(3.5);
    expect(result.points.length).toBeLessThan(80); // thinned with simplify-js, not one point a step
  });

  it('stops at the first and last guides when asked to (extent "guides")', () => {
    const image = picture(640, 360, (ctx) => stroke(ctx, head, 20, 620, '#000000', 3));
    const result = traceRaster(image, [sheetPoint(100, head(100)), sheetPoint(500, head(500))], { extent: 'guides' });
    const first = result.points[0] as SheetPoint;
    const last = result.points[result.points.length - 1] as SheetPoint;
    expect(Math.abs(first[0] - 100)).toBeLessThan(1); // px
    expect(Math.abs(last[0] - 500)).toBeLessThan(1); // px
  });

  it('runs to the drawn line\'s own ends by default, whatever guides were clicked', () => {
    const image = picture(640, 360, (ctx) => stroke(ctx, head, 20, 620, '#000000', 3));
    const result = traceRaster(image, [sheetPoint(100, head(100)), sheetPoint(500, head(500))]);
    const first = result.points[0] as SheetPoint;
    const last = result.points[result.points.length - 1] as SheetPoint;
    expect(Math.abs(first[0] - 20)).toBeLessThan(2); // px: the line's end, within a step of the follower
    expect(Math.abs(last[0] - 620)).toBeLessThan(2); // px
    expect(worstOff(result.points, head)).toBeLessThan(0.3); // px
  });

  it('stops a whole-line trace at the panel frame', () => {
    const image = picture(640, 360, (ctx) => stroke(ctx, head, 20, 620, '#000000', 3));
    const result = traceRaster(image, [sheetPoint(100, head(100)), sheetPoint(500, head(500))], { frame: [50, 0, 560, 360] });
    expect(Math.min(...result.points.map((p) => p[0]))).toBeGreaterThan(47); // px: frame at 50, less half a line width and 1 px
    expect(Math.max(...result.points.map((p) => p[0]))).toBeLessThan(563); // px
  });

  it('carries on through grid lines and a crossing line of the same colour', () => {
    const image = picture(640, 360, (ctx) => {
      grid(ctx, 640, 360, 40);
      stroke(ctx, head, 20, 620, '#000000', 3);
      ctx.lineWidth = 2;
      ctx.beginPath();
      ctx.moveTo(200, 20);
      ctx.lineTo(380, 340);
      ctx.moveTo(520, 20);
      ctx.lineTo(420, 340);
      ctx.stroke();
    });
    const result = traceRaster(image, [sheetPoint(40, head(40)), sheetPoint(600, head(600))]);
    expect(result.lost).toEqual([]);
    expect(worstOff(result.points, head)).toBeLessThan(0.6); // px, including the crossings
  });

  it('carries on through a label that interrupts the line and through a curve of another colour', () => {
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, head, 20, 620, '#c01818', 3);
      stroke(ctx, (x) => 330 - 0.6 * x, 60, 500, '#1840c0', 3);
      ctx.fillStyle = '#ffffff';
      ctx.fillRect(290, head(310) - 8, 60, 16);
      ctx.fillStyle = '#000000';
      ctx.font = '14px "Liberation Sans"';
      ctx.fillText('12 in', 296, head(310) + 5);
    });
    const result = traceRaster(image, [sheetPoint(40, head(40)), sheetPoint(600, head(600))]);
    expect(result.lost).toEqual([]);
    expect(worstOff(result.points, head)).toBeLessThan(0.8); // px; the 60-px gap is bridged by prediction
  });

  it('follows the colour found under the guide, not a darker line running beside it', () => {
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, head, 20, 620, '#2050d0', 3);
      stroke(ctx, (x) => head(x) + 9, 20, 620, '#000000', 3);
    });
    const result = traceRaster(image, [sheetPoint(40, head(40) + 1.5), sheetPoint(600, head(600))]);
    expect(result.line.colour[2]).toBeGreaterThan(150); // blue measured under the guide
    expect(worstOff(result.points, head)).toBeLessThan(0.5); // px: stays on the blue line, 9 px from the black one
  });

  it('follows two same-coloured curves through their shallow crossing, each on its own line', () => {
    const a = (x: number) => 300 - 0.5 * x; // rising
    const b = (x: number) => 90 + 0.00045 * (x - 320) ** 2 + 0.12 * x; // crosses a at a shallow angle
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, a, 20, 560, '#000000', 3);
      stroke(ctx, b, 20, 620, '#000000', 3);
    });
    const ta = traceRaster(image, [sheetPoint(40, a(40)), sheetPoint(540, a(540))]);
    const tb = traceRaster(image, [sheetPoint(40, b(40)), sheetPoint(600, b(600))]);
    expect(worstOff(ta.points, a)).toBeLessThan(1); // px
    expect(worstOff(tb.points, b)).toBeLessThan(1); // px
  });

  it('follows a U-shaped loop through three guides', () => {
    // An iso-efficiency loop: down one side, round the bottom, up the other side.
    const cx = 320;
    const cy = 120;
    const loop = (t: number) => [cx + 160 * Math.sin(t), cy + 180 * (1 - Math.cos(t))] as const; // t in [-1.2, 1.2]
    const image = picture(640, 360, (ctx) => {
      ctx.strokeStyle = '#008030';
      ctx.lineWidth = 2;
      ctx.beginPath();
      for (let t = -1.2; t <= 1.2001; t += 0.01) {
        const [x, y] = loop(t);
        if (t === -1.2) ctx.moveTo(x, y);
        else ctx.lineTo(x, y);
      }
      ctx.stroke();
    });
    const g = [-1.15, 0, 1.15].map((t) => sheetPoint(...loop(t)));
    const result = traceRaster(image, g);
    expect(result.lost).toEqual([]);
    // Distance to the ellipse, measured along the normal by sampling it densely.
    const dense = Array.from({ length: 2401 }, (_, i) => loop(-1.2 + (2.4 * i) / 2400));
    const off = Math.max(...result.points.map((p) => Math.min(...dense.map((q) => Math.hypot(p[0] - q[0], p[1] - q[1])))));
    expect(off).toBeLessThan(0.5); // px
    const xs = result.points.map((p) => p[0]);
    expect(Math.min(...xs)).toBeLessThan(cx - 140);
    expect(Math.max(...xs)).toBeGreaterThan(cx + 140);
  });

  it('reports where the line was lost, and where it was seen again, when a gap is too long to bridge', () => {
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, head, 20, 250, '#000000', 3);
      stroke(ctx, head, 450, 620, '#000000', 3);
    });
    const result = traceRaster(image, [sheetPoint(40, head(40)), sheetPoint(600, head(600))], { maxGapPx: 60 });
    expect(result.lost).toHaveLength(1);
    const lost = result.lost[0]!;
    expect(Math.abs(lost.at[0] - 250)).toBeLessThan(4); // px: the last point seen before the gap
    expect(Math.abs((lost.resumedAt as SheetPoint)[0] - 450)).toBeLessThan(4); // px: seen again from the far guide
    expect(lost.between).toEqual([1, 2]);
    expect(lost.reason).toMatch(/no ink of the line.s colour and width/);
  });

  it('with a single guide, follows the line both ways to its ends', () => {
    const image = picture(640, 360, (ctx) => stroke(ctx, head, 60, 580, '#000000', 3));
    const result = traceRaster(image, [sheetPoint(300, head(300))]);
    const xs = result.points.map((p) => p[0]);
    expect(Math.min(...xs)).toBeLessThan(64); // px from the line's left end at 60
    expect(Math.max(...xs)).toBeGreaterThan(576); // px from its right end at 580
    expect(worstOff(result.points, head)).toBeLessThan(0.5);
  });

  it('returns sheet coordinates, dividing pixels by the raster scale', () => {
    const image = picture(640, 360, (ctx) => stroke(ctx, head, 20, 620, '#000000', 3), 2);
    const result = traceRaster(image, [sheetPoint(20, head(40) / 2), sheetPoint(300, head(600) / 2)]);
    expect(worstOff(result.points, (x) => head(2 * x) / 2)).toBeLessThan(0.2); // sheet units = half a pixel
  });

  it('reads only pixels near the path', () => {
    const image = picture(1200, 900, (ctx) => stroke(ctx, (x) => 200 + 0.0003 * (x - 100) ** 2, 50, 1150, '#000000', 3));
    const f = (x: number) => 200 + 0.0003 * (x - 100) ** 2;
    const result = traceRaster(image, [sheetPoint(80, f(80)), sheetPoint(1120, f(1120))]);
    expect(result.pixelsRead).toBeLessThan(0.1 * image.width * image.height);
  });

  it('uses explicit points as they are', () => {
    const image = picture(64, 64, () => undefined);
    const points = [sheetPoint(1, 2), sheetPoint(3.25, 4.5), sheetPoint(60, 7)];
    const result = captureRasterTrace(image, { points });
    expect(result.points).toEqual(points);
    expect(result.lost).toEqual([]);
  });

  it('says so, without throwing, when no line stands out under any guide', () => {
    const image = picture(200, 200, () => undefined);
    const result = traceRaster(image, [sheetPoint(50, 50), sheetPoint(150, 150)]);
    expect(result.points).toEqual([]);
    expect(result.lost[0]?.reason).toMatch(/no line stands out from the paper/);
  });

  it('refuses guides it cannot use with a sentence', () => {
    const image = picture(200, 100, () => undefined);
    expect(() => traceRaster(image, [])).toThrow(TraceInputError);
    expect(() => traceRaster(image, [sheetPoint(10, 10), sheetPoint(250, 50)])).toThrow(/Guide 2 at \(250\.0, 50\.0\) lies outside the sheet \(200 × 100\)/);
    expect(() => traceRaster(image, [sheetPoint(Number.NaN, 10)])).toThrow(/not a finite number/);
  });

  it('follows a dashed and a dotted line across their gaps as one line', () => {
    for (const [pattern, cap] of [[[10, 5], 'butt'], [[0.01, 5], 'round']] as const) {
      const image = picture(640, 300, (ctx) => {
        ctx.setLineDash([...pattern]);
        ctx.lineCap = cap;
        stroke(ctx, head, 20, 620, '#1f5fbf', 2);
      });
      const result = traceRaster(image, [sheetPoint(200, head(200))]);
      expect(result.line.dashed, `pattern ${pattern.join(' ')}`).toBe(true);
      expect(result.lost).toEqual([]);
      // From one guide to both ends of the drawn line (20 to 620 px), on the line.
      expect(Math.min(...result.points.map((p) => p[0]))).toBeLessThan(30);
      expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(605);
      expect(worstOff(result.points, head)).toBeLessThan(0.6); // px: dash ends and dots move the centroid a little
    }
  });

  it('runs on past a label written on the line beyond the last guide, to the line\'s own end', () => {
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, head, 20, 620, '#c01818', 2);
      ctx.fillStyle = '#ffffff';
      ctx.fillRect(430, head(460) - 9, 70, 18);
      ctx.fillStyle = '#c01818';
      ctx.font = '14px "Liberation Sans"';
      ctx.fillText('12.5 in', 436, head(460) + 5);
    });
    const result = traceRaster(image, [sheetPoint(100, head(100)), sheetPoint(300, head(300))]);
    expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(605); // px: the line's end at 620, beyond the 70-px label
    expect(worstOff(result.points, head)).toBeLessThan(1); // px: across the label the stretch is bridged smoothly
  });

  it('carries a fast-bending line on across a long break where a label is written on it', () => {
    const steep = (x: number) => 40 + 0.0011 * (x - 40) ** 2; // bends fast towards run-out
    const image = picture(640, 460, (ctx) => {
      stroke(ctx, steep, 20, 620, '#1a1a1a', 2);
      labelOver(ctx, steep, 440, 512, 4, '#1a1a1a', 14, '250 mm');
    });
    const result = traceRaster(image, [sheetPoint(100, steep(100)), sheetPoint(300, steep(300))]);
    expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(605); // px: the line's end at 620, beyond the 72-px break
    expect(worstOff(result.points.filter((p) => p[0] < 440 || p[0] > 512), steep)).toBeLessThan(1.5); // px: on the line on both sides of the break
  });

  it('runs on past a label written over a thin line that is longer than the gap it bridges', () => {
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, head, 20, 620, '#c01818', 1);
      // The label's knock-out is 100 px long: twice what a 1-px line bridges on its prediction alone (50 px).
      labelOver(ctx, head, 400, 500, 10, '#c01818', 20, '350 mm');
    });
    const result = traceRaster(image, [sheetPoint(100, head(100)), sheetPoint(300, head(300))]);
    expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(605); // px: the line's end at 620, beyond the label
    expect(worstOff(result.points.filter((p) => p[0] < 400 || p[0] > 500), head)).toBeLessThan(1); // px: on the line on both sides
  });

  it('does not take up, past a label at a line\'s end, a grid line that crosses its course', () => {
    const image = picture(640, 360, (ctx) => {
      grid(ctx, 640, 360, 60);
      stroke(ctx, head, 20, 400, '#333333', 1);
      ctx.fillStyle = '#333333';
      ctx.font = '20px "Liberation Sans"';
      ctx.fillText('350 mm', 405, head(420) + 7);
    });
    const result = traceRaster(image, [sheetPoint(100, head(100)), sheetPoint(300, head(300))]);
    // Whatever the trace keeps beyond the line's end lies on the line's own course, or the trace says it may not.
    const beyond = result.points.filter((p) => p[0] > 405);
    if (beyond.length > 0 && result.doubts.length === 0) expect(worstOff(beyond, head)).toBeLessThan(2);
    expect(worstOff(result.points.filter((p) => p[0] <= 400), head)).toBeLessThan(1);
  });

  it('does not run on, unflagged, on to another line of its colour that starts beyond its end', () => {
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, head, 20, 400, '#1a1a1a', 1.5);
      // Another line, 7 px below the first one's course, beginning 40 px beyond its end.
      stroke(ctx, (x) => head(x) + 7, 440, 620, '#1a1a1a', 1.5);
    });
    const result = traceRaster(image, [sheetPoint(100, head(100)), sheetPoint(300, head(300))]);
    const beyond = Math.max(...result.points.map((p) => p[0])) > 420;
    // Either the trace ends at its line's end, or it says that it may have gone on along another line.
    if (beyond) expect(result.doubts.map((d) => d.code)).toContain('takeoff.end-after-gap');
    expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(395);
  });

  it('keeps a dotted line dotted when a few of its dots are lost near the guide', () => {
    const image = picture(640, 300, (ctx) => {
      ctx.setLineDash([0.01, 6]);
      ctx.lineCap = 'round';
      stroke(ctx, head, 20, 620, '#d08090', 2.5);
      ctx.fillStyle = '#ffffff';
      ctx.fillRect(218, head(222) - 6, 14, 12); // two dots gone, as a poor scan loses faint ones
    });
    const result = traceRaster(image, [sheetPoint(200, head(200))]);
    expect(result.line.dashed).toBe(true);
    expect(Math.min(...result.points.map((p) => p[0]))).toBeLessThan(30);
    expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(605);
    expect(worstOff(result.points, head)).toBeLessThan(1); // px
  });

  it('takes a solid line for solid, whatever crosses it', () => {
    const image = picture(640, 300, (ctx) => {
      grid(ctx, 640, 300, 40);
      stroke(ctx, head, 20, 620, '#000000', 1.5);
    });
    expect(traceRaster(image, [sheetPoint(200, head(200)), sheetPoint(500, head(500))]).line.dashed).toBeUndefined();
  });

  it('says when a whole-line trace runs on to the right edge of the panel frame, and not at its left edge', () => {
    const image = picture(640, 300, (ctx) => stroke(ctx, head, 20, 630, '#000000', 2));
    const frame = [20, 20, 620, 290] as const;
    const result = traceRaster(image, [sheetPoint(200, head(200)), sheetPoint(400, head(400))], { frame });
    expect(result.doubts.map((d) => d.code)).toEqual(['takeoff.end-at-frame']);
    expect(result.doubts[0]?.message).toMatch(/runs on to the panel's frame near \(6\d\d/);
    const inside = traceRaster(picture(640, 300, (ctx) => stroke(ctx, head, 20, 560, '#000000', 2)), [sheetPoint(200, head(200)), sheetPoint(400, head(400))], { frame });
    expect(inside.doubts).toEqual([]);
  });
  it('follows a faint line clicked beside a darker grid line, not the grid line', () => {
    const image = picture(640, 300, (ctx) => {
      ctx.strokeStyle = '#303030';
      ctx.lineWidth = 2;
      ctx.beginPath();
      ctx.moveTo(206, 0);
      ctx.lineTo(206, 300);
      ctx.stroke();
      stroke(ctx, head, 20, 620, '#b4b4b4', 1.5);
    });
    // One guide on the faint curve, 6 px from the dark grid line.
    const result = traceRaster(image, [sheetPoint(200, head(200))]);
    expect(Math.min(...result.points.map((p) => p[0]))).toBeLessThan(40);
    expect(Math.max(...result.points.map((p) => p[0]))).toBeGreaterThan(600);
    expect(worstOff(result.points, head)).toBeLessThan(1);
  });

  it('takes the line model from the guide whose colour is found at the other guides, and doubts a guide that sampled another line', () => {
    const other = (x: number) => (x < 200 ? head(x) : head(x) + 0.15 * (x - 200));
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, head, 20, 620, '#2050d0', 4);
      stroke(ctx, other, 20, 620, '#d03020', 2); // drawn along the middle of the blue line up to x = 200, then apart
    });
    const result = traceRaster(image, [sheetPoint(100, head(100)), sheetPoint(400, head(400)), sheetPoint(550, head(550))]);
    expect(result.line.colour[2]).toBeGreaterThan(150); // blue, the colour found at guides 2 and 3
    expect(worstOff(result.points.filter((p) => p[0] > 260), head)).toBeLessThan(0.6);
    expect(result.doubts.map((d) => d.code)).toEqual(['takeoff.guide-in-bunch']);
    expect(result.doubts[0]?.message).toMatch(/^guide 1 near/);
  });
  it('does not take the model of a neighbour that only lies within the search radius of the other guides', () => {
    // A purple curve; an orange one runs 6 px beside it, then crosses it at a shallow angle,
    // drawn over it, at x ≈ 400, where the third guide was clicked (its colour sample is orange).
    const other = (x: number) => (x < 300 ? head(x) + 6 : head(x) + 6 - 0.06 * (x - 300));
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, head, 20, 620, '#7030b0', 1.5);
      stroke(ctx, other, 20, 620, '#e07000', 1.5);
    });
    const result = traceRaster(image, [sheetPoint(150, head(150)), sheetPoint(250, head(250)), sheetPoint(400, head(400))]);
    expect(result.line.colour[2]).toBeGreaterThan(result.line.colour[1] + 40); // purple, not orange
    expect(worstOff(result.points.filter((p) => p[0] > 480), head)).toBeLessThan(1);
    // Guide 3, where the orange line hides the purple one, is said to find no line of the colour.
    expect(result.lost.map((l) => l.between)).toEqual([[3, 3]]);
  });
});
