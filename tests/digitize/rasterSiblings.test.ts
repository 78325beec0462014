import { describe, expect, it } from 'vitest';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { picture, stroke } from './rasterPictures.ts';

const lastX = (points: readonly SheetPoint[]) => Math.max(...points.map((p) => p[0]));

describe('raster line model where lines bunch', () => {
  it('takes the colour where the line has room of its own, not the colour of the line drawn over it in a bunch', () => {
    // A blue curve; a red one drawn over it (wider, hiding it) and a green one touching it up to
    // x = 250, where both part from the blue one. Two guides clicked on the blue line inside the
    // bunch sample red; one where it stands alone samples blue.
    const blue = (x: number) => 300 - 0.5 * x;
    const part = (x: number) => (x < 250 ? 0 : 0.002 * (x - 250) ** 2);
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, blue, 20, 620, '#0000ff', 3);
      stroke(ctx, (x) => blue(x) + part(x), 20, 620, '#ff0000', 4);
      stroke(ctx, (x) => blue(x) + 3.5 + 1.5 * part(x), 20, 620, '#00a000', 3);
    });
    // Beyond x = 250 the red line bends away below the blue one; guide 3 at x = 500 is on blue alone.
    const result = traceRaster(image, [sheetPoint(100, blue(100)), sheetPoint(150, blue(150)), sheetPoint(500, blue(500))]);
    const [r, , b] = result.line.colour;
    expect(b).toBeGreaterThan(r + 100); // the blue line's colour (0–255 channels), not red
    // The guides in the bunch find no blue there, and say so: nothing goes unflagged.
    expect(result.lost.map((l) => l.between[0])).toEqual(expect.arrayContaining([1, 2]));
  });
});

describe('other traces\' guides', () => {
  const curve = (x: number) => 80 + 0.0006 * (x - 40) ** 2;

  it('ends a whole-line trace where it runs on to the line of another trace\'s guide', () => {
    // One drawn line, but the engineer's other trace claims its right part with a guide at x = 560:
    // the trace of the left part must not run on over it.
    const image = picture(640, 360, (ctx) => stroke(ctx, curve, 20, 620, '#000000', 2));
    const guides = [sheetPoint(100, curve(100)), sheetPoint(200, curve(200))];
    const alone = traceRaster(image, guides);
    expect(lastX(alone.points)).toBeGreaterThan(610); // px: without siblings it runs to the line's end
    const result = traceRaster(image, guides, { siblings: [[sheetPoint(560, curve(560))]] });
    expect(lastX(result.points)).toBeLessThan(480); // px: cut where it joined the other trace's line (followed 120 px along it from its guide)
    expect(lastX(result.points)).toBeGreaterThan(300); // px: but not short of that
    expect(result.doubts.map((d) => d.code)).toContain('takeoff.end-through-bunch');
  });

  it('runs on over another trace\'s guide clicked where a faint line crosses it', () => {
    // An iso-line crosses the curve at x = 400; its trace's guide sits on the crossing.
    const image = picture(640, 360, (ctx) => {
      stroke(ctx, curve, 20, 620, '#000000', 2);
      ctx.strokeStyle = '#b0b0b0';
      ctx.lineWidth = 1;
      ctx.beginPath();
      ctx.moveTo(340, curve(400) - 60);
      ctx.lineTo(460, curve(400) + 60);
      ctx.stroke();
    });
    const guides = [sheetPoint(100, curve(100)), sheetPoint(200, curve(200))];
    const result = traceRaster(image, guides, { siblings: [[sheetPoint(400, curve(400))]] });
    expect(lastX(result.points)).toBeGreaterThan(610); // px: the crossing says nothing about whose line it is
    expect(result.doubts.map((d) => d.code)).not.toContain('takeoff.end-through-bunch');
  });

  it('ignores another trace\'s guide clicked close to one of its own', () => {
    const image = picture(640, 360, (ctx) => stroke(ctx, curve, 20, 620, '#000000', 2));
    const guides = [sheetPoint(100, curve(100)), sheetPoint(500, curve(500))];
    const result = traceRaster(image, guides, { siblings: [[sheetPoint(503, curve(503))]] });
    expect(lastX(result.points)).toBeGreaterThan(610); // px: two traces clicked together sit where their lines run together
  });
});
