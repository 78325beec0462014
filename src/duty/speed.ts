/**
 * The speed at which a variable-speed pump meets the duty on the system curve.
 *
 * By the speed affinity law the curve at speed ratio r = n/n0 is H_r(Q) = r²·H(Q/r). The wanted
 * speed is the one whose curve crosses the system curve at the duty flow:
 *   r²·H(Q_d/r) = H_sys(Q_d).
 * The law is close to exact within ±20 % of speed (Karassik, Pump Handbook; Lobanoff & Ross);
 * further away the result is flagged. With a large static head the efficiency does NOT follow
 * the duty along an affinity parabola, which is why the efficiency is read at the new point.
 */
import { pumpCurveAtSpeed, pumpCurveOfMember, type PumpCurve } from './pumpCurve.ts';
import type { CurveSet, Member } from '../model/curveset.ts';
import { bracketingSpeeds, drawnSpeeds, npsh3ForSpeed, type Npsh3AtSpeed } from '../fit/speedFamily.ts';
import { evaluateUnchecked } from '../fit/polynomial.ts';
import { AffinityInputError, membersByDiameter } from '../fit/affinity.ts';
import { minFlowAt } from '../fit/speedFamilyLimits.ts';
import { figuresAt, type PointFigures } from './operatingPoint.ts';
import { systemHead, type SystemCurve } from './systemCurve.ts';
import { bisect } from './solve.ts';

/** Speed ratios the search covers, and the band where the affinity law is close to exact. */
export const SPEED_SEARCH_RATIOS = [0.2, 1.5] as const;
export const SPEED_AFFINITY_BAND = [0.8, 1.2] as const;

export type SpeedResult =
  | {
      status: 'ok';
      speed_rpm: number;
      /** n / n_rated. */
      ratio: number;
      point: PointFigures;
      /** True when the ratio lies outside ±20 % of the curve's speed. */
      outside_affinity_band: boolean;
    }
  | { status: 'not-reachable'; reason: 'too-much-head' | 'too-little-head' | 'off-curve'; message: string };

/**
 * @param curve      pump curve at its rated speed
 * @param system     system curve; the duty flow must lie on it
 * @param flow_m3s   duty flow Q_d [m³/s], > 0
 */
export function speedToDuty(curve: PumpCurve, system: SystemCurve, flow_m3s: number): SpeedResult {
  const target = systemHead(system, flow_m3s);
  const gap = (r: number) => r * r * curve.head(flow_m3s / r) - target;
  const [rLo, rHi] = SPEED_SEARCH_RATIOS;
  // The scaled curve must cover the duty flow: Q_d/r inside the head domain.
  const lo = Math.max(rLo, flow_m3s / curve.domain[1]);
  const hi = curve.domain[0] > 0 ? Math.min(rHi, flow_m3s / curve.domain[0]) : rHi;
  if (!(lo < hi)) {
    return { status: 'not-reachable', reason: 'off-curve', message: `${curve.label}: no speed between ${rLo * 100} % and ${rHi * 100} % of rated puts the duty flow on the curve.` };
  }
  const gLo = gap(lo);
  const gHi = gap(hi);
  if (gLo > 0) {
    return { status: 'not-reachable', reason: 'too-much-head', message: `${curve.label}: even at ${Math.round(lo * 100)} % speed the pump gives more head than the system needs at the duty flow.` };
  }
  if (gHi < 0) {
    return { status: 'not-reachable', reason: 'too-little-head', message: `${curve.label}: even at ${Math.round(hi * 100)} % speed the pump cannot reach the system head at the duty flow.` };
  }
  const r = gLo === 0 ? lo : bisect(gap, lo, hi, gLo);
  const speed = curve.speed_rpm * r;
  const scaled = pumpCurveAtSpeed(curve, speed);
  return {
    status: 'ok',
    speed_rpm: speed,
    ratio: r,
    point: figuresAt(scaled, flow_m3s),
    outside_affinity_band: r < SPEED_AFFINITY_BAND[0] || r > SPEED_AFFINITY_BAND[1],
  };
}

/**
 * Speeds of neighbouring drawn curves may put the duty at speeds this far apart (relative) before
 * a warning: 1 % in speed is 2 % in head at the duty (H ∝ n²), about four times the reading
 * accuracy of a careful take-off (≈ 0.5 %, common practice) — more than that, and the drawn
 * curves do not follow the speed law between them.
 */
export const SPEED_NEIGHBOUR_TOLERANCE = 0.01;

