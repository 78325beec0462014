/**
 * A coloured curve that ends in a black label beside its end: the line finder reads darkness and
 * joins the label's letters to the line, so the line found ends past the drawn curve's end (the
 * committed colour scan's 330 mm efficiency curve ended 18.6 m³/h late, did not end where its head
 * curve ends, and was left out with a question). Where the tracer's line stops short and the line
 * found runs on in ink of another colour than the tracer's, the line ends where the tracer did.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { notOwnInkFrom } from '../../src/digitize/detect/rasterCurves.ts';
import { trackOf } from '../../src/digitize/detect/rasterLines.ts';
import { inkModel, type Rgb } from '../../src/digitize/colour.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';
import { closeTextReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { detectSample } from './sampleDetect.ts';

afterAll(() => closeTextReaderNode());

const PAPER: Rgb = [248, 246, 240];
const GREEN: Rgb = [30, 140, 70];
const BLACK: Rgb = [40, 40, 40];

/** A level line at row 50 from column 10 to 300: `first` ink up to column 200, `then` ink past it. */
function picture(first: Rgb, then: Rgb): RasterImage {
  const width = 320;
  const height = 100;
  const data = new Uint8ClampedArray(width * height * 4);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 4;
      const ink = Math.abs(y - 50) <= 1 && x >= 10 && x <= 300;
      const c = ink ? (x <= 200 ? first : then) : PAPER;
      data[i] = c[0];
      data[i + 1] = c[1];
      data[i + 2] = c[2];
      data[i + 3] = 255;
    }
  }
  return { width, height, data, scale: 1 };
}

const found = trackOf(Array.from({ length: 291 }, (_, k) => [10 + k + 0.5, 50.5] as const));
const traced = Array.from({ length: 19 }, (_, k) => [10 + 10 * k, 50.5] as [number, number]);
const at = (u: number, v: number) => sheetPoint(u, v);

describe('a line found running on past the tracer in other ink', () => {
  it('ends where the tracer did when the run is another colour than the traced line (a black label past a green curve)', () => {
    expect(notOwnInkFrom(picture(GREEN, BLACK), found, traced, inkModel(GREEN, PAPER), 10, at)).toBe(190);
  });

  it('is kept as found where the run is the line\'s own colour (the tracer stopped short in a bunch)', () => {
    expect(notOwnInkFrom(picture(GREEN, GREEN), found, traced, inkModel(GREEN, PAPER), 10, at)).toBeUndefined();
  });

  it('is kept as found for a line of no clear hue (a black label tells nothing from a black line)', () => {
    expect(notOwnInkFrom(picture(BLACK, BLACK), found, traced, inkModel(BLACK, PAPER), 10, at)).toBeUndefined();
  });

  it('is kept as found where the tracer ran nearly as far (within the margin)', () => {
    expect(notOwnInkFrom(picture(GREEN, BLACK), found, [...traced, [295, 50.5]], inkModel(GREEN, PAPER), 10, at)).toBeUndefined();
  });
});

describe('the committed colour scan (an INVENTED sample sheet)', () => {
  it('names its 330 mm efficiency curve, which ends in the 330 mm label beside it, and asks nothing about its end', { timeout: 120_000 }, async () => {
    const got = await detectSample('si-panels-colour-scan');
    expect(got.takeoff.traces.filter((t) => t.quantity === 'efficiency').map((t) => t.diameter)).toContain(330);
    expect(got.questions.join(' ')).not.toMatch(/efficiency curve on panel "efficiency" ending at/);
  });
});
