import { createCanvas } from '@napi-rs/canvas';
import { describe, expect, it } from 'vitest';
import { guideBeyondCrossing, guidesOffCrossings } from '../../src/digitize/isoGuides.ts';
import { distanceToPolyline } from '../../src/digitize/polyline.ts';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';

type F = (x: number) => number;

// A thick head curve (3 px) and a thin iso-line (1 px) crossing it, with a grey grid, drawn
// with a 2D canvas; the code under test sees only the RGBA buffer.
function sheet(head: F, iso: F, isoFrom: number, isoTo: number, headColour: string, isoColour: string, scale = 1, second?: F): RasterImage {
  const width = 400;
  const height = 300;
  const canvas = createCanvas(width * scale, height * scale);
  const ctx = canvas.getContext('2d');
  ctx.scale(scale, scale);
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, width, height);
  ctx.strokeStyle = '#c8c8c8';
  ctx.lineWidth = 1;
  for (let x = 40; x < width; x += 40) {
    ctx.beginPath();
    ctx.moveTo(x, 0);
    ctx.lineTo(x, height);
    ctx.stroke();
  }
  for (let y = 40; y < height; y += 40) {
    ctx.beginPath();
    ctx.moveTo(0, y);
    ctx.lineTo(width, y);
    ctx.stroke();
  }
  const stroke = (f: F, x0: number, x1: number, colour: string, w: number) => {
    ctx.strokeStyle = colour;
    ctx.lineWidth = w;
    ctx.beginPath();
    for (let x = x0; x <= x1; x += 0.5) (x === x0 ? ctx.moveTo(x, f(x)) : ctx.lineTo(x, f(x)));
    ctx.stroke();
  };
  stroke(head, 20, 380, headColour, 3);
  if (second) stroke(second, 20, 380, headColour, 3);
  stroke(iso, isoFrom, isoTo, isoColour, 1);
  return { width: width * scale, height: height * scale, data: new Uint8ClampedArray(ctx.getImageData(0, 0, width * scale, height * scale).data), scale };
}

const head: F = (x) => 80 + 0.0012 * (x - 20) ** 2;
// A steep iso-line from below the head curve up through it, ending 40 px beyond.
const iso: F = (x) => 260 - 2.2 * (x - 150);
const headPoints = Array.from({ length: 361 }, (_, i) => sheetPoint(20 + i, head(20 + i)));
const isoPoints = (from: number, to: number) => Array.from({ length: Math.round((to - from) / 0.25) + 1 }, (_, i) => sheetPoint(from + 0.25 * i, iso(from + 0.25 * i)));

/** Where the iso-line crosses a head curve (bisection on x). */
function crossing(h: F = head): SheetPoint {
  let lo = 100;
  let hi = 300;
  for (let k = 0; k < 60; k++) {
    const mid = (lo + hi) / 2;
    if (iso(mid) - h(mid) > 0) lo = mid;
    else hi = mid;
  }
  return sheetPoint(lo, h(lo));
}

