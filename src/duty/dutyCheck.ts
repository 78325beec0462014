/**
 * The whole duty check for one curve set, as data: system curve, operating point of every
 * captured diameter, the trim that meets the duty, parallel operation, variable speed, NPSH
 * margin at each point, motor and energy. SI throughout; the CLI and screens format it.
 */
import type { CurveSet } from '../model/curveset.ts';
import { membersByDiameter, NPSH3_TRIM_RULE, withSheetNpsh3 } from '../fit/affinity.ts';
import { displayFor } from '../fit/checks/display.ts';
import { familyFigures } from '../fit/checks/speedFigures.ts';
import { NSS_US_CAUTION } from '../fit/specificSpeed.ts';
import { parallelPumps, pumpCurveAtSpeed, pumpCurveOfMember, type PumpCurve } from './pumpCurve.ts';
import { figuresAt, operatingPoint, type OperatingPointResult, type PointFigures } from './operatingPoint.ts';
import { fitSystemCurve, systemCurveThroughDuty, systemHead, type SystemCurve } from './systemCurve.ts';
import { curveAtDiameter, meetDuty, type DutyMatch } from './meetDuty.ts';
import { parallelOperation, type ParallelResult } from './parallel.ts';
import { speedToDuty, type SpeedResult } from './speed.ts';
import { resolveSite, type ResolvedSite, type SiteInput } from './site.ts';
import { npshAvailable, velocityHeadReconciliation, type NpshAvailable } from './npsh.ts';
import { npshOverRange, type NpshRangeResult } from './npshRange.ts';
import { failingFindings } from './trust.ts';
import { judgeNpshMargin, npshMarginRule, type NpshApplication, type NpshJudgement, type NpshMarginRule } from './npshMargin.ts';
import { nonOverloadingPower, selectMotor, type MotorSelection, type MotorStandard } from './motor.ts';
import { annualEnergy, type EnergyResult } from './energy.ts';
import { EXTRAPOLATION_CAUTION, MOTOR_CAUTION, NPSH_CAUTION, PRELIMINARY, serviceCaution, type Service } from './cautions.ts';
import { DutyError } from './errors.ts';
import { belowMinFlow, curveAtSpeedInFamily, membersRatedFirst, SPEED_FAMILY_NO_TRIM, speedToDutyInFamily } from './speed.ts';

export interface DutyCheckInput {
  /** Duty of the whole installation: total flow [m³/s] and head [m]. */
  flow_m3s: number;
  head_m: number;
  /** System curve: through the duty with this static head [m] (default 0), or fitted to points. */
  static_head_m?: number;
  system_points?: ReadonlyArray<readonly [number, number]>;
  system_exponent?: number;
  density_kg_m3?: number;
  /** Further impeller diameters [m] (trims between or below the captured ones) to give operating points for. */
  extra_diameters_m?: number[];
  /** Identical pumps running in parallel (1…3 typical; default 1). */
  parallel_count?: number;
  /** Also find the speed that meets the duty with the full impeller. */
  variable_speed?: boolean;
  site?: SiteInput;
  application?: NpshApplication;
  motor_standard?: MotorStandard;
  energy?: { hours_per_year: number; motor_efficiency: number; tariff_per_kWh?: number; drive_efficiency?: number };
  service?: Service;
}

export interface NpshAtPoint {
  where: string;
  flow_m3s: number;
  available: NpshAvailable;
  judgement?: NpshJudgement;
  /** NPSH3 was read outside its captured range. */
  npshr_extrapolated: boolean;
}

export interface OperatingPointEntry {
  kind: 'captured' | 'trim';
  diameter_m?: number;
  label: string;
  result: OperatingPointResult;
  /** Each pump's figures when `parallel_count` > 1. */
  per_pump?: PointFigures;
}

