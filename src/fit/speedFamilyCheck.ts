/**
 * Checks that belong to a speed family only (one impeller drawn at several speeds).
 *
 * The speed affinity law — Q ∝ n, H ∝ n², P ∝ n³, η about constant along the parabolas
 * H ∝ Q² — holds for one geometrically unchanged pump (Karassik et al., Pump Handbook,
 * 4th ed., "Affinity laws"; Lobanoff & Ross, Centrifugal Pumps: Design and Application,
 * 2nd ed.). It is close to exact within about ±20 % of speed; over wider steps the efficiency
 * drifts (Reynolds-number and clearance effects grow at low speed) and the comparison of two
 * drawn curves by the law is less exact, so a wider step between neighbouring drawn speeds
 * gets a warning rather than silence.
 */
import type { CurveSet, Finding, Member, PolynomialFit } from '../model/curveset.ts';
import { evaluateUnchecked, inDomain } from './polynomial.ts';
import { makeFinding } from './checks/finding.ts';

/** Neighbouring drawn speeds closer than this ratio (slower / faster) are compared by the law as exact (±20 %, Karassik; Lobanoff & Ross). */
export const SPEED_LAW_BAND = 0.8;
export const SPEED_METHOD = 'Affinity law for speed (Q ∝ n, H ∝ n², P ∝ n³; Karassik, Pump Handbook; Lobanoff & Ross, Centrifugal Pumps), close to exact within about ±20 % of speed';

/** Warns for each step between neighbouring drawn speeds wider than ±20 %. Nothing for a diameter family. */
export function speedSpanFindings(set: Pick<CurveSet, 'members' | 'family'>): Finding[] {
  if (set.family !== 'speed') return [];
  const speeds = [...new Set(set.members.filter((m) => m.curves.head?.fit).map((m) => m.speed_rpm))].sort((a, b) => b - a);
  const findings: Finding[] = [];
  for (let i = 1; i < speeds.length; i++) {
    const fast = speeds[i - 1] as number;
    const slow = speeds[i] as number;
    const ratio = slow / fast;
    if (ratio >= SPEED_LAW_BAND) continue;
    findings.push(
      makeFinding({
        code: 'affinity.speed-span',
        severity: 'warn',
        member: { speed_rpm: slow },
        quantity: 'head',
        message:
          `The drawn speeds ${Math.round(fast)} rpm and ${Math.round(slow)} rpm are ${(100 * (1 - ratio)).toFixed(0)} % apart, more than the ±20 % within which the speed affinity law is close to exact; ` +
          'the comparison of these two curves, and any duty between them, is less exact — prefer the drawn curves near the duty.',
        method: SPEED_METHOD,
        figures: { speed_ratio: ratio },
      }),
    );
  }
  return findings;
}

/**
 * Warn limits for one drawn speed's curve against its neighbours scaled by the speed law.
 * The curves of one impeller at several speeds are drawn from one test scaled by the law, or
 * tested at each speed within ±20 % where the law is close to exact (Karassik, Pump Handbook),
 * so two neighbours differ by little more than the reading of two lines: about 1 % of the axis
 * span each on a scan (a stroke is a pixel or two at 200–300 dpi; common practice).
 * - efficiency 3 % of its value (2 points at 70 %): two readings of 1 point each, plus the
 *   efficiency drift of up to about a point over a 20 % speed step (from memory);
 * - power 3 % of its largest value: two readings of about 1.2 % of the largest value (1 % of a
 *   span drawn about 20 % above the curve), plus that efficiency drift;
 * - NPSH3 8 % of its largest value, wider because the n² law for NPSH3 is only approximate:
 *   exponents between about 1.7 and 2.3 are found in tests, ±6 % over a 20 % step (Karassik,
 *   Pump Handbook; from memory).
 * Only warnings: the law itself is not exact, and the curve may be drawn that way. Before, these
 * were the ISO 9906 grade 2B bands (5 % / 8 % / 15 %), which are for two tests of one pump and let
 * a misread line of 3–5 % of span through.
 */
