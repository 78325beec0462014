/**
 * The printed grid found and taken out of a raster panel: on INVENTED synthetic pictures drawn
 * here (a grey grid turned by a degree, as a scan turns it, and a dark curve over it).
 */
import { describe, expect, it } from 'vitest';
import { findGridLines, removeGrid, withoutGrid } from '../../src/digitize/gridLines.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';

const PAPER = [236, 234, 226] as const;
const GRID = [150, 150, 150] as const;
const W = 420;
/** Width of the pictures drawn, unless a test asks for a wider one. */
const WIDE = W;
const H = 300;
const TURN = Math.tan((1 * Math.PI) / 180);
const SPACING = 24;

/** Share of a pixel a stroke of `width` covers at distance `d` from its centre line (a box filter). */
const cover = (d: number, width: number) => Math.max(0, Math.min(1, width / 2 + 0.5 - Math.abs(d)));

/** The curve: a falling parabola across the panel, pixels. */
const curveY = (x: number) => 60 + 0.0012 * (x - 30) ** 2;

interface Drawn {
  image: RasterImage;
  /** Distance of a pixel from the curve's centre line (vertical, fine for a gentle curve). */
  curveDistance: (x: number, y: number) => number;
}

/** Paper, a grid of grey lines 2 px wide every SPACING px turned by 1°, and optionally a black curve 1.5 px wide over it. */
function draw(withCurve: boolean, extra?: (x: number, y: number) => number, W = WIDE): Drawn {
  const data = new Uint8ClampedArray(W * H * 4);
  const curveDistance = (x: number, y: number) => Math.abs(y - curveY(x)) / Math.sqrt(1 + (0.0024 * (x - 30)) ** 2);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      // Lines across: y = k·SPACING + TURN·x; lines down: x = k·SPACING − TURN·y (the same turn).
      const across = (((y - TURN * x) % SPACING) + SPACING) % SPACING;
      const down = (((x + TURN * y) % SPACING) + SPACING) % SPACING;
      const grid = Math.max(cover(Math.min(across, SPACING - across) - 0, 2), cover(Math.min(down, SPACING - down), 2));
      const ink = withCurve ? cover(curveDistance(x, y), 1.5) : 0;
      const more = extra ? extra(x, y) : 0;
      for (let c = 0; c < 3; c++) {
        // Painted in order: paper, grid, then the curve and anything extra over it.
        let v = (PAPER[c] as number) * (1 - grid) + (GRID[c] as number) * grid;
        v = v * (1 - ink) + 20 * ink;
        v = v * (1 - more) + 20 * more;
        data[4 * (y * W + x) + c] = Math.round(v);
      }
      data[4 * (y * W + x) + 3] = 255;
    }
  }
  return { image: { width: W, height: H, data, scale: 1 }, curveDistance };
}

const BOX = [10, 10, W - 10, H - 10] as const;

