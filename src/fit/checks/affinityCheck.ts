/**
 * Affinity consistency of a family: each member's head curve is predicted from its
 * nearest neighbours by the affinity law (Q ∝ D, H ∝ D² for trims at constant speed; Q ∝ n,
 * H ∝ n² for speeds) and compared at matching points.
 *
 * Thresholds (judged on the median head deviation against the better-agreeing neighbour):
 * - warn above 3 %: two readings of one pump may disagree by the ISO 9906 grade 2B head
 *   band (±5 %) only when one of them sits at its edge; a 3 % systematic offset is more
 *   than reading error (≈ 0.5 %) plus the usual shortfall of trimmed curves within the
 *   normal trim range, so it deserves a look;
 * - fail above 6 %: beyond the whole 2B head band plus reading error. A deviation this large
 *   does not come from trim behaviour; it is almost always a mislabelled diameter or a
 *   curve read off the wrong line. A diameter label off by 5 % gives about 10 %.
 * (ISO 9906:2012 grade bands as listed in REFERENCES.md, from memory.)
 *
 * To single out the curve that disagrees rather than blame an innocent neighbour, each
 * member is compared with its two nearest members, and scored by the BETTER of the two
 * agreements: an innocent member always has one good neighbour, a wrong one has none.
 * The worst member beyond the fail limit is flagged, set aside, and the rest re-judged.
 */
import type { CurveSet, Finding, Member, PolynomialFit } from '../../model/curveset.ts';
import { parabolaCrossing } from '../affinity.ts';
import { evaluateUnchecked, inDomain } from '../polynomial.ts';
import type { Display } from './display.ts';
import { makeFinding } from './finding.ts';
import { SPEED_METHOD, speedCurveFindings, speedRangeFindings, speedSpanFindings } from '../speedFamilyCheck.ts';

export const AFFINITY_WARN = 0.03;
export const AFFINITY_FAIL = 0.06;
const METHOD_TRIM = 'Affinity law for impeller trim (Q ∝ D, H ∝ D²; Karassik, Pump Handbook); limits from ISO 9906 grade 2B head band';
const METHOD_SPEED = `${SPEED_METHOD}; limits from ISO 9906 grade 2B head band`;
/** Matching points are taken over this part of each curve's flow range. */
const FRACTIONS = [0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9];

export interface PairComparison {
  /** Median of (predicted − drawn)/drawn head at matching flows. */
  headDeviation: number;
  maxHeadDeviation: number;
  /** Median of (predicted − drawn)/drawn flow along the affinity parabolas. */
  flowDeviation: number;
  /** Median exponent m in H_k/H_j = (size_k/size_j)^m implied by the two curves (the law says 2). */
  impliedExponent: number;
  /** Median size of member k implied by member j's curve and label. */
  impliedSize: number;
  points: number;
}

interface Sized {
  member: Member;
  size: number;
  fit: PolynomialFit;
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? (s[m] as number) : 0.5 * ((s[m - 1] as number) + (s[m] as number));
};

/** Predicts member k's head curve from member j and compares them. */
export function comparePair(k: Sized, j: Sized): PairComparison | undefined {
  const r = k.size / j.size;
  const head: number[] = [];
  const flow: number[] = [];
  const exponent: number[] = [];
  const implied: number[] = [];
  const [lo, hi] = k.fit.domain;
  for (const f of FRACTIONS) {
    const q = lo + f * (hi - lo);
    if (q <= 0) continue;
    const h = evaluateUnchecked(k.fit, q);
    if (!(h > 0)) continue;
    if (inDomain(j.fit, q / r)) head.push((r * r * evaluateUnchecked(j.fit, q / r) - h) / h);
    const qx = parabolaCrossing(j.fit, h / (q * q));
    if (qx !== undefined && qx > 0) {
      flow.push((qx * r - q) / q);
      const hx = evaluateUnchecked(j.fit, qx);
      if (hx > 0 && r !== 1) exponent.push(Math.log(h / hx) / Math.log(r));
      implied.push((j.size * q) / qx);
    }
  }
  if (head.length < 3) return undefined;
  return {
    headDeviation: median(head),
    maxHeadDeviation: head.reduce((m, d) => (Math.abs(d) > Math.abs(m) ? d : m), 0),
    flowDeviation: flow.length ? median(flow) : NaN,
    impliedExponent: exponent.length ? median(exponent) : NaN,
    impliedSize: implied.length ? median(implied) : NaN,
    points: head.length,
  };
}

