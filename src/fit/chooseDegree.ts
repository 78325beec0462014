/**
 * Choosing the polynomial degree of a pump curve.
 *
 * Rule: the lowest degree whose RMS residual is within the reading accuracy and whose shape is
 * plausible for the quantity (shape.ts). Degrees run from 1 (2 for efficiency) up to
 * min(6, what the points allow): at least one degree of freedom must remain, so n − 2 for a
 * full polynomial and n − 1 through the origin.
 *
 * An RMS within the accuracy can still hide a systematic misfit that piles up at the ends of
 * the range. So a degree within the accuracy is passed over when the next degree is plausible,
 * improves the fit significantly (partial F-test at 95 % and at least 10 % less RMS) and moves
 * the curve by more than the reading accuracy somewhere on the domain.
 *
 * When no degree reaches the reading accuracy (the points scatter more than claimed, or the
 * curve has a feature a low polynomial cannot follow), the choice is the lowest shape-valid
 * degree after which one more degree stops helping: the next degree either fails a partial
 * F-test at the 95 % level (significance.ts) or lowers the RMS by less than 10 %. If every
 * added degree still helps, the shape-valid degree with the lowest RMS is taken.
 *
 * Points that lie exactly on a drawn line (`exactPoints`: vector paths and their exact
 * crossings) carry no reading noise: what a fit leaves is its own misfit, and a polynomial
 * short of the curve's shape leaves it where the curve ends (a power curve, Q·H/η, is no
 * polynomial: degree 5 left 59 W at the end of an 83 kW curve whose RMS was 13 W). For them
 * the tolerance bounds every point's residual, not only the RMS, and the F-test rules, whose
 * premise is noise, do not hold a lower degree.
 *
 * Efficiency is fitted through the origin (no efficiency at zero flow).
 */
import { PolynomialFit, QUANTITY_WORDS, type CurvePoint, type Quantity } from '../model/curveset.ts';
import { FitError } from './fitError.ts';
import { evaluateUnchecked, linspace } from './polynomial.ts';
import { fitPolynomial, type PolynomialFitResult } from './polyfit.ts';
import { shapeProblems } from './shape.ts';
import { nestedFTest } from './significance.ts';
import { formatFixed, formatPrecision, formatValue, NOT_AVAILABLE } from '../units/format.ts';
import { labelOf } from '../units/convert.ts';
import { QUANTITY_KIND } from '../units/quantityUnits.ts';
import { SI_BASE } from '../units/units.ts';