export interface DutyCheckReport {
  duty: { flow_m3s: number; head_m: number; per_pump_flow_m3s: number };
  system: SystemCurve;
  parallel_count: number;
  /** One per captured diameter (the combination of `parallel_count` pumps when more than one). */
  /** One per captured diameter, then one per requested trim ('trim'); combined for `parallel_count` pumps. */
  operating_points: OperatingPointEntry[];
  /** The trim (or speed) meeting the duty, per pump. */
  trim: DutyMatch;
  /** Where the selected (trimmed) pump(s) run on the system curve: the duty itself unless the system curve was fitted to a table. */
  trim_operating_point?: OperatingPointResult;
  parallel?: ParallelResult;
  speed?: SpeedResult;
  npsh?: {
    site: ResolvedSite;
    rule: NpshMarginRule;
    points: NpshAtPoint[];
    /** The margin judged from minimum flow to run-out (one pump alone), with the allowable eye elevation. */
    range?: NpshRangeResult & { run_out_basis: string };
    /** Where NPSH3 of a trim comes from (common practice). */
    npsh3_basis: string;
    /** The velocity-head convention reconciled with the hand method, at the duty. */
    velocity_head?: string;
    caution: string;
  };
  motor?: { standard: MotorStandard; peak_flow_m3s: number; selection: MotorSelection; caution: string };
  energy?: EnergyResult & { hours_per_year: number; motor_efficiency: number; shaft_power_W: number; pumps: number };
  /** One sentence: what the check concludes. Never says the duty is met while a problem stands. */
  headline: string;
  /** Problems that fail the check (duty not met, cavitation, margin below guidance). */
  problems: string[];
  /** Warnings beside the results. */
  warnings: string[];
  cautions: string[];
}

