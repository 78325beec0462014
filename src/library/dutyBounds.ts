/**
 * Cheap screening of one curve set against a duty, before the duty engine runs on it.
 *
 * 1. Reject: the largest captured head curve passes below the duty, or the smallest passes above
 *    it (the duty would need a trim deeper than the smallest captured diameter).
 * 2. Bound: with the two captured diameters D_L ≤ D ≤ D_U whose head curves bracket the duty, the
 *    engine's trimmed curve is a blend w·y_U(Q·D_U/D)·(D/D_U)^k + (1−w)·y_L(Q·D_L/D)·(D/D_L)^k
 *    (trim law, see fit/affinity.ts), so at the duty flow Q
 *      η ≤ max( max η_U on [Q, Q·D_U/D_L],  max η_L on [Q·D_L/D_U, Q] )
 *      P ≥ min( (D_L/D_U)³·min P_U on [Q, Q·D_U/D_L],  min P_L on [Q·D_L/D_U, Q] )
 *    (without a power curve P = ρ·g·Q·H/η ≥ ρ·g·Q·H/η_max). The duty search evaluates sets in the
 *    order of these bounds and stops once no remaining set can enter the top of the ranking.
 * Bounds carry a small safety margin; a looser bound only costs another evaluation.
 */
import type { CurveSet, Member, PolynomialFit } from '../model/curveset.ts';
import { evaluateUnchecked, stationaryPoints } from '../fit/polynomial.ts';
import { STANDARD_GRAVITY } from '../units/constants.ts';

/** Relative slack on the reject tests, so that round-off never drops a pump that meets the duty exactly. */
const REJECT_SLACK = 1e-6;
/** Safety margin on the bounds (relative). */
const BOUND_MARGIN = 2e-3;
/** Samples per interval when looking for interior extrema of a fitted curve. */
const EXTREMA_SAMPLES = 24;

export interface DutyScreen {
  /** Largest efficiency (fraction) any qualifying trim can have at the duty; -1 when the set has no efficiency curve. */
  efficiencyBound: number;
  /** Smallest shaft power (W) any qualifying trim can need at the duty; 0 when unknown. */
  powerBound: number;
}

const UNBOUNDED: DutyScreen = { efficiencyBound: Infinity, powerBound: 0 };

/**
 * Smallest and largest value of a fitted polynomial on [a, b]: the ends and the stationary points
 * inside. Up to degree 3 the stationary points are the roots of a quadratic; above, they are found
 * by sampling and bisection.
 */
export function extremaOn(fit: PolynomialFit, a: number, b: number): { min: number; max: number } {
  const ya = evaluateUnchecked(fit, a);
  const yb = evaluateUnchecked(fit, b);
  let min = ya < yb ? ya : yb;
  let max = ya < yb ? yb : ya;
  const c = fit.coefficients;
  if (c.length <= 2 || !(b > a)) return { min, max };
  let r1 = Number.NaN;
  let r2 = Number.NaN;
  if (c.length <= 4) {
    // dy/dt = c1 + 2·c2·t + 3·c3·t², t = Q / flow_scale.
    const s = fit.flow_scale;
    const A = 3 * (c.length === 4 ? (c[3] as number) : 0);
    const B = 2 * (c[2] as number);
    const C = c[1] as number;
    if (A === 0) {
      if (B !== 0) r1 = (-C / B) * s;
    } else {
      const disc = B * B - 4 * A * C;
      if (disc >= 0) {
        const root = Math.sqrt(disc);
        r1 = ((-B + root) / (2 * A)) * s;
        r2 = ((-B - root) / (2 * A)) * s;
      }
    }
    if (r1 > a && r1 < b) {
      const y = evaluateUnchecked(fit, r1);
      if (y < min) min = y;
      if (y > max) max = y;
    }
    if (r2 > a && r2 < b) {
      const y = evaluateUnchecked(fit, r2);
      if (y < min) min = y;
      if (y > max) max = y;
    }
    return { min, max };
  }
  for (const q of stationaryPoints(fit, a, b, EXTREMA_SAMPLES)) {
    const y = evaluateUnchecked(fit, q);
    if (y < min) min = y;
    if (y > max) max = y;
  }
  return { min, max };
}