export const SPEED_CURVE_WARN: Record<'efficiency' | 'power' | 'npshr', number> = { efficiency: 0.03, power: 0.03, npshr: 0.08 };
const EXPONENT: Record<'efficiency' | 'power' | 'npshr', number> = { efficiency: 0, power: 3, npshr: 2 };
const WHAT: Record<'efficiency' | 'power' | 'npshr', string> = { efficiency: 'efficiency', power: 'power', npshr: 'NPSH3' };
/** Matching flows over this part of the slower curve's drawn range. */
const SPEED_FRACTIONS = [0.15, 0.25, 0.35, 0.45, 0.55, 0.65, 0.75, 0.85, 0.95];

/**
 * Largest deviation of member k's curve from member j's scaled to k's speed:
 * y_k(Q) ≈ (n_k/n_j)^e · y_j(Q·n_j/n_k), e = 0 (η), 3 (P), 2 (NPSH3), as a fraction of k's own
 * value (η) or of its largest value over the compared flows (P, NPSH3). Undefined when the
 * two curves share no flows after scaling.
 */
export function speedCurveDeviation(k: Member, j: Member, quantity: 'efficiency' | 'power' | 'npshr'): number | undefined {
  const fk = k.curves[quantity]?.fit;
  const fj = j.curves[quantity]?.fit;
  if (!fk || !fj) return undefined;
  const r = k.speed_rpm / j.speed_rpm;
  const [lo, hi] = fk.domain;
  const pairs: [number, number][] = [];
  for (const f of SPEED_FRACTIONS) {
    const q = lo + f * (hi - lo);
    if (!inDomain(fj, q / r)) continue;
    pairs.push([evaluateUnchecked(fk, q), r ** EXPONENT[quantity] * evaluateUnchecked(fj, q / r)]);
  }
  if (pairs.length < 3) return undefined;
  const scale = Math.max(...pairs.map((p) => Math.abs(p[0])));
  if (!(scale > 0)) return undefined;
  return Math.max(...pairs.map(([drawn, predicted]) => Math.abs(predicted - drawn) / (quantity === 'efficiency' ? Math.max(Math.abs(drawn), 0.05 * scale) : scale)));
}

/**
 * Efficiency, power and NPSH3 of each drawn speed against its two nearest drawn speeds, scaled by
 * the speed law. A curve is judged by the BETTER of its two agreements (an innocent curve always
 * has one good neighbour), and one that agrees with neither beyond the limit is named with a
 * warning: typically a line read off a neighbour where the curves bunch. Nothing for a diameter family.
 */
export function speedCurveFindings(set: Pick<CurveSet, 'members' | 'family'>): Finding[] {
  if (set.family !== 'speed') return [];
  const findings: Finding[] = [];
  for (const quantity of ['efficiency', 'power', 'npshr'] as const) {
    const drawn = set.members.filter((m) => m.curves[quantity]?.fit).sort((a, b) => a.speed_rpm - b.speed_rpm);
    if (drawn.length < 3) continue;
    drawn.forEach((m, i) => {
      // The two nearest drawn speeds (both on one side for the slowest and the fastest), as the head check does.
      const devs = nearestSpeeds(drawn, i).map((x) => speedCurveDeviation(m, x, quantity)).filter((d): d is number => d !== undefined);
      if (devs.length === 0) return;
      const best = Math.min(...devs);
      if (best <= SPEED_CURVE_WARN[quantity]) return;
      const share = `${(100 * best).toFixed(1)} %`;
      findings.push(
        makeFinding({
          code: 'affinity.speed-curve',
          severity: 'warn',
          member: { speed_rpm: m.speed_rpm },
          quantity,
          message:
            `The ${Math.round(m.speed_rpm)} rpm ${WHAT[quantity]} curve differs by up to ${share} from its neighbouring speeds scaled by the speed affinity law, ` +
            `more than the ${(100 * SPEED_CURVE_WARN[quantity]).toFixed(0)} % two readings of one pump may differ; check that the trace follows its own line where the curves bunch, and its speed label.`,
          method: SPEED_METHOD,
          figures: { deviation: best },
        }),
      );
    });
  }
  return findings;
}

