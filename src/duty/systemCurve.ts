/**
 * System curves H = Hs + k·Q^n: the head the piping asks of the pump at each flow.
 * Hs is the static head [m] (difference of liquid levels plus pressure difference as head),
 * k the resistance [m/(m³/s)^n], n the flow exponent (2 for fully rough turbulent flow,
 * 1.852 for Hazen-Williams, between 1.75 and 2 for smooth pipes).
 */
import { DutyError } from './errors.ts';

export interface SystemCurve {
  /** Static head Hs [m]. */
  readonly static_head_m: number;
  /** Resistance k [m per (m³/s)^n]. */
  readonly k: number;
  /** Flow exponent n (dimensionless). */
  readonly exponent: number;
  /** How the curve was obtained, in words. */
  readonly basis: string;
  /** Losses [m] at total flow q [m³/s] computed from pipe runs; when present it replaces k·Q^n, which is then a summary for display. */
  readonly loss_at?: (q: number) => number;
  /** Residuals of a fit to tabulated points [m]. */
  readonly fit?: { readonly rms_m: number; readonly max_residual_m: number; readonly points: number };
}

/** H(Q) = Hs + k·Q^n [m] at flow q [m³/s] (q ≥ 0). */
export function systemHead(system: SystemCurve, q: number): number {
  return system.static_head_m + (system.loss_at ? system.loss_at(Math.abs(q)) : system.k * Math.abs(q) ** system.exponent);
}

/**
 * The system curve through one duty point with a given static head:
 * k = (H_d − Hs) / Q_d^n.
 * @param static_head_m  Hs [m]
 * @param flow_m3s       duty flow Q_d [m³/s], > 0
 * @param head_m         duty head H_d [m], ≥ Hs
 * @param exponent       n, default 2 (common practice for turbulent flow)
 * Throws DutyError when the duty head lies below the static head or the flow is not positive.
 */
export function systemCurveThroughDuty(static_head_m: number, flow_m3s: number, head_m: number, exponent = 2): SystemCurve {
  if (!(flow_m3s > 0) || !Number.isFinite(flow_m3s)) throw new DutyError(`The duty flow must be a positive number, not ${flow_m3s}.`);
  if (!Number.isFinite(head_m) || !Number.isFinite(static_head_m)) throw new DutyError('The duty head and the static head must be finite numbers.');
  if (head_m < static_head_m) {
    throw new DutyError('The duty head lies below the static head; the duty head must include the static head, so check both values.');
  }
  if (!(exponent > 0)) throw new DutyError(`The system-curve exponent must be positive, not ${exponent}.`);
  return {
    static_head_m,
    k: (head_m - static_head_m) / flow_m3s ** exponent,
    exponent,
    basis: `static head plus one duty point, H = Hs + k·Q^${exponent}`,
  };
}

export interface SystemFitOptions {
  /** Hold the static head at this value [m] instead of fitting it. */
  static_head_m?: number;
  /** Hold the exponent at this value instead of fitting it in [1, 3]. */
  exponent?: number;
}

/**
 * Least-squares fit of H = Hs + k·Q^n to tabulated (Q [m³/s], H [m]) points.
 * For a fixed n the model is linear in Hs and k and is solved directly; n itself (when free)
 * is found by a scan of [1, 3] in steps of 0.01 and a golden-section refinement of the
 * residual sum of squares.
 * Needs at least 2 points with different flows, or 3 when both Hs and n are free.
 * Throws DutyError for too few points, non-finite values or a curve that falls with flow.
 */
export function fitSystemCurve(points: ReadonlyArray<readonly [number, number]>, options: SystemFitOptions = {}): SystemCurve {
  for (const [q, h] of points) {
    if (!Number.isFinite(q) || !Number.isFinite(h) || q < 0) throw new DutyError('System-curve points need a flow of zero or more and a finite head.');
  }
  const distinct = new Set(points.map(([q]) => q)).size;
  const unknowns = (options.static_head_m === undefined ? 1 : 0) + (options.exponent === undefined ? 1 : 0) + 1;
  if (distinct < Math.max(2, unknowns)) {
    throw new DutyError(`A system curve needs at least ${Math.max(2, unknowns)} points at different flows for this fit; ${distinct} given.`);
  }
  const qMax = Math.max(...points.map(([q]) => q));
  const solve = (n: number) => solveLinear(points, n, qMax, options.static_head_m);
  let n = options.exponent;
  if (n === undefined) {
    let best = 1;
    let bestSse = Infinity;
    for (let i = 0; i <= 200; i++) {
      const trial = 1 + i * 0.01;
      const sse = solve(trial).sse;
      if (sse < bestSse) {
        bestSse = sse;
        best = trial;
      }
    }
    let lo = Math.max(1, best - 0.01);
    let hi = Math.min(3, best + 0.01);
    const ratio = (Math.sqrt(5) - 1) / 2;
    for (let k = 0; k < 60; k++) {
      const a = hi - ratio * (hi - lo);
      const b = lo + ratio * (hi - lo);
      if (solve(a).sse <= solve(b).sse) hi = b;
      else lo = a;
    }
    n = 0.5 * (lo + hi);
  }
  const { hs, k } = solve(n);
  if (!(k >= 0)) throw new DutyError('The system-curve points fall as flow rises; a system curve must rise with flow, so check the table.');
  const residuals = points.map(([q, h]) => h - (hs + k * q ** n));
  const rms = Math.sqrt(residuals.reduce((s, r) => s + r * r, 0) / residuals.length);
  const maxResidual = Math.max(...residuals.map(Math.abs));
  return {
    static_head_m: hs,
    k,
    exponent: n,
    basis: `least-squares fit of H = Hs + k·Q^n to ${points.length} points${options.static_head_m !== undefined ? ' (Hs held)' : ''}${options.exponent !== undefined ? ' (n held)' : ''}`,
    fit: { rms_m: rms, max_residual_m: maxResidual, points: points.length },
  };
}

/** Linear least squares of h = Hs + k·x with x = (q/qMax)^n (scaled so that x ≤ 1); Hs optionally held. */
function solveLinear(points: ReadonlyArray<readonly [number, number]>, n: number, qMax: number, heldStatic?: number): { hs: number; k: number; sse: number } {
  const xs = points.map(([q]) => (q / qMax) ** n);
  const hs0 = points.map(([, h]) => h);
  let hs: number;
  let kScaled: number;
  if (heldStatic !== undefined) {
    const sxx = xs.reduce((s, x) => s + x * x, 0);
    const sxy = xs.reduce((s, x, i) => s + x * ((hs0[i] as number) - heldStatic), 0);
    hs = heldStatic;
    kScaled = sxx > 0 ? sxy / sxx : 0;
  } else {
    const m = xs.length;
    const mx = xs.reduce((s, x) => s + x, 0) / m;
    const my = hs0.reduce((s, y) => s + y, 0) / m;
    let sxx = 0;
    let sxy = 0;
    xs.forEach((x, i) => {
      sxx += (x - mx) ** 2;
      sxy += (x - mx) * ((hs0[i] as number) - my);
    });
    kScaled = sxx > 0 ? sxy / sxx : 0;
    hs = my - kScaled * mx;
  }
  const sse = xs.reduce((s, x, i) => s + ((hs0[i] as number) - hs - kScaled * x) ** 2, 0);
  return { hs, k: kScaled / qMax ** n, sse };
}