interface Verdict {
  item: Sized;
  best: { other: Sized; cmp: PairComparison } | undefined;
  all: { other: Sized; cmp: PairComparison }[];
}

/**
 * Each member against its two nearest members by size (|log size ratio|, ties by order in the
 * set). `active` is sorted by size, so the two nearest lie among the two on either side: the
 * verdicts cost O(n), not O(n²). Pair comparisons are kept in `pairs`, so re-judging after a
 * member is set aside only compares the pairs that are new (a 100-member family with many
 * mislabels is judged in well under a second, where comparing every pair afresh took minutes
 * at 1 000 members).
 */
function judge(active: Sized[], order: Map<Sized, number>, pairs: Map<string, PairComparison | undefined>): Verdict[] {
  return active.map((item, i) => {
    const distance = (o: Sized) => Math.abs(Math.log(o.size / item.size));
    const others = active
      .slice(Math.max(0, i - 2), i + 3)
      .filter((o) => o !== item)
      .sort((a, b) => distance(a) - distance(b) || (order.get(a) as number) - (order.get(b) as number))
      .slice(0, 2);
    const all = others.flatMap((other) => {
      const key = `${order.get(item)}:${order.get(other)}`;
      if (!pairs.has(key)) pairs.set(key, comparePair(item, other));
      const cmp = pairs.get(key);
      return cmp ? [{ other, cmp }] : [];
    });
    const best = all.reduce<Verdict['best']>((b, x) => (!b || Math.abs(x.cmp.headDeviation) < Math.abs(b.cmp.headDeviation) ? x : b), undefined);
    return { item, best, all };
  });
}

/**
 * The flow deviation along the affinity parabola and the implied exponent, in words, leaving
 * out a figure that could not be computed (the parabola crossed neither curve in range)
 * rather than printing NaN.
 */
function alongParabola(c: PairComparison, show: Display, style: 'outlier' | 'deviation'): string {
  const flow = Number.isFinite(c.flowDeviation) ? `flow ${show.percent(c.flowDeviation)} along the ${style === 'outlier' ? 'affinity ' : ''}parabola` : undefined;
  const exponent = Number.isFinite(c.impliedExponent) ? `implied exponent ${c.impliedExponent.toFixed(2)}${style === 'outlier' ? ' where' : ','} the law gives 2` : undefined;
  const parts = [flow, exponent].filter((p): p is string => p !== undefined);
  if (parts.length === 0) return '';
  return style === 'outlier' ? ` (${parts.join(', ')})` : `; ${parts.join('; ')}`;
}

