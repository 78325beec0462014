/**
 * One study option worked out, SI inside: system curves at the low and high static head from the
 * pipe runs, the impeller (drawn, trimmed to the duty or given), 1–3 pumps in parallel, control
 * by throttling or variable speed; the duty point, efficiency and shaft power; the motor
 * (non-overloading to the end of the curve); NPSHa, NPSH3 and the ANSI/HI 9.6.1 margin at the
 * duty and at run-out with the allowable eye elevation; annual energy from the operating profile,
 * its cost and the life-cycle cost. Problems become findings; a fail finding never leaves an option
 * looking sound. Pure: the curve set is handed in.
 *
 * Conventions (stated in the report): suction pipe runs belong to each pump (per-pump flow),
 * discharge runs carry the total flow; NPSHa is taken at the LOWEST suction level; the duty head is
 * the system head at the HIGHEST static head unless given; energy is computed at the mean static
 * head with all pumps running and throttling (or speed) to each profile flow; the run-out is one
 * pump alone at the lowest static head with the valve open (at the highest speed used).
 */
import type { CurveSet, Member } from '../model/curveset.ts';
import { StudyError as StudyError2 } from '../model/study.ts';
import { membersByDiameter, withSheetNpsh3 } from '../fit/affinity.ts';
import { familyFigures } from '../fit/checks/speedFigures.ts';
import { curveAtDiameter, TRIM_SEARCH_FLOOR } from '../duty/meetDuty.ts';
import { trimToDuty } from '../duty/trim.ts';
import { parallelPumps, pumpCurveAtSpeed, pumpCurveOfMember, type PumpCurve } from '../duty/pumpCurve.ts';
import { figuresAt, operatingPoint, type PointFigures } from '../duty/operatingPoint.ts';
import { bracketingSpeeds } from '../fit/speedFamily.ts';
import { curveAtSpeedInFamily, ratedMember, SPEED_FAMILY_NO_TRIM, speedToDuty, speedToDutyInFamily } from '../duty/speed.ts';
import { systemHead, type SystemCurve } from '../duty/systemCurve.ts';
import { runLoss, runsLoss, systemFromLoss, type LiquidFlowProps } from '../duty/pipeRun.ts';
import { resolveSite } from '../duty/site.ts';
import { npshAvailable, velocityHeadReconciliation, type SuctionSite } from '../duty/npsh.ts';
import { judgeNpshMargin, npshMarginRule, type NpshJudgement } from '../duty/npshMargin.ts';
import { npshOverRange, type NpshRangeResult } from '../duty/npshRange.ts';
import { nonOverloadingPower, selectMotor, type MotorSelection } from '../duty/motor.ts';
import { failingFindings } from '../duty/trust.ts';
import { waterKinematicViscosity } from '../physics/viscosity.ts';
import { viscousFactors, viscousParameterB, type ViscousFactors } from '../physics/viscousCorrection.ts';
import { STANDARD_GRAVITY } from '../units/constants.ts';
import { lifeCycleCost, type LifeCycleCost } from './lcc.ts';
import type { ResolvedOption } from './resolve.ts';

export interface StudyFinding {
  severity: 'fail' | 'warn' | 'note';
  message: string;
}

export interface NpshAt {
  flow_m3s: number;
  npsha_m: number;
  npsh3_m: number;
  judgement: NpshJudgement;
}

export interface OptionResult {
  name: string;
  option: ResolvedOption;
  pumps: number;
  control: 'throttle' | 'speed';
  diameter_m?: number;
  /** Speed at the design duty (variable speed) [rpm]. */
  speed_rpm?: number;
  rated_speed_rpm?: number;
  /** The design duty: total flow, the pump head there, the system head, per-pump efficiency, total shaft power. */
  duty?: { flow_m3s: number; head_m: number; system_head_m: number; efficiency?: number; power_W?: number; per_pump: PointFigures };
  /** Where the pumps run, all pumps, valve open (throttle) or at the duty (speed), at the low and high static head. */
  operating_points: { low?: { flow_m3s: number; head_m: number; speed_rpm?: number }; high?: { flow_m3s: number; head_m: number; speed_rpm?: number } };
  motor?: { selection: MotorSelection; peak_flow_m3s: number };
  npsh?: { duty?: NpshAt; run_out?: NpshAt; range?: NpshRangeResult; max_eye_elevation_m?: number; rule_basis: string; velocity_head?: string; run_out_basis: string };
  viscous?: { b: number; c_q: number; c_eta: number };
  energy?: { kWh: number; cost?: number; input_power_at_duty_W: number };
  lcc?: LifeCycleCost;
  findings: StudyFinding[];
  /** For drawing: one pump's curve as run (trimmed or drawn, rated speed), and the two system curves. */
  curve?: PumpCurve;
  /** For drawing a speed family (water) at the duty speed: the nearest drawn speed at or above it, scaled by the law. */
  curve_at_speed?: PumpCurve;
  systems: { low: SystemCurve; high: SystemCurve };
}

