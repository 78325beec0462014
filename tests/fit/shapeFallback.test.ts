/**
 * A fit held at a coarser degree by a shape rule is said, never silent: `fit.shape-fallback`
 * names the degree that met the reading accuracy and what was wrong with its shape. Invented
 * points only.
 */
import { describe, expect, it } from 'vitest';
import { buildCurveSet } from '../../src/fit/build.ts';
import type { CurvePoint } from '../../src/model/curveset.ts';

const build = (head: CurvePoint[], accuracy: number) =>
  buildCurveSet({
    pump: { name: 'Invented test pump (not a real product)' },
    speed_rpm: 1450,
    fluid: { name: 'water', density_kg_m3: 998.2, specific_gravity: 1 },
    display_units: { flow: 'm3/s', head: 'm', npsh: 'm', power: 'W', diameter: 'm' },
    provenance: { created: '2026-01-01T00:00:00Z' },
    members: [{ diameter_m: 0.25, points: { head } }],
    readingAccuracy: { head: accuracy },
  });

describe('a fit held back by its shape', () => {
  // Head 40 + 4t − 8t² (t = flow in m³/s) peaks at t = 0.25, but only one point lies before the
  // peak, so the droop is not shown by the points and degrees 2 and 3 are refused for it.
  const humped: CurvePoint[] = [[0, 40], [0.3, 40.48], [0.5, 40], [0.7, 38.88], [1, 36]];

  it('warns, naming the refused degree and its shape, when the fallback misses the reading accuracy', () => {
    const set = build(humped, 0.45);
    const fit = set.members[0]!.curves.head!.fit!;
    expect(fit.degree).toBe(1);
    // The straight line misses by more than the 0.45 m accuracy but less than twice it (no fit.misses-accuracy).
    expect(fit.rms).toBeGreaterThan(0.45);
    expect(fit.rms).toBeLessThan(0.9);
    const said = set.findings.filter((f) => f.code === 'fit.shape-fallback');
    expect(said).toHaveLength(1);
    expect(said[0]!.severity).toBe('warn');
    expect(said[0]!.message).toMatch(/fitted at degree 1, .* degree 2 met it .* a maximum at .* that the points do not rise to from shutoff/);
    expect(set.findings.some((f) => f.code === 'fit.misses-accuracy')).toBe(false);
  });

  it('says nothing when the chosen degree meets the accuracy', () => {
    const set = build([[0, 40], [0.25, 39.75], [0.5, 39], [0.75, 37.75], [1, 36]], 0.1);
    expect(set.members[0]!.curves.head!.fit!.degree).toBe(2);
    expect(set.findings.some((f) => f.code === 'fit.shape-fallback')).toBe(false);
  });
});