/** "a", "a and b", "a, b and c". */
function listed(items: readonly string[]): string {
  return items.length <= 1 ? (items[0] ?? '') : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

export interface FitCurveOptions {
  /** Reading accuracy: the RMS residual that is good enough, in the SI unit of the quantity. */
  tolerance: number;
  /** Highest degree to try (default and ceiling 6). */
  maxDegree?: number;
  /**
   * The points lie exactly on the drawn line (read from vector paths or their exact crossings),
   * so `tolerance` is the drawing's precision and bounds the largest residual, not only the RMS.
   */
  exactPoints?: boolean;
}

export interface DegreeCandidate {
  degree: number;
  /** The fit, absent when this degree could not be solved. */
  fit?: PolynomialFitResult;
  withinTolerance: boolean;
  /** Shape problems in words; empty when the shape is plausible. */
  problems: string[];
}

export interface DegreeChoice {
  fit: PolynomialFit;
  /** Every degree tried, lowest first, for display beside the chosen fit. */
  candidates: DegreeCandidate[];
  /** True when the chosen fit meets the reading accuracy. */
  withinTolerance: boolean;
}

const CEILING = 6;
/** Significance level of the partial F-test. */
const F_TEST_LEVEL = 0.05;
/** Smallest relative RMS drop that counts as an improvement. */
const MEANINGFUL_RMS_DROP = 0.1;

const NAMES = QUANTITY_WORDS;
/** The unit a fit's figures are written in: the SI unit of the quantity (efficiency, a fraction, in %). */
const figureUnit = (quantity: Quantity): string => (quantity === 'efficiency' ? '%' : labelOf(SI_BASE[QUANTITY_KIND[quantity]]));

/**
 * A figure of a fit (RMS, tolerance, change) in the quantity's SI unit, to two significant figures
 * with their trailing zeros ("0.30 m"), by the one formatter; "not available" for a non-finite one.
 */
export function formatQuantity(quantity: Quantity, v: number): string {
  if (!Number.isFinite(v)) return NOT_AVAILABLE.text;
  return `${formatPrecision(quantity === 'efficiency' ? v * 100 : v, 2)} ${figureUnit(quantity)}`;
}

function formatFlow(q: number): string {
  return formatValue(q, labelOf('m3/s'), 3);
}

/** Fits `points` at the degree the rule above chooses; returns the record with its reason. */
export function fitCurve(points: readonly CurvePoint[], quantity: Quantity, options: FitCurveOptions): PolynomialFit {
  return chooseDegree(points, quantity, options).fit;
}

/** As fitCurve, and also returns every degree tried. */
export function chooseDegree(points: readonly CurvePoint[], quantity: Quantity, options: FitCurveOptions): DegreeChoice {
  const name = NAMES[quantity];
  const { tolerance } = options;
  validate(points, name, quantity, options);

  const throughOrigin = quantity === 'efficiency';
  const flows = points.map((p) => p[0]);
  const values = points.map((p) => p[1]);
  const distinct = new Set(flows).size;
  const distinctNonZero = new Set(flows.filter((q) => q !== 0)).size;
  const lowest = throughOrigin ? 2 : 1;
  const allowed = throughOrigin ? Math.min(points.length - 1, distinctNonZero) : Math.min(points.length - 2, distinct - 1);
  const highest = Math.min(CEILING, options.maxDegree ?? CEILING, allowed);
  const ceilingWhy =
    highest === allowed
      ? `it is the highest degree the ${points.length} points allow`
      : highest === options.maxDegree
        ? `it is the highest degree asked for`
        : `it is the highest degree tried`;
  if (highest < lowest) {
    throw new FitError(
      options.maxDegree !== undefined && options.maxDegree < lowest
        ? `The highest degree for the ${name} curve must be at least ${lowest}; got ${options.maxDegree}.`
        : `The ${name} curve has ${points.length} points at ${distinct} distinct flows; more distinct flows are needed for a fit.`,
    );
  }

  const fmt = (v: number) => formatQuantity(quantity, v);
  const context = { points, tolerance, formatValue: fmt, formatFlow };
  const exact = options.exactPoints === true;
  const measure = exactMeasure(exact);
  const candidates: DegreeCandidate[] = [];
  for (let degree = lowest; degree <= highest; degree++) {
    let fit: PolynomialFitResult | undefined;
    try {
      fit = fitPolynomial(flows, values, degree, { throughOrigin });
    } catch (error) {
      // A higher degree may be numerically singular on clustered flows; the lower ones stand.
      if (error instanceof FitError && degree > lowest) {
        candidates.push({ degree, withinTolerance: false, problems: ['a singular design matrix'] });
        continue;
      }
      throw error;
    }
    candidates.push({ degree, fit, withinTolerance: measure.of(fit) <= tolerance, problems: shapeProblems(fit, quantity, context) });
  }

  const usable = (c: DegreeCandidate): c is DegreeCandidate & { fit: PolynomialFitResult } => c.fit !== undefined && c.problems.length === 0;
  const valid = candidates.filter(usable);
  // Within the reading accuracy is not enough when the next degree still removes a real,
  // systematic misfit (significant at 95 % and at least 10 % of the RMS): the error at the
  // ends of the range would then exceed the reading accuracy even though the RMS does not.
  const good = valid.find((c) => c.withinTolerance && misfitRemovedByNext(c, candidates, tolerance) === undefined);
  if (good) {
    const simpler = exact ? undefined : statisticallyEquivalentLower(good, valid, tolerance);
    if (simpler) {
      const test = nestedFTest(simpler.fit.ssr, good.fit.ssr, good.fit.parameters - simpler.fit.parameters, good.fit.points - good.fit.parameters);
      return finish(
        simpler,
        candidates,
        false,
        `degree ${simpler.degree}: RMS ${fmt(simpler.fit.rms)}, just above the ${fmt(tolerance)} reading accuracy, but degree ${good.degree} (RMS ${fmt(good.fit.rms)}) is not significantly better (partial F-test p = ${formatFixed(test.pValue, 2)}), so the extra terms would only follow the reading noise.`,
      );
    }
    return finish(good, candidates, true, reasonWithin(good, candidates, tolerance, fmt, measure));
  }
  if (valid.length === 0) {
    const worst = candidates.map((c) => `degree ${c.degree}: ${listed(c.problems)}`).join('; ');
    throw new FitError(
      `No polynomial of degree ${lowest}–${highest} gives the ${name} curve a plausible shape (${worst}); check the captured points for misreadings.`,
    );
  }
  for (const c of valid) {
    const next = candidates.find((n) => n.degree === c.degree + 1);
    if (!next?.fit) {
      const why = next ? `degree ${next.degree} could not be solved` : ceilingWhy;
      return finish(c, candidates, false, `${noneWithin(candidates, tolerance, fmt, measure)}; degree ${c.degree} chosen because ${why} (RMS ${fmt(c.fit.rms)}).`);
    }
    const test = nestedFTest(c.fit.ssr, next.fit.ssr, next.fit.parameters - c.fit.parameters, next.fit.points - next.fit.parameters);
    // Nested fits never raise the RMS; the clamp only hides rounding.
    const drop = c.fit.rms > 0 ? Math.max(0, 1 - next.fit.rms / c.fit.rms) : 0;
    if (test.pValue >= F_TEST_LEVEL || drop < MEANINGFUL_RMS_DROP) {
      const verdict = test.pValue >= F_TEST_LEVEL ? 'not significant at 95 %' : 'less than the 10 % that counts';
      return finish(
        c,
        candidates,
        false,
        `${noneWithin(candidates, tolerance, fmt, measure)}; degree ${c.degree} chosen because degree ${next.degree} lowered the RMS only from ${fmt(c.fit.rms)} to ${fmt(next.fit.rms)} (${Math.round(drop * 100)} %, ${verdict}).`,
      );
    }
  }
  const best = valid.reduce((m, c) => (c.fit.rms < m.fit.rms ? c : m));
  const rejected = candidates.filter((c) => c.degree > best.degree && c.problems.length > 0);
  const note = rejected.length ? ` (${rejected.map((c) => `degree ${c.degree} had ${listed(c.problems)}`).join('; ')})` : '';
  return finish(
    best,
    candidates,
    false,
    `${noneWithin(candidates, tolerance, fmt, measure)}; degree ${best.degree} chosen because it has the lowest RMS (${fmt(best.fit.rms)}) among degrees without spurious wiggles${note}.`,
  );
}

/** Largest |next − this| over the domain, when the next degree is a real, material improvement. */
function misfitRemovedByNext(c: DegreeCandidate & { fit: PolynomialFitResult }, candidates: DegreeCandidate[], tolerance: number): number | undefined {
  const next = candidates.find((n) => n.degree === c.degree + 1);
  if (!next?.fit || next.problems.length > 0) return undefined;
  const dof = next.fit.points - next.fit.parameters;
  if (dof <= 0) return undefined;
  const test = nestedFTest(c.fit.ssr, next.fit.ssr, next.fit.parameters - c.fit.parameters, dof);
  const drop = c.fit.rms > 0 ? Math.max(0, 1 - next.fit.rms / c.fit.rms) : 0;
  if (test.pValue >= F_TEST_LEVEL || drop < MEANINGFUL_RMS_DROP) return undefined;
  const [a, b] = c.fit.domain;
  const nextFit = next.fit;
  const change = Math.max(...linspace(a, b, 201).map((q) => Math.abs(evaluateUnchecked(nextFit, q) - evaluateUnchecked(c.fit, q))));
  return change > tolerance ? change : undefined;
}

/**
 * When the noise is about the size of the reading accuracy, the hard RMS limit can pass over
 * a low degree that misses it by a hair in favour of a high one that merely follows the
 * noise. A lower shape-valid degree within 25 % above the accuracy is preferred when the
 * partial F-test does not find the higher degree significantly better (95 % level).
 */
function statisticallyEquivalentLower(
  good: DegreeCandidate & { fit: PolynomialFitResult },
  valid: (DegreeCandidate & { fit: PolynomialFitResult })[],
  tolerance: number,
): (DegreeCandidate & { fit: PolynomialFitResult }) | undefined {
  const dof = good.fit.points - good.fit.parameters;
  if (dof <= 0) return undefined;
  return valid.find((c) => {
    if (c.degree >= good.degree || c.fit.rms > 1.25 * tolerance) return false;
    const test = nestedFTest(c.fit.ssr, good.fit.ssr, good.fit.parameters - c.fit.parameters, dof);
    return test.pValue >= F_TEST_LEVEL;
  });
}

function finish(chosen: DegreeCandidate & { fit: PolynomialFitResult }, candidates: DegreeCandidate[], withinTolerance: boolean, reason: string): DegreeChoice {
  const f = chosen.fit;
  const fit = PolynomialFit.parse({
    kind: 'polynomial',
    flow_scale: f.flow_scale,
    coefficients: f.coefficients,
    domain: f.domain,
    degree: f.degree,
    through_origin: f.through_origin,
    rms: f.rms,
    max_residual: f.max_residual,
    condition: f.condition,
    reason,
  });
  return { fit, candidates, withinTolerance };
}

/** What the tolerance bounds: the RMS of read points, or the largest residual of exact ones; and its words. */
interface Measure {
  of(fit: Pick<PolynomialFitResult, 'rms' | 'max_residual'>): number;
  /** "RMS", "largest residual". */
  name: string;
  /** "reading accuracy", "drawing precision". */
  accuracy: string;
}

function exactMeasure(exact: boolean): Measure {
  return exact
    ? { of: (f) => f.max_residual, name: 'largest residual', accuracy: 'drawing precision' }
    : { of: (f) => f.rms, name: 'RMS', accuracy: 'reading accuracy' };
}

function reasonWithin(chosen: DegreeCandidate & { fit: PolynomialFitResult }, candidates: DegreeCandidate[], tolerance: number, fmt: (v: number) => string, measure: Measure): string {
  const parts = [`degree ${chosen.degree}: ${measure.name} ${fmt(measure.of(chosen.fit))} within the ${fmt(tolerance)} ${measure.accuracy}`];
  for (const c of candidates.filter((c) => c.degree < chosen.degree).reverse()) {
    if (!c.fit) parts.push(`degree ${c.degree} could not be solved`);
    else if (!c.withinTolerance && c.degree === chosen.degree - 1) parts.push(`degree ${c.degree} left ${measure.name === 'RMS' ? '' : `a ${measure.name} of `}${fmt(measure.of(c.fit))}`);
    else if (c.withinTolerance && c.problems.length > 0) parts.push(`degree ${c.degree} (${measure.name} ${fmt(measure.of(c.fit))}) had ${listed(c.problems)}`);
    else if (c.withinTolerance) {
      const change = misfitRemovedByNext({ ...c, fit: c.fit }, candidates, tolerance) ?? NaN;
      parts.push(`degree ${c.degree} (${measure.name} ${fmt(measure.of(c.fit))}) left a systematic misfit: degree ${c.degree + 1} improved it significantly and moved the curve by up to ${fmt(change)}`);
    }
  }
  return `${parts.join('; ')}.`;
}

function noneWithin(candidates: DegreeCandidate[], tolerance: number, fmt: (v: number) => string, measure: Measure): string {
  const fitted = candidates.filter((c): c is DegreeCandidate & { fit: PolynomialFitResult } => c.fit !== undefined);
  const withinButImplausible = fitted.filter((c) => c.withinTolerance);
  if (withinButImplausible.length > 0) {
    const detail = withinButImplausible.map((c) => `degree ${c.degree} reached ${measure.name} ${fmt(measure.of(c.fit))} but had ${listed(c.problems)}`).join('; ');
    return `no degree within the ${fmt(tolerance)} ${measure.accuracy} has a plausible shape (${detail})`;
  }
  const best = fitted.reduce((m, c) => (measure.of(c.fit) < measure.of(m.fit) ? c : m));
  return `no degree within the ${fmt(tolerance)} ${measure.accuracy} (best ${measure.name} ${fmt(measure.of(best.fit))} at degree ${best.degree})`;
}

function validate(points: readonly CurvePoint[], name: string, quantity: Quantity, options: FitCurveOptions): void {
  const { tolerance, maxDegree } = options;
  if (!Number.isFinite(tolerance) || tolerance <= 0) {
    throw new FitError(`The reading accuracy for the ${name} curve must be a positive number in ${quantity === 'efficiency' ? 'fractions of one' : figureUnit(quantity)}; got ${tolerance}.`);
  }
  if (maxDegree !== undefined && !Number.isInteger(maxDegree)) {
    throw new FitError(`The highest degree for the ${name} curve must be a whole number; got ${maxDegree}.`);
  }
  points.forEach(([q, y], i) => {
    if (!Number.isFinite(q)) throw new FitError(`Point ${i + 1} of the ${name} curve has a flow of ${q}, not a finite number; correct or remove it.`);
    if (!Number.isFinite(y)) throw new FitError(`Point ${i + 1} of the ${name} curve has a value of ${y}, not a finite number; correct or remove it.`);
    if (q < 0) throw new FitError(`Point ${i + 1} of the ${name} curve has a negative flow (${q} m³/s); flows must be zero or positive.`);
  });
  if (points.length < 3) {
    throw new FitError(`The ${name} curve has ${points.length} ${points.length === 1 ? 'point' : 'points'}; at least 3 are needed for a fit.`);
  }
  const distinct = new Set(points.map((p) => p[0])).size;
  if (distinct < 3) {
    throw new FitError(`The ${name} curve has ${points.length} points but only ${distinct} distinct flows; at least 3 are needed for a fit.`);
  }
}
