/**
 * Least-squares polynomial in a scaled abscissa:
 *   y(x) = Σ c_i · (x / s)^i,   s = max |x|,
 * the convention of `PolynomialFit` in model/curveset.ts (`flow_scale` = s).
 *
 * Scaling keeps every column of the design matrix within [−1, 1], so the condition number
 * depends on the spread of the points and the degree, not on the units of x. A fit in m³/s
 * (flows near 0.05) and one in m³/h (flows near 200) produce the same scaled coefficients.
 * The system is solved by QR (leastSquares.ts), never by the normal equations.
 */
import type { PolynomialFit } from '../model/curveset.ts';
import { FitError } from './fitError.ts';
import { solveLeastSquares } from './leastSquares.ts';
import { evaluateUnchecked } from './polynomial.ts';

export { FitError } from './fitError.ts';

export interface PolynomialFitOptions {
  /** Hold the constant term at zero, so y(0) = 0 (efficiency at zero flow). */
  throughOrigin?: boolean;
}

/** A fitted polynomial with its diagnostics; the fields shared with `PolynomialFit` mean the same. */
export interface PolynomialFitResult extends Omit<PolynomialFit, 'reason'> {
  /** Residual standard deviation √(SSR / (n − p)), p = number of free coefficients; NaN when n = p. */
  residual_sd: number;
  /** Standard error of each scaled coefficient; 0 for a constant held at zero, NaN when n = p. */
  standard_errors: number[];
  /** y − fit, in the order of the points. */
  residuals: number[];
  /** Sum of squared residuals. */
  ssr: number;
  /** Number of points fitted. */
  points: number;
  /** Number of free coefficients (degree + 1, or degree when through the origin). */
  parameters: number;
}

/**
 * Fits a polynomial of the given degree to (xs, ys) by least squares.
 * `rms` is √(SSR / n); `max_residual` is the largest |y − fit|; `condition` is the 2-norm
 * condition number of the scaled design matrix.
 * Throws FitError for mismatched or non-finite input and for too few (distinct) points.
 */
export function fitPolynomial(xs: readonly number[], ys: readonly number[], degree: number, options: PolynomialFitOptions = {}): PolynomialFitResult {
  const throughOrigin = options.throughOrigin ?? false;
  validate(xs, ys, degree, throughOrigin);

  const maxAbs = xs.reduce((m, x) => Math.max(m, Math.abs(x)), 0);
  const scale = maxAbs > 0 ? maxAbs : 1;
  const firstPower = throughOrigin ? 1 : 0;
  const design = xs.map((x) => {
    const t = x / scale;
    const row: number[] = [];
    for (let i = firstPower; i <= degree; i++) row.push(t ** i);
    return row;
  });
  const ls = solveLeastSquares(design, ys);

  const coefficients = throughOrigin ? [0, ...ls.solution] : ls.solution;
  const standardErrors = throughOrigin ? [0, ...ls.standardErrors] : ls.standardErrors;
  const maxResidual = ls.residuals.reduce((m, e) => Math.max(m, Math.abs(e)), 0);
  return {
    kind: 'polynomial',
    flow_scale: scale,
    coefficients,
    domain: [Math.min(...xs), Math.max(...xs)],
    degree,
    through_origin: throughOrigin,
    rms: Math.sqrt(ls.ssr / xs.length),
    max_residual: maxResidual,
    condition: ls.condition,
    residual_sd: ls.residualSd,
    standard_errors: standardErrors,
    residuals: ls.residuals,
    ssr: ls.ssr,
    points: xs.length,
    parameters: ls.columns,
  };
}

/**
 * Coefficients of plain powers of x: y = Σ a_i x^i with a_i = c_i / s^i.
 * For reading a fit by eye and for comparing with published coefficients; evaluate with the
 * scaled coefficients, which are better conditioned.
 */
export function monomialCoefficients(fit: Pick<PolynomialFit, 'coefficients' | 'flow_scale'>): number[] {
  return fit.coefficients.map((c, i) => c / fit.flow_scale ** i);
}

/** Standard errors of the plain-power coefficients, σ(a_i) = σ(c_i) / s^i. */
export function monomialStandardErrors(fit: Pick<PolynomialFitResult, 'standard_errors' | 'flow_scale'>): number[] {
  return fit.standard_errors.map((e, i) => e / fit.flow_scale ** i);
}

/** The fit at each x (scaled evaluation). */
export function fittedValues(fit: Pick<PolynomialFit, 'coefficients' | 'flow_scale'>, xs: readonly number[]): number[] {
  return xs.map((x) => evaluateUnchecked(fit, x));
}

function validate(xs: readonly number[], ys: readonly number[], degree: number, throughOrigin: boolean): void {
  const lowest = throughOrigin ? 1 : 0;
  if (!Number.isInteger(degree) || degree < lowest) {
    throw new FitError(`The degree must be a whole number of at least ${lowest}${throughOrigin ? ' for a fit through the origin' : ''}; got ${degree}.`);
  }
  if (xs.length !== ys.length) {
    throw new FitError(`There are ${xs.length} abscissae but ${ys.length} values; give one value per abscissa.`);
  }
  xs.forEach((x, i) => {
    if (!Number.isFinite(x)) throw new FitError(`Point ${i + 1} has an abscissa of ${x}, not a finite number; correct or remove that point.`);
  });
  ys.forEach((y, i) => {
    if (!Number.isFinite(y)) throw new FitError(`Point ${i + 1} has a value of ${y}, not a finite number; correct or remove that point.`);
  });
  const needed = throughOrigin ? degree : degree + 1;
  const what = `A degree-${degree} fit${throughOrigin ? ' through the origin' : ''}`;
  if (xs.length < needed) {
    throw new FitError(`${what} needs at least ${needed} points; got ${xs.length}.`);
  }
  // Through the origin the constant column is absent, so a point at x = 0 adds no information.
  const distinct = new Set(xs.filter((x) => !throughOrigin || x !== 0)).size;
  if (distinct < needed) {
    throw new FitError(
      `${what} needs at least ${needed} distinct ${throughOrigin ? 'non-zero ' : ''}abscissae; the ${xs.length} points have only ${distinct}.`,
    );
  }
}