export type FamilySpeedResult =
  | (Extract<SpeedResult, { status: 'ok' }> & {
      /** The speed each bracketing drawn curve gives by the affinity law [rpm]. */
      from_below?: { drawn_rpm: number; speed_rpm: number };
      from_above?: { drawn_rpm: number; speed_rpm: number };
      /** |n_from_above − n_from_below| / n; 0 when only one drawn curve was used. */
      neighbour_disagreement: number;
      /** The speed lies outside the drawn speeds (one curve scaled alone). */
      extrapolated: boolean;
      /** Where NPSH3 at the speed comes from, and its caution when scaled. */
      npsh3?: Npsh3AtSpeed;
      warnings: string[];
    })
  | Extract<SpeedResult, { status: 'not-reachable' }>;

/**
 * The speed at which a pump of a SPEED family (curves drawn at several speeds) meets the duty
 * on the system curve. Each drawn curve predicts the speed by the affinity law
 * (r²·H_i(Q_d/r) = H_sys(Q_d), `speedToDuty`); the answer comes from the two drawn curves that
 * bracket it, weighted linearly in speed so that it equals a drawn curve's answer at that
 * curve's speed, and the two predictions are compared (warning above
 * `SPEED_NEIGHBOUR_TOLERANCE`). Outside the drawn speeds the nearest curve is scaled alone
 * and the result is flagged. Efficiency and power are read on the nearer drawn curve scaled to
 * the speed; NPSH3 by `npsh3ForSpeed` (nearest drawn speed at or above, scaled by n² with a
 * caution). Source of the law: Karassik et al., Pump Handbook; Lobanoff & Ross.
 *
 * @param set        a curve set of family 'speed'
 * @param system     system curve; the duty flow must lie on it
 * @param flow_m3s   duty flow [m³/s], > 0
 * @param density_kg_m3 liquid density of the duty [kg/m³]
 */
export function speedToDutyInFamily(set: CurveSet, system: SystemCurve, flow_m3s: number, density_kg_m3 = set.fluid.density_kg_m3): FamilySpeedResult {
  const drawn = drawnSpeeds(set);
  const fastest = drawn[drawn.length - 1];
  if (!fastest) return { status: 'not-reachable', reason: 'off-curve', message: 'The curve set has no fitted head curve at any speed.' };
  const curveOf = (m: Member) => pumpCurveOfMember(m, density_kg_m3, set.fluid.density_kg_m3);
  const first = speedToDuty(curveOf(fastest), system, flow_m3s);
  if (first.status !== 'ok') return first;
  const { below, above } = bracketingSpeeds(set, first.speed_rpm);
  const from = (m: Member | undefined) => {
    if (!m) return undefined;
    const r = m === fastest ? first : speedToDuty(curveOf(m), system, flow_m3s);
    return r.status === 'ok' ? { drawn_rpm: m.speed_rpm, speed_rpm: r.speed_rpm } : undefined;
  };
  const lo = from(below);
  const hi = from(above);
  const warnings: string[] = [];
  let speed: number;
  let nearer: Member;
  if (lo && hi && below && above && below !== above) {
    const w = Math.min(1, Math.max(0, (first.speed_rpm - below.speed_rpm) / (above.speed_rpm - below.speed_rpm)));
    speed = w * hi.speed_rpm + (1 - w) * lo.speed_rpm;
    nearer = w >= 0.5 ? above : below;
  } else {
    const one = lo ?? hi;
    const m = lo ? below : above;
    if (!one || !m) return { status: 'not-reachable', reason: 'off-curve', message: `No drawn curve of ${set.pump.name} puts the duty flow on its curve at a reachable speed.` };
    speed = one.speed_rpm;
    nearer = m;
  }
  const disagreement = lo && hi ? Math.abs(hi.speed_rpm - lo.speed_rpm) / speed : 0;
  if (disagreement > SPEED_NEIGHBOUR_TOLERANCE) {
    warnings.push(
      `The drawn curves at ${lo?.drawn_rpm} rpm and ${hi?.drawn_rpm} rpm put the duty at ${Math.round(lo?.speed_rpm ?? 0)} rpm and ${Math.round(hi?.speed_rpm ?? 0)} rpm, ${(100 * disagreement).toFixed(1)} % apart (more than ${100 * SPEED_NEIGHBOUR_TOLERANCE} %): the curves do not follow the speed law between them; check their speed labels.`,
    );
  }
  const slowest = drawn[0] as Member;
  const extrapolated = speed < slowest.speed_rpm * (1 - 1e-9) || speed > fastest.speed_rpm * (1 + 1e-9);
  if (extrapolated) warnings.push(`The speed ${Math.round(speed)} rpm lies outside the drawn speeds (${slowest.speed_rpm}–${fastest.speed_rpm} rpm): its curve is the nearest drawn curve scaled by the affinity law, an extrapolation.`);
  const ratioToNearer = speed / nearer.speed_rpm;
  const outside = ratioToNearer < SPEED_AFFINITY_BAND[0] || ratioToNearer > SPEED_AFFINITY_BAND[1];
  if (outside) warnings.push(`The speed is more than 20 % from the nearest drawn curve (${nearer.speed_rpm} rpm), where the affinity law is less exact.`);
  const { curve: scaled, npsh3 } = curveAtSpeedInFamily(set, speed, density_kg_m3, nearer);
  if (npsh3?.caution) warnings.push(npsh3.caution);
  return {
    status: 'ok',
    speed_rpm: speed,
    ratio: speed / set.speed_rpm,
    point: figuresAt(scaled, flow_m3s),
    outside_affinity_band: outside,
    ...(lo ? { from_below: lo } : {}),
    ...(hi ? { from_above: hi } : {}),
    neighbour_disagreement: disagreement,
    extrapolated,
    ...(npsh3 ? { npsh3 } : {}),
    warnings,
  };
}