export function dutyCheck(set: CurveSet, input: DutyCheckInput): DutyCheckReport {
  const count = input.parallel_count ?? 1;
  if (!Number.isInteger(count) || count < 1 || count > 6) throw new DutyError(`The number of pumps in parallel must be a whole number from 1 to 6, not ${count}.`);
  const density = input.density_kg_m3 ?? input.site?.density_kg_m3 ?? set.fluid.density_kg_m3;
  const system = input.system_points
    ? fitSystemCurve(input.system_points, {
        ...(input.static_head_m !== undefined ? { static_head_m: input.static_head_m } : {}),
        ...(input.system_exponent !== undefined ? { exponent: input.system_exponent } : {}),
      })
    : systemCurveThroughDuty(input.static_head_m ?? 0, input.flow_m3s, input.head_m, input.system_exponent ?? 2);
  const perPumpFlow = input.flow_m3s / count;
  const offCurve = systemHead(system, input.flow_m3s) / input.head_m - 1;
  const problems: string[] = [];
  const warnings: string[] = [];
  const cautions: string[] = [PRELIMINARY];
  const service = input.service ?? (input.application === 'hydrocarbon' ? 'hazardous' : 'general');
  const code = serviceCaution(service);
  if (code) cautions.push(code);
  if (Math.abs(offCurve) > 0.01) warnings.push(`The duty point lies ${(Math.abs(offCurve) * 100).toFixed(1)} % ${offCurve > 0 ? 'below' : 'above'} the system curve; the trim meets the duty point, and the pump then runs where its curve crosses the system curve.`);
  if (input.static_head_m === undefined && !input.system_points) warnings.push('No static head given: the system curve is taken as pure friction through the duty point (H = k·Q²).');

  const members = membersRatedFirst(set);
  const entryFor = (single: PumpCurve, kind: OperatingPointEntry['kind']): OperatingPointEntry => {
    const result = operatingPoint(parallelPumps(single, count), system);
    const entry: OperatingPointEntry = { kind, label: single.label, result, ...(single.diameter_m !== undefined ? { diameter_m: single.diameter_m } : {}) };
    if (result.status === 'ok' && count > 1) entry.per_pump = figuresAt(single, result.point.flow_m3s / count);
    return entry;
  };
  const failing = failingFindings(set);
  if (failing) problems.push(failing);
  const operating_points = members.map((m) => entryFor(pumpCurveOfMember(withSheetNpsh3(set, m), density, set.fluid.density_kg_m3), 'captured'));
  for (const d of input.extra_diameters_m ?? []) {
    if (!(d > 0)) throw new DutyError(`An impeller diameter to evaluate must be positive, not ${d} m.`);
    if (set.family === 'speed') throw new DutyError(SPEED_FAMILY_NO_TRIM);
    if (membersByDiameter(set).length === 0) throw new DutyError('This curve set has no impeller diameters, so no trim can be evaluated.');
    const curve = curveAtDiameter(set, d, density);
    operating_points.push(entryFor({ ...curve, label: `trim ${displayFor(set.display_units).diameter(d)}` }, 'trim'));
  }

  const trim = meetDuty(set, { flow_m3s: perPumpFlow, head_m: input.head_m, static_head_m: system.static_head_m, density_kg_m3: density });
  if (trim.status !== 'meets') problems.push(trim.message);
  else {
    if (trim.below_trim_limit) warnings.push(`The trim is ${(100 * (trim.trim_ratio ?? 0)).toFixed(1)} % of full diameter, below the usual ${Math.round(100 * (trim.trim_limit_ratio ?? 0.8))} % limit (Lobanoff & Ross): efficiency falls and the prediction is less reliable.`);
    if (trim.trim_extrapolated) warnings.push('The trim lies below the smallest captured diameter: its curve is an affinity extrapolation.');
    if (trim.point && trim.point.por_position !== 'within' && trim.point.por_position !== 'unknown') {
      warnings.push(`At the duty each pump runs ${trim.point.por_position} its preferred operating region (${((trim.point.flow_to_bep ?? 0) * 100).toFixed(0)} % of BEP flow).`);
    }
    if (trim.point?.extrapolated.length) warnings.push(EXTRAPOLATION_CAUTION);
    if (trim.outside_affinity_band) warnings.push('The speed lies outside ±20 % of the captured speed, where the affinity law is less exact.');
    if (trim.warnings) warnings.push(...trim.warnings);
    const below = belowMinFlow(set, trim.point);
    if (below) warnings.push(below);
  }
  // The curve the installation runs on: the trimmed (or speed-matched) one; none when the duty cannot be met.
  const selected: PumpCurve | undefined = selectedCurve(set, trim, density);

  const report: DutyCheckReport = {
    duty: { flow_m3s: input.flow_m3s, head_m: input.head_m, per_pump_flow_m3s: perPumpFlow },
    system,
    parallel_count: count,
    operating_points,
    trim,
    headline: '',
    problems,
    warnings,
    cautions,
  };
  if (selected) report.trim_operating_point = operatingPoint(parallelPumps(selected, count), system);

  if (selected && count > 1) {
    report.parallel = parallelOperation(selected, count, system);
    const per = report.parallel.per_pump;
    if (per && per.por_position !== 'within' && per.por_position !== 'unknown') warnings.push(`In parallel each pump runs ${per.por_position} its POR (${((per.flow_to_bep ?? 0) * 100).toFixed(0)} % of BEP flow).`);
    const alone = report.parallel.single;
    if (alone.status !== 'ok') warnings.push(`With one pump running alone: ${alone.message}`);
    else if (alone.point.por_position === 'above') warnings.push(`With one pump running alone it runs out beyond its POR (${((alone.point.flow_to_bep ?? 0) * 100).toFixed(0)} % of BEP flow): check its power and NPSH there.`);
  }

  if (input.variable_speed) {
    const full = members[0];
    if (full) {
      // The system curve is in TOTAL flow: the speed is found for the combination of `count`
      // pumps at the total duty flow, then each pump's figures are read at its share.
      const single = pumpCurveOfMember(withSheetNpsh3(set, full), density, set.fluid.density_kg_m3);
      const found = set.family === 'speed' && count === 1 ? speedToDutyInFamily(set, system, input.flow_m3s, density) : speedToDuty(parallelPumps(single, count), system, input.flow_m3s);
      report.speed = found.status === 'ok' && count > 1 ? { ...found, point: figuresAt(pumpCurveAtSpeed(single, found.speed_rpm), perPumpFlow) } : found;
    }
  }

  if (input.site) report.npsh = npshSection(set, input, selected, report, problems, warnings);

  if (selected) {
    const standard = input.motor_standard ?? 'iec';
    const peak = nonOverloadingPower(selected);
    if (peak) {
      const selection = selectMotor(peak.power_W, standard, trim.point?.power_W);
      report.motor = { standard, peak_flow_m3s: peak.flow_m3s, selection, caution: MOTOR_CAUTION };
      if (!selection.rating) problems.push(selection.notes[0] ?? 'No standard motor is large enough.');
    } else warnings.push('The curve set has neither a power curve nor an efficiency curve, so no motor size can be given.');
  }

  if (input.energy) {
    const shaft = trim.point?.power_W;
    if (shaft === undefined) warnings.push('No shaft power at the duty, so no energy estimate.');
    else {
      const e = annualEnergy({ shaft_power_W: shaft * count, ...input.energy });
      report.energy = { ...e, hours_per_year: input.energy.hours_per_year, motor_efficiency: input.energy.motor_efficiency, shaft_power_W: shaft * count, pumps: count };
    }
  }
  report.headline = headlineOf(report);
  return report;
}

