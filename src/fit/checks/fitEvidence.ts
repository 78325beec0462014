/**
 * Findings of the build about a fit and the points it was fitted to, naming each point as
 * the user knows it (a row of the points table, a trace of the take-off):
 * - `fit.point-off` (fail): points the curve misses by far more than the reading accuracy,
 *   judged against the curve through the other points (pointEvidence.ts);
 * - `fit.misses-accuracy` (warn / fail): the fit's RMS residual is well above the reading
 *   accuracy it was fitted to;
 * - `fit.shape-fallback` (warn): the fit misses the reading accuracy (by less than the
 *   `fit.misses-accuracy` margin) only because a higher degree that met it had an implausible
 *   shape (shape.ts): a real fallback to a coarser curve is said, never silent.
 */
import { QUANTITY_WORDS, type CurvePoint, type Finding, type Member, type PolynomialFit, type Quantity } from '../../model/curveset.ts';
import type { Display } from './display.ts';
import { makeFinding } from './finding.ts';
import { fitMissesAccuracy, MISS_FAIL, MISS_WARN, OFF_CURVE_FACTOR, pointsOffTheirCurve } from './pointEvidence.ts';

export interface FitEvidenceInput {
  member: Pick<Member, 'diameter_m' | 'speed_rpm' | 'label'>;
  quantity: Quantity;
  /** The points as fitted (sorted by flow), SI. */
  points: readonly CurvePoint[];
  fit: PolynomialFit;
  /** Reading accuracy the fit was chosen for, SI. */
  tolerance: number;
  /** Where each point came from, in the order of `points`. */
  sources?: readonly { text: string; trace?: string }[] | undefined;
  /** The lowest degree above the chosen one that met the reading accuracy but was refused for its shape. */
  refusedForShape?: { degree: number; rms: number; problems: readonly string[] } | undefined;
}

const NAMES = QUANTITY_WORDS;
/** Points named in one finding; the rest are counted. */
const NAMED = 3;

/** A value of the quantity in the set's display units. */
export function valueText(show: Display, quantity: Quantity, si: number): string {
  switch (quantity) {
    case 'head':
      return show.head(si);
    case 'npshr':
      return show.npsh(si);
    case 'power':
      return show.power(si);
    case 'efficiency':
      return show.efficiency(si);
  }
}

/** A difference of the quantity: efficiency in points, the others in their display unit. */
function differenceText(show: Display, quantity: Quantity, si: number): string {
  return quantity === 'efficiency' ? `${show.efficiency(Math.abs(si)).replace(' %', '')} points` : valueText(show, quantity, Math.abs(si));
}

function times(ratio: number): string {
  return ratio >= 10 ? `${Math.round(ratio)}` : ratio.toFixed(1);
}

export function fitEvidenceFindings(input: FitEvidenceInput, show: Display): Finding[] {
  const { member, quantity, points, fit, tolerance, sources } = input;
  const name = `${show.member(member)} ${NAMES[quantity]}`;
  const accuracy = differenceText(show, quantity, tolerance);
  const out: Finding[] = [];

  const off = pointsOffTheirCurve(points, fit, quantity, tolerance);
  if (off.length > 0) {
    const describe = (i: number) => {
      const miss = off[i] as (typeof off)[number];
      const where = sources?.[miss.index]?.text;
      const at = `${show.flow(miss.flow)}, ${valueText(show, quantity, miss.value)}`;
      return `${where ? `${where} (${at})` : `the point at ${at}`} by ${differenceText(show, quantity, miss.miss)}, ${times(Math.abs(miss.miss) / tolerance)} times the ${accuracy} reading accuracy`;
    };
    const named = off.slice(0, NAMED).map((_, i) => describe(i));
    const more = off.length > NAMED ? ` and ${off.length - NAMED} more` : '';
    const worst = off[0] as (typeof off)[number];
    const trace = sources?.[worst.index]?.trace;
    const fromTable = sources?.[worst.index]?.text.startsWith('line') ?? false;
    out.push(
      makeFinding({
        code: 'fit.point-off',
        severity: 'fail',
        member,
        quantity,
        ...(trace ? { trace } : {}),
        message:
          `The ${name} curve through the other points misses ${named.join('; ')}${more}. ` +
          (fromTable
            ? 'Check that row for a typo: swapped flow and value, a wrong diameter or quantity, a misplaced decimal point.'
            : 'Check that point on the sheet: a guide on another line, a label or a grid line caught by the trace.'),
        method: `Deletion residual against the curve fitted without the point, over a robust scale max(1.4826·MAD, reading accuracy); fail beyond ${OFF_CURVE_FACTOR} (Iglewicz & Hoaglin 1993, widened)`,
        figures: {
          points_off: off.length,
          worst_flow_m3s: worst.flow,
          worst_value: worst.value,
          worst_expected: worst.expected,
          worst_miss: worst.miss,
          reading_accuracy: tolerance,
        },
      }),
    );
  }

  const severity = fitMissesAccuracy(fit, tolerance);
  const refused = input.refusedForShape;
  if (!severity && refused && fit.rms > tolerance) {
    out.push(
      makeFinding({
        code: 'fit.shape-fallback',
        severity: 'warn',
        member,
        quantity,
        message:
          `The ${name} curve is fitted at degree ${fit.degree}, missing its points by ${differenceText(show, quantity, fit.rms)} RMS, above the ${accuracy} reading accuracy: ` +
          `degree ${refused.degree} met it (${differenceText(show, quantity, refused.rms)} RMS) but had ${refused.problems.join(' and ')}. ` +
          'Check the points for a bump where the trace caught another line; if the sheet really draws that shape, read more points along it.',
        method: 'Lowest plausible degree within the reading accuracy (shape rules of src/fit/shape.ts; common practice)',
        figures: { degree: fit.degree, rms: fit.rms, refused_degree: refused.degree, refused_rms: refused.rms, reading_accuracy: tolerance },
      }),
    );
  }
  if (severity) {
    out.push(
      makeFinding({
        code: 'fit.misses-accuracy',
        severity,
        member,
        quantity,
        message:
          `The ${name} fit misses its ${points.length} points by ${differenceText(show, quantity, fit.rms)} RMS (largest ${differenceText(show, quantity, fit.max_residual)}), ` +
          `${times(fit.rms / tolerance)} times the ${accuracy} reading accuracy it was fitted to. ` +
          (off.length > 0
            ? 'The points it misses by far (named in the finding on its points) pull it off; correct them and build again.'
            : 'The points do not lie on one smooth pump curve: look for a trace that jumped to another line, two curves given the same diameter, or points read off the wrong axis.'),
        method: `RMS residual against the reading accuracy; warn beyond ${MISS_WARN}×, fail beyond ${MISS_FAIL}× (common practice)`,
        figures: { rms: fit.rms, max_residual: fit.max_residual, reading_accuracy: tolerance, points: points.length },
      }),
    );
  }
  return out;
}
