/**
 * Scores a replayed take-off of a random sheet against its exact truth, curve by curve:
 * the worst error of the fitted curve over the truth's flow range (head, power, NPSHr in %
 * of the axis span; efficiency in points), whether the replay flagged it (a warn or fail
 * finding naming one of its traces, or its diameter and quantity, or a fail for the whole
 * sheet, or a refusal), and whether it is wrong (beyond the tolerance, or missing).
 * Written apart from scripts/sheets/score.ts on purpose: the bed must not share its checks.
 */
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import type { CurveSet, Finding } from '../../src/model/curveset.ts';
import { exact, siFactor, type PumpFamily } from './pumpFamily.ts';
import type { TruthCurve } from './randomSheet.ts';

/**
 * Tolerances for "wrong" (the acceptance maxima): 1 % of axis span for a curve; efficiency within
 * 1.5 points where it is read from its own curves, 2 points where it comes from iso-lines.
 */
export const WRONG_PERCENT = 1;
export const WRONG_POINTS = 1.5;
export const WRONG_POINTS_ISO = 2;

/** The tolerance a curve of this quantity and source is held to, % of span or points. */
export function wrongLimit(curve: { quantity: TruthCurve['quantity']; source: TruthCurve['source'] }): number {
  if (curve.quantity !== 'efficiency') return WRONG_PERCENT;
  return curve.source === 'iso' ? WRONG_POINTS_ISO : WRONG_POINTS;
}

export interface CurveScore {
  id: string;
  quantity: TruthCurve['quantity'];
  source: TruthCurve['source'];
  /** Worst error, % of span or points; Infinity when the curve set lacks the curve. */
  error: number;
  flagged: boolean;
  wrong: boolean;
  /** Why it counts as flagged (the finding codes), for reading the bench's worst cases. */
  flags: string[];
}

/**
 * Findings about the shape of a sound curve (they fire on the exact points of the invented
 * families too): they tell nothing about the reading, so they do not count as flags.
 */
const SHAPE_ONLY = /^(head\.rising|bep\.outside-range|figures\.)/;

function flagsFor(findings: readonly Finding[], curve: TruthCurve, diameterM: number): string[] {
  return findings
    .filter((f) => f.severity !== 'note' && !SHAPE_ONLY.test(f.code))
    .filter((f) => {
      const s = f.subject;
      if (s.trace !== undefined) return curve.traces.includes(s.trace);
      if (curve.speed !== undefined && s.speed_rpm !== undefined) return Math.abs(s.speed_rpm - curve.speed) < 1e-6 && (s.quantity === undefined || s.quantity === curve.quantity);
      if (s.diameter_m !== undefined) return Math.abs(s.diameter_m - diameterM) < 1e-9 && (s.quantity === undefined || s.quantity === curve.quantity);
      return f.severity === 'fail';
    })
    .map((f) => f.code);
}

/** How a speed family (speedSheet.ts) finds a curve's member and its exact value; the diameter bed uses the defaults. */
export interface TruthSource {
  member(set: CurveSet, curve: TruthCurve): CurveSet['members'][number] | undefined;
  value(curve: TruthCurve, q: number): number;
}

export function scoreReplay(family: PumpFamily, truth: readonly TruthCurve[], set: CurveSet | { refused: string }, source?: TruthSource): CurveScore[] {
  const si = siFactor(family);
  return truth.map((curve) => {
    const id = `${curve.quantity}-${curve.speed ?? curve.diameter}${curve.source === 'iso' ? ' (iso)' : ''}`;
    if ('refused' in set) return { id, quantity: curve.quantity, source: curve.source, error: Infinity, flagged: true, wrong: true, flags: ['refused'] };
    const dM = curve.diameter * si.diameter;
    const member = source ? source.member(set, curve) : set.members.find((m) => m.diameter_m !== undefined && Math.abs(m.diameter_m - dM) < 1e-9);
    const fit = member?.curves[curve.quantity]?.fit;
    const toValue = curve.quantity === 'efficiency' ? 0.01 : curve.quantity === 'power' ? si.power : si.head;
    let error = Infinity;
    if (fit) {
      error = 0;
      for (let i = 0; i <= 100; i++) {
        const q = curve.range[0] + ((curve.range[1] - curve.range[0]) * i) / 100;
        const read = evaluateUnchecked(fit, q * si.flow) / toValue;
        const want = source ? source.value(curve, q) : exact(family, curve.quantity, curve.diameter, q);
        error = Math.max(error, (100 * Math.abs(read - want)) / curve.span);
      }
    }
    const flags = flagsFor(set.findings, curve, dM);
    const limit = wrongLimit(curve);
    return { id, quantity: curve.quantity, source: curve.source, error, flagged: flags.length > 0, wrong: !(error <= limit), flags };
  });
}