function selectedCurve(set: CurveSet, trim: DutyMatch, density: number): PumpCurve | undefined {
  if (trim.status !== 'meets') return undefined;
  if (trim.method === 'trim' && trim.diameter_m !== undefined) return curveAtDiameter(set, trim.diameter_m, density);
  if (set.family === 'speed' && trim.speed_rpm !== undefined) return curveAtSpeedInFamily(set, trim.speed_rpm, density).curve;
  const fastest = [...set.members].sort((a, b) => b.speed_rpm - a.speed_rpm)[0];
  if (!fastest || trim.speed_rpm === undefined) return undefined;
  const base = pumpCurveOfMember(fastest, density, set.fluid.density_kg_m3);
  return pumpCurveAtSpeed(base, trim.speed_rpm);
}

function npshSection(set: CurveSet, input: DutyCheckInput, selected: PumpCurve | undefined, report: DutyCheckReport, problems: string[], warnings: string[]): DutyCheckReport['npsh'] {
  const siteInput = input.site as SiteInput;
  const site = resolveSite({ ...siteInput, ...(siteInput.suction_loss_m > 0 && siteInput.loss_reference_flow_m3s === undefined ? { loss_reference_flow_m3s: report.duty.per_pump_flow_m3s } : {}) });
  const rule = npshMarginRule(input.application ?? 'general', familyFigures(set).nss_us);
  const points: NpshAtPoint[] = [];
  const judge = (where: string, f: PointFigures | undefined) => {
    if (!f) return;
    const available = npshAvailable(site, f.flow_m3s);
    const entry: NpshAtPoint = { where, flow_m3s: f.flow_m3s, available, npshr_extrapolated: f.extrapolated.includes('npshr') };
    if (f.npshr_m !== undefined && f.npshr_m > 0) entry.judgement = judgeNpshMargin(available.npsha_m, f.npshr_m, rule);
    points.push(entry);
  };
  judge('duty (trimmed impeller)', report.trim.point);
  if (report.parallel?.single.status === 'ok') judge('one pump running alone', report.parallel.single.point);
  for (const op of report.operating_points) {
    const name = op.diameter_m !== undefined && op.kind !== 'trim' ? displayFor(set.display_units).diameter(op.diameter_m) : op.label;
    if (op.result.status === 'ok') judge(`operating point, ${name}`, report.parallel_count > 1 ? op.per_pump : op.result.point);
  }
  const duty = points[0]?.judgement;
  if (duty && duty.verdict !== 'meets-guidance') problems.push(`NPSH at the duty: ${duty.message}`);
  else if (points[0] && !duty) warnings.push('The curve set has no NPSH3 curve at the duty flow, so the NPSH margin cannot be judged.');
  const alone = points.find((p) => p.where === 'one pump running alone')?.judgement;
  if (alone && alone.verdict === 'cavitation-expected') problems.push(`NPSH with one pump running alone: cavitation — ${alone.message}`);
  else if (alone && alone.verdict !== 'meets-guidance') problems.push(`NPSH with one pump running alone: ${alone.message}`);
  let range: (NpshRangeResult & { run_out_basis: string }) | undefined;
  if (selected) {
    const run = runOutRange(selected, report);
    const judged = npshOverRange(selected, site, rule, run.range);
    if (judged) {
      range = { ...judged, run_out_basis: run.basis };
      const w = judged.worst;
      const at = `${((100 * w.flow_m3s) / report.duty.per_pump_flow_m3s).toFixed(0)} % of the duty flow per pump`;
      if (judged.cavitation_from_m3s !== undefined && !problems.some((p) => /cavitation/i.test(p))) {
        problems.push(`NPSH from minimum flow to run-out: cavitation — NPSHa falls to NPSH3 from ${((100 * judged.cavitation_from_m3s) / report.duty.per_pump_flow_m3s).toFixed(0)} % of the duty flow per pump (${run.basis}).`);
      } else if (w.judgement.verdict === 'below-guidance' && !problems.some((p) => p.startsWith('NPSH'))) {
        problems.push(`NPSH from minimum flow to run-out: the margin falls below the ANSI/HI 9.6.1 guidance at ${at} (ratio ${w.judgement.ratio.toFixed(2)}, ${(w.judgement.required_npsha_m / w.judgement.npsh3_m).toFixed(2)} needed).`);
      }
      if (judged.npsh3_extrapolated) warnings.push('Part of the flow range to run-out lies outside the captured NPSH3 curve; NPSH3 there is extrapolated.');
    }
  }
  if (rule.nss_us !== undefined && rule.nss_us > NSS_US_CAUTION) {
    warnings.push(`Suction specific speed ${Math.round(rule.nss_us)} (US) is above about ${NSS_US_CAUTION}: suction recirculation is a traditional concern at part load; keep the pump near its BEP.`);
  }
  if (points.some((p) => p.npshr_extrapolated)) warnings.push('Some NPSH3 values were read outside the captured NPSH3 curve.');
  if (!selected) warnings.push('No trim meets the duty; NPSH is judged at the operating points of the captured diameters only.');
  const first = points[0];
  const vh = first && site.velocity_head_at ? velocityHeadReconciliation(first.available, site.velocity_head_at(first.flow_m3s)) : undefined;
  return { site, rule, points, ...(range ? { range } : {}), npsh3_basis: NPSH3_TRIM_RULE, ...(vh ? { velocity_head: vh } : {}), caution: NPSH_CAUTION };
}

