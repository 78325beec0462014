/**
 * The grid of a scan is looked through, also where its rows and columns cross: a faint-lined
 * sheet (thin pale curves on a dense grey grid, as scanned) gives its curves and nothing else.
 * INVENTED ink maps, drawn here.
 */
import { describe, expect, it } from 'vitest';
import { frameLines, gridDarkness, trackAt } from '../../src/digitize/detect/rasterLines.ts';
import type { InkMap } from '../../src/digitize/detect/ink.ts';

const W = 900;
const H = 500;
const FRAME = [40, 40, 860, 460] as const;
/** Profile of a blurred 1 px line across its middle (darkness shares). */
const PROFILE = [0.5, 1, 1, 0.5];

/** A dense grid (rows every 22 px, columns every 24 px, closer than the gaps a dashed line may leave, darkness `grid`), the lines laid over one another as ink does, and curves of darkness `curve`. */
function faintSheet(grid: number, curve: number, curves: ((x: number) => number)[]): { map: InkMap; rows: number[]; cols: number[] } {
  const share = new Float32Array(W * H); // light let through, 1 = paper
  share.fill(1);
  const rows: number[] = [];
  const cols: number[] = [];
  for (let y = 62; y < 450; y += 22) rows.push(y + 0.5);
  for (let x = 64; x < 850; x += 24) cols.push(x + 0.5);
  const lay = (i: number, d: number) => (share[i] = (share[i] as number) * (1 - d / 255));
  for (const y of rows) for (let x = 40; x < 860; x++) PROFILE.forEach((p, k) => lay((Math.floor(y) - 1 + k) * W + x, p * grid));
  for (const x of cols) for (let y = 40; y < 460; y++) PROFILE.forEach((p, k) => lay(y * W + Math.floor(x) - 1 + k, p * grid));
  for (const f of curves) {
    for (let x = 41; x < 859; x++) {
      const y = f(x + 0.5);
      for (let yy = Math.floor(y - 1); yy <= Math.ceil(y + 1); yy++) {
        const cover = Math.max(0, Math.min(1, 1.3 - Math.abs(yy + 0.5 - y)));
        if (cover > 0) lay(yy * W + x, cover * curve);
      }
    }
  }
  const ink = new Uint8Array(W * H);
  for (let i = 0; i < ink.length; i++) ink[i] = Math.round(255 * (1 - (share[i] as number)));
  return { map: { width: W, height: H, ink }, rows, cols };
}

describe('grid crossings', () => {
  it('a crossing is as dark as its row and column laid one over the other', () => {
    expect(gridDarkness(0, 37)).toBe(37);
    expect(gridDarkness(39, 0)).toBe(39);
    // 39 and 37 over each other: 1 − (1 − 39/255)(1 − 37/255) = 70.3/255.
    expect(gridDarkness(39, 37)).toBeCloseTo(70.3, 1);
    expect(gridDarkness(39, 37)).toBeGreaterThan(39);
  });

  it('two pale curves on a dense grid of about their own darkness come back as two lines; the crossings of the grid make none', () => {
    const curves = [(x: number) => 110 + 0.0004 * (x - 40) ** 2, (x: number) => 250 + 0.0003 * (x - 40) ** 2];
    const { map, rows, cols } = faintSheet(40, 45, curves);
    const tracks = frameLines(map, FRAME, { grid: { x: cols, y: rows }, ceiling: 35 });
    expect(tracks).toHaveLength(2);
    for (const f of curves) {
      const t = tracks.find((k) => Math.abs((trackAt(k, 450) ?? 1e9) - f(450)) < 2);
      expect(t).toBeDefined();
      expect(t!.u[t!.u.length - 1]! - t!.u[0]!).toBeGreaterThan(700);
    }
  });
});