/** How figures inside sentences are written: in the study's units (SI metres and m³/h by default). */
export interface SentenceUnits {
  head(m: number): string;
  flow(m3s: number): string;
}

const SI_WORDS: SentenceUnits = { head: (m) => `${m.toFixed(2)} m`, flow: (q) => `${(q * 3600).toFixed(1)} m³/h` };

/** Works out one option on its curve set. Throws only for unusable input (UserError with a sentence). */
export function evaluateOption(set: CurveSet, o: ResolvedOption, words: SentenceUnits = SI_WORDS): OptionResult {
  const findings: StudyFinding[] = [];
  const failing = failingFindings(set);
  if (failing) findings.push({ severity: 'fail', message: failing });
  const site = resolveSite({
    temperature_K: o.liquid.temperature_K,
    suction_static_m: o.suction.surface_low_m,
    suction_loss_m: 0,
    ...(o.site.pressure_Pa !== undefined ? { site_pressure_Pa: o.site.pressure_Pa } : {}),
    ...(o.site.elevation_m !== undefined ? { elevation_m: o.site.elevation_m } : {}),
    ...(o.liquid.vapour_pressure_Pa !== undefined ? { vapour_pressure_Pa: o.liquid.vapour_pressure_Pa } : {}),
    ...(o.liquid.density_kg_m3 !== undefined ? { density_kg_m3: o.liquid.density_kg_m3 } : {}),
  });
  const density = site.density_kg_m3;
  const isWater = o.liquid.viscosity_m2_s === undefined;
  const liquid: LiquidFlowProps = { density_kg_m3: density, kinematic_viscosity_m2_s: o.liquid.viscosity_m2_s ?? waterKinematicViscosity(o.liquid.temperature_K), is_water: isWater };
  const n = o.pumps;
  const Qd = o.duty.flow_m3s;
  const qd = Qd / n;
  const suctionLoss = (q: number) => runsLoss(o.suction.pipes, q, liquid, o.friction);
  const loss = (Q: number) => runsLoss(o.discharge.pipes, Q, liquid, o.friction) + suctionLoss(Q / n);
  const basis = `static head plus suction (per pump) and discharge pipe runs by ${o.friction === 'hazen-williams' ? 'Hazen–Williams' : 'Darcy–Weisbach with Colebrook–White'}`;
  const sysLow = systemFromLoss(o.discharge.static_low_m, loss, Qd, `${basis}, lowest static head`);
  const sysHigh = systemFromLoss(o.discharge.static_high_m, loss, Qd, `${basis}, highest static head`);
  const sysMean = systemFromLoss(0.5 * (o.discharge.static_low_m + o.discharge.static_high_m), loss, Qd, `${basis}, mean static head`);
  const result: OptionResult = { name: o.name, option: o, pumps: n, control: o.control, operating_points: {}, findings, systems: { low: sysLow, high: sysHigh } };
  const regimes = [...o.suction.pipes.map((run) => runLoss(run, qd, liquid, o.friction)), ...o.discharge.pipes.map((run) => runLoss(run, Qd, liquid, o.friction))];
  if (regimes.some((r) => r.regime === 'transitional')) findings.push({ severity: 'warn', message: 'A pipe run is in the laminar–turbulent transition at the duty (Re 2000–4000), where the friction factor is uncertain.' });
  const designHead = o.duty.head_m ?? systemHead(sysHigh, Qd);
  if (o.duty.head_m !== undefined && Math.abs(o.duty.head_m / systemHead(sysHigh, Qd) - 1) > 0.02) {
    findings.push({ severity: 'warn', message: `The given duty head differs by ${(100 * Math.abs(o.duty.head_m / systemHead(sysHigh, Qd) - 1)).toFixed(1)} % from the system head the pipe runs give at the highest static head.` });
  }

  // The impeller, one pump at rated speed (viscosity-corrected when the liquid is viscous).
  let viscous: ViscousFactors | undefined;
  const correct = (c: PumpCurve) => (viscous ? viscousCurve(c, viscous, density) : c);
  const byDiameter = set.family === 'speed' ? [] : membersByDiameter(set);
  const full = ratedMember(set);
  if (set.family === 'speed' && (o.impeller.kind === 'trim' || o.impeller.diameter_m !== undefined)) throw new StudyError2(`Option "${o.name}": ${SPEED_FAMILY_NO_TRIM}`);
  const fullWater = pumpCurveOfMember(withSheetNpsh3(set, full), density, set.fluid.density_kg_m3);
  if (!isWater) {
    const bep = fullWater.bep_flow_m3s;
    if (!fullWater.efficiency) throw new StudyError2(`Option "${o.name}": the curve set has no efficiency curve, so the viscosity correction (ANSI/HI 9.6.7) cannot be applied; give tested viscous curves instead.`);
    if (bep === undefined) throw new StudyError2(`Option "${o.name}": the curve set has no BEP, so the viscosity correction (ANSI/HI 9.6.7) cannot be applied; give tested viscous curves instead.`);
    const eyes = set.pump.suction === 'double' ? 2 : 1;
    const stages = set.pump.stages ?? 1;
    const b = viscousParameterB((o.liquid.viscosity_m2_s as number) * 1e6, (bep * 3600) / eyes, fullWater.head(bep) / stages, full.speed_rpm);
    viscous = viscousFactors(b); // refuses B ≥ 40 with a sentence
    result.viscous = { b, c_q: viscous.c_q, c_eta: viscous.c_eta };
    findings.push({ severity: 'note', message: `Viscous liquid: flow, head and efficiency corrected by ANSI/HI 9.6.7 (from memory; confirm with the standard): B = ${b.toFixed(2)}, C_Q = ${viscous.c_q.toFixed(3)}, C_η = ${viscous.c_eta.toFixed(3)}.` });
  }
  let single: PumpCurve | undefined;
  if (o.impeller.kind === 'trim') {
    if (byDiameter.length === 0) throw new StudyError2(`Option "${o.name}" asks for a trim, but the curve set has no impeller diameters; use "drawn".`);
    const dFull = full.diameter_m as number;
    const smallest = byDiameter[byDiameter.length - 1]?.diameter_m as number;
    const ns = familyFigures(set).ns_us;
    const t = trimToDuty({ curveAt: (d) => correct(curveAtDiameter(set, d, density)), full_diameter_m: dFull, min_diameter_m: Math.min(smallest, TRIM_SEARCH_FLOOR * dFull), ...(ns !== undefined ? { ns_us: ns } : {}) }, qd, designHead);
    if (t.status !== 'ok') {
      findings.push({ severity: 'fail', message: t.message });
      return result;
    }
    result.diameter_m = t.diameter_m;
    if (t.below_limit) findings.push({ severity: 'warn', message: `The trim is ${(100 * t.ratio).toFixed(1)} % of full diameter, below the usual ${Math.round(100 * t.limit_ratio)} % limit (Lobanoff & Ross).` });
    single = correct(curveAtDiameter(set, t.diameter_m, density));
  } else if (o.impeller.diameter_m !== undefined) {
    const d = o.impeller.diameter_m;
    if (o.impeller.kind === 'drawn' && !byDiameter.some((m) => Math.abs((m.diameter_m as number) / d - 1) < 0.005)) {
      throw new StudyError2(`Option "${o.name}": ${(d * 1000).toFixed(1)} mm is not a drawn diameter of the curve set; use "given" for a trim to that diameter.`);
    }
    result.diameter_m = d;
    single = correct(curveAtDiameter(set, d, density));
  } else {
    if (full.diameter_m !== undefined) result.diameter_m = full.diameter_m;
    single = correct(fullWater);
  }
  result.curve = single;
  result.rated_speed_rpm = single.speed_rpm;
  const combined = parallelPumps(single, n);

  // Operating points and the design duty.
  let runSpeed = single.speed_rpm;
  if (o.control === 'throttle') {
    for (const [key, sys] of [['low', sysLow], ['high', sysHigh]] as const) {
      const op = operatingPoint(combined, sys);
      if (op.status === 'ok') result.operating_points[key] = { flow_m3s: op.point.flow_m3s, head_m: op.point.head_m };
      else findings.push({ severity: 'warn', message: `At the ${key} static head with the valve open: ${op.message}` });
    }
    const per = figuresAt(single, qd);
    const need = systemHead(sysHigh, Qd);
    if (per.head_m < Math.max(need, designHead) * (1 - 1e-9)) {
      findings.push({ severity: 'fail', message: `The pump${n > 1 ? 's' : ''} cannot deliver the duty flow: ${words.head(per.head_m)} of head at ${words.flow(qd)} per pump where the system needs ${words.head(Math.max(need, designHead))} at the highest static head.` });
    } else if (o.impeller.kind !== 'trim' && per.head_m > need * 1.005) {
      findings.push({ severity: 'note', message: `Throttling burns ${words.head(per.head_m - need)} of head at the duty (the valve closes in to hold the duty flow at the highest static head).` });
    }
    if (per.extrapolated.length) findings.push({ severity: 'warn', message: `At the duty the curve is read outside its captured range (${per.extrapolated.join(', ')}); treat the figures as rough.` });
    result.duty = { flow_m3s: Qd, head_m: per.head_m, system_head_m: need, per_pump: per, ...(per.efficiency !== undefined ? { efficiency: per.efficiency } : {}), ...(per.power_W !== undefined ? { power_W: per.power_W * n } : {}) };
  } else {
    const speeds: number[] = [];
    for (const [key, sys] of [['low', sysLow], ['high', sysHigh]] as const) {
      // A speed family with one pump on water: the speed from the bracketing drawn curves (src/duty/speed.ts).
      const fam = set.family === 'speed' && n === 1 && !viscous ? speedToDutyInFamily(set, sys, Qd, density) : undefined;
      const s = fam ?? speedToDuty(combined, sys, Qd);
      if (s.status !== 'ok') {
        findings.push({ severity: 'fail', message: `At the ${key} static head no speed meets the duty: ${s.message}` });
        continue;
      }
      speeds.push(s.speed_rpm);
      result.operating_points[key] = { flow_m3s: Qd, head_m: systemHead(sys, Qd), speed_rpm: s.speed_rpm };
      if (s.ratio > 1 + 1e-9) findings.push({ severity: 'fail', message: `At the ${key} static head the duty needs ${(100 * s.ratio).toFixed(1)} % of rated speed; the drive would have to overspeed the pump.` });
      else if (s.outside_affinity_band) findings.push({ severity: 'warn', message: `At the ${key} static head the speed is ${(100 * s.ratio).toFixed(0)} % of rated, outside ±20 % where the affinity law is close to exact.` });
      if (key === 'high') {
        const per = fam?.status === 'ok' ? fam.point : figuresAt(pumpCurveAtSpeed(single, s.speed_rpm), qd);
        if (fam?.status === 'ok') for (const w of fam.warnings) findings.push({ severity: 'warn', message: w });
        result.speed_rpm = s.speed_rpm;
        result.duty = { flow_m3s: Qd, head_m: per.head_m, system_head_m: per.head_m, per_pump: per, ...(per.efficiency !== undefined ? { efficiency: per.efficiency } : {}), ...(per.power_W !== undefined ? { power_W: per.power_W * n } : {}) };
      }
    }
    if (speeds.length) runSpeed = Math.min(single.speed_rpm, Math.max(...speeds));
    const at = result.speed_rpm;
    if (set.family === 'speed' && !viscous && at !== undefined) result.curve_at_speed = curveAtSpeedInFamily(set, at, density, bracketingSpeeds(set, at).above).curve;
  }

  // Motor: non-overloading to the end of the curve at rated speed (common practice).
  const peak = nonOverloadingPower(single);
  if (peak) {
    const selection = selectMotor(peak.power_W, o.motor_standard, result.duty?.per_pump.power_W);
    if (o.control === 'speed') selection.notes.push('With variable speed the motor is still sized for the rated-speed curve, so the drive may reach rated speed without overload.');
    result.motor = { selection, peak_flow_m3s: peak.flow_m3s };
    if (!selection.rating) findings.push({ severity: 'fail', message: selection.notes[0] ?? 'No standard motor is large enough.' });
  } else findings.push({ severity: 'warn', message: 'The curve set has neither a power nor an efficiency curve, so no motor size can be given.' });

  // NPSH at the duty, at run-out and over the range, at the lowest suction level.
  result.npsh = npshSection(o, site, single, runSpeed, sysLow, result, suctionLoss, set, findings, words);

  // Energy, cost and life-cycle cost.
  energySection(o, single, combined, sysMean, result, findings);
  return result;
}

