/**
 * A speed family between and beyond its drawn speeds: which drawn curves bracket a speed, and
 * where NPSH3 at a speed comes from.
 *
 * Speed affinity law (one geometrically unchanged pump): Q ∝ n, H ∝ n², P ∝ n³, η about
 * constant at corresponding points; close to exact within about ±20 % of speed (Karassik et al.,
 * Pump Handbook; Lobanoff & Ross, Centrifugal Pumps: Design and Application).
 *
 * NPSH3 follows the law less well than head: NPSH3 ∝ n² is the usual rule (common practice), but
 * the exponent found in tests differs from 2, so a scaled NPSH3 is an estimate. The rule here
 * (common practice; a drawn curve at or above the speed where the sheet has one): NPSH3 at speed n is read from
 * the drawn curve of the nearest speed at or above n, scaled to n by (n/n_drawn)² — and that
 * scaling always comes with a caution; above every drawn speed the fastest curve is scaled up
 * and flagged as an extrapolation.
 */
import type { CurveSet, Member, PolynomialFit } from '../model/curveset.ts';
import { AffinityInputError, scaleFit } from './affinity.ts';

/** Drawn members of a speed family that have a fitted head curve, slowest first. */
export function drawnSpeeds(set: Pick<CurveSet, 'members'>): Member[] {
  return set.members.filter((m) => m.curves.head?.fit).sort((a, b) => a.speed_rpm - b.speed_rpm);
}

/** The drawn members bracketing speed n [rpm]: the nearest at or below and the nearest at or above (one of them missing outside the drawn range). */
export function bracketingSpeeds(set: Pick<CurveSet, 'members'>, speed_rpm: number): { below?: Member; above?: Member } {
  const drawn = drawnSpeeds(set);
  if (drawn.length === 0) throw new AffinityInputError('This curve set has no fitted head curve at any speed.');
  const below = [...drawn].reverse().find((m) => m.speed_rpm <= speed_rpm);
  const above = drawn.find((m) => m.speed_rpm >= speed_rpm);
  return { ...(below ? { below } : {}), ...(above ? { above } : {}) };
}

export const NPSH3_SPEED_RULE =
  'NPSH3 at a speed is read from the drawn curve of the nearest speed at or above it, scaled by (n/n_drawn)² (common practice); the n² scaling is approximate, so confirm NPSH3 at reduced speed with the manufacturer.';

export interface Npsh3AtSpeed {
  /** The NPSH3 fit at the wanted speed (flow ∝ n, value ∝ n²). */
  fit: PolynomialFit;
  /** Speed of the drawn curve used [rpm]. */
  from_speed_rpm: number;
  /** True when the drawn curve was scaled (the wanted speed is not a drawn one). */
  scaled: boolean;
  /** True when the wanted speed lies above every drawn NPSH3 curve (scaled up: an extrapolation). */
  extrapolated: boolean;
  /** A caution sentence whenever the curve was scaled; empty otherwise. */
  caution: string;
}

/** NPSH3 of a speed family at speed n [rpm] by `NPSH3_SPEED_RULE`; undefined when no member has an NPSH3 curve. */
export function npsh3ForSpeed(set: Pick<CurveSet, 'members'>, speed_rpm: number): Npsh3AtSpeed | undefined {
  if (!(speed_rpm > 0)) throw new AffinityInputError(`The speed must be a positive number of rpm, not ${speed_rpm}.`);
  const drawn = set.members.filter((m) => m.curves.npshr?.fit).sort((a, b) => a.speed_rpm - b.speed_rpm);
  if (drawn.length === 0) return undefined;
  const atOrAbove = drawn.find((m) => m.speed_rpm >= speed_rpm * (1 - 1e-9));
  const source = atOrAbove ?? (drawn[drawn.length - 1] as Member);
  const fit = source.curves.npshr?.fit as PolynomialFit;
  const r = speed_rpm / source.speed_rpm;
  const scaled = Math.abs(r - 1) > 1e-9;
  const extrapolated = !atOrAbove;
  const caution = !scaled
    ? ''
    : extrapolated
      ? `NPSH3 at ${Math.round(speed_rpm)} rpm is the ${Math.round(source.speed_rpm)} rpm curve scaled UP by (n/n_drawn)², above every drawn speed: an extrapolation; confirm it with the manufacturer's certified data.`
      : `NPSH3 at ${Math.round(speed_rpm)} rpm is the ${Math.round(source.speed_rpm)} rpm curve scaled by (n/n_drawn)² (common practice, approximate at reduced speed); confirm it with the manufacturer's certified data.`;
  return { fit: scaled ? scaleFit(fit, r, 'npshr') : fit, from_speed_rpm: source.speed_rpm, scaled, extrapolated, caution };
}
