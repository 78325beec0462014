/**
 * Affinity laws for centrifugal pumps.
 *
 * Speed change (geometrically the same pump):   Q ∝ n,  H ∝ n²,  P ∝ n³,  η ≈ constant.
 * Impeller trim at constant speed (approximate): Q ∝ D,  H ∝ D²,  P ∝ D³,  η ≈ constant.
 * NPSHr is scaled with the square of the ratio for a SPEED change (common practice for small
 * changes). For a TRIM it is never scaled down: a trimmed impeller keeps the eye of the full
 * one, and its NPSH3 is taken from the drawn curve of the nearest equal or larger diameter at
 * the same flow (common practice; see `npsh3ForDiameter`). Scaling it down with D² puts the
 * figure 1–8 % below the sheet, on the unsafe side.
 *
 * Sources: Karassik et al., Pump Handbook; Lobanoff & Ross, Centrifugal Pumps: Design and
 * Application. The speed law is close to exact within ±20 % of speed; the trim law is
 * approximate, worsens with trim depth, and real trimmed curves fall a little below it.
 * Trims below about 80 % of the full diameter are avoided (Lobanoff & Ross).
 *
 * A fitted curve y(Q) = Σ c_i (Q/s)^i scales exactly: y'(Q') = r^k · y(Q'/r) is the same
 * polynomial with flow_scale s·r and coefficients c_i·r^k, so scaling never refits.
 */
import { UserError } from '../model/errors.ts';
import type { Curve, CurveSet, Member, PolynomialFit, Quantity } from '../model/curveset.ts';
import { evaluateUnchecked } from './polynomial.ts';

/** Exponent of the ratio applied to each quantity's value (flow always takes exponent 1). */
export const VALUE_EXPONENT: Readonly<Record<Quantity, number>> = { head: 2, efficiency: 0, power: 3, npshr: 2 };

/** Thrown when a diameter or speed cannot be reached from the curve set's members. */
export class AffinityInputError extends UserError {
  override name = 'AffinityInputError';
}

/** Scales one fitted curve by ratio r (speed or diameter ratio, new / old). */
export function scaleFit(fit: PolynomialFit, r: number, quantity: Quantity): PolynomialFit {
  const k = VALUE_EXPONENT[quantity];
  const f = r ** k;
  return {
    ...fit,
    flow_scale: fit.flow_scale * r,
    coefficients: fit.coefficients.map((c) => c * f),
    domain: [fit.domain[0] * r, fit.domain[1] * r],
    rms: fit.rms * Math.abs(f),
    max_residual: fit.max_residual * Math.abs(f),
  };
}

/** Scales one curve (points and fit) by ratio r. */
export function scaleCurve(curve: Curve, r: number, quantity: Quantity): Curve {
  const f = r ** VALUE_EXPONENT[quantity];
  const points = curve.points.map(([q, y]) => [q * r, y * f] as [number, number]);
  const drawn = curve.drawn_as ? { drawn_as: curve.drawn_as } : {};
  return curve.fit ? { points, fit: scaleFit(curve.fit, r, quantity), ...drawn } : { points, ...drawn };
}

function scaleCurves(curves: Member['curves'], r: number): Member['curves'] {
  const out: Member['curves'] = {};
  for (const q of ['head', 'efficiency', 'power', 'npshr'] as const) {
    const c = curves[q];
    if (c) out[q] = scaleCurve(c, r, q);
  }
  return out;
}

function scaleDerived(d: Member['derived'], r: number): Member['derived'] {
  const out: Member['derived'] = {};
  if (d.shutoff_head_m !== undefined) out.shutoff_head_m = d.shutoff_head_m * r * r;
  if (d.bep) out.bep = { flow_m3s: d.bep.flow_m3s * r, head_m: d.bep.head_m * r * r, efficiency: d.bep.efficiency };
  if (d.end_of_curve_m3s !== undefined) out.end_of_curve_m3s = d.end_of_curve_m3s * r;
  if (d.por) out.por = { ...d.por, min_m3s: d.por.min_m3s * r, max_m3s: d.por.max_m3s * r };
  if (d.aor) out.aor = { ...d.aor, min_m3s: d.aor.min_m3s * r, max_m3s: d.aor.max_m3s * r };
  return out;
}

