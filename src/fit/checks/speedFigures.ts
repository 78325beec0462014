/** Family figures (Ns, nq, Nss) at the full diameter's BEP, with a note when Nss is high. */
import type { CurveSet, Finding, Member } from '../../model/curveset.ts';
import { evaluateUnchecked, inDomain } from '../polynomial.ts';
import { NSS_US_CAUTION, specificSpeedSI, specificSpeedUS, suctionSpecificSpeedSI, suctionSpecificSpeedUS } from '../specificSpeed.ts';
import type { Display } from './display.ts';
import { makeFinding } from './finding.ts';

export type Figures = NonNullable<CurveSet['figures']>;

/** The member that carries the family's rated figures: the largest diameter (or highest speed) with a BEP. */
export function ratedMember(set: Pick<CurveSet, 'members'>): Member | undefined {
  const withBep = set.members.filter((m) => m.derived.bep);
  return withBep.sort((a, b) => (b.diameter_m ?? 0) - (a.diameter_m ?? 0) || b.speed_rpm - a.speed_rpm)[0];
}

export function familyFigures(set: Pick<CurveSet, 'members' | 'pump'>): Figures {
  const m = ratedMember(set);
  if (!m?.derived.bep) return {};
  const stages = set.pump.stages ?? 1;
  const eyes = set.pump.suction === 'double' ? 2 : 1;
  const { flow_m3s: q, head_m } = m.derived.bep;
  const h = head_m / stages;
  const figures: Figures = { ns_us: specificSpeedUS(m.speed_rpm, q, h), nq_si: specificSpeedSI(m.speed_rpm, q, h) };
  const npsh = m.curves.npshr?.fit;
  if (npsh && inDomain(npsh, q)) {
    const n3 = evaluateUnchecked(npsh, q);
    figures.nss_us = suctionSpecificSpeedUS(m.speed_rpm, q, n3, eyes);
    figures.nss_si = suctionSpecificSpeedSI(m.speed_rpm, q, n3, eyes);
  }
  for (const k of Object.keys(figures) as (keyof Figures)[]) if (!Number.isFinite(figures[k])) delete figures[k];
  return figures;
}

export function speedFindings(set: Pick<CurveSet, 'members' | 'pump'>, figures: Figures, show: Display): Finding[] {
  const m = ratedMember(set);
  if (!m || figures.ns_us === undefined) return [];
  const out: Finding[] = [
    makeFinding({
      code: 'figures.specific-speed',
      severity: 'note',
      member: m,
      message:
        `Specific speed at the ${show.member(m)} BEP (${show.flow(m.derived.bep!.flow_m3s)}, ${show.head(m.derived.bep!.head_m)}): Ns ${Math.round(figures.ns_us)} (US units), nq ${figures.nq_si!.toFixed(1)} (SI, m³/s and m)` +
        (figures.nss_us !== undefined ? `; suction specific speed Nss ${Math.round(figures.nss_us)} (US), ${figures.nss_si!.toFixed(0)} (SI).` : '.'),
      method: 'Ns = n·√Q/H^0.75 and Nss = n·√Q/NPSH3^0.75 at BEP, per stage and per impeller eye (Hydraulic Institute)',
      figures: { ...figures },
    }),
  ];
  if (figures.nss_us !== undefined && figures.nss_us > NSS_US_CAUTION) {
    out.push(
      makeFinding({
        code: 'figures.high-nss',
        severity: 'warn',
        member: m,
        quantity: 'npshr',
        message: `Suction specific speed Nss ${Math.round(figures.nss_us)} (US units) is above about ${NSS_US_CAUTION}: expect suction recirculation at part load. Keep the duty near BEP and allow a larger NPSH margin (ANSI/HI 9.6.1).`,
        method: 'Suction specific speed guidance (Hydraulic Institute, ANSI/HI 9.6.1; published with caveats)',
        figures: { nss_us: figures.nss_us },
      }),
    );
  }
  return out;
}