/**
 * Largest share of the flow range a drawn speed's curve may lack against a neighbouring speed's
 * range scaled by Q ∝ n. A maker draws the curves of one impeller at several speeds over
 * corresponding ranges (the end of curve and the minimum flow follow Q ∝ n; Karassik, Pump
 * Handbook), so a curve traced over much less than its neighbours' scaled range was cut short:
 * the line was lost, or ran into a neighbour where the curves bunch. 10 % of the range is about
 * five times the reading accuracy of a scan's line end (0.5–1 % of the axis, pixel-sized strokes;
 * common practice) plus the small spread of where a person stops a trace, so a whole trace never
 * reaches it; a curve cut shorter cannot be read where it is missing, and the check would otherwise
 * stay silent because every comparison is made over the drawn part only. The same share applies
 * to the upper end of a speed's efficiency, power and NPSH3 curve against that speed's own head
 * curve: a sheet draws all curves of one speed to the same end of curve (common practice), and
 * neighbours cut short together (curves that bunch toward their ends) would not show otherwise.
 */
export const SPEED_RANGE_SHORT = 0.1;
const RANGE_WHAT: Record<'head' | 'efficiency' | 'power' | 'npshr', string> = { head: 'head', ...WHAT };

/**
 * Share of the flow range of member j, scaled to member k's speed by Q ∝ n, that k's curve of
 * `quantity` does not cover (0 when it covers it all); undefined when either curve is missing.
 */
export function speedRangeShortfall(k: Member, j: Member, quantity: 'head' | 'efficiency' | 'power' | 'npshr'): number | undefined {
  const fk = k.curves[quantity]?.fit;
  const fj = j.curves[quantity]?.fit;
  if (!fk || !fj) return undefined;
  const r = k.speed_rpm / j.speed_rpm;
  const lo = r * fj.domain[0];
  const hi = r * fj.domain[1];
  if (!(hi > lo)) return undefined;
  return (Math.max(0, fk.domain[0] - lo) + Math.max(0, hi - fk.domain[1])) / (hi - lo);
}

/** Share of member m's head-curve flow range beyond the upper end of `fit` (0 when it reaches the head curve's end or m has no head curve). */
function ownHeadShortfall(m: Member, fit: PolynomialFit): number {
  const head = m.curves.head?.fit;
  if (!head || !(head.domain[1] > head.domain[0])) return 0;
  return Math.max(0, head.domain[1] - fit.domain[1]) / (head.domain[1] - head.domain[0]);
}

/** The two nearest drawn speeds of `drawn[i]` (both on one side for the slowest and the fastest). */
function nearestSpeeds(drawn: readonly Member[], i: number): Member[] {
  const m = drawn[i] as Member;
  return drawn
    .filter((_, k) => k !== i)
    .sort((x, y) => Math.abs(Math.log(x.speed_rpm / m.speed_rpm)) - Math.abs(Math.log(y.speed_rpm / m.speed_rpm)))
    .slice(0, 2);
}

/**
 * Each drawn speed's head, efficiency, power and NPSH3 curve against the flow ranges of its two
 * nearest drawn speeds scaled by Q ∝ n. A curve that lacks more than `SPEED_RANGE_SHORT` of BOTH
 * neighbours' scaled ranges (judged by the better one, so a short neighbour does not blame an
 * innocent curve) is named with a warning: nothing was read where it is missing, and a value
 * there would be an extrapolation. Nothing for a diameter family.
 *
 * A curve read only from iso-lines (`drawn_as: "iso-lines"`) is neither judged nor a neighbour:
 * its points end at the last iso-line that crosses the head curve, wherever the end of curve is,
 * so its range says nothing of a trace cut short (the iso-crossing audit of the take-off counts
 * the crossings an iso-line missed instead). A curve of unknown origin is judged as a curve.
 */
