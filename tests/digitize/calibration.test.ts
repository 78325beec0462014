import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { calibrate, CalibrationError, type AnchorInput } from '../../src/digitize/calibration.ts';
import { dataPoint, sheetPoint } from '../../src/digitize/points.ts';

/** A known panel: data (after log10 where asked) → sheet through rotation, skew and unequal scales. */
function panelMap(opts: { rotateDeg: number; skew: number; sx: number; sy: number; ox: number; oy: number; logX?: boolean; logY?: boolean }) {
  const th = (opts.rotateDeg * Math.PI) / 180;
  const fx = (x: number) => (opts.logX ? Math.log10(x) : x);
  const fy = (y: number) => (opts.logY ? Math.log10(y) : y);
  return (x: number, y: number): [number, number] => {
    const u = fx(x) * opts.sx + opts.skew * fy(y);
    const v = -fy(y) * opts.sy; // y up on the plot, down on the sheet
    return [opts.ox + Math.cos(th) * u - Math.sin(th) * v, opts.oy + Math.sin(th) * u + Math.cos(th) * v];
  };
}

const REL = 1e-9; // relative tolerance for exact (noise-free) anchors

describe('calibration from 3 or more anchors with both values (affine least squares)', () => {
  it('recovers a rotated, skewed panel with unequal scales exactly', () => {
    const toSheet = panelMap({ rotateDeg: 4, skew: 0.03, sx: 0.29, sy: 2.6, ox: 72, oy: 640 });
    const values: [number, number][] = [[0, 0], [1600, 0], [0, 180], [1600, 180]];
    const anchors: AnchorInput[] = values.map(([x, y]) => ({ at: toSheet(x, y), x, y }));
    const cal = calibrate(anchors);
    expect(cal.method).toBe('affine');
    for (const [x, y] of [[400, 90], [1234.5, 17.25], [50, 170]] as const) {
      const d = cal.toData(sheetPoint(...toSheet(x, y)));
      expect(Math.abs(d[0] - x)).toBeLessThan(REL * 1600);
      expect(Math.abs(d[1] - y)).toBeLessThan(REL * 180);
    }
    expect(cal.maxSheet).toBeLessThan(1e-9);
    expect(cal.warnings).toEqual([]);
  });

  it('works on log–log panels (flow 10…1000 and head 1…100, each a log10 axis)', () => {
    const toSheet = panelMap({ rotateDeg: -2, skew: 0, sx: 150, sy: 120, ox: 60, oy: 700, logX: true, logY: true });
    const anchors: AnchorInput[] = ([[10, 1], [1000, 1], [10, 100]] as const).map(([x, y]) => ({ at: toSheet(x, y), x, y }));
    const cal = calibrate(anchors, { xScale: 'log', yScale: 'log' });
    const d = cal.toData(sheetPoint(...toSheet(200, 35)));
    expect(d[0] / 200 - 1).toBeCloseTo(0, 10);
    expect(d[1] / 35 - 1).toBeCloseTo(0, 10);
  });

  it('toSheet and toData are exact inverses (property, relative 1e-9)', () => {
    const toSheet = panelMap({ rotateDeg: 7, skew: -0.05, sx: 0.4, sy: 3.1, ox: 50, oy: 500, logX: true });
    const anchors: AnchorInput[] = ([[5, 0], [500, 0], [5, 120], [500, 120]] as const).map(([x, y]) => ({ at: toSheet(x, y), x, y }));
    const cal = calibrate(anchors, { xScale: 'log' });
    fc.assert(
      fc.property(fc.double({ min: 1, max: 2000, noNaN: true }), fc.double({ min: -50, max: 300, noNaN: true }), (x, y) => {
        const back = cal.toData(cal.toSheet(dataPoint(x, y)));
        return Math.abs(back[0] / x - 1) < 1e-9 && Math.abs(back[1] - y) < 1e-9 * 300;
      }),
    );
  });

  it('reports the residual in sheet units and % of span, and warns above 0.3 %', () => {
    const toSheet = panelMap({ rotateDeg: 0, skew: 0, sx: 0.3, sy: 2.5, ox: 72, oy: 640 });
    const values: [number, number][] = [[0, 0], [1600, 0], [0, 180], [1600, 180], [800, 90]];
    const anchors: AnchorInput[] = values.map(([x, y]) => ({ at: toSheet(x, y), x, y }));
    const clean = calibrate(anchors);
    expect(clean.anchorPercentOfSpan).toBeLessThan(1e-9);
    // Exact anchors still show the error expected from anchors snapped within half a unit: never 0 %.
    expect(clean.maxPercentOfSpan).toBeGreaterThan(0.001);
    expect(clean.maxPercentOfSpan).toBeLessThan(0.2);
    // Misplace the middle anchor by 4 sheet units to the right: 4 / (0.3 × 1600) = 0.83 % of the x span
    // before the fit spreads it; any least-squares share of it stays above 0.3 %.
    const shifted = anchors.map((a, i) => (i === 4 ? { ...a, at: [a.at[0] + 4, a.at[1]] as [number, number] } : a));
    const cal = calibrate(shifted, { panel: 'head' });
    expect(cal.maxSheet).toBeGreaterThan(2);
    expect(cal.maxSheet).toBeLessThan(4);
    expect(cal.anchorPercentOfSpan).toBeGreaterThan(0.3);
    // The misfit raises the scatter found, and with it the error expected over the plot.
    expect(cal.maxPercentOfSpan).toBeGreaterThan(5 * clean.maxPercentOfSpan);
    expect(cal.warnings.length).toBeGreaterThan(0);
    expect(cal.warnings[0]).toMatch(/^Panel "head": anchor 5 is off by \d+\.\d\d % of the axis span/);
  });

  it('widens the residual shown by a placement error the anchors share, which more anchors do not average away', () => {
    // 25 grid crossings of a 1000 × 500 unit plot, every one read 0.3 units to the right and
    // 0.3 units low (a frame rule's centre read off, as on a scan): the map is off by 0.03 % of
    // the flow span and 0.06 % of the head span everywhere.
    const toSheet = panelMap({ rotateDeg: 0, skew: 0, sx: 1000 / 1600, sy: 500 / 180, ox: 72, oy: 640 });
    const anchors: AnchorInput[] = [];
    for (let i = 0; i <= 4; i++) for (let j = 0; j <= 4; j++) {
      const [x, y] = [400 * i, 45 * j];
      const [sx, sy] = toSheet(x, y);
      anchors.push({ at: [sx + 0.3, sy + 0.3], x, y });
    }
    const real = (c: ReturnType<typeof calibrate>) => {
      let worst = 0;
      for (const [x, y] of [[0, 0], [1600, 180], [800, 90]] as const) {
        const d = c.toData(sheetPoint(...toSheet(x, y)));
        worst = Math.max(worst, (100 * Math.abs(d[0] - x)) / 1600, (100 * Math.abs(d[1] - y)) / 180);
      }
      return worst;
    };
    const alone = calibrate(anchors);
    const shared = calibrate(anchors, { anchorBias: 0.3 });
    expect(real(alone)).toBeGreaterThan(0.05);
    // Without the shared error the residual shown is a small fraction of the real one.
    expect(alone.maxPercentOfSpan).toBeLessThan(real(alone) / 3);
    // With it, the residual shown covers the real error and stays within 3× of it.
    expect(shared.maxPercentOfSpan).toBeGreaterThan(real(shared));
    expect(shared.maxPercentOfSpan).toBeLessThan(3 * real(shared));
    // The map itself is the same: the shared error only widens what is shown.
    expect(shared.matrix).toEqual(alone.matrix);
  });
});

