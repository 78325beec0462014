/**
 * A study option resolved against the base: the option's fields override the base's (objects
 * merged field by field, arrays such as pipe lists replaced whole), then every number is turned
 * into SI. Pure; the curve set itself is loaded by the caller (paths are relative to the study file).
 */
import type { Study, StudyOption, StudyPipe } from '../model/study.ts';
import { StudyError } from '../model/study.ts';
import { presetNamed, resolveUnits, toSI, type ResolvedUnits, type UnitSystem } from '../units/index.ts';
import type { FrictionMethod, PipeRun } from '../duty/pipeRun.ts';
import type { NpshApplication } from '../duty/npshMargin.ts';
import type { MotorStandard } from '../duty/motor.ts';
import { readDutyInput } from '../duty/dutyInput.ts';

export interface ResolvedOption {
  name: string;
  curveset: string;
  impeller: { kind: 'drawn' | 'trim' | 'given'; diameter_m?: number };
  pumps: number;
  control: 'throttle' | 'speed';
  capital_cost?: number;
  liquid: { name?: string; temperature_K: number; density_kg_m3?: number; vapour_pressure_Pa?: number; viscosity_m2_s?: number };
  site: { pressure_Pa?: number; elevation_m?: number };
  duty: { flow_m3s: number; head_m?: number };
  suction: { surface_low_m: number; surface_high_m: number; pipes: PipeRun[] };
  discharge: { static_low_m: number; static_high_m: number; pipes: PipeRun[] };
  friction: FrictionMethod;
  application: NpshApplication;
  motor_standard: MotorStandard;
  operation: {
    /** Hours per year at fractions of the duty flow. */
    profile: Array<{ fraction: number; hours: number }>;
    tariff?: number;
    motor_efficiency: number;
    drive_efficiency: number;
    years: number;
    discount_rate: number;
    energy_escalation: number;
    maintenance_per_year: number;
  };
}

export function studyUnitSystem(study: Pick<Study, 'units'>): UnitSystem {
  return presetNamed(study.units);
}

