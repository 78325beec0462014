// FROZEN COPY of src/duty/trim.ts as it was before the speed-up of meetDuty (issue #13), kept only as the
// reference of tests/duty/meetDutySame.test.ts. Do not edit or import it from src.
/**
 * The impeller trim that meets a duty point.
 *
 * First estimate (common practice): follow the affinity parabola H = (H_d/Q_d²)·Q² from the duty
 * point up to the full-diameter curve; where it crosses at Q_cross, D_req = D_full·Q_d/Q_cross.
 * Then the estimate is refined against the trimmed curves themselves (for a curve set, the
 * blend of the two neighbouring captured diameters scaled by the trim law), so that the curve
 * at the returned diameter passes through the duty point: H(Q_d; D) = H_d.
 *
 * Trims below about 80 % of the full diameter are avoided, about 90 % for high specific-speed
 * impellers (Lobanoff & Ross, Centrifugal Pumps; published). Real trimmed curves usually fall a
 * little below the affinity prediction, more so for deep trims: the result is preliminary and
 * the final trim is the manufacturer's to confirm.
 */
import type { PumpCurve } from '../../../../src/duty/pumpCurve.ts';
import { bisect, rootsOn } from '../../../../src/duty/solve.ts';

/** Trim ratio below which the trim is flagged (Lobanoff & Ross). */
export const TRIM_LIMIT_RATIO = 0.8;
/** Trim ratio limit for high specific-speed impellers (Lobanoff & Ross; the Ns threshold is the one the POR uses, from memory). */
export const TRIM_LIMIT_RATIO_HIGH_NS = 0.9;
export const HIGH_NS_US_FOR_TRIM = 4500;

export interface TrimSearch {
  /** The pump curve at impeller diameter d [m] (same speed). */
  curveAt(diameter_m: number): PumpCurve;
  /** Full (largest) diameter [m]. */
  full_diameter_m: number;
  /** Smallest diameter the search may reach [m]. */
  min_diameter_m: number;
  /** Specific speed of the full impeller (US units), to choose the trim limit. */
  ns_us?: number;
}

export interface AffinityParabolaEstimate {
  /** Flow where the parabola meets the full-diameter curve [m³/s]. */
  crossing_flow_m3s: number;
  diameter_m: number;
}

export type TrimResult =
  | {
      status: 'ok';
      diameter_m: number;
      /** D / D_full. */
      ratio: number;
      /** The affinity-parabola estimate, when the parabola meets the full curve. */
      estimate?: AffinityParabolaEstimate;
      /** Trim ratio limit applied, and whether the result lies below it. */
      limit_ratio: number;
      below_limit: boolean;
      /** The duty flow lies outside the trimmed head curve's flow range. */
      duty_flow_extrapolated: boolean;
    }
  | { status: 'above-full-diameter' | 'below-search-range'; message: string; estimate?: AffinityParabolaEstimate };

/**
 * The affinity-parabola estimate of the trim (common practice; see the file comment).
 * Returns undefined when the parabola does not meet the full-diameter curve inside its domain.
 */
export function affinityParabolaTrim(full: PumpCurve, full_diameter_m: number, flow_m3s: number, head_m: number): AffinityParabolaEstimate | undefined {
  if (!(flow_m3s > 0) || !(head_m > 0)) return undefined;
  const c = head_m / (flow_m3s * flow_m3s);
  const roots = rootsOn((q) => full.head(q) - c * q * q, full.domain[0], full.domain[1], 400);
  const cross = roots[roots.length - 1];
  if (cross === undefined || !(cross > 0)) return undefined;
  return { crossing_flow_m3s: cross, diameter_m: (full_diameter_m * flow_m3s) / cross };
}

/**
 * The diameter whose curve passes through the duty point (Q_d [m³/s], H_d [m]), found by
 * bisection on H(Q_d; D) − H_d between `min_diameter_m` and `full_diameter_m` to a relative
 * diameter tolerance of 1e-10. Head must rise with diameter at the duty flow, as it does for a
 * trimmed impeller.
 */
export function trimToDuty(search: TrimSearch, flow_m3s: number, head_m: number): TrimResult {
  const full = search.curveAt(search.full_diameter_m);
  const estimate = affinityParabolaTrim(full, search.full_diameter_m, flow_m3s, head_m);
  const withEstimate = estimate ? { estimate } : {};
  const gap = (d: number) => search.curveAt(d).head(flow_m3s) - head_m;
  const gapFull = gap(search.full_diameter_m);
  if (gapFull < 0) {
    return {
      status: 'above-full-diameter',
      message: `The duty lies above the full-diameter curve (it gives ${fmt((100 * full.head(flow_m3s)) / head_m)} % of the duty head at the duty flow); no trim of this impeller meets it.`,
      ...withEstimate,
    };
  }
  const gapMin = gap(search.min_diameter_m);
  if (gapMin > 0) {
    return {
      status: 'below-search-range',
      message: `Even an impeller trimmed to ${fmt((100 * search.min_diameter_m) / search.full_diameter_m)} % of full diameter gives more head than the duty needs; this pump is too large for the duty.`,
      ...withEstimate,
    };
  }
  const d =
    gapFull === 0 ? search.full_diameter_m : gapMin === 0 ? search.min_diameter_m : bisect(gap, search.min_diameter_m, search.full_diameter_m, gapMin);
  const ratio = d / search.full_diameter_m;
  const limit = search.ns_us !== undefined && search.ns_us > HIGH_NS_US_FOR_TRIM ? TRIM_LIMIT_RATIO_HIGH_NS : TRIM_LIMIT_RATIO;
  const trimmed = search.curveAt(d);
  const slack = 1e-9 * trimmed.domain[1];
  return {
    status: 'ok',
    diameter_m: d,
    ratio,
    ...withEstimate,
    limit_ratio: limit,
    below_limit: ratio < limit,
    duty_flow_extrapolated: flow_m3s < trimmed.domain[0] - slack || flow_m3s > trimmed.domain[1] + slack,
  };
}

function fmt(v: number): string {
  return String(Number(v.toPrecision(4)));
}