/** The member at another speed, by the speed affinity law. */
export function scaleMemberToSpeed(member: Member, speed_rpm: number): Member {
  if (!(speed_rpm > 0)) throw new AffinityInputError(`The new speed must be a positive number of rpm, not ${speed_rpm}.`);
  const r = speed_rpm / member.speed_rpm;
  return { ...member, speed_rpm, curves: scaleCurves(member.curves, r), derived: scaleDerived(member.derived, r) };
}

/** The member at another impeller diameter (same speed), by the trim law. */
export function scaleMemberToDiameter(member: Member, diameter_m: number): Member {
  if (member.diameter_m === undefined) throw new AffinityInputError('This member has no impeller diameter to scale from.');
  if (!(diameter_m > 0)) throw new AffinityInputError(`The new diameter must be positive, not ${diameter_m} m.`);
  const r = diameter_m / member.diameter_m;
  const { label: _label, ...rest } = member;
  return { ...rest, diameter_m, curves: scaleCurves(member.curves, r), derived: scaleDerived(member.derived, r) };
}

/** The whole curve set at another speed (e.g. a 60 Hz sheet converted to 50 Hz). */
export function scaleCurveSetToSpeed(set: CurveSet, speed_rpm: number): CurveSet {
  if (!(speed_rpm > 0)) throw new AffinityInputError(`The new speed must be a positive number of rpm, not ${speed_rpm}.`);
  const r = speed_rpm / set.speed_rpm;
  return {
    ...set,
    speed_rpm,
    members: set.members.map((m) => scaleMemberToSpeed(m, m.speed_rpm * r)),
    figures: undefined,
    findings: [],
  };
}

/** Members with a diameter, largest first. */
export function membersByDiameter(set: Pick<CurveSet, 'members'>): Member[] {
  return set.members.filter((m) => m.diameter_m !== undefined).sort((a, b) => (b.diameter_m as number) - (a.diameter_m as number));
}

/**
 * A trimmed impeller between two captured diameters: each neighbour's curve is scaled to
 * the wanted diameter by the trim law, and the two predictions are blended with weights
 * linear in diameter, so that the result equals a captured curve at its own diameter and
 * moves smoothly between them. Outside the captured range the nearest member is scaled
 * alone (trim below the smallest, or above the largest — flagged by `extrapolated`).
 *
 * The blend y(Q) = w·y_a'(Q) + (1−w)·y_b'(Q) is itself a polynomial, so it is formed
 * exactly from the coefficients (see `blendFits`), valid on the overlap of the two domains.
 */
export function memberAtDiameter(set: Pick<CurveSet, 'members'>, diameter_m: number): Member & { extrapolated: boolean } {
  return withSheetNpsh3(set, trimmedMember(set, diameter_m));
}

/** Where a trim's NPSH3 curve comes from. */
export interface Npsh3Source {
  /** The drawn NPSH3 fit, as read off the sheet (flow and value unchanged), or scaled UP for a diameter above every drawn one. */
  fit: PolynomialFit;
  /** Diameter of the drawn curve used [m]. */
  from_diameter_m: number;
  /** True when the diameter lies above every drawn NPSH3 curve and the curve was scaled up by (D/D_drawn)² (an extrapolation). */
  scaled_up: boolean;
}

/** The rule in words, for reports. */
export const NPSH3_TRIM_RULE =
  'NPSH3 of a trim is read from the drawn curve of the nearest equal or larger diameter at the same flow, never scaled down (common practice: the trimmed impeller keeps the same eye).';

/**
 * NPSH3 for an impeller of diameter d [m] (common practice): the drawn NPSH3 curve of the
 * smallest captured diameter at or above d, at the same flow, unscaled — so a trim is never
 * given an NPSH3 below the sheet's. Above every drawn diameter the largest drawn curve is
 * scaled up by (d/D)² at the same flow (larger, hence on the safe side) and flagged.
 * Undefined when the set has no NPSH3 curve at all.
 */