function npshSection(o: ResolvedOption, resolved: ReturnType<typeof resolveSite>, single: PumpCurve, runSpeed: number, sysLow: SystemCurve, result: OptionResult, suctionLoss: (q: number) => number, set: CurveSet, findings: StudyFinding[], words: SentenceUnits): OptionResult['npsh'] {
  const last = o.suction.pipes[o.suction.pipes.length - 1];
  const site: SuctionSite = {
    ...resolved,
    suction_static_m: o.suction.surface_low_m,
    suction_loss_m: 0,
    loss_at: suctionLoss,
    ...(last ? { velocity_head_at: (q: number) => (((4 * q) / (Math.PI * last.diameter_m ** 2)) ** 2) / (2 * STANDARD_GRAVITY) } : {}),
  };
  const rule = npshMarginRule(o.application, familyFigures(set).nss_us);
  // On a speed family (water) NPSH3 at a reduced speed comes from the nearest drawn speed at or
  // above it (src/duty/speed.ts, as the duty check reads it), not from the rated curve scaled.
  const atSpeed = (n: number) => (set.family === 'speed' && !result.viscous ? curveAtSpeedInFamily(set, n, resolved.density_kg_m3).curve : pumpCurveAtSpeed(single, n));
  const runCurve = runSpeed < single.speed_rpm * (1 - 1e-12) ? atSpeed(runSpeed) : single;
  const alone = operatingPoint(runCurve, sysLow);
  const runOutBasis = alone.status === 'beyond-end-of-curve' ? 'run-out taken at the end of the curve: one pump alone would run past it' : `run-out: one pump ${o.pumps > 1 ? 'of the set ' : ''}running alone at the lowest static head, valve open${o.control === 'speed' ? ', at the highest speed used' : ''}`;
  if (alone.status === 'beyond-end-of-curve') findings.push({ severity: 'warn', message: 'One pump alone at the lowest static head would run beyond the end of its curve; run-out is judged at the end of the curve.' });
  const qd = o.duty.flow_m3s / o.pumps;
  const runOutFlow = alone.status === 'ok' ? alone.point.flow_m3s : runCurve.domain[1];
  const minFlows = [qd, ...o.operation.profile.map((p) => (p.fraction * o.duty.flow_m3s) / o.pumps)];
  if (result.operating_points.high && o.control === 'throttle') minFlows.push(result.operating_points.high.flow_m3s / o.pumps);
  const lo = Math.max(runCurve.domain[0], Math.min(...minFlows));
  const hi = Math.max(lo, Math.min(runCurve.domain[1], Math.max(runOutFlow, qd)));
  const out: NonNullable<OptionResult['npsh']> = { rule_basis: rule.basis, run_out_basis: runOutBasis };
  const dutyCurve = o.control === 'speed' && result.speed_rpm ? atSpeed(result.speed_rpm) : single;
  if (!single.npshr) {
    findings.push({ severity: 'warn', message: 'The curve set has no NPSH3 curve, so the NPSH margin cannot be judged.' });
    return out;
  }
  const at = (curve: PumpCurve, q: number): NpshAt => {
    const a = npshAvailable(site, q);
    const n3 = (curve.npshr as (q: number) => number).call(curve, q);
    return { flow_m3s: q, npsha_m: a.npsha_m, npsh3_m: n3, judgement: judgeNpshMargin(a.npsha_m, n3, rule) };
  };
  out.duty = at(dutyCurve, qd);
  out.run_out = at(runCurve, runOutFlow <= runCurve.domain[1] ? runOutFlow : runCurve.domain[1]);
  const range = npshOverRange(runCurve, site, rule, [lo, hi]);
  if (range) {
    out.range = range;
    out.max_eye_elevation_m = range.max_eye_elevation_m;
    if (range.npsh3_extrapolated) findings.push({ severity: 'warn', message: 'Part of the range to run-out lies outside the captured NPSH3 curve (extrapolated).' });
  }
  if (site.velocity_head_at) out.velocity_head = velocityHeadReconciliation(npshAvailable(site, qd), site.velocity_head_at(qd), words.head);
  const worst = [out.duty.judgement, out.run_out.judgement, range?.worst.judgement].filter((j): j is NpshJudgement => j !== undefined);
  if (worst.some((j) => j.verdict === 'cavitation-expected')) {
    const where = out.duty.judgement.verdict === 'cavitation-expected' ? 'at the duty' : 'towards run-out';
    findings.push({ severity: 'fail', message: `NPSH: cavitation expected ${where} — NPSHa falls to NPSH3 or below (${runOutBasis}).` });
  } else if (worst.some((j) => j.verdict === 'below-guidance')) {
    findings.push({ severity: 'fail', message: `NPSH margin below the ANSI/HI 9.6.1 guidance between minimum flow and run-out (lowest ratio ${Math.min(...worst.map((j) => j.ratio)).toFixed(2)}; ${rule.basis}).` });
  }
  return out;
}