describe('calibration from 2 anchors on each axis', () => {
  it('matches the affine truth on a rotated, skewed panel', () => {
    const toSheet = panelMap({ rotateDeg: 3, skew: 0.04, sx: 0.3, sy: 2.4, ox: 80, oy: 620 });
    // x anchors on the flow axis (y = 0), y anchors on the head axis (x = 0).
    const anchors: AnchorInput[] = [
      { at: toSheet(200, 0), x: 200 },
      { at: toSheet(1400, 0), x: 1400 },
      { at: toSheet(0, 20), y: 20 },
      { at: toSheet(0, 160), y: 160 },
    ];
    const cal = calibrate(anchors);
    expect(cal.method).toBe('axes');
    const d = cal.toData(sheetPoint(...toSheet(900, 75)));
    expect(d[0]).toBeCloseTo(900, 8);
    expect(d[1]).toBeCloseTo(75, 8);
    const s = cal.toSheet(dataPoint(900, 75));
    const truth = toSheet(900, 75);
    expect(Math.hypot(s[0] - truth[0], s[1] - truth[1])).toBeLessThan(1e-9);
  });

  it('takes a log flow axis with more than 2 anchors and reports their scatter', () => {
    const toSheet = panelMap({ rotateDeg: 0, skew: 0, sx: 160, sy: 2, ox: 60, oy: 600, logX: true });
    const anchors: AnchorInput[] = [
      { at: toSheet(10, 0), x: 10 },
      { at: toSheet(100, 0), x: 100 },
      { at: toSheet(1000, 0), x: 1000 },
      { at: toSheet(10, 0), y: 0 },
      { at: toSheet(10, 200), y: 200 },
    ];
    const cal = calibrate(anchors, { xScale: 'log' });
    expect(cal.toData(sheetPoint(...toSheet(316.2, 50)))[0]).toBeCloseTo(316.2, 6);
    expect(cal.maxPercentOfSpan).toBeLessThan(1e-9);
  });
});