export function npsh3ForDiameter(set: Pick<CurveSet, 'members'>, diameter_m: number): Npsh3Source | undefined {
  const drawn = set.members
    .filter((m) => m.diameter_m !== undefined && m.curves.npshr?.fit)
    .sort((a, b) => (a.diameter_m as number) - (b.diameter_m as number));
  const atOrAbove = drawn.find((m) => (m.diameter_m as number) >= diameter_m * (1 - 1e-9));
  if (atOrAbove) return { fit: atOrAbove.curves.npshr?.fit as PolynomialFit, from_diameter_m: atOrAbove.diameter_m as number, scaled_up: false };
  const largest = drawn[drawn.length - 1];
  if (!largest) return undefined;
  const r2 = (diameter_m / (largest.diameter_m as number)) ** 2;
  const fit = largest.curves.npshr?.fit as PolynomialFit;
  return {
    fit: { ...fit, coefficients: fit.coefficients.map((c) => c * r2), rms: fit.rms * r2, max_residual: fit.max_residual * r2, reason: `${fit.reason}; scaled up by (D/D_drawn)² above the largest drawn NPSH3 curve` },
    from_diameter_m: largest.diameter_m as number,
    scaled_up: true,
  };
}

/** The member with its NPSH3 curve replaced by the sheet's (see `npsh3ForDiameter`); members without a diameter are returned as they are. */
export function withSheetNpsh3<M extends Member>(set: Pick<CurveSet, 'members'> & Partial<Pick<CurveSet, 'family'>>, member: M): M {
  // A speed family's members may all carry the one impeller diameter: each keeps its own NPSH3.
  if (member.diameter_m === undefined || set.family === 'speed') return member;
  const source = npsh3ForDiameter(set, member.diameter_m);
  const curves = { ...member.curves };
  if (source) curves.npshr = { points: source.from_diameter_m === member.diameter_m ? member.curves.npshr?.points ?? [] : [], fit: source.fit };
  else delete curves.npshr;
  return { ...member, curves };
}

function trimmedMember(set: Pick<CurveSet, 'members'>, diameter_m: number): Member & { extrapolated: boolean } {
  const sorted = membersByDiameter(set);
  if (sorted.length === 0) throw new AffinityInputError('This curve set has no impeller diameters to trim between.');
  if (!(diameter_m > 0)) throw new AffinityInputError(`The diameter must be positive, not ${diameter_m} m.`);
  const largest = sorted[0] as Member;
  const smallest = sorted[sorted.length - 1] as Member;
  if (diameter_m >= (largest.diameter_m as number)) {
    return { ...scaleMemberToDiameter(largest, diameter_m), extrapolated: diameter_m > (largest.diameter_m as number) * (1 + 1e-12) };
  }
  if (diameter_m <= (smallest.diameter_m as number)) {
    return { ...scaleMemberToDiameter(smallest, diameter_m), extrapolated: diameter_m < (smallest.diameter_m as number) * (1 - 1e-12) };
  }
  let i = 0;
  while ((sorted[i + 1]?.diameter_m as number) > diameter_m) i++;
  const upper = sorted[i] as Member;
  const lower = sorted[i + 1] as Member;
  if (lower.diameter_m === diameter_m) return { ...lower, extrapolated: false };
  const dU = upper.diameter_m as number;
  const dL = lower.diameter_m as number;
  const w = (diameter_m - dL) / (dU - dL); // weight of the upper neighbour
  // Each neighbour scaled to the diameter (as `scaleMemberToDiameter` does); a blended curve
  // keeps no points, so only the fits are scaled for it.
  const rU = diameter_m / dU;
  const rL = diameter_m / dL;
  const curves: Member['curves'] = {};
  for (const q of ['head', 'efficiency', 'power', 'npshr'] as const) {
    const ca = upper.curves[q];
    const cb = lower.curves[q];
    if (ca?.fit && cb?.fit) curves[q] = { points: [], fit: blendFits(scaleFit(ca.fit, rU, q), scaleFit(cb.fit, rL, q), w) };
    else if (ca || cb) curves[q] = (w >= 0.5 ? ca ? scaleCurve(ca, rU, q) : scaleCurve(cb as Curve, rL, q) : cb ? scaleCurve(cb, rL, q) : scaleCurve(ca as Curve, rU, q));
  }
  return { diameter_m, speed_rpm: upper.speed_rpm, curves, derived: blendDerived(scaleDerived(upper.derived, rU), scaleDerived(lower.derived, rL), w), extrapolated: false };
}

