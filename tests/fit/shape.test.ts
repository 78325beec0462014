import { describe, expect, it } from 'vitest';
import { stationaryPoints } from '../../src/fit/polynomial.ts';
import { inflections, interiorExtrema, lowestValue, secondDerivative, shapeProblems } from '../../src/fit/shape.ts';

const fmtFlow = (q: number) => `${q} m³/s`;
const context = (points: [number, number][], tolerance: number) => ({ points, tolerance, formatValue: (v: number) => `${v}`, formatFlow: fmtFlow });

describe('shape of a fitted curve', () => {
  // y = t³ − 1.5 t² (flow_scale 1): y' = 3t(t − 1), y'' = 6t − 3.
  const cubic = { coefficients: [0, 0, -1.5, 1], flow_scale: 1 };

  it('second derivative matches the analytic 6t − 3, also with a flow scale', () => {
    expect(secondDerivative(cubic, 0.25)).toBeCloseTo(-1.5, 12);
    // Same curve with Q = 2t: y''(Q) = (6t − 3)/4.
    expect(secondDerivative({ coefficients: [0, 0, -1.5, 1], flow_scale: 2 }, 0.5)).toBeCloseTo(-1.5 / 4, 12);
  });

  it('stationaryPoints reports no interior point for a curve that is only level at its start', () => {
    // 52 − 20t²: zero slope at t = 0, the end of the range, and nowhere inside it.
    expect(stationaryPoints({ coefficients: [52, 0, -20], flow_scale: 1 }, 0, 1)).toEqual([]);
  });

  it('stationaryPoints finds an extremum that falls exactly on a sample point', () => {
    // 40 + 2t − 4t² peaks at t = 0.25, sample 100 of 400.
    expect(stationaryPoints({ coefficients: [40, 2, -4], flow_scale: 1 }, 0, 1)).toEqual([0.25]);
  });

  it('finds the interior maximum and minimum with their prominences', () => {
    // On [−1, 2]: y(−1) = −2.5, max y(0) = 0, min y(1) = −0.5, y(2) = 2; both prominences 0.5.
    const extrema = interiorExtrema(cubic, -1, 2);
    expect(extrema.map((e) => e.kind)).toEqual(['maximum', 'minimum']);
    expect(extrema[0]?.flow).toBeCloseTo(0, 9);
    expect(extrema[1]?.flow).toBeCloseTo(1, 9);
    expect(extrema[0]?.prominence).toBeCloseTo(0.5, 9);
    expect(extrema[1]?.prominence).toBeCloseTo(0.5, 9);
  });

  it('locates the inflection within one sample interval and the lowest value', () => {
    const found = inflections(cubic, -1, 2);
    expect(found).toHaveLength(1);
    expect(Math.abs((found[0] ?? 0) - 0.5)).toBeLessThan(3 / 400);
    expect(lowestValue(cubic, -1, 2)).toEqual({ flow: -1, value: -2.5 });
  });

  it('flags a head maximum the points do not rise to, and accepts it when they do', () => {
    // Head 40 + 2t − 4t² on [0, 1]: peak 40.25 at t = 0.25.
    const fit = { coefficients: [40, 2, -4], flow_scale: 1, domain: [0, 1] as [number, number] };
    // The fit peaks 0.25 above the 40.0 reading at shutoff, but the points rise only 0.05.
    const flatAtShutoff: [number, number][] = [[0, 40], [0.1, 40.05], [0.5, 40], [1, 38]];
    expect(shapeProblems(fit, 'head', context(flatAtShutoff, 0.1))).toEqual(['a maximum at 0.25 m³/s that the points do not rise to from shutoff']);
    const rising: [number, number][] = [[0, 40], [0.1, 40.16], [0.25, 40.25], [0.5, 40], [1, 38]];
    expect(shapeProblems(fit, 'head', context(rising, 0.1))).toEqual([]);
    // Only one point before the peak is not enough to show a droop.
    const onePointBefore: [number, number][] = [[0, 40], [0.3, 40.25], [0.5, 40], [1, 38]];
    expect(shapeProblems(fit, 'head', context(onePointBefore, 0.1))).toHaveLength(1);
    // Points that rise to the peak, though by no more than the resolution, show a real droop:
    // the fit's peak stands 0.01 above the highest point, within the 0.245 resolution.
    const risingByTheResolution: [number, number][] = [[0, 40], [0.1, 40.16], [0.2, 40.24], [0.3, 40.24], [0.5, 40], [1, 38]];
    expect(shapeProblems(fit, 'head', context(risingByTheResolution, 0.245))).toEqual([]);
    // A rise within the reading accuracy, or within the fit's own RMS, counts as level ground.
    expect(shapeProblems(fit, 'head', context(flatAtShutoff, 0.3))).toEqual([]);
    expect(shapeProblems({ ...fit, rms: 0.3 }, 'head', context(flatAtShutoff, 0.1))).toEqual([]);
  });

  it('flags negative efficiency and a minimum inside an efficiency curve', () => {
    const dipping = { coefficients: [0, -0.1, 1], flow_scale: 1, domain: [0, 1] as [number, number] };
    const problems = shapeProblems(dipping, 'efficiency', context([], 0.001));
    expect(problems.some((p) => p.startsWith('a minimum at'))).toBe(true);
    expect(problems.some((p) => p.startsWith('negative efficiency, -0.0025'))).toBe(true);
  });

  it('allows one extremum in power and NPSHr but not two, and flags two inflections', () => {
    const oneMin = { coefficients: [2.5, -3, 4.5], flow_scale: 1, domain: [0, 1] as [number, number] };
    expect(shapeProblems(oneMin, 'npshr', context([], 0.05))).toEqual([]);
    const twoExtrema = { ...cubic, domain: [-1, 2] as [number, number] };
    expect(shapeProblems(twoExtrema, 'power', context([], 0.05))[0]).toMatch(/^2 extrema at /);
    // y'' = 12t² − 12t + 2 changes sign twice in (0, 1).
    const quartic = { coefficients: [0, 0, 1, -2, 1], flow_scale: 1, domain: [0, 1] as [number, number] };
    expect(shapeProblems(quartic, 'power', context([], 10)).some((p) => p.startsWith('an oscillation with 2 inflections'))).toBe(true);
  });
});
