/**
 * Projective calibration for photos (src/digitize/calibration.ts, homography.ts): a sheet
 * photographed in perspective is read exactly with 4 anchors, the residual shown is never a
 * 0 % from an exactly fixed map, and anchors that cannot show perspective are said to.
 */
import { describe, expect, it } from 'vitest';
import { calibrate, type AnchorInput } from '../../src/digitize/calibration.ts';
import { applyHomography, fitHomography, invertHomography, type H9 } from '../../src/digitize/homography.ts';
import { dataPoint, sheetPoint } from '../../src/digitize/points.ts';

/** A panel (flow 0–400, head 0–80) printed 1000 × 600 px, photographed with its far (top) edge 8 % shorter and turned 1.5°. */
function photo(): (x: number, y: number) => [number, number] {
  const flat = (q: number, h: number): [number, number] => [100 + (q / 400) * 1000, 700 - (h / 80) * 600];
  const corners: [number, number][] = [flat(0, 80), flat(400, 80), flat(400, 0), flat(0, 0)];
  const turn = (1.5 * Math.PI) / 180;
  const seen = corners.map(([x, y], i) => {
    const squeeze = i < 2 ? (i === 0 ? 40 : -40) : 0; // top edge 80 px (8 %) shorter
    const px = x + squeeze - 600;
    const py = y - 400;
    return [600 + Math.cos(turn) * px - Math.sin(turn) * py, 400 + Math.sin(turn) * px + Math.cos(turn) * py] as [number, number];
  });
  const h = fitHomography(corners, seen) as H9;
  return (q, v) => applyHomography(h, ...flat(q, v));
}

const corners: [number, number][] = [[0, 0], [400, 0], [0, 80], [400, 80]];

