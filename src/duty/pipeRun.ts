/**
 * Losses of the pipe runs on the suction and discharge sides, and the system curve they make:
 *
 *   H_sys(Q) = H_static + Σ_runs h_run(Q),   h_run = (f·L/D + ΣK)·v²/(2g)   (Darcy–Weisbach)
 *                                           or 10.67·L·Q^1.852/(C^1.852·D^4.8704) + ΣK·v²/(2g) (Hazen–Williams)
 *
 * Q here is the flow through the run [m³/s]: the total flow for a common header. SI inside.
 * Roughness by material comes from a table of typical values (from memory); a given roughness
 * always wins. Sources: see src/physics/pipeFriction.ts and src/physics/fittings.ts.
 */
import { STANDARD_GRAVITY } from '../units/constants.ts';
import { darcyWeisbachLoss, hazenWilliamsLoss, type FlowRegime } from '../physics/pipeFriction.ts';
import { fittingK } from '../physics/fittings.ts';
import type { SystemCurve } from './systemCurve.ts';
import { DutyError } from './errors.ts';

/** Typical absolute roughness ε of new pipe [m] (from memory; typical values). */
export const MATERIAL_ROUGHNESS_M: Readonly<Record<string, number>> = {
  'steel': 0.045e-3,
  'commercial-steel': 0.045e-3,
  'cast-iron': 0.26e-3,
  'drawn-tubing': 0.0015e-3,
  'pvc': 0.005e-3,
  'stainless-steel': 0.015e-3,
};

export type FrictionMethod = 'darcy-weisbach' | 'hazen-williams';

export interface PipeRun {
  /** Inside diameter [m]. */
  diameter_m: number;
  /** Length [m]. */
  length_m: number;
  /** Absolute roughness ε [m] (Darcy–Weisbach). */
  roughness_m?: number;
  /** Material name, for ε from the table when no roughness is given. */
  material?: string;
  /** Hazen–Williams C (Hazen–Williams only). */
  hazen_williams_c?: number;
  /** Sum of fitting K values given directly. */
  k?: number;
  /** Named fittings from the table, each with a count. */
  fittings?: ReadonlyArray<{ name: string; count?: number }>;
}

export interface LiquidFlowProps {
  density_kg_m3: number;
  kinematic_viscosity_m2_s: number;
  /** Hazen–Williams is for water only. */
  is_water: boolean;
}

export interface RunLoss {
  loss_m: number;
  velocity_m_s: number;
  velocity_head_m: number;
  reynolds?: number;
  friction_factor?: number;
  regime?: FlowRegime;
}

/** ΣK of a run: the given K plus the named fittings. */
export function runK(run: PipeRun): number {
  return (run.k ?? 0) + (run.fittings ?? []).reduce((s, f) => s + fittingK(f.name, f.count ?? 1), 0);
}

/** Roughness of a run [m]: given, or from the material table. Throws DutyError when neither. */
export function runRoughness(run: PipeRun): number {
  if (run.roughness_m !== undefined) return run.roughness_m;
  if (run.material !== undefined) {
    const e = MATERIAL_ROUGHNESS_M[run.material];
    if (e === undefined) throw new DutyError(`Unknown pipe material "${run.material}"; use one of ${Object.keys(MATERIAL_ROUGHNESS_M).join(', ')}, or give the roughness.`);
    return e;
  }
  throw new DutyError('A pipe run needs a roughness or a material for the Darcy–Weisbach friction factor.');
}

/** Head loss of one run at flow q [m³/s]. */
export function runLoss(run: PipeRun, q: number, liquid: LiquidFlowProps, method: FrictionMethod = 'darcy-weisbach'): RunLoss {
  if (!(run.diameter_m > 0) || !(run.length_m >= 0)) throw new DutyError('Each pipe run needs a positive inside diameter and a length of zero or more.');
  const k = runK(run);
  const v = (4 * Math.abs(q)) / (Math.PI * run.diameter_m ** 2);
  const vh = (v * v) / (2 * STANDARD_GRAVITY);
  if (method === 'hazen-williams') {
    if (!liquid.is_water) throw new DutyError('Hazen–Williams holds for water only; use Darcy–Weisbach for this liquid.');
    const c = run.hazen_williams_c;
    if (c === undefined) throw new DutyError('A Hazen–Williams pipe run needs its C factor (e.g. 120 for steel, 130 for ductile iron, 150 for PVC).');
    return { loss_m: hazenWilliamsLoss(q, run.diameter_m, run.length_m, c) + k * vh, velocity_m_s: v, velocity_head_m: vh };
  }
  const r = darcyWeisbachLoss(q, run.diameter_m, run.length_m, runRoughness(run), liquid.kinematic_viscosity_m2_s, k);
  return { loss_m: r.loss_m, velocity_m_s: v, velocity_head_m: vh, reynolds: r.reynolds, friction_factor: r.f, regime: r.regime };
}

/** Sum of the losses of a list of runs at flow q [m³/s] [m]. */
export function runsLoss(runs: readonly PipeRun[], q: number, liquid: LiquidFlowProps, method: FrictionMethod = 'darcy-weisbach'): number {
  return runs.reduce((s, run) => s + runLoss(run, q, liquid, method).loss_m, 0);
}

/**
 * A system curve from a static head [m] and a loss function of the total flow [m³/s].
 * `k` and `exponent` are a two-point power-law summary (through the losses at Q_ref and Q_ref/2)
 * for display only; heads are always computed from `loss_at`.
 */
export function systemFromLoss(static_head_m: number, loss_at: (q: number) => number, reference_flow_m3s: number, basis: string): SystemCurve {
  if (!Number.isFinite(static_head_m)) throw new DutyError('The static head must be a finite number.');
  if (!(reference_flow_m3s > 0)) throw new DutyError('The reference flow of a system curve must be positive.');
  const h1 = loss_at(reference_flow_m3s);
  const h2 = loss_at(reference_flow_m3s / 2);
  const exponent = h1 > 0 && h2 > 0 ? Math.log(h1 / h2) / Math.LN2 : 2;
  return { static_head_m, k: h1 > 0 ? h1 / reference_flow_m3s ** exponent : 0, exponent, basis, loss_at };
}

/** The system curve of a static head [m] and pipe runs all carrying the total flow. */
export function systemFromPipes(static_head_m: number, runs: readonly PipeRun[], liquid: LiquidFlowProps, method: FrictionMethod, reference_flow_m3s: number, words = ''): SystemCurve {
  for (const run of runs) runLoss(run, reference_flow_m3s, liquid, method); // refuse bad runs now, with their sentence
  const basis = `static head plus ${runs.length} pipe run${runs.length === 1 ? '' : 's'} by ${method === 'hazen-williams' ? 'Hazen–Williams' : 'Darcy–Weisbach with Colebrook–White'}${words ? `, ${words}` : ''}`;
  return systemFromLoss(static_head_m, (q) => runsLoss(runs, q, liquid, method), reference_flow_m3s, basis);
}
