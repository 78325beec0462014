/**
 * Where a pump curve meets a system curve, and what the pump does there.
 */
import type { OptionalQuantity, PumpCurve } from './pumpCurve.ts';
import { systemHead, type SystemCurve } from './systemCurve.ts';
import { rootsOn } from './solve.ts';

export type PorPosition = 'below' | 'within' | 'above' | 'unknown';

/** The pump's figures at one flow. Power and NPSH3 are omitted when the curve set lacks them. */
export interface PointFigures {
  flow_m3s: number;
  head_m: number;
  /** Fraction 0…1. */
  efficiency?: number;
  power_W?: number;
  npshr_m?: number;
  /** Position of the flow against the POR. */
  por_position: PorPosition;
  /** Q / Q_BEP, when the BEP is known. */
  flow_to_bep?: number;
  /** Quantities read outside the flow range where they were captured. */
  extrapolated: Array<'head' | OptionalQuantity>;
}

/** Reads every curve of the pump at flow q [m³/s] and places q against the POR. */
export function figuresAt(curve: PumpCurve, q: number): PointFigures {
  const extrapolated: PointFigures['extrapolated'] = [];
  if (!within(curve.domain, q)) extrapolated.push('head');
  const out: PointFigures = { flow_m3s: q, head_m: curve.head(q), por_position: porPosition(curve, q), extrapolated };
  const read = (key: OptionalQuantity, fn: ((q: number) => number) | undefined) => {
    if (!fn) return undefined;
    const range = curve.validity?.[key];
    if (range && !within(range, q)) extrapolated.push(key);
    const v = fn(q);
    return Number.isFinite(v) ? v : undefined;
  };
  const eta = read('efficiency', curve.efficiency?.bind(curve));
  const power = read('power', curve.power?.bind(curve));
  const npshr = read('npshr', curve.npshr?.bind(curve));
  if (eta !== undefined) out.efficiency = eta;
  if (power !== undefined) out.power_W = power;
  if (npshr !== undefined) out.npshr_m = npshr;
  if (curve.bep_flow_m3s !== undefined && curve.bep_flow_m3s > 0) out.flow_to_bep = q / curve.bep_flow_m3s;
  return out;
}

/** 'below' / 'within' / 'above' the POR, or 'unknown' when the curve has no POR. */
export function porPosition(curve: Pick<PumpCurve, 'por'>, q: number): PorPosition {
  const por = curve.por;
  if (!por) return 'unknown';
  const tol = 1e-9 * por.max_m3s;
  if (q < por.min_m3s - tol) return 'below';
  if (q > por.max_m3s + tol) return 'above';
  return 'within';
}

export type OperatingPointResult =
  | {
      status: 'ok';
      point: PointFigures;
      /** Number of crossings inside the curve's domain; more than one means a drooping (unstable) curve, and the largest flow is reported. */
      crossings: number;
    }
  | {
      status: 'system-above-pump' | 'beyond-end-of-curve';
      message: string;
    };

/**
 * The operating point: the flow where pump head equals system head, looked for inside the
 * pump curve's flow domain only (so a point is never read off an extrapolated head curve).
 * - 'system-above-pump': the system asks for more head than the pump gives at every flow.
 * - 'beyond-end-of-curve': the pump gives more head than the system asks up to the end of
 *   the curve; the pump would run out past its published range.
 */
export function operatingPoint(curve: PumpCurve, system: SystemCurve): OperatingPointResult {
  const [lo, hi] = curve.domain;
  const diff = (q: number) => curve.head(q) - systemHead(system, q);
  const roots = rootsOn(diff, lo, hi, 400);
  const last = roots[roots.length - 1];
  if (last !== undefined) return { status: 'ok', point: figuresAt(curve, last), crossings: roots.length };
  if (diff(hi) > 0) {
    return {
      status: 'beyond-end-of-curve',
      message: `${curve.label}: the pump still gives more head than the system needs at the end of its curve, so it would run beyond its published range.`,
    };
  }
  return {
    status: 'system-above-pump',
    message: `${curve.label}: the system needs more head than the pump gives at every flow, so the pump cannot deliver into it.`,
  };
}

function within(range: readonly [number, number], q: number): boolean {
  const slack = 1e-9 * Math.max(Math.abs(range[1]), 1e-12);
  return q >= range[0] - slack && q <= range[1] + slack;
}