describe('projective calibration', () => {
  it('fitHomography recovers a known homography from 4 points and invertHomography undoes it (relative 1e-9)', () => {
    const h: H9 = [1.1, 0.05, 3, -0.02, 0.95, 7, 1e-4, -2e-4, 1];
    const from: [number, number][] = [[0, 0], [500, 10], [480, 400], [20, 390]];
    const got = fitHomography(from, from.map(([x, y]) => applyHomography(h, x, y))) as H9;
    for (const [x, y] of [[250, 200], [10, 380]] as const) {
      const [u, v] = applyHomography(got, x, y);
      const [u0, v0] = applyHomography(h, x, y);
      expect(Math.hypot(u - u0, v - v0)).toBeLessThan(1e-9 * 500);
      const [bx, by] = applyHomography(invertHomography(got), u, v);
      expect(Math.hypot(bx - x, by - y)).toBeLessThan(1e-9 * 500);
    }
  });

  it('chooses projective for a photo with 4 anchors, reads it exactly, and shows an estimated residual with a warning, never 0 %', () => {
    const at = photo();
    const anchors: AnchorInput[] = corners.map(([x, y]) => ({ at: at(x, y), x, y }));
    const cal = calibrate(anchors, { panel: 'head' });
    expect(cal.projection).toBe('projective');
    expect(cal.residualKind).toBe('estimated');
    expect(cal.maxPercentOfSpan).toBeGreaterThan(0.01); // % of span: 0.5 px over a ~1000 px panel
    expect(cal.maxPercentOfSpan).toBeLessThan(0.5);
    expect(cal.warnings.some((w) => /cannot be checked.*Add a fifth anchor/.test(w))).toBe(true);
    for (const [q, v] of [[200, 40], [380, 10], [20, 75]] as const) {
      const d = cal.toData(sheetPoint(...at(q, v)));
      expect(Math.abs(d[0] - q)).toBeLessThan(1e-7 * 400);
      expect(Math.abs(d[1] - v)).toBeLessThan(1e-7 * 80);
      const s = cal.toSheet(dataPoint(q, v));
      expect(Math.hypot(s[0] - at(q, v)[0], s[1] - at(q, v)[1])).toBeLessThan(1e-6); // sheet units
    }
  });

  it('the affine map misreads the same photo by more than 1 % of span at a far corner (why projective is needed)', () => {
    const at = photo();
    const cal = calibrate(corners.map(([x, y]) => ({ at: at(x, y), x, y })), { projection: 'affine' });
    expect(cal.projection).toBe('affine');
    const d = cal.toData(sheetPoint(...at(200, 40)));
    expect(Math.max(Math.abs(d[0] - 200) / 4, Math.abs(d[1] - 40) / 0.8)).toBeGreaterThan(0.5); // % of span in the middle
  });

  it('with 5 anchors shows the leave-one-out residual, which grows with a misplaced anchor', () => {
    const at = photo();
    const five: [number, number][] = [...corners, [100, 60]]; // off the diagonals: any four of them fix a homography
    const clean = calibrate(five.map(([x, y]) => ({ at: at(x, y), x, y })));
    expect(clean.projection).toBe('projective');
    expect(clean.residualKind).toBe('leave-one-out');
    expect(clean.anchorPercentOfSpan).toBeLessThan(1e-6);
    const nudged = calibrate(five.map(([x, y], i) => ({ at: (i === 4 ? [at(x, y)[0] + 3, at(x, y)[1]] : at(x, y)) as [number, number], x, y })));
    expect(nudged.anchorPercentOfSpan).toBeGreaterThan(0.2); // 3 px off over ~1000 px, seen from the other four
    expect(nudged.maxPercentOfSpan).toBeGreaterThan(3 * clean.maxPercentOfSpan);
  });

  it('keeps affine for a flat scan and warns when 3 anchors, or anchors on two lines, cannot show perspective', () => {
    const flat = (q: number, h: number): [number, number] => [100 + q * 2.5, 700 - h * 7.5];
    expect(calibrate(corners.map(([x, y]) => ({ at: flat(x, y), x, y }))).projection).toBe('affine');
    const three = calibrate(corners.slice(0, 3).map(([x, y]) => ({ at: flat(x, y), x, y })), { panel: 'p' });
    expect(three.residualKind).toBe('none');
    expect(three.maxPercentOfSpan).toBeGreaterThan(0.01); // never 0 % from an exactly fixed map: the 0.5-unit estimate (% of span)
    expect(three.warnings.some((w) => /three anchors fix an affine map exactly/.test(w))).toBe(true);
    const at = photo();
    const twoLines: [number, number][] = [[0, 0], [200, 0], [400, 0], [0, 40], [0, 80]];
    const cal = calibrate(twoLines.map(([x, y]) => ({ at: at(x, y), x, y })), { panel: 'p' });
    expect(cal.projection).toBe('affine');
    expect(cal.warnings.some((w) => /cannot reveal the perspective/.test(w))).toBe(true);
    expect(() => calibrate(twoLines.map(([x, y]) => ({ at: at(x, y), x, y })), { projection: 'projective' })).toThrow(/not all along two lines from one anchor/);
    // Four anchors, three of them along the bottom edge: no four can fix a perspective.
    const threeOnOne: [number, number][] = [[0, 0], [200, 0], [400, 0], [200, 80]];
    const flatLine = calibrate(threeOnOne.map(([x, y]) => ({ at: at(x, y), x, y })), { panel: 'p' });
    expect(flatLine.projection).toBe('affine');
    expect(flatLine.warnings.some((w) => /three on one line, so they cannot reveal the perspective/.test(w))).toBe(true);
  });

  it('chooses projective with 5 anchors when the homography fits them far better, even when one of them nearly lines up with two others', () => {
    const at = photo();
    // A fifth anchor on the bottom edge: leaving out a bottom corner leaves three anchors nearly
    // on one line, so the left-out test alone cannot speak for the homography.
    const five: [number, number][] = [...corners, [200, 0]];
    const cal = calibrate(five.map(([x, y]) => ({ at: at(x, y), x, y })));
    expect(cal.projection).toBe('projective');
    const [q, v] = cal.toData(sheetPoint(...at(380, 75)));
    expect(Math.abs(q - 380)).toBeLessThan(1e-6 * 400);
    expect(Math.abs(v - 75)).toBeLessThan(1e-6 * 80);
  });

  it('the residual shown predicts the real error over the plot within a factor of 3 (anchors snapped with a few tenths of a unit of scatter)', () => {
    // Seeded scatter (a linear congruential generator and Box–Muller), 200 placements of 4 or 5 anchors.
    let state = 12345;
    const uniform = () => ((state = (state * 1103515245 + 12345) % 2147483648) + 0.5) / 2147483648;
    const normal = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
    const at = photo();
    const frame: [number, number, number, number] = [Math.min(at(0, 80)[0], at(0, 0)[0]), Math.min(at(0, 80)[1], at(400, 80)[1]), Math.max(at(400, 0)[0], at(400, 80)[0]), Math.max(at(0, 0)[1], at(400, 0)[1])];
    let within = 0;
    const trials = 200;
    for (let t = 0; t < trials; t++) {
      const sigma = 0.15 + 0.35 * uniform(); // sheet units
      const values: [number, number][] = t % 2 === 0 ? corners : [...corners, [100 + 200 * uniform(), 20 + 40 * uniform()]];
      const anchors = values.map(([x, y]) => ({ at: [at(x, y)[0] + sigma * normal(), at(x, y)[1] + sigma * normal()] as [number, number], x, y }));
      const cal = calibrate(anchors, { frame });
      let real = 0;
      for (let i = 0; i <= 8; i++) {
        for (let j = 0; j <= 8; j++) {
          const [q, v] = [50 * i, 10 * j];
          const d = cal.toData(sheetPoint(...at(q, v)));
          real = Math.max(real, (100 * Math.abs(d[0] - q)) / 400, (100 * Math.abs(d[1] - v)) / 80);
        }
      }
      if (cal.maxPercentOfSpan / real <= 3 && real / cal.maxPercentOfSpan <= 3) within++;
    }
    expect(within / trials).toBeGreaterThan(0.85);
  });
});
