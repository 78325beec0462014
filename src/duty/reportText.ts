/**
 * The duty report as readable text: every number with its unit, cautions beside NPSH and motor.
 * Numbers go through the one formatter, which also writes "not available" for a missing figure.
 */
import { parseUnit, showFixed, showNumber, showValue } from '../units/index.ts';
import type { DutyReportView } from './reportView.ts';

export function dutyReportText(v: DutyReportView): string {
  const u = {
    flow: parseUnit('flow', v.units.flow).label,
    head: parseUnit('head', v.units.head).label,
    npsh: parseUnit('head', v.units.npsh).label,
    power: parseUnit('power', v.units.power).label,
    diameter: parseUnit('diameter', v.units.diameter).label,
    pressure: parseUnit('pressure', v.units.pressure).label,
    temperature: parseUnit('temperature', v.units.temperature).label,
  };
  const n = (x: number | null | undefined, unit: string, digits = 4) => showValue(x, unit, digits).text;
  const pc = (x: number | null | undefined, decimals = 1) => showFixed(x, decimals, '%').text;
  const ratio = (x: number | null | undefined) => showFixed(x, 2).text;
  const plain = (x: number | null | undefined) => showNumber(x, 4).text;
  const L: string[] = [];
  L.push(`Duty check — ${v.curve_set.pump} (${v.curve_set.file})`);
  L.push(`Result: ${v.headline}`);
  L.push(`Duty: ${n(v.duty.flow, u.flow)} at ${n(v.duty.head, u.head)}${v.duty.parallel_count > 1 ? `, ${v.duty.parallel_count} pumps in parallel (${n(v.duty.per_pump_flow, u.flow)} each)` : ''}`);
  const s = v.system_curve;
  L.push(`System curve: H = ${n(s.static_head, u.head)} + ${plain(s.k)}·Q^${plain(s.exponent)}  (Q in ${u.flow}, H in ${u.head}; ${s.basis})`);
  if (s.fit) L.push(`  fit residuals: rms ${n(s.fit.rms, u.head, 3)}, largest ${n(s.fit.max_residual, u.head, 3)} over ${s.fit.points} points`);
  L.push('');
  L.push(`Operating points on the system curve${v.duty.parallel_count > 1 ? ` (${v.duty.parallel_count} pumps combined)` : ''}:`);
  for (const op of v.operating_points) {
    const name = (op.diameter === null ? op.label : `${op.kind === 'trim' ? 'trim ' : ''}${n(op.diameter, u.diameter)}`).padEnd(op.kind === 'trim' ? 15 : 10);
    if (op.status !== 'ok') {
      L.push(`  ${name} ${op.message ?? op.status}`);
      continue;
    }
    L.push(
      `  ${name} ${n(op.flow, u.flow)} at ${n(op.head, u.head)}, efficiency ${pc(op.efficiency)}, power ${n(op.power, u.power)}, NPSH3 ${n(op.npshr, u.npsh, 3)}, POR: ${op.por_position}${op.extrapolated.length ? ` (extrapolated: ${op.extrapolated.join(', ')})` : ''}`,
    );
  }
  L.push('');
  const t = v.trim;
  L.push(t.method === 'speed' ? 'Speed meeting the duty:' : 'Trim meeting the duty:');
  L.push(`  ${t.message}`);
  if (t.status === 'meets') {
    if (t.method === 'trim') L.push(`  diameter ${n(t.diameter, u.diameter)} of ${n(t.full_diameter, u.diameter)} (${pc(t.diameter_ratio)}); affinity-parabola estimate ${n(t.estimate_diameter, u.diameter)}`);
    else L.push(`  speed ${n(t.speed, 'rpm')}`);
    const op = t.operating_point;
    if (op && op.status === 'ok' && op.flow !== null && v.duty.flow !== null && Math.abs(op.flow / v.duty.flow - 1) > 1e-3) {
      L.push(`  on the system curve it runs at ${n(op.flow, u.flow)} and ${n(op.head, u.head)} (the system curve does not pass through the duty point)`);
    }
    L.push(`  at ${n(t.flow, u.flow)} and ${n(t.head, u.head)}: efficiency ${pc(t.efficiency)}, power ${n(t.power, u.power)}, NPSH3 ${n(t.npshr, u.npsh, 3)}, ${pc(t.flow_to_bep, 0)} of BEP flow (POR: ${t.por_position})`);
  }
  if (v.parallel) {
    L.push('');
    L.push(`Parallel operation, ${v.parallel.count} pumps:`);
    const c = v.parallel.combined;
    L.push(c.message ? `  combined: ${c.message}` : `  combined ${n(c.flow, u.flow)} at ${n(c.head, u.head)}, power ${n(c.power, u.power)}`);
    const p = v.parallel.per_pump;
    if (p) L.push(`  each pump ${n(p.flow, u.flow)}, efficiency ${pc(p.efficiency)}, ${pc(p.flow_to_bep, 0)} of BEP flow (POR: ${p.por_position})`);
    const a = v.parallel.one_pump_alone;
    L.push(a.message ? `  one pump alone: ${a.message}` : `  one pump alone ${n(a.flow, u.flow)} at ${n(a.head, u.head)}, power ${n(a.power, u.power)}, NPSH3 ${n(a.npshr, u.npsh, 3)} (POR: ${a.por_position})`);
  }
  if (v.speed) {
    L.push('');
    L.push('Variable speed, full impeller:');
    if (v.speed.status === 'ok') L.push(`  ${n(v.speed.speed, 'rpm')} (${pc(v.speed.ratio)} of rated): efficiency ${pc(v.speed.efficiency)}, power ${n(v.speed.power, u.power)}, NPSH3 ${n(v.speed.npshr, u.npsh, 3)}${v.speed.outside_affinity_band ? '; outside ±20 % of rated speed, affinity law less exact' : ''}`);
    else L.push(`  ${v.speed.message}`);
  }
  if (v.npsh) {
    const site = v.npsh.site;
    L.push('');
    L.push('NPSH available:');
    L.push(`  surface pressure ${n(site.surface_pressure, u.pressure, 5)} (${site.pressure_basis})`);
    L.push(`  liquid at ${n(site.temperature, u.temperature)}: vapour pressure ${n(site.vapour_pressure, u.pressure)}, density ${n(site.density_kg_m3, 'kg/m³', 5)} (${site.liquid_basis})`);
    L.push(`  suction static ${n(site.suction_static, u.npsh, 3)} (+ liquid above the eye), suction loss ${n(site.suction_loss_at_duty, u.npsh, 3)} at the duty flow, scaled with flow squared`);
    L.push(`  ${site.velocity_head}`);
    L.push(`  guidance: ${v.npsh.rule.basis}`);
    for (const p of v.npsh.points) {
      const verdict = p.verdict === 'meets-guidance' ? 'ok' : p.verdict === 'below-guidance' ? 'BELOW GUIDANCE' : p.verdict === 'cavitation-expected' ? 'CAVITATION' : 'no NPSH3';
      L.push(`  ${p.where}: NPSHa ${n(p.npsha, u.npsh, 3)}, NPSH3 ${n(p.npshr, u.npsh, 3)}, margin ${n(p.margin, u.npsh, 3)} (ratio ${ratio(p.margin_ratio)}), needs ${n(p.required_npsha, u.npsh, 3)} — ${verdict}${p.npshr_extrapolated ? ' (NPSH3 extrapolated)' : ''}`);
    }
    const r = v.npsh.range;
    if (r) {
      const verdict = r.worst_verdict === 'meets-guidance' ? 'ok' : r.worst_verdict === 'below-guidance' ? 'BELOW GUIDANCE' : 'CAVITATION';
      L.push(`  from minimum flow ${n(r.from_flow, u.flow)} to run-out ${n(r.to_flow, u.flow)} per pump (${r.run_out_basis}): lowest margin at ${n(r.worst_flow, u.flow)}, NPSHa ${n(r.worst_npsha, u.npsh, 3)}, NPSH3 ${n(r.worst_npshr, u.npsh, 3)}, ratio ${ratio(r.worst_margin_ratio)} — ${verdict}${r.npshr_extrapolated ? ' (NPSH3 extrapolated in part)' : ''}`);
      L.push(`  highest allowable impeller-eye elevation above the liquid surface keeping the margin: ${n(r.max_eye_elevation, u.npsh, 3)}${(r.max_eye_elevation ?? 0) < 0 ? ' (negative: the eye must sit below the surface)' : ''}`);
    }
    L.push(`  ${v.npsh.npsh3_basis}`);
    if (v.npsh.velocity_head_check) L.push(`  ${v.npsh.velocity_head_check}`);
    L.push(`  Caution: ${v.npsh.caution}`);
  }
  if (v.motor) {
    const m = v.motor;
    L.push('');
    L.push(`Motor (${m.standard === 'nema' ? 'NEMA' : 'IEC'} ratings):`);
    L.push(`  largest power to the end of the curve ${n(m.sizing_power, u.power)} at ${n(m.sizing_flow, u.flow)}; at the duty ${n(m.duty_power, u.power)}`);
    L.push(`  next standard size: ${m.rating ?? 'none in the list'}${m.rating ? ` (${n(m.rating_power, u.power)}; loaded ${pc(m.load_at_duty, 0)} at the duty, ${pc(m.load_at_sizing, 0)} at most)` : ''}`);
    for (const note of m.notes) L.push(`  ${note}`);
    L.push(`  Caution: ${m.caution}`);
  }
  if (v.energy) {
    const e = v.energy;
    L.push('');
    L.push(`Energy: ${e.pumps > 1 ? `${e.pumps} pumps, ` : ''}shaft ${n(e.shaft_power, u.power)}, input ${n(e.input_power, u.power)} at ${pc(e.motor_efficiency)} motor efficiency; ${n(e.energy_kWh_per_year, 'kWh')} per year over ${e.hours_per_year} h${e.cost_per_year === null ? '' : `, cost ${plain(e.cost_per_year)} per year at the given tariff`}`);
  }
  if (v.problems.length) {
    L.push('');
    L.push('Problems:');
    for (const p of v.problems) L.push(`  FAIL  ${p}`);
  }
  if (v.warnings.length) {
    L.push('');
    L.push('Warnings:');
    for (const w of v.warnings) L.push(`  WARN  ${w}`);
  }
  L.push('');
  for (const c of v.cautions) L.push(`Caution: ${c}`);
  return `${L.join('\n')}\n`;
}
