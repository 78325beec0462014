/**
 * Derived figures of one member: shutoff head, BEP, end of curve, POR.
 *
 * POR (Preferred Operating Region), ANSI/HI 9.6.3: 70 %–120 % of BEP flow for most pumps
 * (published). For high specific speed (Ns > 4500, US units) the band is narrower, about
 * 80 %–115 % (from memory). The AOR is the manufacturer's and is kept only when given.
 */
import type { Derived, Member } from '../model/curveset.ts';
import { argMax, evaluateUnchecked } from './polynomial.ts';

export const POR_STANDARD = { low: 0.7, high: 1.2, basis: 'ANSI/HI 9.6.3: 70–120 % of BEP flow' } as const;
export const POR_HIGH_NS = { low: 0.8, high: 1.15, basis: 'ANSI/HI 9.6.3 for Ns above 4500 (US): 80–115 % of BEP flow (from memory)' } as const;
/** Specific speed (US units) above which the narrower POR applies. */
export const HIGH_NS_US = 4500;

/** Shutoff head, BEP, end of curve and POR from the member's fits. `nsUs` picks the POR band. */
export function deriveFigures(member: Pick<Member, 'curves'>, nsUs?: number): Derived {
  const out: Derived = {};
  const head = member.curves.head?.fit;
  const eff = member.curves.efficiency?.fit;
  if (head) {
    out.shutoff_head_m = evaluateUnchecked(head, 0);
    out.end_of_curve_m3s = head.domain[1];
  }
  if (eff) {
    const [lo, hi] = eff.domain;
    const q = argMax(eff, lo, hi);
    const efficiency = evaluateUnchecked(eff, q);
    const headAtBep = head ? evaluateUnchecked(head, q) : NaN;
    if (Number.isFinite(headAtBep)) {
      out.bep = { flow_m3s: q, head_m: headAtBep, efficiency };
      const band = nsUs !== undefined && nsUs > HIGH_NS_US ? POR_HIGH_NS : POR_STANDARD;
      out.por = { min_m3s: band.low * q, max_m3s: band.high * q, basis: band.basis };
    }
  }
  return out;
}

/** Whether the BEP sits at an end of the efficiency fit's domain (the peak was not captured). */
export function bepAtDomainEnd(member: Pick<Member, 'curves' | 'derived'>): 'low' | 'high' | undefined {
  const eff = member.curves.efficiency?.fit;
  const bep = member.derived.bep;
  if (!eff || !bep) return undefined;
  const [lo, hi] = eff.domain;
  const tol = 1e-6 * (hi - lo);
  if (bep.flow_m3s <= lo + tol) return 'low';
  if (bep.flow_m3s >= hi - tol) return 'high';
  return undefined;
}