export function affinityFindings(set: Pick<CurveSet, 'members' | 'family'>, show: Display): Finding[] {
  const bySpeed = set.family === 'speed';
  const sized: Sized[] = set.members.flatMap((member) => {
    const fit = member.curves.head?.fit;
    const size = bySpeed ? member.speed_rpm : member.diameter_m;
    return fit && size !== undefined ? [{ member, size, fit }] : [];
  });
  if (sized.length < 2) return [];
  const method = bySpeed ? METHOD_SPEED : METHOD_TRIM;
  const name = (s: Sized) => show.member(s.member);
  const sizeText = (v: number) => (bySpeed ? `${Math.round(v)} rpm` : show.diameter(v));
  const findings: Finding[] = [];
  const order = new Map(sized.map((s, i) => [s, i]));
  const pairs = new Map<string, PairComparison | undefined>();
  let active = [...sized].sort((a, b) => a.size - b.size || (order.get(a) as number) - (order.get(b) as number));

  // Set aside, one at a time, the member that agrees with none of its neighbours.
  while (active.length >= 3) {
    const verdicts = judge(active, order, pairs).filter((v) => v.best);
    const worst = verdicts.reduce<Verdict | undefined>((w, v) => (!w || Math.abs(v.best!.cmp.headDeviation) > Math.abs(w.best!.cmp.headDeviation) ? v : w), undefined);
    if (!worst?.best || Math.abs(worst.best.cmp.headDeviation) <= AFFINITY_FAIL) break;
    const devs = worst.all.map((a) => a.cmp);
    const impliedSizes = devs.map((d) => d.impliedSize).filter(Number.isFinite);
    const implied = impliedSizes.length ? median(impliedSizes) : NaN;
    const neighbours = worst.all.map((a) => name(a.other)).join(' and ');
    findings.push(
      makeFinding({
        code: 'affinity.outlier',
        severity: 'fail',
        member: worst.item.member,
        quantity: 'head',
        message:
          `The ${name(worst.item)} head curve disagrees with the affinity law: scaled from ${neighbours}, the predicted head at matching flows is ` +
          `${show.percent(worst.best.cmp.headDeviation)} off the drawn curve${alongParabola(worst.best.cmp, show, 'outlier')}. ` +
          (!Number.isFinite(implied)
            ? 'Check its label and which line was traced.'
            : bySpeed
              ? `By its neighbours the ${name(worst.item)} curve fits about ${sizeText(implied)}; check the speed label and which line was traced.`
              : `Its neighbours put this curve at about ${sizeText(implied)}; check the diameter label and which line was traced.`),
        method,
        figures: {
          head_deviation: worst.best.cmp.headDeviation,
          flow_deviation: worst.best.cmp.flowDeviation,
          implied_exponent: worst.best.cmp.impliedExponent,
          ...(Number.isFinite(implied) ? { implied_size: implied } : {}),
        },
      }),
    );
    active = active.filter((a) => a !== worst.item);
  }

  // Judge what remains member by member.
  const exponents: number[] = [];
  let worstRemaining = 0;
  for (const v of judge(active, order, pairs)) {
    if (!v.best) continue;
    const c = v.best.cmp;
    if (Number.isFinite(c.impliedExponent)) exponents.push(c.impliedExponent);
    worstRemaining = Math.max(worstRemaining, Math.abs(c.headDeviation));
    const severity = Math.abs(c.headDeviation) > AFFINITY_FAIL ? 'fail' : Math.abs(c.headDeviation) > AFFINITY_WARN ? 'warn' : undefined;
    if (!severity) continue;
    const pairOnly = active.length < 3;
    findings.push(
      makeFinding({
        code: 'affinity.deviation',
        severity,
        member: v.item.member,
        quantity: 'head',
        message:
          `The ${name(v.item)} head curve, predicted from ${name(v.best.other)} by the affinity law, is ${show.percent(c.headDeviation)} off at matching flows ` +
          `(largest ${show.percent(c.maxHeadDeviation)}${alongParabola(c, show, 'deviation')}).` +
          (pairOnly ? ' With only two curves to compare, either label may be the wrong one.' : ' Check the labels, or expect trimmed curves to fall below the simple law.'),
        method,
        figures: { head_deviation: c.headDeviation, max_head_deviation: c.maxHeadDeviation, flow_deviation: c.flowDeviation, implied_exponent: c.impliedExponent },
      }),
    );
  }
  if (exponents.length && findings.length === 0) {
    findings.push(
      makeFinding({
        code: 'affinity.summary',
        severity: 'note',
        message: `The ${sized.length} head curves agree with the affinity law within ${show.percent(worstRemaining).replace('+', '')} of head (implied exponent ${median(exponents).toFixed(2)}; the law gives 2).`,
        method,
        figures: { worst_head_deviation: worstRemaining, implied_exponent: median(exponents) },
      }),
    );
  }
  findings.push(...speedSpanFindings(set), ...speedRangeFindings(set), ...speedCurveFindings(set));
  return findings;
}