/**
 * A warning when the duty point lies below the curve set's minimum continuous flow (a stated
 * flow, or the traced line's flow at the point's head); undefined when it does not, or when the
 * set states no minimum flow. Running below it risks recirculation, heating and vibration
 * (common practice; ANSI/HI 9.6.3 on allowable operating regions).
 */
export function belowMinFlow(set: Pick<CurveSet, 'limits'>, point: Pick<PointFigures, 'flow_m3s' | 'head_m'> | undefined): string | undefined {
  if (!point) return undefined;
  const min = minFlowAt(set.limits, point.head_m);
  if (!min || point.flow_m3s >= min.flow_m3s) return undefined;
  return (
    `At the duty each pump runs at ${(100 * (point.flow_m3s / min.flow_m3s)).toFixed(0)} % of its minimum continuous flow (${min.basis}): below it the pump recirculates, heats and vibrates; add a bypass or choose a smaller pump.` +
    (min.beyond_line ? ' The duty head lies beyond the ends of the traced minimum-flow line, so its nearest end was used.' : '')
  );
}

/**
 * The pump curve of a speed family at speed n [rpm]: head, efficiency and power from the drawn
 * curve nearest in speed (or `from`), scaled by the speed affinity law (Q ∝ n, H ∝ n², P ∝ n³;
 * Karassik, Pump Handbook); NPSH3 by `npsh3ForSpeed` (nearest drawn speed at or above, scaled by
 * n² with a caution), or none when no member has an NPSH3 curve.
 */
export function curveAtSpeedInFamily(set: CurveSet, speed_rpm: number, density_kg_m3 = set.fluid.density_kg_m3, from?: Member): { curve: PumpCurve; npsh3?: Npsh3AtSpeed } {
  const drawn = drawnSpeeds(set);
  const nearer = from ?? drawn.reduce<Member | undefined>((best, m) => (!best || Math.abs(Math.log(m.speed_rpm / speed_rpm)) < Math.abs(Math.log(best.speed_rpm / speed_rpm)) ? m : best), undefined);
  if (!nearer) throw new AffinityInputError('This curve set has no fitted head curve at any speed.');
  const base = pumpCurveAtSpeed(pumpCurveOfMember(nearer, density_kg_m3, set.fluid.density_kg_m3), speed_rpm);
  const npsh3 = npsh3ForSpeed(set, speed_rpm);
  const npshFit = npsh3?.fit;
  const curve: PumpCurve = npshFit
    ? { ...base, npshr: (q: number) => evaluateUnchecked(npshFit, q), validity: { ...base.validity, npshr: npshFit.domain } }
    : (({ npshr: _n, ...rest }) => rest)(base);
  return { curve, ...(npsh3 ? { npsh3 } : {}) };
}

/**
 * The members of a set, rated curve first: a diameter family largest diameter first (fastest
 * first when no member has a diameter); a speed family fastest first. The members of a speed
 * family may all carry the one impeller diameter, so the diameter must not decide there.
 */
export function membersRatedFirst(set: Pick<CurveSet, 'members' | 'family'>): Member[] {
  const byDiameter = set.family === 'speed' ? [] : membersByDiameter(set);
  return byDiameter.length > 0 ? byDiameter : [...set.members].sort((a, b) => b.speed_rpm - a.speed_rpm);
}

/** The rated member: the largest diameter of a diameter family, the fastest drawn curve of a speed family. */
export function ratedMember(set: Pick<CurveSet, 'members' | 'family'>): Member {
  return membersRatedFirst(set)[0] as Member;
}

/** Why a trim or another impeller diameter cannot be evaluated on a speed family (one sentence). */
export const SPEED_FAMILY_NO_TRIM = 'This curve set is a speed family (one impeller drawn at several speeds), so no impeller trim or other diameter can be evaluated on it; use speed control or a drawn speed.';
