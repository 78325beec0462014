import { describe, expect, it } from 'vitest';
import { snapToRaster, snapToStraights, straightPieces, strongestRun } from '../../src/ui/geometry/snap.ts';
import { plotsOfFrame, quantityOfTitle, readHints, type TextItem } from '../../src/ui/geometry/hints.ts';
import { fitRect, toScreen, toSheetFromScreen, visibleRect, zoomAt } from '../../src/ui/canvas/view.ts';
import { bestProposal } from '../../src/ui/app/proposals.ts';
import { niceTicks } from '../../src/units/index.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import type { VectorPath } from '../../src/digitize/sheet.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';

const line = (a: [number, number], b: [number, number]): VectorPath => ({
  segments: [{ kind: 'move', to: sheetPoint(...a) }, { kind: 'line', to: sheetPoint(...b) }],
  stroke: '#000000', fill: null, lineWidth: 0.5, dashed: false,
});

describe('snapping on a vector page', () => {
  const grid = straightPieces([line([0, 100], [400, 100]), line([200, 0], [200, 300]), line([300, 100], [300, 104]), line([10, 10], [50, 60])]);

  it('keeps only level and upright straight pieces', () => {
    expect(grid.map((s) => s.level)).toEqual([true, false, false]);
  });

  it('snaps to the crossing of two grid lines first', () => {
    expect(snapToStraights(grid, [203, 98], 8)).toEqual({ at: [200, 100], what: 'crossing' });
  });

  it('snaps to the end of a tick mark when no crossing is near', () => {
    expect(snapToStraights(grid, [301, 105], 3)).toEqual({ at: [300, 104], what: 'tick' });
  });

  it('falls back to the foot on the nearest line, and to nothing when nothing is near', () => {
    expect(snapToStraights(grid, [100, 103], 5)).toEqual({ at: [100, 100], what: 'line' });
    expect(snapToStraights(grid, [100, 200], 5)).toBeNull();
  });
});

/** A white picture with dark lines: rows and columns listed, each one pixel wide. */
function picture(width: number, height: number, rows: number[], cols: number[], scale = 1): RasterImage {
  const data = new Uint8ClampedArray(width * height * 4).fill(255);
  const ink = (x: number, y: number) => data.fill(20, (y * width + x) * 4, (y * width + x) * 4 + 3);
  for (const r of rows) for (let x = 0; x < width; x++) ink(x, r);
  for (const c of cols) for (let y = 0; y < height; y++) ink(c, y);
  return { width, height, data, scale };
}

describe('snapping on a scan', () => {
  it('finds the crossing of a dark row and a dark column at pixel centres', () => {
    expect(snapToRaster(picture(60, 60, [30], [20]), [24, 27], 8)).toEqual({ at: [20.5, 30.5], what: 'crossing' });
  });

  it('works in sheet units when the picture is drawn at another scale', () => {
    const s = snapToRaster(picture(120, 120, [60], [40], 2), [21, 31], 6);
    expect(s?.at[0]).toBeCloseTo(20.25, 9); // (40 + 0.5) / 2, exact
    expect(s?.at[1]).toBeCloseTo(30.25, 9);
  });

  it('snaps onto a single line when it is the only one near', () => {
    expect(snapToRaster(picture(60, 60, [30], []), [24, 27], 8)).toEqual({ at: [24, 30.5], what: 'line' });
    expect(snapToRaster(picture(60, 60, [], []), [24, 27], 8)).toBeNull();
  });

  it('takes the ink-weighted centre of the strongest run', () => {
    expect(strongestRun(new Float32Array([0, 0.9, 0.9, 0, 0.5, 0]), 0.4)).toBeCloseTo(1.5, 12);
    expect(strongestRun(new Float32Array([0, 0.1]), 0.4)).toBeNull();
  });
});

const text = (t: string, x = 0, y = 0, angle = 0, size = 8): TextItem => ({ text: t, at: [x, y], size, width: t.length * 4, angle });