/** Merges and converts one option. Throws StudyError naming the option and what is missing. */
export function resolveOption(study: Study, option: StudyOption): ResolvedOption {
  const u = resolveUnits(studyUnitSystem(study));
  const where = `Option "${option.name}"`;
  const curveset = option.curveset ?? study.curveset;
  if (!curveset) throw new StudyError(`${where} names no curve set, and the study has no base "curveset"; add one.`);
  const liquid = { ...study.liquid, ...defined(option.liquid ?? {}) };
  const site = { ...study.site, ...defined(option.site ?? {}) };
  if (site.pressure !== undefined && site.elevation !== undefined && option.site) {
    // An option naming one of them replaces the other.
    if (option.site.pressure !== undefined) delete site.elevation;
    else delete site.pressure;
  }
  const duty = { ...study.duty, ...defined(option.duty ?? {}) };
  const suction = { ...study.suction, ...defined(option.suction ?? {}) };
  const discharge = { ...study.discharge, ...defined(option.discharge ?? {}) };
  const operation = { ...study.operation, ...defined(option.operation ?? {}) };
  const control = option.control ?? study.control ?? 'throttle';
  let impellerField = option.impeller ?? study.impeller ?? (control === 'trim' ? 'trim' : 'drawn');
  if (control === 'trim') impellerField = 'trim';
  const diameter = option.diameter;
  const impeller: ResolvedOption['impeller'] =
    typeof impellerField === 'number'
      ? { kind: 'given', diameter_m: toSI(impellerField, u.diameter) }
      : impellerField === 'given'
        ? diameter === undefined
          ? fail(`${where} asks for a given impeller but has no "diameter"; add it in ${u.diameter.label}.`)
          : { kind: 'given', diameter_m: toSI(diameter, u.diameter) }
        : { kind: impellerField, ...(diameter !== undefined && impellerField === 'drawn' ? { diameter_m: toSI(diameter, u.diameter) } : {}) };
  const [sLow, sHigh] = pair(suction.surface_above_eye);
  const [dLow, dHigh] = pair(discharge.static_head);
  if (operation.hours_per_year === undefined && !operation.profile) throw new StudyError(`${where}: the operation needs "hours_per_year" or a "profile" of hours at flows; add one.`);
  const profile = operation.profile ? operation.profile.map((p) => ({ fraction: p.flow / 100, hours: p.hours })) : [{ fraction: 1, hours: operation.hours_per_year as number }];
  const hours = profile.reduce((s, p) => s + p.hours, 0);
  if (hours > 8784) throw new StudyError(`${where}: the operation adds up to ${hours} hours a year, more than a year has (8784); check the profile.`);
  // The duty, liquid and site numbers go through the one duty-input reader the command line and
  // the workbench use, so that all three read them alike.
  const read = readDutyInput(
    {
      flow: duty.flow, head: duty.head, temperature: liquid.temperature, density: liquid.density, vapour_pressure: liquid.vapour_pressure,
      site_pressure: site.pressure, elevation: site.elevation, parallel: option.pumps ?? study.pumps, application: study.application,
      motor: study.motor_standard ?? (study.units === 'us' ? 'nema' : 'iec'),
    },
    studyUnitSystem(study),
    { flow: `${where}: the duty flow`, head: `${where}: the duty head`, temperature: `${where}: the liquid temperature` },
    { head_optional: true },
  );
  const siteRead = read.input.site;
  const out: ResolvedOption = {
    name: option.name,
    curveset,
    impeller,
    pumps: option.pumps ?? study.pumps ?? 1,
    control: control === 'speed' ? 'speed' : 'throttle',
    liquid: {
      temperature_K: siteRead?.temperature_K ?? toSI(liquid.temperature as number, u.temperature),
      ...(liquid.name !== undefined ? { name: liquid.name } : {}),
      ...(siteRead?.density_kg_m3 !== undefined ? { density_kg_m3: siteRead.density_kg_m3 } : {}),
      ...(siteRead?.vapour_pressure_Pa !== undefined ? { vapour_pressure_Pa: siteRead.vapour_pressure_Pa } : {}),
      ...(liquid.viscosity !== undefined ? { viscosity_m2_s: liquid.viscosity * 1e-6 } : {}),
    },
    site: {
      ...(siteRead?.site_pressure_Pa !== undefined ? { pressure_Pa: siteRead.site_pressure_Pa } : {}),
      ...(siteRead?.elevation_m !== undefined ? { elevation_m: siteRead.elevation_m } : {}),
    },
    duty: { flow_m3s: read.input.flow_m3s, ...(duty.head !== undefined ? { head_m: read.input.head_m } : {}) },
    suction: { surface_low_m: toSI(sLow, u.head), surface_high_m: toSI(sHigh, u.head), pipes: (suction.pipes ?? []).map((p) => pipeSI(p, u)) },
    discharge: { static_low_m: toSI(dLow, u.head), static_high_m: toSI(dHigh, u.head), pipes: (discharge.pipes ?? []).map((p) => pipeSI(p, u)) },
    friction: study.friction,
    application: read.input.application ?? study.application,
    motor_standard: read.input.motor_standard ?? (study.units === 'us' ? 'nema' : 'iec'),
    operation: {
      profile,
      ...(operation.tariff !== undefined ? { tariff: operation.tariff } : {}),
      motor_efficiency: (operation.motor_efficiency ?? 94) / 100,
      drive_efficiency: control === 'speed' ? (operation.drive_efficiency ?? 97) / 100 : 1,
      years: operation.years ?? 20,
      discount_rate: (operation.discount_rate ?? 5) / 100,
      energy_escalation: (operation.energy_escalation ?? 0) / 100,
      maintenance_per_year: operation.maintenance_per_year ?? 0,
    },
  };
  const capital = option.capital_cost;
  if (capital !== undefined) out.capital_cost = capital;
  return out;
}

function pipeSI(p: StudyPipe, u: ResolvedUnits): PipeRun {
  return {
    diameter_m: toSI(p.diameter, u.diameter),
    length_m: toSI(p.length, u.head),
    ...(p.roughness !== undefined ? { roughness_m: toSI(p.roughness, u.diameter) } : {}),
    ...(p.material !== undefined ? { material: p.material } : {}),
    ...(p.c !== undefined ? { hazen_williams_c: p.c } : {}),
    ...(p.k !== undefined ? { k: p.k } : {}),
    ...(p.fittings ? { fittings: p.fittings.map((f) => (typeof f === 'string' ? { name: f, count: 1 } : { name: f.name, count: f.count ?? 1 })) } : {}),
  };
}

function pair(v: number | [number, number]): [number, number] {
  if (typeof v === 'number') return [v, v];
  return v[0] <= v[1] ? [v[0], v[1]] : [v[1], v[0]];
}

function defined<T extends object>(o: T): Partial<T> {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as Partial<T>;
}

function fail(message: string): never {
  throw new StudyError(message);
}