describe('findGridLines', () => {
  it('finds every grid line crossing the box, across and down, with its turn', () => {
    const { image } = draw(true);
    const lines = findGridLines(image, BOX);
    const across = lines.filter((l) => !l.vertical);
    const down = lines.filter((l) => l.vertical);
    // Lines across at y = k·24 + TURN·x inside rows 10–290: k = 1 … 11 (k = 12 leaves the box as
    // the turn lifts it 7 px over the width); lines down at x = k·24 − TURN·y: k = 1 … 17.
    expect(across.length).toBe(11);
    expect(down.length).toBe(17);
    for (const l of across) {
      expect(Math.abs(l.b - TURN)).toBeLessThan(0.003);
      // On a multiple of the spacing, within a third of a pixel.
      expect(Math.abs(l.a - Math.round(l.a / SPACING) * SPACING)).toBeLessThan(0.35);
    }
    for (const l of down) expect(Math.abs(l.b + TURN)).toBeLessThan(0.003);
  });

  it('does not take a curve, or a straight line steeper than a turned grid line, for a grid line', () => {
    const steep = (x: number, y: number) => cover(Math.abs(y - (40 + 0.3 * x)) / Math.hypot(1, 0.3), 2);
    const plain = findGridLines(draw(true).image, BOX);
    const lines = findGridLines(draw(true, steep).image, BOX);
    // Every line found is a grid line (turned by the grid's 1°, where a grid line lies without the
    // steep line); a grid line the curves cover for a good part of its strips may go unfound,
    // and is then left in the picture, as it was.
    expect(lines.length).toBeGreaterThanOrEqual(plain.length - 2);
    for (const l of lines) {
      expect(Math.abs(Math.abs(l.b) - TURN)).toBeLessThan(0.003);
      expect(plain.some((p) => p.vertical === l.vertical && Math.abs(p.a - l.a) < 0.5)).toBe(true);
    }
  });

  it('does not take a straight curve that crosses most of the box but ends inside it for a grid line', () => {
    // A power line drawn straight, from the box's left side to 72 % across, turned as little as a
    // grid line may be (about 1.1°): straight enough and long enough for a grid line, but a grid
    // line runs from side to side. Taken out as grid, the curve would be wiped from the picture.
    // A panel 1200 px wide: 36 strips, the line seen in the first 27 (a grid line is seen within 7 of each side).
    const wide = 1200;
    const box = [10, 10, wide - 10, H - 10] as const;
    const ends = 10 + 0.72 * (wide - 20);
    const straight = (x: number, y: number) => (x > ends ? 0 : cover(Math.abs(y - (150 + 0.02 * x)), 2));
    const plain = findGridLines(draw(false, undefined, wide).image, box);
    const lines = findGridLines(draw(false, straight, wide).image, box);
    expect(plain.filter((l) => !l.vertical).length).toBeGreaterThan(5);
    expect(lines.length).toBeGreaterThanOrEqual(plain.length - 1);
    for (const l of lines) expect(plain.some((p) => p.vertical === l.vertical && Math.abs(p.a - l.a) < 0.5)).toBe(true);
    // Nothing found along the straight line: every line across lies off it at mid-box.
    for (const l of lines.filter((q) => !q.vertical)) expect(Math.abs(l.a + l.b * 200 - (150 + 0.02 * 200))).toBeGreaterThan(3);
  });

  it('does not take a straight coloured line across the whole box for a grid line of a grey grid', () => {
    // An orange power line drawn straight from side to side (or with its label standing in for
    // the last stretch): long, straight and level enough for a grid line, but not in the grid's ink.
    const { image } = draw(false);
    const orange = [224, 123, 0];
    for (let y = 0; y < H; y++) {
      for (let x = 0; x < W; x++) {
        const ink = cover(Math.abs(y - (150 + 0.02 * x)), 2);
        for (let c = 0; c < 3; c++) {
          const o = 4 * (y * W + x) + c;
          image.data[o] = Math.round((image.data[o] as number) * (1 - ink) + (orange[c] as number) * ink);
        }
      }
    }
    const plain = findGridLines(draw(false).image, BOX);
    const lines = findGridLines(image, BOX);
    expect(lines.length).toBeGreaterThanOrEqual(plain.length - 1);
    for (const l of lines) expect(plain.some((p) => p.vertical === l.vertical && Math.abs(p.a - l.a) < 0.5)).toBe(true);
    for (const l of lines.filter((q) => !q.vertical)) expect(Math.abs(l.a + l.b * 200 - (150 + 0.02 * 200))).toBeGreaterThan(3);
  });

  it('still finds every line of a grid printed in a colour', () => {
    // The same grid in green: each pixel's darkness kept in red and blue and a third of it in green.
    const { image } = draw(false);
    for (let o = 0; o < image.data.length; o += 4) {
      for (let c = 0; c < 3; c++) {
        const dark = (PAPER[c] as number) - (image.data[o + c] as number);
        image.data[o + c] = Math.round((PAPER[c] as number) - (c === 1 ? 0.35 : 1) * dark);
      }
    }
    expect(findGridLines(image, BOX).length).toBe(findGridLines(draw(false).image, BOX).length);
  });

  it('finds a grid line seen in too few strips where the spacing puts one, and no line where none is printed', () => {
    // Line across k = 5 (y = 120 + TURN·x) with 45 % of its length hidden (paper over it, as
    // where curves run along it or a label covers it): the strips see it in too few places to
    // link it, but the grid is evenly spaced and the line is there along the rest of its length.
    const { image } = draw(false);
    const hide = (k: number, from: number, to: number) => {
      for (let x = from; x < to; x++) {
        for (let y = Math.floor(k * SPACING + TURN * x - 3); y <= k * SPACING + TURN * x + 3; y++) {
          for (let c = 0; c < 3; c++) image.data[4 * (y * W + x) + c] = PAPER[c] as number;
        }
      }
    };
    hide(5, 90, 280);
    const lines = findGridLines(image, BOX).filter((l) => !l.vertical);
    expect(lines.length).toBe(11);
    const filled = lines.find((l) => Math.abs(l.a - 5 * SPACING) < 1);
    expect(filled).toBeDefined();
    expect(Math.abs((filled as { b: number }).b - TURN)).toBeLessThan(0.003);
    // Wholly hidden, line k = 7 is not invented: nothing is printed where the spacing puts it.
    hide(7, 0, W);
    const fewer = findGridLines(image, BOX).filter((l) => !l.vertical);
    expect(fewer.length).toBe(10);
    expect(fewer.some((l) => Math.abs(l.a - 7 * SPACING) < 3)).toBe(false);
  });

  it('finds nothing in a box too small to hold three strips, or on bare paper', () => {
    expect(findGridLines(draw(true).image, [0, 0, 60, 60])).toEqual([]);
    const bare = new Uint8ClampedArray(W * H * 4).fill(230);
    expect(findGridLines({ width: W, height: H, data: bare, scale: 1 }, BOX)).toEqual([]);
  });
});

describe('removeGrid', () => {
  it('leaves paper where the grid was and keeps the curve dark', () => {
    const { image, curveDistance } = draw(true);
    const data = new Uint8ClampedArray(image.data);
    removeGrid(image, data, BOX);
    let worstGrid = 0;
    let weakestCurve = Infinity;
    for (let y = 14; y < H - 14; y++) {
      for (let x = 14; x < W - 14; x++) {
        const o = 4 * (y * W + x);
        const d = curveDistance(x, y);
        if (d > 4) worstGrid = Math.max(worstGrid, Math.abs((data[o + 1] as number) - (PAPER[1] as number)));
        else if (d < 0.3) weakestCurve = Math.min(weakestCurve, (PAPER[1] as number) - (data[o + 1] as number));
      }
    }
    // Grid pixels come back within 24 levels of the paper, of the 84 the grid darkens them by (a
    // sharp line on the pixel lattice keeps a little at its edges: its cross-section is the median
    // over every place of its centre within a pixel; a scan's blur leaves less); the curve keeps
    // at least 150 levels of its 214 of darkness even where it crosses the grid.
    expect(worstGrid).toBeLessThanOrEqual(24);
    expect(weakestCurve).toBeGreaterThanOrEqual(150);
  });

  it('keeps one cleaned copy per image, leaving the image itself as it was', () => {
    const { image } = draw(false);
    const before = image.data.slice();
    const a = withoutGrid(image, BOX);
    const b = withoutGrid(image, BOX);
    expect(a).toBe(b);
    expect(a.data).not.toBe(image.data);
    expect(image.data).toEqual(before);
  });
});
