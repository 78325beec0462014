/**
 * Power consistency: each captured power curve is compared with ρ·g·Q·H/η computed from
 * the same member's head and efficiency curves, at the curve set's density.
 *
 * Judged on the median relative difference over 30–95 % of the common flow range (at low
 * flow η is small and the ratio is ill-conditioned; the median ignores end wiggles):
 * - warn above 4 %: head and power read to about 0.5 % each and efficiency to 1–2 points
 *   (1.5–3 % of its value) add up to about 3 %; beyond 4 % — the ISO 9906 grade 1B/1E power
 *   band — the three curves no longer describe one pump within reading error;
 * - fail above 6 %: twice the combined reading error. The curves on one sheet come from the
 *   same test and are drawn to agree, so a difference this large means one of them was
 *   misread, belongs to another diameter, or the sheet's density basis differs.
 * (ISO 9906:2012 grades as listed in REFERENCES.md, from memory.)
 */
import type { CurveSet, Finding } from '../../model/curveset.ts';
import { evaluateUnchecked, linspace } from '../polynomial.ts';
import type { Display } from './display.ts';
import { makeFinding } from './finding.ts';
import { shaftPowerW } from './hydraulicPower.ts';

export const POWER_WARN = 0.04;
export const POWER_FAIL = 0.06;
const METHOD = 'P = ρ·g·Q·H/η against the captured power curve; warn beyond 4 % (ISO 9906 grade 1B power band), fail beyond 6 % (twice the combined reading error)';

export function powerFindings(set: Pick<CurveSet, 'members' | 'fluid'>, show: Display): Finding[] {
  const findings: Finding[] = [];
  const rho = set.fluid.density_kg_m3;
  for (const member of set.members) {
    const head = member.curves.head?.fit;
    const eff = member.curves.efficiency?.fit;
    const power = member.curves.power?.fit;
    if (!head || !eff || !power) continue;
    const lo = Math.max(head.domain[0], eff.domain[0], power.domain[0]);
    const hi = Math.min(head.domain[1], eff.domain[1], power.domain[1]);
    if (!(hi > lo)) continue;
    const devs: { q: number; dev: number }[] = [];
    for (const f of linspace(0.3, 0.95, 14)) {
      const q = lo + f * (hi - lo);
      const expected = shaftPowerW(rho, q, evaluateUnchecked(head, q), evaluateUnchecked(eff, q));
      const drawn = evaluateUnchecked(power, q);
      if (Number.isFinite(expected) && expected > 0) devs.push({ q, dev: (drawn - expected) / expected });
    }
    if (devs.length < 3) continue;
    const sorted = devs.map((d) => d.dev).sort((a, b) => a - b);
    const median = sorted[sorted.length >> 1] as number;
    const worst = devs.reduce((w, d) => (Math.abs(d.dev) > Math.abs(w.dev) ? d : w));
    const size = Math.abs(median);
    const severity = size > POWER_FAIL ? 'fail' : size > POWER_WARN ? 'warn' : undefined;
    if (!severity) continue;
    const direction = median > 0 ? 'higher' : 'lower';
    findings.push(
      makeFinding({
        code: 'power.consistency',
        severity,
        member,
        quantity: 'power',
        message:
          `The ${show.member(member)} power curve is ${show.percent(median)} (${direction}) against ρ·g·Q·H/η from its head and efficiency curves ` +
          `at ${Math.round(rho)} kg/m³ (worst ${show.percent(worst.dev)} at ${show.flow(worst.q)}). ` +
          'Check that the power, head and efficiency traces belong to the same diameter, the power axis, and the sheet\'s liquid density.',
        method: METHOD,
        figures: { median_deviation: median, worst_deviation: worst.dev, worst_flow_m3s: worst.q, density_kg_m3: rho },
      }),
    );
  }
  return findings;
}
