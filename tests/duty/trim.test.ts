import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { affinityParabolaTrim, trimToDuty, TRIM_LIMIT_RATIO } from '../../src/duty/trim.ts';
import type { PumpCurve } from '../../src/duty/pumpCurve.ts';
import { trimByParabola } from '../../src/fit/affinity.ts';
import { A, D_FULL, H0, inventedCurveAt, inventedMember } from './inventedFamily.ts';

/** Exact diameter for the invented affinity family: 50 r² − 12000 Q² = H  ⇒  r = √((H + 12000 Q²)/50). */
const exactAffinity = (q: number, h: number) => D_FULL * Math.sqrt((h + A * q * q) / H0);

const search = { curveAt: inventedCurveAt, full_diameter_m: D_FULL, min_diameter_m: 0.6 * D_FULL };

describe('trimToDuty on an invented family that obeys the affinity law', () => {
  it.each([
    [0.03, 30],
    [0.025, 40],
    [0.02, 25],
    [0.035, 20],
  ])('meets the duty %s m³/s at %s m with the exact diameter within 1e-9 relative', (q, h) => {
    const r = trimToDuty(search, q, h);
    expect(r.status).toBe('ok');
    if (r.status !== 'ok') return;
    expect(Math.abs(r.diameter_m / exactAffinity(q, h) - 1)).toBeLessThan(1e-9);
    expect(Math.abs(inventedCurveAt(r.diameter_m).head(q) - h)).toBeLessThan(1e-8);
    // For curves that obey the affinity law, the affinity parabola gives the same diameter (common practice).
    expect(Math.abs((r.estimate?.diameter_m ?? 0) / exactAffinity(q, h) - 1)).toBeLessThan(1e-9);
  });

  it('warns below 80 % of the full diameter (Lobanoff & Ross) and not above it', () => {
    const deep = trimToDuty(search, 0.02, 20); // r = √(24.8/50) = 0.704
    expect(deep.status === 'ok' && deep.below_limit).toBe(true);
    expect(deep.status === 'ok' && deep.limit_ratio).toBe(TRIM_LIMIT_RATIO);
    const shallow = trimToDuty(search, 0.03, 30);
    expect(shallow.status === 'ok' && shallow.below_limit).toBe(false);
  });

  it('uses the 90 % limit for a high specific-speed impeller', () => {
    const r = trimToDuty({ ...search, ns_us: 5000 }, 0.025, 32); // r ≈ 0.88
    expect(r.status === 'ok' && r.limit_ratio).toBe(0.9);
    expect(r.status === 'ok' && r.below_limit).toBe(true);
  });

  it('says no trim meets a duty above the full-diameter curve', () => {
    expect(trimToDuty(search, 0.03, 45).status).toBe('above-full-diameter');
  });

  it('says the pump is too large when even the smallest allowed diameter gives too much head', () => {
    expect(trimToDuty(search, 0.01, 5).status).toBe('below-search-range');
  });
});

describe('trimToDuty on an invented family that departs from the affinity law', () => {
  // invented: H(Q; D) = 50 r^2.3 − 12000 Q² r^-0.4 (trimmed curves fall below the affinity prediction)
  const curveAt = (d: number): PumpCurve => {
    const r = d / D_FULL;
    return { label: 'invented', diameter_m: d, speed_rpm: 2900, domain: [0, 0.06 * r], head: (q) => H0 * r ** 2.3 - A * q * q * r ** -0.4 };
  };
  it('iterates to the diameter whose curve passes through the duty point, where the parabola estimate misses', () => {
    const r = trimToDuty({ curveAt, full_diameter_m: D_FULL, min_diameter_m: 0.15 }, 0.03, 30);
    expect(r.status).toBe('ok');
    if (r.status !== 'ok') return;
    expect(Math.abs(curveAt(r.diameter_m).head(0.03) - 30)).toBeLessThan(1e-8);
    const estimateError = Math.abs((r.estimate?.diameter_m ?? 0) / r.diameter_m - 1);
    expect(estimateError).toBeGreaterThan(0.002); // the simple parabola is off on such a family
  });
});

describe('affinityParabolaTrim', () => {
  it('agrees with the fit-level parabola of src/fit/affinity.ts within 1e-9 relative', () => {
    const member = inventedMember(D_FULL);
    const fit = member.curves.head?.fit;
    if (!fit) throw new Error('invented member lacks a head fit');
    const ours = affinityParabolaTrim(inventedCurveAt(D_FULL), D_FULL, 0.028, 33);
    const theirs = trimByParabola(fit, D_FULL, 0.028, 33);
    expect(Math.abs((ours?.diameter_m ?? 0) / (theirs?.diameter_m ?? 1) - 1)).toBeLessThan(1e-9);
  });
});

describe('trimToDuty, property', () => {
  it('for any invented quadratic family obeying the affinity law and any reachable duty, the curve at the returned diameter passes through the duty within 1e-7 m', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 10, max: 200, noNaN: true }), // shutoff head at full diameter [m]
        fc.double({ min: 0.3, max: 0.9, noNaN: true }), // head falls to this fraction at the end of curve
        fc.double({ min: 0.01, max: 0.5, noNaN: true }), // end-of-curve flow [m³/s]
        fc.double({ min: 0.82, max: 0.99, noNaN: true }), // wanted trim ratio
        fc.double({ min: 0.2, max: 0.9, noNaN: true }), // duty flow as a fraction of the trimmed end of curve
        (h0, fall, qEnd, r, f) => {
          const a = (h0 * (1 - fall)) / (qEnd * qEnd);
          const curveAt = (d: number): PumpCurve => {
            const k = d / 0.3;
            return { label: 'invented', diameter_m: d, speed_rpm: 1450, domain: [0, qEnd * k], head: (q) => h0 * k * k - a * q * q };
          };
          const q = f * qEnd * r;
          const h = h0 * r * r - a * q * q;
          const result = trimToDuty({ curveAt, full_diameter_m: 0.3, min_diameter_m: 0.2 }, q, h);
          return result.status === 'ok' && Math.abs(curveAt(result.diameter_m).head(q) - h) < 1e-7 && Math.abs(result.ratio - r) < 1e-7;
        },
      ),
      { numRuns: 300, seed: 42 },
    );
  });
});
