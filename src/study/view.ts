/**
 * The study result in the study's own units, as JSON-ready data (`pumpscribe study --json`), and
 * as a ranked text table. Units are named once at the top; nulls where a figure is not available.
 */
import { fromSI, parseUnit, roundSignificant, type UnitSystem } from '../units/index.ts';
import type { StudyResult } from './runStudy.ts';
import { isFailing } from './runStudy.ts';

export const STUDY_RESULT_FORMAT = 'pumpscribe.study-result';
export const STUDY_RESULT_VERSION = 1;

type Num = number | null;

export function studyView(result: StudyResult, system: UnitSystem, source: { file: string }) {
  const flowU = parseUnit('flow', system.flow);
  const headU = parseUnit('head', system.head);
  const npshU = parseUnit('head', system.npsh);
  const powerU = parseUnit('power', system.power);
  const diaU = parseUnit('diameter', system.diameter);
  const cv = (u: typeof flowU) => (v: number | undefined): Num => (v === undefined || !Number.isFinite(v) ? null : fromSI(v, u));
  const flow = cv(flowU);
  const head = cv(headU);
  const npsh = cv(npshU);
  const power = cv(powerU);
  const diameter = cv(diaU);
  const options = result.ranked.map((r, i) => ({
    rank: i + 1,
    name: r.name,
    result: isFailing(r) ? 'fail' : 'ok',
    pumps: r.pumps,
    control: r.control,
    diameter: diameter(r.diameter_m),
    speed: r.speed_rpm ?? r.rated_speed_rpm ?? null,
    flow: flow(r.duty?.flow_m3s),
    head: head(r.duty?.head_m),
    system_head: head(r.duty?.system_head_m),
    efficiency: r.duty?.efficiency === undefined ? null : r.duty.efficiency * 100,
    power: power(r.duty?.power_W),
    motor_rating: r.motor?.selection.rating?.label ?? null,
    motor_sizing_power: power(r.motor?.selection.sizing_power_W),
    npsha: npsh(r.npsh?.duty?.npsha_m),
    npsh3: npsh(r.npsh?.duty?.npsh3_m),
    npsh_margin_ratio: r.npsh?.duty?.judgement.ratio ?? null,
    run_out: r.npsh?.run_out ? { flow: flow(r.npsh.run_out.flow_m3s), npsha: npsh(r.npsh.run_out.npsha_m), npsh3: npsh(r.npsh.run_out.npsh3_m), npsh_margin_ratio: r.npsh.run_out.judgement.ratio, basis: r.npsh.run_out_basis } : null,
    max_eye_elevation: npsh(r.npsh?.max_eye_elevation_m),
    operating_points: {
      low_static: r.operating_points.low ? { flow: flow(r.operating_points.low.flow_m3s), head: head(r.operating_points.low.head_m), speed: r.operating_points.low.speed_rpm ?? null } : null,
      high_static: r.operating_points.high ? { flow: flow(r.operating_points.high.flow_m3s), head: head(r.operating_points.high.head_m), speed: r.operating_points.high.speed_rpm ?? null } : null,
    },
    annual_energy_kwh: r.energy?.kWh ?? null,
    annual_cost: r.energy?.cost ?? null,
    life_cycle_cost: r.lcc?.total ?? null,
    capital_cost: r.option.capital_cost ?? null,
    viscous_correction: r.viscous ?? null,
    velocity_head_check: r.npsh?.velocity_head ?? null,
    findings: r.findings.map((f) => `${f.severity}: ${f.message}`),
  }));
  return {
    format: STUDY_RESULT_FORMAT,
    version: STUDY_RESULT_VERSION,
    study: { file: source.file, name: result.study.name ?? null },
    units: { flow: flowU.token, head: headU.token, npsh: npshU.token, power: powerU.token, diameter: diaU.token, efficiency: '%', speed: 'rpm', annual_energy: 'kWh/year', cost: 'tariff currency' },
    basis: 'flow and power are the totals of all pumps at the duty; head, efficiency, NPSH and the motor rating are per pump; NPSHa at the lowest suction level; max_eye_elevation is above the lowest suction level',
    result: options.every((o) => o.result === 'fail') ? 'fail' : 'ok',
    why: result.why,
    options,
    notes: result.notes,
    cautions: result.cautions,
  };
}

