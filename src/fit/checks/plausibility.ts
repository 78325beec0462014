/**
 * Plausibility of each member's curves: the shapes a centrifugal pump's curves have, so
 * that a misread axis or a mislabelled line shows up before it is used.
 */
import type { CurveSet, Finding, Member } from '../../model/curveset.ts';
import { bepAtDomainEnd } from '../derived.ts';
import { derivative, evaluateUnchecked, linspace, stationaryPoints } from '../polynomial.ts';
import type { Display } from './display.ts';
import { makeFinding } from './finding.ts';

/** Efficiency above this is not credible for a centrifugal pump (best large pumps reach about 0.92; common practice). */
export const EFFICIENCY_CEILING = 0.95;
const SHAPE = 'Curve shape expected of a centrifugal pump (common practice)';
/** A BEP this share of the head curve's flow span beyond its captured end still reads the head from the fit (common practice: a hair of extrapolation is drawing tolerance). */
export const BEP_HEAD_SLACK = 0.02;

/** Findings that say a member's BEP (and its POR and specific speed) cannot be relied on. */
const BEP_DOUBTS = new Set(['bep.outside-range', 'bep.beyond-head']);

/** True when a warn or fail of the set doubts this member's BEP: every shell marks such a BEP where it shows it. */
export function bepDoubted(findings: readonly Finding[], m: Pick<Member, 'diameter_m' | 'speed_rpm'>): boolean {
  return findings.some((f) => BEP_DOUBTS.has(f.code) && f.severity !== 'note' && f.subject.diameter_m === m.diameter_m && (m.diameter_m !== undefined || f.subject.speed_rpm === m.speed_rpm));
}

export function plausibilityFindings(set: Pick<CurveSet, 'members'>, show: Display): Finding[] {
  const out: Finding[] = [];
  for (const m of set.members) {
    out.push(...headShape(m, show), ...efficiencyShape(m, show), ...npshShape(m, show));
  }
  out.push(...familyOrder(set.members, show));
  return out;
}

function headShape(m: Member, show: Display): Finding[] {
  const fit = m.curves.head?.fit;
  if (!fit) return [];
  const [lo, hi] = fit.domain;
  const out: Finding[] = [];
  const peaks = stationaryPoints(fit, lo, hi).filter((q) => derivative(fit, q - 1e-9 * hi) > 0);
  const h0 = evaluateUnchecked(fit, lo);
  for (const q of peaks) {
    const hp = evaluateUnchecked(fit, q);
    if (hp > h0 * 1.005) {
      out.push(
        makeFinding({
          code: 'head.rising',
          severity: 'warn',
          member: m,
          quantity: 'head',
          message: `The ${show.member(m)} head curve rises from ${show.head(h0)} toward shutoff to a peak of ${show.head(hp)} at ${show.flow(q)}: a drooping (unstable) curve. Avoid duties left of the peak and parallel operation there, or check the trace.`,
          method: SHAPE,
          figures: { shutoff_head_m: h0, peak_head_m: hp, peak_flow_m3s: q },
        }),
      );
    }
  }
  if (lo > 0.05 * hi) {
    out.push(
      makeFinding({
        code: 'head.shutoff-extrapolated',
        severity: 'note',
        member: m,
        quantity: 'head',
        message: `The ${show.member(m)} head curve starts at ${show.flow(lo)}; its shutoff head ${show.head(evaluateUnchecked(fit, 0))} is extrapolated and only indicative.`,
        method: 'Polynomial fit used outside its captured range',
        figures: { first_flow_m3s: lo },
      }),
    );
  }
  return out;
}