function energySection(o: ResolvedOption, single: PumpCurve, combined: PumpCurve, sysMean: SystemCurve, result: OptionResult, findings: StudyFinding[]): void {
  const op = o.operation;
  const eff = op.motor_efficiency * op.drive_efficiency;
  let kWh = 0;
  let dutyInput: number | undefined;
  for (const step of op.profile) {
    if (step.hours === 0) continue;
    const Q = step.fraction * o.duty.flow_m3s;
    let shaft: number | undefined;
    if (o.control === 'speed') {
      const s = speedToDuty(combined, sysMean, Q);
      if (s.status === 'ok') shaft = (s.point.power_W ?? Number.NaN);
    } else {
      const q = Q / o.pumps;
      if (single.head(q) >= systemHead(sysMean, Q) * (1 - 1e-9) && single.power) shaft = o.pumps * single.power(q);
    }
    if (shaft === undefined || !Number.isFinite(shaft)) {
      findings.push({ severity: step.fraction <= 1 ? 'fail' : 'warn', message: `The operating profile asks for ${(step.fraction * 100).toFixed(0)} % of the duty flow, which the option cannot deliver at the mean static head; no energy figure for it.` });
      return;
    }
    const input = shaft / eff;
    if (step.fraction === 1) dutyInput = input;
    kWh += (input * step.hours) / 1000;
  }
  result.energy = { kWh, input_power_at_duty_W: dutyInput ?? (result.duty?.power_W ?? 0) / eff };
  if (op.tariff === undefined) {
    findings.push({ severity: 'note', message: 'No tariff given, so no energy cost or life-cycle cost.' });
    return;
  }
  result.energy.cost = kWh * op.tariff;
  result.lcc = lifeCycleCost({
    ...(result.option.capital_cost !== undefined ? { capital: result.option.capital_cost } : {}),
    annual_energy_cost: result.energy.cost,
    annual_maintenance: op.maintenance_per_year,
    years: op.years,
    rate: op.discount_rate,
    escalation: op.energy_escalation,
  });
  if (result.option.capital_cost === undefined) findings.push({ severity: 'note', message: 'No capital cost given: the life-cycle cost holds energy and maintenance only.' });
}

