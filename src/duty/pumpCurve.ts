/**
 * The pump curve the duty engine works on: head (and, when known, efficiency, power and NPSH3)
 * as functions of flow, SI throughout (flow m³/s, head m, power W, efficiency fraction 0…1).
 * Built from a curve-set member by `pumpCurveOfMember`, or written directly in tests.
 * Keeping the engine on this small interface lets it treat a captured diameter, a trim between
 * diameters, a speed-scaled curve and a parallel combination alike.
 */
import type { Member, PolynomialFit } from '../model/curveset.ts';
import { derivative, evaluateUnchecked } from '../fit/polynomial.ts';
import { STANDARD_GRAVITY } from '../units/constants.ts';
import { DutyError } from './errors.ts';

export type OptionalQuantity = 'efficiency' | 'power' | 'npshr';

/** A flow band [m³/s] with where it comes from. */
export interface FlowBand {
  readonly min_m3s: number;
  readonly max_m3s: number;
  readonly basis?: string;
}

export interface PumpCurve {
  readonly label: string;
  readonly diameter_m?: number;
  readonly speed_rpm: number;
  /** Flow range of the head curve [m³/s]; operating points are looked for only inside it. */
  readonly domain: readonly [number, number];
  /** Head [m] at flow q [m³/s]. */
  head(q: number): number;
  /** Efficiency (fraction 0…1) at flow q [m³/s]. */
  efficiency?(q: number): number;
  /** Shaft power [W] at flow q [m³/s], for the liquid the duty is checked with. */
  power?(q: number): number;
  /** NPSH3 [m] at flow q [m³/s]. */
  npshr?(q: number): number;
  /** Flow range where each optional curve was captured; readings outside it are extrapolated. */
  readonly validity?: Partial<Record<OptionalQuantity, readonly [number, number]>>;
  readonly por?: FlowBand;
  readonly aor?: FlowBand;
  readonly bep_flow_m3s?: number;
  /** 'curve': from the captured power curve; 'head-efficiency': ρ·g·Q·H/η. */
  readonly power_basis?: 'curve' | 'head-efficiency';
}

/**
 * The duty engine's view of one curve-set member.
 *
 * Power: from the captured power curve when there is one, scaled by ρ_duty/ρ_sheet (power of a
 * centrifugal pump is proportional to density at the same flow and head, common practice);
 * otherwise P = ρ·g·Q·H/η from the head and efficiency curves. At Q = 0 the ratio Q/η is taken
 * as its limit 1/η'(0), so shutoff power stays finite.
 *
 * @param member            a curve-set member with a fitted head curve
 * @param density_kg_m3     density of the liquid of the duty [kg/m³]
 * @param sheetDensity_kg_m3 density the sheet's power curve was drawn for [kg/m³]; defaults to the duty's
 * Throws DutyError when the member has no fitted head curve.
 */
export function pumpCurveOfMember(member: Member, density_kg_m3: number, sheetDensity_kg_m3 = density_kg_m3): PumpCurve {
  const label = member.label ?? (member.diameter_m !== undefined ? `${(member.diameter_m * 1000).toFixed(1)} mm` : `${member.speed_rpm} rpm`);
  const headFit = member.curves.head?.fit;
  if (!headFit) throw new DutyError(`The curve for ${label} has no fitted head curve; fit the captured points before a duty check.`);
  if (!(density_kg_m3 > 0) || !(sheetDensity_kg_m3 > 0)) throw new DutyError('The liquid density must be a positive number of kg/m³.');
  const effFit = member.curves.efficiency?.fit;
  const powerFit = member.curves.power?.fit;
  const npshFit = member.curves.npshr?.fit;
  const at = (fit: PolynomialFit) => (q: number) => evaluateUnchecked(fit, q);
  const head = at(headFit);

  const validity: Partial<Record<OptionalQuantity, readonly [number, number]>> = {};
  let power: ((q: number) => number) | undefined;
  let power_basis: PumpCurve['power_basis'];
  if (powerFit) {
    const ratio = density_kg_m3 / sheetDensity_kg_m3;
    power = (q) => ratio * evaluateUnchecked(powerFit, q);
    power_basis = 'curve';
    validity.power = powerFit.domain;
  } else if (effFit) {
    const slope0 = derivative(effFit, 0);
    power = (q) => {
      const eta = evaluateUnchecked(effFit, q);
      const qOverEta = q > 0 && eta > 0 ? q / eta : q === 0 && slope0 > 0 ? 1 / slope0 : Number.NaN;
      return density_kg_m3 * STANDARD_GRAVITY * head(q) * qOverEta;
    };
    power_basis = 'head-efficiency';
    validity.power = [Math.max(headFit.domain[0], effFit.domain[0]), Math.min(headFit.domain[1], effFit.domain[1])];
  }
  if (effFit) validity.efficiency = effFit.domain;
  if (npshFit) validity.npshr = npshFit.domain;

  const curve: PumpCurve = {
    label,
    speed_rpm: member.speed_rpm,
    domain: headFit.domain,
    head,
    validity,
    ...(member.diameter_m !== undefined ? { diameter_m: member.diameter_m } : {}),
    ...(effFit ? { efficiency: at(effFit) } : {}),
    ...(power ? { power, power_basis } : {}),
    ...(npshFit ? { npshr: at(npshFit) } : {}),
    ...(member.derived.por ? { por: member.derived.por } : {}),
    ...(member.derived.aor ? { aor: member.derived.aor } : {}),
    ...(member.derived.bep ? { bep_flow_m3s: member.derived.bep.flow_m3s } : {}),
  };
  return curve;
}