/**
 * Head [m] of the trimmed impeller at diameter d [m] and flow q [m³/s], without building the
 * member: a shortcut for searches that evaluate many diameters (the trim that meets a duty).
 * It repeats the arithmetic of `memberAtDiameter` → `scaleFit` → `blendFits` →
 * `evaluateUnchecked` operation by operation, so the value is the same to the last bit
 * (tests/duty/meetDutySame.test.ts holds it to that).
 *
 * Returns a function of (d, q); the function returns undefined whenever the member at d would
 * not carry a fitted head curve made that way (a neighbour without a head fit, a diameter that
 * is not positive): the caller then builds the member, which says what is wrong.
 */
export function trimmedHeadAt(set: Pick<CurveSet, 'members'>): (diameter_m: number, flow_m3s: number) => number | undefined {
  const sorted = membersByDiameter(set);
  const diameters = sorted.map((m) => m.diameter_m as number);
  const fits = sorted.map((m) => m.curves.head?.fit);
  const n = sorted.length;
  const k = VALUE_EXPONENT.head;
  return (diameter_m, flow_m3s) => {
    if (n === 0 || !(diameter_m > 0)) return undefined;
    const dMax = diameters[0] as number;
    const dMin = diameters[n - 1] as number;
    // Outside the captured range (or at the largest): the nearest member scaled alone (`scaleFit`).
    if (diameter_m >= dMax || diameter_m <= dMin) {
      const j = diameter_m >= dMax ? 0 : n - 1;
      const fit = fits[j];
      if (!fit) return undefined;
      const r = diameter_m / (diameters[j] as number);
      const f = r ** k;
      const t = flow_m3s / (fit.flow_scale * r);
      const c = fit.coefficients;
      let y = 0;
      for (let i = c.length - 1; i >= 0; i--) y = y * t + (c[i] as number) * f;
      return y;
    }
    let i = 0;
    while ((diameters[i + 1] as number) > diameter_m) i++;
    const dU = diameters[i] as number;
    const dL = diameters[i + 1] as number;
    const fa = fits[i];
    const fb = fits[i + 1];
    if (dL === diameter_m) return fb ? evaluateUnchecked(fb, flow_m3s) : undefined;
    if (!fa || !fb) return undefined;
    const w = (diameter_m - dL) / (dU - dL);
    const rA = diameter_m / dU;
    const rB = diameter_m / dL;
    const gA = rA ** k;
    const gB = rB ** k;
    const sA = fa.flow_scale * rA;
    const ratio = sA / (fb.flow_scale * rB);
    const ca = fa.coefficients;
    const cb = fb.coefficients;
    const t = flow_m3s / sA;
    let y = 0;
    for (let j = Math.max(ca.length, cb.length) - 1; j >= 0; j--) {
      const a = j < ca.length ? (ca[j] as number) * gA : 0;
      const b = j < cb.length ? (cb[j] as number) * gB : 0;
      y = y * t + (w * a + (1 - w) * b * ratio ** j);
    }
    return y;
  };
}

/**
 * w·fa + (1−w)·fb as one polynomial. Coefficients are brought to fa's flow scale
 * (c_i·(s_a/s_b)^i, exact), and the domain is the overlap of the two domains.
 */