export type StudyView = ReturnType<typeof studyView>;

/** The ranked table as text, cautions beside the NPSH and motor columns. */
export function studyText(v: StudyView): string {
  const u = v.units;
  const f = (x: Num | undefined, d = 4) => (x === null || x === undefined ? '—' : String(roundSignificant(x, d)));
  const label = (k: 'flow' | 'head' | 'npsh' | 'power' | 'diameter', kind: 'flow' | 'head' | 'power' | 'diameter') => parseUnit(kind, u[k]).label;
  const L: string[] = [];
  L.push(`Study — ${v.study.name ?? v.study.file}`);
  L.push(`Units: flow ${label('flow', 'flow')}, head and NPSH ${label('head', 'head')}, power ${label('power', 'power')}, diameter ${label('diameter', 'diameter')}, efficiency %, energy kWh/year, cost in the tariff's currency`);
  L.push(`Flow and power are totals of all pumps at the duty; efficiency, NPSH and motor are per pump.`);
  L.push(`Result: ${v.why}`);
  L.push('');
  const cols = ['#', 'option', 'flow', 'head', 'eff', 'power', 'motor', 'NPSHa', 'NPSH3', 'ratio', 'run-out ratio', 'eye max', 'kWh/yr', 'cost/yr', 'LCC', 'result'];
  const rows = v.options.map((o) => [
    String(o.rank), o.name, f(o.flow), f(o.head), f(o.efficiency, 3), f(o.power), o.motor_rating ?? '—', f(o.npsha, 3), f(o.npsh3, 3),
    o.npsh_margin_ratio === null ? '—' : o.npsh_margin_ratio.toFixed(2), o.run_out ? o.run_out.npsh_margin_ratio.toFixed(2) : '—', f(o.max_eye_elevation, 3),
    o.annual_energy_kwh === null ? '—' : Math.round(o.annual_energy_kwh).toString(), o.annual_cost === null ? '—' : Math.round(o.annual_cost).toString(),
    o.life_cycle_cost === null ? '—' : Math.round(o.life_cycle_cost).toString(), o.result === 'fail' ? 'FAIL' : 'ok',
  ]);
  const widths = cols.map((c, i) => Math.max(c.length, ...rows.map((r) => (r[i] as string).length)));
  const line = (cells: string[]) => cells.map((c, i) => (i === 1 ? c.padEnd(widths[i] as number) : c.padStart(widths[i] as number))).join('  ');
  L.push(line(cols));
  for (const r of rows) L.push(line(r));
  L.push('');
  for (const o of v.options) {
    L.push(`${o.rank}. ${o.name}: ${o.pumps} pump${o.pumps > 1 ? 's' : ''}, ${o.control === 'speed' ? 'variable speed' : 'throttled'}, impeller ${f(o.diameter)} ${label('diameter', 'diameter')}${o.speed ? ` at ${Math.round(o.speed)} rpm` : ''}`);
    const op = o.operating_points;
    L.push(`   operating points: low static ${op.low_static ? `${f(op.low_static.flow)} at ${f(op.low_static.head)}` : '—'}, high static ${op.high_static ? `${f(op.high_static.flow)} at ${f(op.high_static.head)}` : '—'}`);
    if (o.run_out) L.push(`   run-out ${f(o.run_out.flow)}: NPSHa ${f(o.run_out.npsha, 3)}, NPSH3 ${f(o.run_out.npsh3, 3)} (${o.run_out.basis}); highest eye elevation above the lowest level ${f(o.max_eye_elevation, 3)}`);
    if (o.velocity_head_check) L.push(`   ${o.velocity_head_check}`);
    for (const finding of o.findings) L.push(`   ${finding.startsWith('fail') ? 'FAIL' : finding.startsWith('warn') ? 'WARN' : 'note'}  ${finding.replace(/^(fail|warn|note): /, '')}`);
  }
  L.push('');
  for (const n of v.notes) L.push(`Note: ${n}`);
  for (const c of v.cautions) L.push(`Caution: ${c}`);
  return `${L.join('\n')}\n`;
}
