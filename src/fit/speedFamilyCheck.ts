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
import type { CurveSet, Finding } from '../model/curveset.ts';
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