describe('hints read from the text of a vector sheet', () => {
  it('reads the speed, the diameters on the curves and the units of the axis titles', () => {
    const hints = readHints([text('Invented pump · 1 480 rpm · clear water'), text('330 mm'), text('310 mm'), text('290 mm'), text('Head (m)'), text('Flow (m³/h)'), text('Shaft power (kW)'), text('NPSHr (m)')]);
    expect(hints).toEqual({ speed_rpm: 1480, diameters: [330, 310, 290], diameterUnit: 'mm', units: { flow: 'm3/h', head: 'm', npsh: 'm', power: 'kW' } });
  });

  it('reads US sheets too, and nothing from a page without such text', () => {
    expect(readHints([text('1780 rpm'), text('13 in'), text('12 in'), text('Head (ft)'), text('Flow (gpm)'), text('Power (hp)')])).toMatchObject({ speed_rpm: 1780, diameters: [13, 12], diameterUnit: 'in', units: { flow: 'gpm', head: 'ft', power: 'hp' } });
    expect(readHints([text('Invented demo')])).toEqual({});
  });

  it('names what a panel plots from the title just above its frame, or upright beside it', () => {
    expect(quantityOfTitle('Shaft power (kW)')).toBe('power');
    expect(quantityOfTitle('Flow (m³/h)')).toBeNull();
    const items = [text('Head (m)', 100, 95), text('Shaft power (kW)', 100, 295), text('NPSHr (m)', 80, 500, -Math.PI / 2)];
    expect(plotsOfFrame(items, [100, 100, 500, 250])).toBe('head');
    expect(plotsOfFrame(items, [100, 300, 500, 400])).toBe('power');
    expect(plotsOfFrame(items, [100, 450, 500, 560])).toBe('npshr');
    expect(plotsOfFrame(items, [100, 700, 500, 800])).toBeNull();
  });
});

describe('the view onto the sheet', () => {
  it('toSheetFromScreen is the inverse of toScreen', () => {
    const v = { zoom: 2.5, offsetX: -40, offsetY: 12 };
    const s = toScreen(v, [33, 71]);
    const back = toSheetFromScreen(v, s);
    expect(back[0]).toBeCloseTo(33, 12);
    expect(back[1]).toBeCloseTo(71, 12);
  });

  it('zooming about a screen point keeps the sheet point under it in place', () => {
    const v = { zoom: 1, offsetX: 10, offsetY: 20 };
    const at: [number, number] = [300, 200];
    const before = toSheetFromScreen(v, at);
    const after = toSheetFromScreen(zoomAt(v, 3, at), at);
    expect(after[0]).toBeCloseTo(before[0], 12);
    expect(after[1]).toBeCloseTo(before[1], 12);
  });

  it('fitting shows the whole page centred with its margin, and the visible part is clipped to the page', () => {
    const v = fitRect([0, 0, 600, 800], 1000, 800, 16);
    expect(v.zoom).toBeCloseTo(768 / 800, 12);
    expect(toScreen(v, [300, 400])).toEqual([500, 400]);
    expect(visibleRect(v, 1000, 800, 600, 800)).toEqual([0, 0, 600, 800]);
    expect(visibleRect({ zoom: 1, offsetX: 5000, offsetY: 0 }, 100, 100, 600, 800)).toBeNull();
  });
});

describe('choosing the proposal for a frame', () => {
  const p = (frame: [number, number, number, number], yAt: number) => ({ frame, anchors: [{ at: [yAt, 0] as [number, number], y: 1 }], xScale: 'linear' as const, yScale: 'linear' as const, residual: 0 });

  it('takes the proposal covering the frame, preferring value labels at its left edge', () => {
    const left = p([100, 100, 500, 300], 100);
    const right = p([100, 100, 500, 300], 500);
    const elsewhere = p([100, 400, 500, 600], 100);
    expect(bestProposal([right, elsewhere, left], [98, 98, 502, 302])).toBe(left);
    expect(bestProposal([elsewhere], [98, 98, 502, 302])).toBeNull();
  });
});

describe('chart ticks', () => {
  it('steps of 1, 2 or 5 times a power of ten covering the range', () => {
    expect(niceTicks(0, 370, 6)).toEqual({ ticks: [0, 100, 200, 300, 400], lo: 0, hi: 400 });
    expect(niceTicks(0.3, 0.87, 4).ticks).toEqual([0.2, 0.4, 0.6, 0.8, 1]);
    expect(niceTicks(5, 5, 4).ticks.length).toBeGreaterThan(1);
  });
});
