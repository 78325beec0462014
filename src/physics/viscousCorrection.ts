/**
 * Correction of water performance for a viscous liquid, ANSI/HI 9.6.7 (FROM MEMORY: the
 * equations below are recalled, not copied from the standard; confirm before relying on them).
 *
 *   B   = 16.5 · ν^0.5 · H_BEP^0.0625 / (Q_BEP^0.375 · N^0.25)    ν cSt, Q m³/h, H m per stage, N rpm
 *   C_Q = 2.71^(−0.165·(log10 B)^3.15)
 *   C_H = 1 − (1 − C_Q)·(Q_W/Q_BEP,W)^0.75
 *   C_η = B^(−0.0547·B^0.69)
 *   Q_vis = C_Q·Q_W,  H_vis = C_H·H_W,  η_vis = C_η·η_W
 *
 * Valid for 1 < B < 40; for B ≤ 1 every factor is 1; at B ≥ 40 the method does not apply and
 * the caller must refuse. Self-consistency values (computed from the equations, not from the
 * standard): B = 10 → C_Q = 0.8483, C_η = 0.5396.
 */
import { PhysicsInputError } from './errors.ts';

export const VISCOUS_B_MAX = 40;

/**
 * The parameter B.
 * @param nu_cSt  kinematic viscosity [cSt = mm²/s], > 0
 * @param bepFlow_m3h  water BEP flow [m³/h] per eye, > 0
 * @param bepHead_m    water BEP head per stage [m], > 0
 * @param speed_rpm    > 0
 */
export function viscousParameterB(nu_cSt: number, bepFlow_m3h: number, bepHead_m: number, speed_rpm: number): number {
  if (!(nu_cSt > 0) || !(bepFlow_m3h > 0) || !(bepHead_m > 0) || !(speed_rpm > 0)) throw new PhysicsInputError('The viscosity correction needs a positive viscosity, BEP flow, BEP head and speed.');
  return (16.5 * Math.sqrt(nu_cSt) * bepHead_m ** 0.0625) / (bepFlow_m3h ** 0.375 * speed_rpm ** 0.25);
}

export interface ViscousFactors {
  b: number;
  c_q: number;
  c_eta: number;
  /** C_H at a flow ratio Q_W/Q_BEP,W. */
  c_h(flowToBep: number): number;
}

/** The correction factors for B; throws PhysicsInputError (one sentence) at B ≥ 40. */
export function viscousFactors(b: number): ViscousFactors {
  if (!(b > 0) || !Number.isFinite(b)) throw new PhysicsInputError('The viscosity parameter B must be a positive number.');
  if (b >= VISCOUS_B_MAX) {
    throw new PhysicsInputError(`The liquid is too viscous for this pump: B = ${b.toFixed(1)} is at or above 40, outside the ANSI/HI 9.6.7 method; ask the manufacturer for tested viscous performance.`);
  }
  if (b <= 1) return { b, c_q: 1, c_eta: 1, c_h: () => 1 };
  const cq = 2.71 ** (-0.165 * Math.log10(b) ** 3.15);
  return { b, c_q: cq, c_eta: b ** (-0.0547 * b ** 0.69), c_h: (x: number) => 1 - (1 - cq) * Math.max(0, x) ** 0.75 };
}
