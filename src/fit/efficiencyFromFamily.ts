/**
 * An efficiency the iso-lines give at too few flows for a curve of its own.
 *
 * Iso-efficiency lines give a member's efficiency only where they cross its head curve. A small
 * impeller (or a low speed) may meet one iso level once or twice, or two levels on one side of
 * its peak: one or two points, too few for a fit (`chooseDegree` needs three), so the sheet's
 * efficiency for that member was missing although the sheet draws it.
 *
 * The member then takes the shape of the nearest member whose efficiency curve was fitted, by the
 * affinity law the rest of the tool uses (`affinity.ts`): flow in proportion to the diameter (a
 * trim) or to the speed, efficiency of the same shape,
 *
 *   η_M(Q) = λ · η_R(Q / r),   r = D_M / D_R (or n_M / n_R),
 *
 * with one factor λ, by least squares over the member's own crossings, λ = Σ η_i f_i / Σ f_i²
 * (f_i = η_R(Q_i / r)): a trimmed impeller's efficiency falls a little below the full one's
 * (Karassik et al., Pump Handbook; Lobanoff & Ross, Centrifugal Pumps), and λ carries that. The
 * scaled polynomial is exact (`scaleFit`), so nothing is refitted.
 *
 * Valid range: r within `RATIO_RANGE` (the trim law is approximate and worsens with depth; trims
 * below about 80 % are avoided, Lobanoff & Ross), λ within `FACTOR_RANGE`, every crossing within
 * the scaled reference's flow range (up to `DOMAIN_SLACK` of it beyond its last point; below its
 * first point down to zero flow where the curve is held through the origin), and the crossings met within
 * `RESIDUAL_LIMIT`. Outside these the member keeps no efficiency curve, and its fit failure
 * stands. Inside them the curve carries a warning: it is the affinity law's, not the sheet's.
 *
 * Pure: members in, fits and findings out.
 */
import type { Finding, Member, PolynomialFit } from '../model/curveset.ts';
import { scaleFit } from './affinity.ts';
import { makeFinding } from './checks/finding.ts';
import type { Display } from './checks/display.ts';
import { evaluateUnchecked } from './polynomial.ts';
import { formatFixed } from '../units/format.ts';

/** Ratio of diameters (or speeds), member over reference, over which a shape is borrowed. */
export const RATIO_RANGE: readonly [number, number] = [0.7, 1 / 0.7];
/**
 * Factor on the borrowed efficiency, either way: a trimmed impeller loses a few points of
 * efficiency, a deep trim (to about 70 %) a tenth or so of it (from memory); not a sixth.
 */
export const FACTOR_RANGE: readonly [number, number] = [0.85, 1 / 0.85];
/** How far outside the scaled reference's flow range a crossing may lie, as a share of that range. */
export const DOMAIN_SLACK = 0.1;
/** Largest miss at the member's own crossings, as a fraction (2 points of efficiency). */
export const RESIDUAL_LIMIT = 0.02;

const METHOD = 'Affinity law (Q ∝ D or Q ∝ n, efficiency of the same shape) from the nearest fitted efficiency curve, one factor by least squares over the iso crossings';

export interface BorrowedEfficiency {
  /** Index of the member given the curve. */
  index: number;
  fit: PolynomialFit;
  finding: Finding;
}

/** Size of a member in its family: diameter, or speed for a speed family. */
function size(m: Member, family: 'diameter' | 'speed'): number | undefined {
  return family === 'speed' ? m.speed_rpm : m.diameter_m;
}

/**
 * Efficiency curves for the members whose efficiency comes from iso-lines alone and has points
 * but no fit, each from the nearest member with a fitted efficiency curve (see the file's note).
 */
export function efficiencyFromFamily(members: readonly Member[], family: 'diameter' | 'speed', show: Display): BorrowedEfficiency[] {
  const out: BorrowedEfficiency[] = [];
  members.forEach((m, index) => {
    const curve = m.curves.efficiency;
    const own = size(m, family);
    if (!curve || curve.fit || curve.drawn_as !== 'iso-lines' || curve.points.length === 0 || own === undefined) return;
    const points = curve.points.filter(([q]) => q > 0);
    if (points.length === 0) return;
    const references = members
      .map((r, k) => ({ r, k, s: size(r, family) }))
      .filter((c): c is { r: Member; k: number; s: number } => c.k !== index && c.s !== undefined && c.s > 0 && c.r.curves.efficiency?.fit !== undefined)
      .sort((a, b) => Math.abs(Math.log(own / a.s)) - Math.abs(Math.log(own / b.s)));
    const nearest = references[0];
    if (!nearest) return;
    const ratio = own / nearest.s;
    if (ratio < (RATIO_RANGE[0] as number) || ratio > (RATIO_RANGE[1] as number)) return;
    const scaled = scaleFit(nearest.r.curves.efficiency?.fit as PolynomialFit, ratio, 'efficiency');
    const [lo, hi] = scaled.domain;
    const slack = DOMAIN_SLACK * (hi - lo);
    // Below its first point a curve held through the origin runs between that point and zero
    // efficiency at zero flow, so it is taken down to zero flow; beyond its last point it is not.
    const from = scaled.through_origin ? 0 : lo - slack;
    if (points.some(([q]) => q < from || q > hi + slack)) return;
    const shape = points.map(([q]) => evaluateUnchecked(scaled, q));
    if (shape.some((f) => !(f > 0))) return;
    const factor = points.reduce((sum, [, eta], i) => sum + eta * (shape[i] as number), 0) / shape.reduce((sum, f) => sum + f * f, 0);
    if (!(factor >= (FACTOR_RANGE[0] as number) && factor <= (FACTOR_RANGE[1] as number))) return;
    const residuals = points.map(([, eta], i) => eta - factor * (shape[i] as number));
    const worst = Math.max(...residuals.map(Math.abs));
    if (!(worst <= RESIDUAL_LIMIT)) return;
    const rms = Math.sqrt(residuals.reduce((sum, r) => sum + r * r, 0) / residuals.length);
    const fit: PolynomialFit = {
      ...scaled,
      coefficients: scaled.coefficients.map((c) => c * factor),
      rms,
      max_residual: worst,
      reason: `too few points of its own (${points.length}): the ${show.member(nearest.r)} efficiency curve scaled by the affinity law and by ${formatFixed(factor, 3)}`,
    };
    const law = family === 'speed' ? 'flow in proportion to speed' : 'flow in proportion to the impeller diameter';
    const n = points.length;
    out.push({
      index,
      fit,
      finding: makeFinding({
        code: 'fit.efficiency-from-family',
        severity: 'warn',
        member: m,
        quantity: 'efficiency',
        message: `The ${show.member(m)} efficiency meets the iso-lines at ${n === 1 ? 'one flow' : `${n} flows`} only, too few for a curve of its own; its curve is the ${show.member(nearest.r)} efficiency curve by the affinity law (${law}, the same shape) times ${formatFixed(factor, 3)}, which meets ${n === 1 ? 'that crossing' : `those crossings within ${formatFixed(100 * worst, 2)} points`}. It is the affinity law's curve, not the sheet's: check it against the sheet before using it at a duty.`,
        method: METHOD,
        figures: { crossings: n, ratio, factor, max_residual: worst },
      }),
    });
  });
  return out;
}