export function blendFits(fa: PolynomialFit, fb: PolynomialFit, w: number): PolynomialFit {
  const n = Math.max(fa.coefficients.length, fb.coefficients.length);
  const ratio = fa.flow_scale / fb.flow_scale;
  const coefficients = Array.from({ length: n }, (_, i) => w * (fa.coefficients[i] ?? 0) + (1 - w) * (fb.coefficients[i] ?? 0) * ratio ** i);
  const lo = Math.max(fa.domain[0], fb.domain[0]);
  const hi = Math.min(fa.domain[1], fb.domain[1]);
  return {
    kind: 'polynomial',
    flow_scale: fa.flow_scale,
    coefficients,
    domain: [lo, Math.max(lo, hi)],
    degree: n - 1,
    through_origin: fa.through_origin && fb.through_origin,
    rms: w * fa.rms + (1 - w) * fb.rms,
    max_residual: Math.max(fa.max_residual, fb.max_residual),
    condition: Math.max(fa.condition, fb.condition),
    reason: `blend of the two neighbouring diameters scaled by the trim law (weight ${w.toFixed(3)} on the larger)`,
  };
}

function blendDerived(a: Member['derived'], b: Member['derived'], w: number): Member['derived'] {
  const mix = (x: number | undefined, y: number | undefined) => (x !== undefined && y !== undefined ? w * x + (1 - w) * y : undefined);
  const out: Member['derived'] = {};
  const shutoff = mix(a.shutoff_head_m, b.shutoff_head_m);
  if (shutoff !== undefined) out.shutoff_head_m = shutoff;
  if (a.bep && b.bep) {
    out.bep = {
      flow_m3s: w * a.bep.flow_m3s + (1 - w) * b.bep.flow_m3s,
      head_m: w * a.bep.head_m + (1 - w) * b.bep.head_m,
      efficiency: w * a.bep.efficiency + (1 - w) * b.bep.efficiency,
    };
  }
  const end = mix(a.end_of_curve_m3s, b.end_of_curve_m3s);
  if (end !== undefined) out.end_of_curve_m3s = end;
  if (a.por && b.por) out.por = { min_m3s: w * a.por.min_m3s + (1 - w) * b.por.min_m3s, max_m3s: w * a.por.max_m3s + (1 - w) * b.por.max_m3s, basis: a.por.basis };
  return out;
}

/**
 * Required trim for a duty point (common practice): follow the parabola H = (H_d/Q_d²)·Q²
 * from the duty point up to the full-diameter head curve, then D_req = D_full · Q_d / Q_cross.
 * Returns undefined when the parabola does not meet the curve inside its domain, or when
 * the duty lies above the full-diameter curve (a trim cannot add head).
 */
export function trimByParabola(fullHead: PolynomialFit, fullDiameter_m: number, dutyFlow_m3s: number, dutyHead_m: number): { diameter_m: number; crossingFlow_m3s: number } | undefined {
  if (!(dutyFlow_m3s > 0) || !(dutyHead_m > 0)) return undefined;
  const cross = parabolaCrossing(fullHead, dutyHead_m / (dutyFlow_m3s * dutyFlow_m3s));
  if (cross === undefined || !(cross > 0)) return undefined;
  const diameter_m = (fullDiameter_m * dutyFlow_m3s) / cross;
  return diameter_m <= fullDiameter_m * (1 + 1e-9) ? { diameter_m, crossingFlow_m3s: cross } : undefined;
}

/**
 * Flow where a head curve meets the affinity parabola H = c·Q², searched inside the fit's
 * domain from low flow up (the first crossing from above), or undefined.
 */
export function parabolaCrossing(fit: Pick<PolynomialFit, 'coefficients' | 'flow_scale' | 'domain'>, c: number, samples = 400): number | undefined {
  const [lo, hi] = fit.domain;
  const g = (q: number) => evaluateUnchecked(fit, q) - c * q * q;
  let a = lo;
  let ga = g(lo);
  for (let i = 1; i <= samples; i++) {
    const b = lo + ((hi - lo) * i) / samples;
    const gb = g(b);
    if (ga >= 0 && gb <= 0) {
      let x = a;
      let y = b;
      for (let k = 0; k < 80; k++) {
        const m = 0.5 * (x + y);
        if (g(m) >= 0) x = m; else y = m;
      }
      return 0.5 * (x + y);
    }
    a = b;
    ga = gb;
  }
  return undefined;
}
