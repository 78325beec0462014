/** The plain-text report of a curve set: figures per member, family figures, findings, cautions. */
import { bepDoubted } from '../fit/checks/plausibility.ts';
import type { CurveSet, Finding } from '../model/curveset.ts';
import { displayFor } from '../fit/checks/display.ts';
import { showFixed } from '../units/format.ts';

export const CAUTION =
  'Caution: preliminary engineering only. Verify curves, NPSH margin and motor sizing against the manufacturer\'s certified data and local codes; have a licensed professional approve the selection.';

const MARK: Record<Finding['severity'], string> = { fail: 'FAIL', warn: 'WARN', note: 'note' };

export function formatFindings(findings: readonly Finding[]): string[] {
  if (findings.length === 0) return ['  (no findings)'];
  return findings.map((f) => `  ${MARK[f.severity].padEnd(4)}  ${f.message}\n        [${f.id}; ${f.method}]`);
}

export function formatReport(set: CurveSet): string {
  const show = displayFor(set.display_units);
  const lines: string[] = [];
  lines.push(`${set.pump.name} — ${set.speed_rpm} rpm, ${set.fluid.name} (${Math.round(set.fluid.density_kg_m3)} kg/m³, SG ${set.fluid.specific_gravity})`);
  if (set.provenance.source) lines.push(`Source: ${set.provenance.source.file} (sha256 ${set.provenance.source.sha256.slice(0, 12)}…)`);
  lines.push('');
  const ordered = [...set.members].sort((a, b) => (b.diameter_m ?? 0) - (a.diameter_m ?? 0) || b.speed_rpm - a.speed_rpm);
  for (const m of ordered) {
    const d = m.derived;
    const parts: string[] = [];
    if (d.shutoff_head_m !== undefined) parts.push(`shutoff ${show.head(d.shutoff_head_m)}`);
    // A BEP the findings doubt (peak not captured, or past the head curve's end) is marked where it is printed.
    const doubted = bepDoubted(set.findings, m);
    if (d.bep) parts.push(`BEP ${show.flow(d.bep.flow_m3s)} at ${show.head(d.bep.head_m)}, ${show.efficiency(d.bep.efficiency)}${doubted ? ' (not reliable: see the findings)' : ''}`);
    if (d.por) parts.push(`POR ${show.flow(d.por.min_m3s)}–${show.flow(d.por.max_m3s)}`);
    if (d.end_of_curve_m3s !== undefined) parts.push(`end of curve ${show.flow(d.end_of_curve_m3s)}`);
    lines.push(`  ${show.member(m).padEnd(10)}${parts.join('; ')}`);
    const fits = (['head', 'efficiency', 'power', 'npshr'] as const).flatMap((q) => {
      const f = m.curves[q]?.fit;
      return f ? [`${q} deg ${f.degree}`] : m.curves[q] ? [`${q} not fitted`] : [];
    });
    lines.push(`  ${''.padEnd(10)}fits: ${fits.join(', ') || 'none'}`);
  }
  const fig = set.figures ?? {};
  if (fig.ns_us !== undefined) {
    lines.push('');
    lines.push(`  Ns ${Math.round(fig.ns_us)} (US), nq ${showFixed(fig.nq_si, 1).text} (SI)` + (fig.nss_us !== undefined ? `; Nss ${Math.round(fig.nss_us)} (US)` : ''));
  }
  lines.push('');
  const counts = (['fail', 'warn', 'note'] as const).map((s) => `${set.findings.filter((f) => f.severity === s).length} ${s}`).join(', ');
  lines.push(`Findings (${counts}):`);
  lines.push(...formatFindings(set.findings));
  lines.push('');
  lines.push(CAUTION);
  return `${lines.join('\n')}\n`;
}

/** The report as JSON for `--json`: what was written, whether it passed, figures per member and findings. */
export function reportJson(set: CurveSet, output?: string, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    ...(output !== undefined ? { output: output === '-' ? 'stdout' : output } : {}),
    passed: !set.findings.some((f) => f.severity === 'fail'),
    pump: set.pump,
    speed_rpm: set.speed_rpm,
    units: 'SI (flow m³/s, head m, power W, diameter m, efficiency fraction)',
    members: set.members.map((m) => ({
      ...(m.diameter_m !== undefined ? { diameter_m: m.diameter_m } : {}),
      speed_rpm: m.speed_rpm,
      derived: m.derived,
      fits: Object.fromEntries(Object.entries(m.curves).map(([q, c]) => [q, c?.fit ? { degree: c.fit.degree, rms: c.fit.rms, domain: c.fit.domain } : null])),
    })),
    figures: set.figures ?? {},
    findings: set.findings,
    ...extra,
    caution: CAUTION,
  };
}
