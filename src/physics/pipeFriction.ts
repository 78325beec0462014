/**
 * Friction in full pipes: Reynolds number, the Darcy friction factor (laminar 64/Re,
 * Colebrook–White for turbulent flow, Swamee–Jain as a second opinion), the Darcy–Weisbach
 * head loss and the Hazen–Williams head loss. SI throughout.
 */
import { STANDARD_GRAVITY } from '../units/constants.ts';
import { PhysicsInputError } from './errors.ts';

/** Below this Reynolds number flow is laminar (common practice). */
export const RE_LAMINAR = 2000;
/** Above this Reynolds number flow is taken as turbulent (common practice). */
export const RE_TURBULENT = 4000;

/**
 * Re = v·D/ν.
 * @param velocity_m_s  mean velocity v [m/s]
 * @param diameter_m    inside diameter D [m], > 0
 * @param kinematicViscosity_m2_s  ν [m²/s], > 0
 * Source: any fluid-mechanics text.
 */
export function reynoldsNumber(velocity_m_s: number, diameter_m: number, kinematicViscosity_m2_s: number): number {
  if (!(diameter_m > 0) || !(kinematicViscosity_m2_s > 0)) throw new PhysicsInputError('The pipe diameter and the liquid viscosity must be positive.');
  return (Math.abs(velocity_m_s) * diameter_m) / kinematicViscosity_m2_s;
}

/**
 * Colebrook–White, solved for the Darcy friction factor f:
 *
 *   1/√f = −2 log10( (ε/D)/3.7 + 2.51/(Re √f) )
 *
 * Solved by Newton's method on x = 1/√f (the equation is x = −2 log10(a + b x), a = (ε/D)/3.7,
 * b = 2.51/Re), started from Swamee–Jain, to |Δx| < 1e-12·x.
 * @param reynolds   Re, valid ≥ 4000 (turbulent); the equation itself is solved for any Re > 0
 * @param relativeRoughness  ε/D, 0 ≤ ε/D ≤ 0.05
 * Source: C. F. Colebrook, J. Inst. Civil Eng. 11, 1939. Check values of the equation:
 * Re 1e5 smooth → 0.01799; Re 1e6, ε/D 1e-4 → 0.01344.
 */
export function colebrookWhite(reynolds: number, relativeRoughness: number): number {
  checkFlow(reynolds, relativeRoughness);
  const a = relativeRoughness / 3.7;
  const b = 2.51 / reynolds;
  let x = 1 / Math.sqrt(swameeJain(Math.max(reynolds, 5000), relativeRoughness));
  for (let k = 0; k < 50; k++) {
    const inner = a + b * x;
    const g = x + 2 * Math.log10(inner);
    const dg = 1 + (2 * b) / (inner * Math.LN10);
    const step = g / dg;
    x -= step;
    if (Math.abs(step) < 1e-12 * x) break;
  }
  return 1 / (x * x);
}

/**
 * Swamee–Jain explicit approximation of Colebrook–White:
 *   f = 0.25 / [ log10( (ε/D)/3.7 + 5.74/Re^0.9 ) ]²
 * Within about 1 % of Colebrook–White for 5e3 < Re < 1e8 and 1e-6 < ε/D < 1e-2.
 * Source: P. K. Swamee and A. K. Jain, J. Hydraulics Div. ASCE 102(5), 1976.
 */
export function swameeJain(reynolds: number, relativeRoughness: number): number {
  checkFlow(reynolds, relativeRoughness);
  const l = Math.log10(relativeRoughness / 3.7 + 5.74 / reynolds ** 0.9);
  return 0.25 / (l * l);
}

export type FlowRegime = 'laminar' | 'transitional' | 'turbulent';

/**
 * Darcy friction factor for any Reynolds number:
 *   Re ≤ 2000: f = 64/Re (Hagen–Poiseuille, exact for laminar flow);
 *   Re ≥ 4000: Colebrook–White;
 *   between: linear in Re from the laminar value at 2000 to Colebrook–White at 4000 — a
 *            bridge, not a law (common practice; the real value is uncertain there), flagged.
 */
