/**
 * The keystone of a photographed page, measured from its own lines (keystone.ts): an INVENTED
 * page of three ruled frames is drawn through a known homography (a hand-held camera's view:
 * the far edge shorter, the page turned), and the page squared again must put every frame's
 * corners back on a rectangle within a third of a pixel. A page that is only turned (a scan)
 * shows no perspective and is left to the turn alone.
 */
import { describe, expect, it } from 'vitest';
import { applyHomography, invertHomography, multiplyHomography, type H9 } from '../../src/digitize/homography.ts';
import { inkMap, levelInk, levelOf, pageAngle, strongInk } from '../../src/digitize/detect/ink.ts';
import { keystoneOf, lineSamples, ruleSamples, showsPerspective, squarePage } from '../../src/digitize/detect/keystone.ts';
import { findRasterFrames, frameSkew, horizontalRules, verticalRules } from '../../src/digitize/detect/rasterFrames.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';

const W = 1400;
const H = 1800;
/** Frames on the page, page pixels: left, top, right, bottom. */
const FRAMES: [number, number, number, number][] = [
  [200, 150, 1250, 650],
  [200, 750, 1250, 1150],
  [200, 1250, 1250, 1650],
];

/** A camera's view of the page: turned by `deg`, the top edge `keystone` shorter than the bottom (about the page's centre). */
function view(deg: number, keystone: number): H9 {
  const cx = W / 2;
  const cy = H / 2;
  // Perspective about the centre: the row y = −H/2 (top) shrinks by 1 − keystone against the bottom.
  const g = (2 * keystone) / (H * (2 - keystone));
  const centre: H9 = [1, 0, -cx, 0, 1, -cy, 0, 0, 1];
  const persp: H9 = [1, 0, 0, 0, 1, 0, 0, -g, 1];
  const a = (deg * Math.PI) / 180;
  const turn: H9 = [Math.cos(a), -Math.sin(a), 0, Math.sin(a), Math.cos(a), 0, 0, 0, 1];
  const back: H9 = [1, 0, cx, 0, 1, cy, 0, 0, 1];
  return multiplyHomography(back, multiplyHomography(turn, multiplyHomography(persp, centre)));
}

/** The page (frames with grid lines every 100 px, 2 px wide, dark grey) seen through `h` (page → image), anti-aliased. */
function photograph(h: H9): RasterImage {
  const data = new Uint8ClampedArray(W * H * 4).fill(245);
  const inverse = invertHomography(h);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const [px, py] = applyHomography(inverse, x + 0.5, y + 0.5);
      let cover = 0;
      for (const [l, t, r, b] of FRAMES) {
        if (px < l - 2 || px > r + 2 || py < t - 2 || py > b + 2) continue;
        for (let gx = l; gx <= r; gx += 105) cover = Math.max(cover, 1.5 - Math.abs(px - gx));
        cover = Math.max(cover, 1.5 - Math.abs(px - r));
        for (let gy = t; gy <= b; gy += 100) cover = Math.max(cover, 1.5 - Math.abs(py - gy));
        cover = Math.max(cover, 1.5 - Math.abs(py - b));
      }
      if (cover <= 0) continue;
      const v = 245 - 200 * Math.min(1, cover);
      const o = (y * W + x) * 4;
      data[o] = v;
      data[o + 1] = v;
      data[o + 2] = v;
    }
  }
  return { width: W, height: H, data, scale: 1 };
}

function squared(image: RasterImage) {
  const raw = inkMap(image);
  const strong = strongInk(raw);
  const angle = pageAngle(raw, 0.6 * strong);
  const turned = levelInk(raw, levelOf(angle, raw.width, raw.height));
  const minSide = 0.15 * Math.min(raw.width, raw.height);
  return { raw, strong, angle, turned, minSide, page: squarePage(raw, turned, angle, 0.6 * strong, minSide) };
}

/** Largest difference, level pixels, between the two ends of any frame side where the frames' true corners land. */
function cornerSkew(h: H9, toLevel: (x: number, y: number) => [number, number]): number {
  return Math.max(
    ...FRAMES.map(([l, t, r, b]) => {
      const c = [[l, t], [r, t], [r, b], [l, b]].map(([x, y]) => {
        const [ix, iy] = applyHomography(h, x as number, y as number);
        return toLevel(ix, iy);
      }) as [number, number][];
      return Math.max(Math.abs(c[0]![1] - c[1]![1]), Math.abs(c[2]![1] - c[3]![1]), Math.abs(c[0]![0] - c[3]![0]), Math.abs(c[1]![0] - c[2]![0]));
    }),
  );
}

describe('a page photographed at an angle', () => {
  it.each([
    [0.8, 0.08],
    [-1.5, 0.1],
    [0.3, 0.03],
  ])('turned %f° with the far edge %f shorter is squared again: every frame a rectangle within 0.3 px, and its frames found square', (deg, keystone) => {
    const h = view(deg, keystone);
    const image = photograph(h);
    const { page, strong, minSide } = squared(image);
    expect(page).not.toBeNull();
    const level = page!.level;
    // Turning alone leaves the frames skewed by pixels: the keystone is real.
    const turnedOnly = levelOf(level.angle, W, H);
    expect(cornerSkew(h, turnedOnly.toLevel)).toBeGreaterThan(2);
    expect(cornerSkew(h, level.toLevel)).toBeLessThanOrEqual(0.3);
    // Each level pixel maps back to the image and again to itself.
    const [x, y] = level.toImage(321.5, 987.25);
    const [u, v] = level.toLevel(x, y);
    expect(Math.hypot(u - 321.5, v - 987.25)).toBeLessThan(1e-6);
    // On the squared ink every frame is found, and square.
    const map = page!.map;
    const frames = findRasterFrames(horizontalRules(map, 0.6 * strong, minSide), verticalRules(map, 0.6 * strong, minSide), minSide, 6);
    expect(frames).toHaveLength(3);
    for (const f of frames) expect(frameSkew(map, f)).toBeLessThanOrEqual(1);
  });

  it('a page only turned (a scan) shows no perspective and is not squared', () => {
    const { page } = squared(photograph(view(1.2, 0)));
    expect(page).toBeNull();
  });

  it('directions read from tiles and from rules agree with the drawn lines, and a lone family tells nothing', () => {
    const h = view(0, 0.08);
    const { turned, strong, minSide } = squared(photograph(h));
    const tiles = lineSamples(turned, 0.6 * strong, 'upright');
    expect(tiles.length).toBeGreaterThanOrEqual(6);
    const rules = ruleSamples(turned, horizontalRules(turned, 0.6 * strong, minSide), 'level', (u, v) => [u, v]);
    expect(rules.length).toBeGreaterThanOrEqual(6);
    // A page's horizontal rules under a keystone about the horizontal axis stay level.
    for (const r of rules) expect(Math.abs(r.angle)).toBeLessThan((0.02 * Math.PI) / 180);
    const k = keystoneOf(rules, tiles, W, H);
    expect(k).not.toBeNull();
    expect(showsPerspective(k!)).toBe(true);
    expect(keystoneOf(rules, [], W, H)).toBeNull();
  });
});