describe('iso-line guides clicked on a crossing with a head curve', () => {
  for (const [name, headColour, isoColour] of [
    ['black on black', '#111111', '#222222'],
    ['a coloured head curve and a dark iso-line', '#1f5fbf', '#222222'],
  ] as const) {
    it(`moves the guide onto the thin line alone (${name})`, () => {
      const image = sheet(head, iso, 150, 260, headColour, isoColour);
      const at = crossing();
      const { guides, moved } = guidesOffCrossings(image, [at], [{ points: headPoints, width: 3 }]);
      expect(moved).toHaveLength(1);
      const to = guides[0] as SheetPoint;
      // On the iso-line (within a pixel), and clear of the head curve (by more than its width).
      expect(distanceToPolyline(isoPoints(150, 260), to)).toBeLessThan(1);
      expect(distanceToPolyline(headPoints, to)).toBeGreaterThan(3);
    });
  }

  it('leaves a guide that sits on the iso-line alone where it is', () => {
    const image = sheet(head, iso, 150, 260, '#111111', '#222222');
    const g = sheetPoint(160, iso(160));
    const { guides, moved } = guidesOffCrossings(image, [g], [{ points: headPoints, width: 3 }]);
    expect(moved).toEqual([]);
    expect(guides[0]).toEqual(g);
  });

  it('finds the iso-line where it ends on the head curve, and works in sheet units on a scaled raster', () => {
    const at = crossing();
    // The iso-line drawn from below up to the head curve only.
    const image = sheet(head, iso, 150, at[0], '#111111', '#222222', 2);
    const { guides, moved } = guidesOffCrossings(image, [at], [{ points: headPoints, width: 3 }]);
    expect(moved).toHaveLength(1);
    expect(distanceToPolyline(isoPoints(150, at[0]), guides[0] as SheetPoint)).toBeLessThan(1);
  });

  it('a trace from guides on two crossings follows the iso-line, not a head curve', () => {
    const lower: F = (x) => head(x) + 90;
    const lowerPoints = Array.from({ length: 361 }, (_, i) => sheetPoint(20 + i, lower(20 + i)));
    const image = sheet(head, iso, 110, 250, '#111111', '#222222', 1, lower);
    const lines = [{ points: headPoints, width: 3 }, { points: lowerPoints, width: 3 }];
    const clicked = [crossing(lower), crossing(head)];
    const { guides, moved } = guidesOffCrossings(image, clicked, lines);
    expect(moved).toHaveLength(2);
    const traced = traceRaster(image, guides, { extent: 'guides' });
    const worst = Math.max(...traced.points.map((p) => distanceToPolyline(isoPoints(110, 250), p)));
    expect(worst).toBeLessThan(1.5); // px: on the iso-line all along
    // The line model is the thin line's (drawn 1 px wide), not the head curve's (3 px).
    expect(traced.line.widthPx).toBeLessThan(2);
    // Sampled on the crossings themselves, the model is the crossing's blot, about 5 px wide.
  });

  it('finds where an iso-line goes on beyond a head curve its trace stopped at, and nothing against its heading', () => {
    const lower: F = (x) => head(x) + 90;
    const lowerPoints = Array.from({ length: 361 }, (_, i) => sheetPoint(20 + i, lower(20 + i)));
    const image = sheet(head, iso, 110, 250, '#111111', '#222222', 1, lower);
    const lines = [{ points: headPoints, width: 3 }, { points: lowerPoints, width: 3 }];
    // The trace came up the iso-line from below and stopped at the lower head curve: heading up and right.
    const length = Math.hypot(1, 2.2);
    const up: [number, number] = [1 / length, -2.2 / length];
    const next = guideBeyondCrossing(image, crossing(lower), up, lines);
    expect(next).toBeDefined();
    expect(distanceToPolyline(isoPoints(110, 250), next as SheetPoint)).toBeLessThan(1);
    expect((next as SheetPoint)[1]).toBeLessThan(crossing(lower)[1]); // beyond, not back
    // Heading along the head curve (level), no ink but the head curve and the upright grid: nothing.
    expect(guideBeyondCrossing(image, crossing(head), [1, 0], lines)).toBeUndefined();
  });
});

describe('a guide on a crossing where other ink leaves it too', () => {
  // A grey iso-line ends on the head curve from below; an untraced black line (a curve of another
  // quantity, thicker and darker than the iso-line) leaves the same crossing up and to the right.
  function busySheet(at: SheetPoint): RasterImage {
    const canvas = createCanvas(400, 300);
    const ctx = canvas.getContext('2d');
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, 400, 300);
    const path = (pts: [number, number][], colour: string, w: number) => {
      ctx.strokeStyle = colour;
      ctx.lineWidth = w;
      ctx.beginPath();
      pts.forEach(([x, y], k) => (k === 0 ? ctx.moveTo(x, y) : ctx.lineTo(x, y)));
      ctx.stroke();
    };
    path(Array.from({ length: 361 }, (_, i) => [20 + i, head(20 + i)] as [number, number]), '#111111', 3);
    path(Array.from({ length: 81 }, (_, i) => [150 + ((at[0] - 150) * i) / 80, iso(150 + ((at[0] - 150) * i) / 80)] as [number, number]), '#555555', 1);
    path([[at[0], at[1]], [at[0] + 45, at[1] - 30]], '#000000', 2);
    return { width: 400, height: 300, data: new Uint8ClampedArray(ctx.getImageData(0, 0, 400, 300).data), scale: 1 };
  }

  it('moves the guide along the iso-line towards the trace\'s other guides, not onto the darker line', () => {
    const at = crossing();
    const image = busySheet(at);
    const other = sheetPoint(160, iso(160)); // a second guide further down the same iso-line
    const { guides, moved } = guidesOffCrossings(image, [at, other], [{ points: headPoints, width: 3 }]);
    expect(moved.map((m) => m.index)).toEqual([0]);
    expect(distanceToPolyline(isoPoints(150, at[0]), guides[0] as SheetPoint)).toBeLessThan(1);
  });
});