export function darcyFrictionFactor(reynolds: number, relativeRoughness: number): { f: number; regime: FlowRegime } {
  if (!(reynolds > 0)) throw new PhysicsInputError('The Reynolds number must be positive; the flow must be above zero.');
  if (reynolds <= RE_LAMINAR) return { f: 64 / reynolds, regime: 'laminar' };
  if (reynolds >= RE_TURBULENT) return { f: colebrookWhite(reynolds, relativeRoughness), regime: 'turbulent' };
  const w = (reynolds - RE_LAMINAR) / (RE_TURBULENT - RE_LAMINAR);
  return { f: (1 - w) * (64 / RE_LAMINAR) + w * colebrookWhite(RE_TURBULENT, relativeRoughness), regime: 'transitional' };
}

/**
 * Darcy–Weisbach head loss of a straight pipe plus minor losses:
 *   h = (f·L/D + ΣK) · v²/(2g),  v = 4Q/(πD²)
 * @param flow_m3s   Q [m³/s] (sign ignored)
 * @param diameter_m D [m]; @param length_m L [m] ≥ 0; @param roughness_m ε [m] ≥ 0
 * @param kinematicViscosity_m2_s ν [m²/s]; @param kSum ΣK of fittings (dimensionless)
 * @returns head loss [m], the friction factor and the regime. Zero at zero flow.
 * Source: Darcy–Weisbach equation; any fluid-mechanics text.
 */
export function darcyWeisbachLoss(flow_m3s: number, diameter_m: number, length_m: number, roughness_m: number, kinematicViscosity_m2_s: number, kSum = 0): { loss_m: number; f: number; regime: FlowRegime; velocity_m_s: number; reynolds: number } {
  if (!(diameter_m > 0) || !(length_m >= 0) || !(roughness_m >= 0) || !(kSum >= 0)) {
    throw new PhysicsInputError('A pipe run needs a positive inside diameter, a length and roughness of zero or more, and fitting K values of zero or more.');
  }
  const v = (4 * Math.abs(flow_m3s)) / (Math.PI * diameter_m * diameter_m);
  if (v === 0) return { loss_m: 0, f: 0, regime: 'laminar', velocity_m_s: 0, reynolds: 0 };
  const re = reynoldsNumber(v, diameter_m, kinematicViscosity_m2_s);
  const { f, regime } = darcyFrictionFactor(re, roughness_m / diameter_m);
  return { loss_m: ((f * length_m) / diameter_m + kSum) * ((v * v) / (2 * STANDARD_GRAVITY)), f, regime, velocity_m_s: v, reynolds: re };
}

/**
 * Hazen–Williams head loss (water, turbulent), SI form:
 *   h = 10.67 · L · Q^1.852 / (C^1.852 · D^4.8704)     [m], Q m³/s, L and D m
 * Valid for water near room temperature, turbulent flow, D above about 50 mm; it ignores
 * viscosity, so it is refused for other liquids by the callers. Source: Hazen and Williams,
 * Hydraulic Tables (1905); SI constant 10.67 as in EPANET's manual (constants vary slightly by source).
 */
export function hazenWilliamsLoss(flow_m3s: number, diameter_m: number, length_m: number, c: number): number {
  if (!(diameter_m > 0) || !(length_m >= 0) || !(c > 0)) throw new PhysicsInputError('A Hazen–Williams pipe run needs a positive diameter and C factor and a length of zero or more.');
  return (10.67 * length_m * Math.abs(flow_m3s) ** 1.852) / (c ** 1.852 * diameter_m ** 4.8704);
}

function checkFlow(reynolds: number, relativeRoughness: number): void {
  if (!(reynolds > 0) || !Number.isFinite(reynolds)) throw new PhysicsInputError('The Reynolds number must be a positive finite number.');
  if (!(relativeRoughness >= 0 && relativeRoughness <= 0.05)) throw new PhysicsInputError(`The relative roughness ε/D must lie between 0 and 0.05, not ${relativeRoughness}; check the roughness and the diameter units.`);
}
