import { createCanvas } from '@napi-rs/canvas';
import { describe, expect, it } from 'vitest';
import { inkModel } from '../../src/digitize/colour.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';
import { alongBand } from '../../src/digitize/rasterBand.ts';

const f = (x: number) => 100 + 0.0004 * (x - 300) ** 2; // y down, a gentle bend

/** Three lines 2.5 px wide, touching: the traced one on top (at f), two more below it. */
function bunch(): RasterImage {
  const canvas = createCanvas(500, 200);
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, 500, 200);
  for (const [dy, colour] of [[0, '#d00000'], [2.5, '#0050d0'], [5, '#00a000']] as const) {
    ctx.strokeStyle = colour;
    ctx.lineWidth = 2.5;
    ctx.beginPath();
    for (let x = 150; x <= 450; x++) (x === 150 ? ctx.moveTo(x, f(x) + dy) : ctx.lineTo(x, f(x) + dy));
    ctx.stroke();
  }
  return { width: 500, height: 200, data: new Uint8ClampedArray(ctx.getImageData(0, 0, 500, 200).data), scale: 1 };
}

describe('a bridge laid along a bunch', () => {
  it('keeps the line at its distance from the bunch\'s edge, where a straight bridge cuts across the bend', () => {
    const image = bunch();
    const style = { model: inkModel([208, 0, 0], [255, 255, 255]), width: 2.5, threshold: 0.4, massRange: [0.55, 1.5] as const };
    // A straight bridge from (200, f(200)) to (400, f(400)): 4 px off the line at its middle.
    const chord: Array<[number, number]> = [];
    for (let x = 200; x <= 400; x += 2) chord.push([x, f(200)]);
    const before = Math.max(...chord.map((p) => Math.abs(p[1] - f(p[0]))));
    const laid = alongBand(image, style, chord, { reads: 0 });
    const after = Math.max(...laid.map((p) => Math.abs(p[1] - f(p[0]))));
    expect(before).toBeGreaterThan(3.9); // px: the chord's sag
    expect(after).toBeLessThan(0.6); // px: anti-aliased edges of a 2.5 px line, found to a fraction of a pixel
  });

  it('leaves the bridge as it is where it cannot see the bunch at its ends', () => {
    const image = bunch();
    const style = { model: inkModel([208, 0, 0], [255, 255, 255]), width: 2.5, threshold: 0.4, massRange: [0.55, 1.5] as const };
    const away: Array<[number, number]> = [];
    for (let x = 200; x <= 400; x += 2) away.push([x, 30]);
    expect(alongBand(image, style, away, { reads: 0 })).toEqual(away);
  });
});