/**
 * The per-pump flow range NPSH is judged over: from the lowest operating flow (all pumps at the
 * duty) to run-out — one pump left running alone on the same system, or the end of its curve
 * when it would run past it.
 */
export function runOutRange(single: PumpCurve, report: Pick<DutyCheckReport, 'duty' | 'system' | 'parallel_count' | 'trim_operating_point'>): { range: [number, number]; basis: string } {
  const duty = report.duty.per_pump_flow_m3s;
  const together = report.trim_operating_point?.status === 'ok' ? report.trim_operating_point.point.flow_m3s / report.parallel_count : duty;
  const alone = operatingPoint(single, report.system);
  const runOut = alone.status === 'ok' ? alone.point.flow_m3s : alone.status === 'beyond-end-of-curve' ? single.domain[1] : Math.max(duty, together);
  const basis =
    alone.status === 'beyond-end-of-curve'
      ? 'run-out taken at the end of the curve: the pump would run past it'
      : report.parallel_count > 1
        ? 'run-out with one pump of the set running alone'
        : 'run-out on the system curve';
  const lo = Math.max(single.domain[0], Math.min(duty, together, runOut));
  return { range: [lo, Math.max(lo, Math.min(single.domain[1], Math.max(duty, together, runOut)))], basis };
}

/** The headline: the fails first (naming them), never "meets the duty" while a problem stands. */
export function headlineOf(report: Pick<DutyCheckReport, 'problems' | 'trim' | 'npsh' | 'motor'>): string {
  if (report.problems.length) {
    const tags: string[] = [];
    for (const p of report.problems) {
      if (/^The curve set has failing findings/.test(p)) tags.push(p.replace(/;.*$/, ''));
      else if (/cavitation/i.test(p)) tags.push('cavitation expected');
      else if (/^NPSH/.test(p)) tags.push('NPSH margin below guidance');
      else if (/motor|rating/i.test(p)) tags.push('no standard motor');
      else tags.push(p.replace(/\.$/, ''));
    }
    return `Does not pass: ${[...new Set(tags)].join('; ')}.`;
  }
  const notJudged = report.npsh ? (report.npsh.points[0]?.judgement ? '' : ' NPSH margin not judged (no NPSH3 curve).') : ' NPSH margin not judged (no suction site given).';
  return `${report.trim.message}${notJudged}`;
}