/**
 * The pump curve for a viscous liquid from its water curve (ANSI/HI 9.6.7, from memory): at a
 * viscous flow q the water flow is q/C_Q; head C_H·H_W, efficiency C_η·η_W, power ρgqH/η. NPSH3
 * is read at the water flow q/C_Q (larger, on the safe side; the method gives no NPSH correction).
 */
export function viscousCurve(water: PumpCurve, f: ViscousFactors, density_kg_m3: number): PumpCurve {
  const cq = f.c_q;
  const qb = water.bep_flow_m3s as number;
  const eff = water.efficiency;
  const npsh = water.npshr;
  const head = (q: number) => f.c_h(q / cq / qb) * water.head(q / cq);
  const efficiency = eff ? (q: number) => f.c_eta * eff.call(water, q / cq) : undefined;
  const scale = (r: readonly [number, number]): [number, number] => [r[0] * cq, r[1] * cq];
  return {
    ...water,
    label: `${water.label} (viscous)`,
    domain: scale(water.domain),
    head,
    ...(efficiency ? { efficiency, power: (q: number) => (q > 0 ? (density_kg_m3 * STANDARD_GRAVITY * q * head(q)) / efficiency(q) : water.power ? water.power(0) / f.c_eta : 0), power_basis: 'head-efficiency' as const } : {}),
    ...(npsh ? { npshr: (q: number) => npsh.call(water, q / cq) } : {}),
    ...(water.validity ? { validity: Object.fromEntries(Object.entries(water.validity).map(([k, r]) => [k, scale(r as [number, number])])) } : {}),
    ...(water.por ? { por: { ...water.por, min_m3s: water.por.min_m3s * cq, max_m3s: water.por.max_m3s * cq } } : {}),
    bep_flow_m3s: qb * cq,
  };
}