export function speedRangeFindings(set: Pick<CurveSet, 'members' | 'family'>): Finding[] {
  if (set.family !== 'speed') return [];
  const findings: Finding[] = [];
  for (const quantity of ['head', 'efficiency', 'power', 'npshr'] as const) {
    const drawn = set.members.filter((m) => m.curves[quantity]?.fit && m.curves[quantity]?.drawn_as !== 'iso-lines').sort((a, b) => a.speed_rpm - b.speed_rpm);
    if (drawn.length < 2) continue;
    drawn.forEach((m, i) => {
      const shorts = nearestSpeeds(drawn, i)
        .map((x) => speedRangeShortfall(m, x, quantity))
        .filter((d): d is number => d !== undefined);
      const fit = m.curves[quantity]?.fit as PolynomialFit;
      const curve = `The ${Math.round(m.speed_rpm)} rpm ${RANGE_WHAT[quantity]} curve`;
      const over = overrunFinding(set.members, m, quantity, fit, curve);
      if (over) findings.push(over);
      const best = shorts.length ? Math.min(...shorts) : 0;
      const own = quantity === 'head' ? 0 : ownHeadShortfall(m, fit);
      if (best <= SPEED_RANGE_SHORT && own <= SPEED_RANGE_SHORT) return;
      const why =
        own > best
          ? `${curve} ends ${(100 * own).toFixed(0)} % of the head curve's flow range before the ${Math.round(m.speed_rpm)} rpm head curve does, where a sheet draws both to the same end of curve: it was likely cut short`
          : `${curve} covers ${(100 * (1 - best)).toFixed(0)} % or less of the flow range its neighbouring speeds give it by the speed affinity law (Q ∝ n): it was cut short`;
      findings.push(
        makeFinding({
          code: 'affinity.speed-range',
          severity: 'warn',
          member: { speed_rpm: m.speed_rpm },
          quantity,
          message: `${why}, so nothing was read where it is missing; trace the line to its drawn ends and check that the trace follows its own line where the curves bunch.`,
          method: SPEED_METHOD,
          figures: { missing_share: Math.max(own, best), flow_from: fit.domain[0], flow_to: fit.domain[1] },
        }),
      );
    });
  }
  return findings;
}

/**
 * The other way round: a curve that runs on past the end of curve the rest of the family gives
 * it. Every curve's end is taken to the rated speed by Q ∝ n; a sheet draws all curves of one
 * impeller to corresponding ends (common practice; Karassik, Pump Handbook), so a curve whose
 * end lies more than `SPEED_RANGE_SHORT` beyond the FARTHEST end of all the other curves (any
 * quantity, any speed) ran on past its own. The farthest other end is the reference so that
 * curves cut short elsewhere never make a whole curve look long. On a scan the follower then ran
 * into another line where the curves cross or bunch (efficiency curves of a speed family cross
 * near their peaks), and the points beyond the end belong to another speed.
 */
function overrunFinding(members: readonly Member[], m: Member, quantity: 'head' | 'efficiency' | 'power' | 'npshr', fit: PolynomialFit, curve: string): Finding | undefined {
  const rated = Math.max(...members.map((x) => x.speed_rpm));
  const endAtRated = (x: Member, f: PolynomialFit) => (f.domain[1] * rated) / x.speed_rpm;
  let reference = 0;
  for (const x of members) {
    for (const q of ['head', 'efficiency', 'power', 'npshr'] as const) {
      const f = x.curves[q]?.fit;
      if (f && !(x === m && q === quantity)) reference = Math.max(reference, endAtRated(x, f));
    }
  }
  if (!(reference > 0)) return undefined;
  const share = endAtRated(m, fit) / reference - 1;
  if (share <= SPEED_RANGE_SHORT) return undefined;
  return makeFinding({
    code: 'affinity.speed-overrun',
    severity: 'warn',
    member: { speed_rpm: m.speed_rpm },
    quantity,
    message:
      `${curve} runs ${(100 * share).toFixed(0)} % past the farthest end of curve any other curve of the family reaches, scaled to its speed by the speed affinity law (Q ∝ n): ` +
      'the trace likely ran on into another line where the curves cross or bunch; check where it ends, and end it on its own line.',
    method: SPEED_METHOD,
    figures: { overrun_share: share, flow_to: fit.domain[1] },
  });
}