interface ScreenModel {
  members: Array<Member & { diameter_m: number }>;
}

/** Per-set preparation, kept as long as the (cached) set object lives. */
const models = new WeakMap<CurveSet, ScreenModel>();

function modelOf(set: CurveSet): ScreenModel {
  let model = models.get(set);
  if (!model) {
    model = { members: withDiameters(set) };
    models.set(set, model);
  }
  return model;
}

function withDiameters(set: CurveSet): Array<Member & { diameter_m: number }> {
  return (set.members.filter((m) => m.diameter_m !== undefined) as Array<Member & { diameter_m: number }>).sort((a, b) => b.diameter_m - a.diameter_m);
}

/**
 * Screens a curve set for a duty (SI: m³/s, m). Returns null when it cannot meet the duty with a
 * diameter between its captured ones, otherwise bounds for ranking. Speed families and sets whose
 * head curves do not bracket the duty cleanly are never rejected and get no useful bound.
 */
export function screenDuty(set: CurveSet, flowM3s: number, headM: number): DutyScreen | null {
  if (set.family === 'speed') return UNBOUNDED;
  const members = modelOf(set).members;
  const full = members[0];
  const fullHead = full?.curves.head?.fit;
  if (!full || !fullHead) return UNBOUNDED;
  const [lo, hi] = fullHead.domain;
  if (flowM3s < lo * (1 - REJECT_SLACK) || flowM3s > hi * (1 + REJECT_SLACK)) return null;
  if (evaluateUnchecked(fullHead, flowM3s) < headM * (1 - REJECT_SLACK)) return null;
  const smallest = members[members.length - 1] as Member & { diameter_m: number };
  const smallHead = smallest.curves.head?.fit;
  if (smallHead && flowM3s >= smallHead.domain[0] && flowM3s <= smallHead.domain[1] && evaluateUnchecked(smallHead, flowM3s) > headM * (1 + REJECT_SLACK)) return null;

  // The bracketing pair, on head curves that fall with diameter at this flow.
  const heads = members.map((m) => (m.curves.head?.fit ? evaluateUnchecked(m.curves.head.fit, flowM3s) : Number.NaN));
  let upper = -1;
  for (let i = 0; i + 1 < members.length; i++) {
    const hu = heads[i] as number;
    const hl = heads[i + 1] as number;
    if (!(hu >= hl)) return UNBOUNDED;
    if (hl <= headM && headM <= hu) upper = i;
  }
  if (members.length === 1) upper = 0;
  if (upper < 0) return UNBOUNDED;
  const U = members[upper] as Member & { diameter_m: number };
  const L = (members[upper + 1] ?? U) as Member & { diameter_m: number };
  const spread = U.diameter_m / L.diameter_m;
  const q = flowM3s;

  let efficiencyBound = -1;
  const eU = U.curves.efficiency?.fit;
  const eL = L.curves.efficiency?.fit;
  if (eU) efficiencyBound = Math.max(efficiencyBound, extremaOn(eU, q, q * spread).max);
  if (eL) efficiencyBound = Math.max(efficiencyBound, extremaOn(eL, q / spread, q).max);
  if (efficiencyBound > 0) efficiencyBound = efficiencyBound * (1 + BOUND_MARGIN) + 1e-4;

  let powerBound = 0;
  const pU = U.curves.power?.fit;
  const pL = L.curves.power?.fit;
  if (pU || pL) {
    const lows: number[] = [];
    if (pU) lows.push(extremaOn(pU, q, q * spread).min / spread ** 3);
    if (pL) lows.push(extremaOn(pL, q / spread, q).min);
    powerBound = Math.max(0, Math.min(...lows) * (1 - BOUND_MARGIN));
  } else if (efficiencyBound > 0) {
    powerBound = ((set.fluid.density_kg_m3 * STANDARD_GRAVITY * q * headM) / efficiencyBound) * (1 - BOUND_MARGIN);
  }
  return { efficiencyBound, powerBound };
}
