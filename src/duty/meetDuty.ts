/**
 * `meetDuty(set, duty)`: how one curve set meets one duty point — the impeller trim (or, for a
 * variable-speed family, the speed) whose curve passes through the duty point, and the pump's
 * efficiency, power, NPSH3 and POR position there. Pure and quick enough to call for every curve
 * set of a library.
 *
 * Trims between captured diameters come from `memberAtDiameter` (each neighbour scaled by the
 * trim law and blended); the diameter is iterated so that the trimmed curve passes through the
 * duty point exactly (see trim.ts). Results are preliminary: trimmed curves are predictions, to
 * be confirmed against the manufacturer's certified data.
 */
import type { CurveSet, Member } from '../model/curveset.ts';
import { memberAtDiameter, membersByDiameter, trimmedHeadAt } from '../fit/affinity.ts';
import { familyFigures } from '../fit/checks/speedFigures.ts';
import { pumpCurveOfMember, type PumpCurve } from './pumpCurve.ts';
import { figuresAt, type PointFigures } from './operatingPoint.ts';
import { speedToDuty, speedToDutyInFamily } from './speed.ts';
import { systemCurveThroughDuty } from './systemCurve.ts';
import { trimToDuty, type AffinityParabolaEstimate } from './trim.ts';
import { DutyError } from './errors.ts';

/** The search reaches down to this fraction of the full diameter, or the smallest captured diameter if smaller. */
export const TRIM_SEARCH_FLOOR = 0.7;

export interface DutyRequest {
  /** Duty flow [m³/s], > 0 (per pump). */
  flow_m3s: number;
  /** Duty head [m], > 0. */
  head_m: number;
  /** Static head of the system [m]; used for the speed of a variable-speed family (default 0). */
  static_head_m?: number;
  /** Density of the pumped liquid [kg/m³]; default the curve set's fluid. */
  density_kg_m3?: number;
}

export type DutyMatchStatus =
  /** A trim (or speed) meets the duty exactly. */
  | 'meets'
  /** The duty lies above the full-diameter (or fastest) curve. */
  | 'above-range'
  /** The duty needs a smaller impeller (or slower speed) than the search allows: the pump is too large. */
  | 'below-range'
  /** The curve set cannot be used for a duty check (e.g. no fitted head curve). */
  | 'unusable';

export interface DutyMatch {
  status: DutyMatchStatus;
  /** One sentence saying what was found. */
  message: string;
  method: 'trim' | 'speed';
  /** Impeller diameter meeting the duty [m] ('trim'), or the diameter of the curve used ('speed'). */
  diameter_m?: number;
  /** Diameter / full diameter. */
  trim_ratio?: number;
  /** Full (largest captured) diameter [m]. */
  full_diameter_m?: number;
  /** Speed meeting the duty [rpm]. */
  speed_rpm?: number;
  /** The affinity-parabola estimate of the trim (common practice), for comparison. */
  estimate?: AffinityParabolaEstimate;
  /** Trim ratio below which the trim is discouraged (Lobanoff & Ross), and whether it is below. */
  trim_limit_ratio?: number;
  below_trim_limit?: boolean;
  /** The trim is below the smallest captured diameter: an affinity extrapolation. */
  trim_extrapolated?: boolean;
  /** Speed outside ±20 % of the captured speed, where the affinity law loses accuracy. */
  outside_affinity_band?: boolean;
  /** Warnings of a speed family's duty (neighbouring curves disagree, NPSH3 scaled by n², outside the drawn speeds). */
  warnings?: string[];
  /** Figures at the duty: flow, head, efficiency (fraction), power [W], NPSH3 [m], POR position, Q/Q_BEP. */
  point?: PointFigures;
}

/**
 * @param set   a validated curve set
 * @param duty  the duty point per pump, SI
 * @returns the match; never throws for a curve set it cannot use (status 'unusable'), but throws
 *          DutyError for a duty point that is not a positive flow and head.
 */
export function meetDuty(set: CurveSet, duty: DutyRequest): DutyMatch {
  if (!(duty.flow_m3s > 0) || !Number.isFinite(duty.flow_m3s)) throw new DutyError(`The duty flow must be a positive number, not ${duty.flow_m3s} m³/s.`);
  if (!(duty.head_m > 0) || !Number.isFinite(duty.head_m)) throw new DutyError(`The duty head must be a positive number, not ${duty.head_m} m.`);
  const density = duty.density_kg_m3 ?? set.fluid.density_kg_m3;
  try {
    return set.family === 'speed' || membersByDiameter(set).length === 0 ? bySpeed(set, duty, density) : byTrim(set, duty, density);
  } catch (error) {
    if (error instanceof Error && (error.name === 'DutyError' || error.name === 'AffinityInputError')) {
      return { status: 'unusable', message: error.message, method: set.family === 'speed' ? 'speed' : 'trim' };
    }
    throw error;
  }
}