function efficiencyShape(m: Member, show: Display): Finding[] {
  const curve = m.curves.efficiency;
  const fit = curve?.fit;
  if (!curve || !fit) return [];
  const out: Finding[] = [];
  const [lo, hi] = fit.domain;
  const peak = Math.max(...linspace(lo, hi, 200).map((q) => evaluateUnchecked(fit, q)), ...curve.points.map((p) => p[1]));
  if (peak > EFFICIENCY_CEILING) {
    out.push(
      makeFinding({
        code: 'efficiency.too-high',
        severity: 'fail',
        member: m,
        quantity: 'efficiency',
        message: `The ${show.member(m)} efficiency reaches ${show.efficiency(peak)}, above the ${show.efficiency(EFFICIENCY_CEILING)} no centrifugal pump attains. Check the efficiency axis calibration and that efficiency was entered in %.`,
        method: SHAPE,
        figures: { peak_efficiency: peak },
      }),
    );
  }
  const end = bepAtDomainEnd(m);
  if (end) {
    out.push(
      makeFinding({
        code: 'bep.outside-range',
        severity: 'warn',
        member: m,
        quantity: 'efficiency',
        message: `The ${show.member(m)} efficiency is still ${end === 'high' ? 'rising at the last' : 'falling at the first'} captured flow (${show.flow(end === 'high' ? hi : lo)}), so its BEP lies outside the captured range. BEP, POR and specific speed for it are not reliable; capture the curve further.`,
        method: 'BEP as the maximum of the efficiency fit',
        figures: { domain_low_m3s: lo, domain_high_m3s: hi },
      }),
    );
  }
  // The head at BEP (and POR and specific speed with it) comes from the head fit: beyond the head
  // curve's captured end it is the polynomial extrapolated, not the sheet. A maker draws head to the
  // end of curve and efficiency no further (common practice), so a BEP past the head's end also
  // says a head trace stopped short or the efficiency flows were misread.
  const bep = m.derived.bep;
  const headFit = m.curves.head?.fit;
  if (bep && headFit && !end) {
    const [hLo, hHi] = headFit.domain;
    const slack = BEP_HEAD_SLACK * (hHi - hLo);
    if (bep.flow_m3s > hHi + slack || bep.flow_m3s < hLo - slack) {
      const beyond = bep.flow_m3s > hHi;
      out.push(
        makeFinding({
          code: 'bep.beyond-head',
          severity: 'warn',
          member: m,
          quantity: 'head',
          message: `The ${show.member(m)} BEP (${show.flow(bep.flow_m3s)}) lies ${beyond ? `beyond the end of its head curve (${show.flow(hHi)})` : `before the start of its head curve (${show.flow(hLo)})`}: the head at BEP (${show.head(bep.head_m)}), POR and specific speed come from the head curve extrapolated past what was captured and are not reliable. Capture the head curve ${beyond ? 'to its end' : 'from shutoff'}, or check the efficiency curve's flows.`,
          method: 'BEP head read from the head fit, which is reliable only over its captured flows',
          figures: { bep_flow_m3s: bep.flow_m3s, head_domain_low_m3s: hLo, head_domain_high_m3s: hHi },
        }),
      );
    }
  }
  // A captured efficiency that does not fall toward zero at zero flow: look at the lowest-flow points.
  const low = [...curve.points].filter((p) => p[0] > 0).sort((a, b) => a[0] - b[0]);
  const bepQ = m.derived.bep?.flow_m3s;
  if (low.length >= 2 && bepQ && (low[0] as [number, number])[0] < 0.35 * bepQ) {
    const [q0, e0] = low[0] as [number, number];
    const peakEff = m.derived.bep?.efficiency ?? peak;
    // Efficiency rises steeply from the origin, but not much faster than 2.5× the chord from 0 to BEP
    // (a steep real curve reaches about 2×); further above it means an offset on the efficiency axis.
    const chord = (peakEff * q0) / bepQ;
    if (e0 > chord * 2.5 + 0.1) {
      out.push(
        makeFinding({
          code: 'efficiency.not-zero-at-shutoff',
          severity: 'warn',
          member: m,
          quantity: 'efficiency',
          message: `The ${show.member(m)} efficiency is already ${show.efficiency(e0)} at ${show.flow(q0)} (${Math.round((q0 / bepQ) * 100)} % of BEP flow); efficiency must fall to zero at zero flow. Check the efficiency axis for an offset.`,
          method: SHAPE,
          figures: { first_flow_m3s: q0, first_efficiency: e0 },
        }),
      );
    }
  }
  return out;
}

function npshShape(m: Member, show: Display): Finding[] {
  const curve = m.curves.npshr;
  const fit = curve?.fit;
  if (!curve) return [];
  const out: Finding[] = [];
  const lowest = Math.min(...curve.points.map((p) => p[1]), ...(fit ? linspace(fit.domain[0], fit.domain[1], 100).map((q) => evaluateUnchecked(fit, q)) : []));
  if (!(lowest > 0)) {
    out.push(
      makeFinding({
        code: 'npshr.non-positive',
        severity: 'fail',
        member: m,
        quantity: 'npshr',
        message: `The ${show.member(m)} NPSHr falls to ${show.npsh(lowest)}; NPSH3 is always positive. Check the NPSH axis calibration.`,
        method: 'NPSH3 definition (HI 14.6 / ISO 9906)',
        figures: { lowest_npshr_m: lowest },
      }),
    );
  }
  if (fit) {
    const [lo, hi] = fit.domain;
    const qa = lo + 0.7 * (hi - lo);
    const drop = evaluateUnchecked(fit, qa) - evaluateUnchecked(fit, hi);
    const level = evaluateUnchecked(fit, hi);
    if (drop > 0.03 * Math.abs(level)) {
      out.push(
        makeFinding({
          code: 'npshr.falling',
          severity: 'warn',
          member: m,
          quantity: 'npshr',
          message: `The ${show.member(m)} NPSHr falls by ${show.npsh(drop)} toward the end of the curve (${show.flow(qa)} to ${show.flow(hi)}); NPSHr normally rises at high flow. Check the trace and its panel.`,
          method: 'NPSH3 rises with flow beyond BEP (common practice)',
          figures: { drop_m: drop },
        }),
      );
    }
  }
  return out;
}

function familyOrder(members: Member[], show: Display): Finding[] {
  const sized = members.filter((m) => m.diameter_m !== undefined && m.curves.head?.fit).sort((a, b) => (b.diameter_m as number) - (a.diameter_m as number));
  const out: Finding[] = [];
  for (let i = 0; i + 1 < sized.length; i++) {
    const big = sized[i] as Member;
    const small = sized[i + 1] as Member;
    const fb = big.curves.head!.fit!;
    const fs = small.curves.head!.fit!;
    const lo = Math.max(fb.domain[0], fs.domain[0]);
    const hi = Math.min(fb.domain[1], fs.domain[1]);
    if (!(hi > lo)) continue;
    const qs = linspace(lo, hi, 9).slice(1, -1);
    const above = qs.filter((q) => evaluateUnchecked(fs, q) > evaluateUnchecked(fb, q));
    if (above.length >= Math.ceil(qs.length / 2)) {
      const q = above[above.length >> 1] as number;
      out.push(
        makeFinding({
          code: 'family.order',
          severity: 'fail',
          member: small,
          quantity: 'head',
          message: `The ${show.member(small)} head curve lies above the larger ${show.member(big)} curve (${show.head(evaluateUnchecked(fs, q))} against ${show.head(evaluateUnchecked(fb, q))} at ${show.flow(q)}). A smaller impeller gives less head: the diameter labels are probably swapped or mistyped.`,
          method: 'Affinity law for impeller trim: head falls with diameter (Karassik, Pump Handbook)',
          figures: { flow_m3s: q },
        }),
      );
    }
  }
  return out;
}