describe('degenerate anchors get one clear CalibrationError', () => {
  const cases: [string, AnchorInput[], RegExp][] = [
    ['coincident anchors', [{ at: [10, 10], x: 0, y: 0 }, { at: [10, 10], x: 100, y: 0 }, { at: [10, 200], x: 0, y: 50 }], /anchors 1 and 2 sit on the same sheet point/],
    ['anchors on one sheet line', [{ at: [10, 10], x: 0, y: 0 }, { at: [110, 110], x: 100, y: 0 }, { at: [210, 210], x: 0, y: 50 }], /lie on one line on the sheet/],
    ['equal x values', [{ at: [10, 10], x: 5, y: 0 }, { at: [110, 10], x: 5, y: 10 }, { at: [10, 210], x: 5, y: 50 }], /same x value/],
    ['equal y values', [{ at: [10, 10], x: 0, y: 7 }, { at: [110, 10], x: 100, y: 7 }, { at: [10, 210], x: 0, y: 7 }], /same y value/],
    ['values on a diagonal', [{ at: [10, 10], x: 0, y: 0 }, { at: [110, 10], x: 100, y: 100 }, { at: [10, 210], x: 50, y: 50 }], /values lie on one line/],
    ['too few anchors', [{ at: [10, 10], x: 0, y: 0 }, { at: [110, 10], x: 100, y: 0 }], /needs either 3 or more anchors/],
    ['zero on a log axis', [{ at: [10, 10], x: 0, y: 1 }, { at: [110, 10], x: 100, y: 1 }, { at: [10, 210], x: 1, y: 50 }], /cannot sit on a log axis/],
    ['parallel axis anchors', [{ at: [10, 300], x: 0 }, { at: [300, 300], x: 100 }, { at: [20, 300], y: 0 }, { at: [200, 300], y: 50 }], /parallel lines/],
    ['equal axis values', [{ at: [10, 300], x: 10 }, { at: [300, 300], x: 10 }, { at: [10, 300.5], y: 0 }, { at: [10, 20], y: 50 }], /x-axis anchors all have the same value/],
  ];
  for (const [name, anchors, message] of cases) {
    it(`refuses ${name}`, () => {
      const run = () => calibrate(anchors, name === 'zero on a log axis' ? { xScale: 'log' } : {});
      expect(run).toThrow(CalibrationError);
      expect(run).toThrow(message);
    });
  }

  it('refuses a non-positive value asked of toSheet on a log axis', () => {
    const cal = calibrate([{ at: [0, 100], x: 1, y: 0 }, { at: [100, 100], x: 100, y: 0 }, { at: [0, 0], x: 1, y: 10 }], { xScale: 'log' });
    expect(() => cal.toSheet(dataPoint(0, 5))).toThrow(/only positive values/);
  });
});