/** The pump curve of the set at an impeller diameter [m] (captured, trimmed between, or scaled). */
export function curveAtDiameter(set: CurveSet, diameter_m: number, density_kg_m3 = set.fluid.density_kg_m3): PumpCurve {
  return pumpCurveOfMember(memberAtDiameter(set, diameter_m), density_kg_m3, set.fluid.density_kg_m3);
}

function byTrim(set: CurveSet, duty: DutyRequest, density: number): DutyMatch {
  const sorted = membersByDiameter(set);
  const full = (sorted[0] as Member).diameter_m as number;
  const smallest = (sorted[sorted.length - 1] as Member).diameter_m as number;
  const ns = familyFigures(set).ns_us;
  // The search asks for the same two diameters more than once (the full one, the result): keep
  // each curve built. In between it reads only the head, through the shortcut.
  const built = new Map<number, PumpCurve>();
  const curveAt = (d: number): PumpCurve => {
    let curve = built.get(d);
    if (!curve) {
      curve = curveAtDiameter(set, d, density);
      built.set(d, curve);
    }
    return curve;
  };
  const result = trimToDuty(
    {
      curveAt,
      headAt: trimmedHeadAt(set),
      full_diameter_m: full,
      min_diameter_m: Math.min(smallest, TRIM_SEARCH_FLOOR * full),
      ...(ns !== undefined ? { ns_us: ns } : {}),
    },
    duty.flow_m3s,
    duty.head_m,
  );
  const base = { method: 'trim' as const, full_diameter_m: full, ...(result.estimate ? { estimate: result.estimate } : {}) };
  if (result.status !== 'ok') {
    return { ...base, status: result.status === 'above-full-diameter' ? 'above-range' : 'below-range', message: result.message };
  }
  const curve = curveAt(result.diameter_m);
  const point = figuresAt(curve, duty.flow_m3s);
  const extrapolated = result.diameter_m < smallest * (1 - 1e-9);
  const pct = (result.ratio * 100).toFixed(1);
  let message = `An impeller trimmed to ${pct} % of full diameter meets the duty`;
  if (result.below_limit) message += `, a trim deeper than the usual ${Math.round(result.limit_ratio * 100)} % limit`;
  if (extrapolated) message += `, below the smallest captured diameter (affinity extrapolation)`;
  if (point.extrapolated.includes('head')) message += `, but the duty flow lies beyond the trimmed curve's captured range (extrapolated)`;
  return {
    ...base,
    status: 'meets',
    message: `${message}.`,
    diameter_m: result.diameter_m,
    trim_ratio: result.ratio,
    speed_rpm: curve.speed_rpm,
    trim_limit_ratio: result.limit_ratio,
    below_trim_limit: result.below_limit,
    trim_extrapolated: extrapolated,
    point,
  };
}

function bySpeed(set: CurveSet, duty: DutyRequest, density: number): DutyMatch {
  const fastest = [...set.members].sort((a, b) => b.speed_rpm - a.speed_rpm)[0] as Member;
  const curve = pumpCurveOfMember(fastest, density, set.fluid.density_kg_m3);
  const system = systemCurveThroughDuty(duty.static_head_m ?? 0, duty.flow_m3s, duty.head_m);
  const result = set.family === 'speed' && set.members.filter((m) => m.curves.head?.fit).length >= 2 ? speedToDutyInFamily(set, system, duty.flow_m3s, density) : speedToDuty(curve, system, duty.flow_m3s);
  const base = { method: 'speed' as const, ...(fastest.diameter_m !== undefined ? { diameter_m: fastest.diameter_m } : {}) };
  if (result.status !== 'ok') {
    const status = result.reason === 'too-little-head' ? 'above-range' : result.reason === 'too-much-head' ? 'below-range' : duty.flow_m3s >= curve.domain[1] ? 'above-range' : 'below-range';
    return { ...base, status, message: result.message };
  }
  return {
    ...base,
    status: 'meets',
    message: `Running at ${Math.round(result.speed_rpm)} rpm (${(result.ratio * 100).toFixed(1)} % of ${fastest.speed_rpm} rpm) meets the duty${result.outside_affinity_band ? ', outside the ±20 % band where the affinity law is close to exact' : ''}.`,
    speed_rpm: result.speed_rpm,
    outside_affinity_band: result.outside_affinity_band,
    ...('warnings' in result && Array.isArray(result.warnings) && result.warnings.length ? { warnings: result.warnings as string[] } : {}),
    point: result.point,
  };
}