/**
 * The same pump at another speed by the speed affinity law (close to exact within ±20 % of speed):
 * Q ∝ n, H ∝ n², P ∝ n³, η unchanged, NPSH3 ∝ n² (common practice for small changes).
 * Source: Karassik et al., Pump Handbook; Lobanoff & Ross, Centrifugal Pumps.
 * @param speed_rpm  new speed [rpm], > 0
 */
export function pumpCurveAtSpeed(curve: PumpCurve, speed_rpm: number): PumpCurve {
  if (!(speed_rpm > 0)) throw new DutyError(`The speed must be a positive number of rpm, not ${speed_rpm}.`);
  const r = speed_rpm / curve.speed_rpm;
  const eff = curve.efficiency;
  const pow = curve.power;
  const npsh = curve.npshr;
  return {
    ...curve,
    label: `${curve.label} at ${Math.round(speed_rpm)} rpm`,
    speed_rpm,
    domain: scaleRange(curve.domain, r),
    head: (q) => r * r * curve.head(q / r),
    ...(eff ? { efficiency: (q: number) => eff(q / r) } : {}),
    ...(pow ? { power: (q: number) => r ** 3 * pow(q / r) } : {}),
    ...(npsh ? { npshr: (q: number) => r * r * npsh(q / r) } : {}),
    ...(curve.validity ? { validity: scaleValidity(curve.validity, r) } : {}),
    ...(curve.por ? { por: scaleBand(curve.por, r) } : {}),
    ...(curve.aor ? { aor: scaleBand(curve.aor, r) } : {}),
    ...(curve.bep_flow_m3s !== undefined ? { bep_flow_m3s: curve.bep_flow_m3s * r } : {}),
  };
}

/**
 * `count` identical pumps in parallel: at a common head each carries Q/count, so
 * H_comb(Q) = H(Q/count), P_comb(Q) = count·P(Q/count), η and NPSH3 those of one pump at Q/count.
 * POR, AOR and BEP flows are multiplied by `count` (each pump's own band, in total flow).
 */
export function parallelPumps(curve: PumpCurve, count: number): PumpCurve {
  if (!Number.isInteger(count) || count < 1) throw new DutyError(`The number of pumps in parallel must be a whole number of 1 or more, not ${count}.`);
  if (count === 1) return curve;
  const eff = curve.efficiency;
  const pow = curve.power;
  const npsh = curve.npshr;
  return {
    ...curve,
    label: `${count} × ${curve.label} in parallel`,
    domain: scaleRange(curve.domain, count),
    head: (q) => curve.head(q / count),
    ...(eff ? { efficiency: (q: number) => eff(q / count) } : {}),
    ...(pow ? { power: (q: number) => count * pow(q / count) } : {}),
    ...(npsh ? { npshr: (q: number) => npsh(q / count) } : {}),
    ...(curve.validity ? { validity: scaleValidity(curve.validity, count) } : {}),
    ...(curve.por ? { por: scaleBand(curve.por, count) } : {}),
    ...(curve.aor ? { aor: scaleBand(curve.aor, count) } : {}),
    ...(curve.bep_flow_m3s !== undefined ? { bep_flow_m3s: curve.bep_flow_m3s * count } : {}),
  };
}

function scaleRange(range: readonly [number, number], r: number): [number, number] {
  return [range[0] * r, range[1] * r];
}

function scaleBand(band: FlowBand, r: number): FlowBand {
  return { ...band, min_m3s: band.min_m3s * r, max_m3s: band.max_m3s * r };
}

function scaleValidity(v: NonNullable<PumpCurve['validity']>, r: number): NonNullable<PumpCurve['validity']> {
  const out: Partial<Record<OptionalQuantity, readonly [number, number]>> = {};
  for (const key of ['efficiency', 'power', 'npshr'] as const) {
    const range = v[key];
    if (range) out[key] = scaleRange(range, r);
  }
  return out;
}
