/**
 * The one reader of duty input: what the engineer typed (command-line flags, workbench fields or
 * a study file's numbers), in one unit system, turned into the SI `DutyCheckInput` of the duty
 * check. Pure. Every unusable value is refused with one sentence naming the field and what to do.
 */
import { presetNamed, resolveUnits, toSI, type Unit, type UnitSystem } from '../units/index.ts';
import { readDecimal } from '../units/readNumber.ts';
import { checkPlausible, type PlausibleKind } from '../units/plausible.ts';
import { UserError } from '../model/errors.ts';
import type { CurveSet } from '../model/curveset.ts';
import { SERVICES, type Service } from './cautions.ts';
import type { DutyCheckInput } from './dutyCheck.ts';
import { DutyError } from './errors.ts';
import { NPSH_APPLICATIONS, type NpshApplication } from './npshMargin.ts';
import type { SiteInput } from './site.ts';

/** Raw duty fields, each as typed (text) or as a number already parsed; blank text counts as absent. */
export interface DutyFields {
  flow?: string | number;
  head?: string | number;
  static?: string | number;
  /** "Q:H,Q:H,…" */
  system_points?: string;
  system_exponent?: string | number;
  density?: string | number;
  parallel?: string | number;
  /** "D,D,…" */
  at_diameter?: string;
  variable_speed?: boolean;
  elevation?: string | number;
  site_pressure?: string | number;
  temperature?: string | number;
  vapour_pressure?: string | number;
  suction_static?: string | number;
  suction_loss?: string | number;
  application?: string;
  service?: string;
  motor?: string;
  hours?: string | number;
  tariff?: string | number;
  motor_efficiency?: string | number;
  drive_efficiency?: string | number;
}

export type DutyField = keyof DutyFields;

/** Thrown for a duty field that cannot be used; `field` names it for the screen that asked. */
export class DutyInputError extends DutyError {
  override name = 'DutyInputError';
  constructor(message: string, readonly field: DutyField) {
    super(message, 'bad-duty-input');
  }
}

const DEFAULT_NAMES: Record<DutyField, string> = {
  flow: 'the duty flow', head: 'the duty head', static: 'the static head', system_points: 'the system points', system_exponent: 'the system-curve exponent',
  density: 'the density', parallel: 'the number of pumps in parallel', at_diameter: 'the diameters to evaluate', variable_speed: 'variable speed',
  elevation: 'the site elevation', site_pressure: 'the site pressure', temperature: 'the liquid temperature', vapour_pressure: 'the vapour pressure',
  suction_static: 'the suction static head', suction_loss: 'the suction loss', application: 'the NPSH application', service: 'the service',
  motor: 'the motor list', hours: 'the running hours', tariff: 'the tariff', motor_efficiency: 'the motor efficiency', drive_efficiency: 'the drive efficiency',
};

export interface DutyReading {
  input: DutyCheckInput;
  /** Sentences about defaults taken (e.g. the temperature assumed). */
  notes: string[];
}

/**
 * @param fields  the raw fields
 * @param system  the unit system the numbers are in (flow, head, pressure, temperature, diameter)
 * @param names   how each field is called where it was typed (e.g. "--flow"); defaults to words
 * @param options head_optional: the head may be missing (head_m is then NaN)
 * Throws DutyInputError naming the first unusable field.
 */
export function readDutyInput(fields: DutyFields, system: UnitSystem, names: Partial<Record<DutyField, string>> = {}, options: { head_optional?: boolean } = {}): DutyReading {
  const u = resolveUnits(system);
  const name = (f: DutyField) => names[f] ?? DEFAULT_NAMES[f];
  const read = (f: DutyField, kind: 'any' | 'positive' | 'non-negative' = 'any'): number | undefined => {
    const raw = fields[f];
    if (raw === undefined || raw === null || typeof raw === 'boolean') return undefined;
    const text = typeof raw === 'number' ? String(raw) : raw.trim().replace(/^(-?\d+),(\d+)$/, '$1.$2');
    if (text === '') return undefined;
    let v: number;
    try {
      v = readDecimal(text, cap(name(f)));
    } catch (error) {
      throw new DutyInputError(error instanceof UserError ? error.message : `${cap(name(f))} must be a number, not "${String(raw)}".`, f);
    }
    if (kind === 'positive' && !(v > 0)) throw new DutyInputError(`${cap(name(f))} must be greater than zero, not ${text}.`, f);
    if (kind === 'non-negative' && !(v >= 0)) throw new DutyInputError(`${cap(name(f))} must be zero or more, not ${text}.`, f);
    return v;
  };
  const need = (f: DutyField, kind: 'positive') => {
    const v = read(f, kind);
    if (v === undefined) throw new DutyInputError(`${cap(name(f))} is missing; enter it in ${f === 'flow' ? u.flow.label : u.head.label}.`, f);
    return v;
  };
  /** Refuses a value outside the physical range of its kind, naming the unit it suggests (a density of 1 kg/m³ looks like an SG). */
  const plausible = (f: DutyField, kind: PlausibleKind, si: number, unit: Unit | null, extra: { liquid?: 'water' | 'other' } = {}): number => {
    try {
      return checkPlausible(kind, si, { field: cap(name(f)), text: String(fields[f]).trim(), ...(unit ? { unit: unit.token } : {}), sgField: 'a specific gravity of', ...extra });
    } catch (error) {
      if (error instanceof UserError) throw new DutyInputError(error.message, f);
      throw error;
    }
  };
  const percent = (f: DutyField): number | undefined => {
    const v = read(f, 'positive');
    if (v === undefined) return undefined;
    if (v > 100) throw new DutyInputError(`${cap(name(f))} is a percentage and must be at most 100, not ${v}.`, f);
    return v / 100;
  };
  const oneOf = <T extends string>(f: DutyField, allowed: readonly T[], fallback: T): T => {
    const raw = fields[f];
    if (raw === undefined || raw === '') return fallback;
    if (!(allowed as readonly string[]).includes(String(raw))) throw new DutyInputError(`${cap(name(f))} must be one of ${allowed.join(', ')}, not "${String(raw)}".`, f);
    return raw as T;
  };

  // A study may leave the head to its pipe runs: then head_m is NaN and the caller must not use it.
  const head = options.head_optional ? read('head', 'positive') : need('head', 'positive');
  const flowSI = plausible('flow', 'flow', toSI(need('flow', 'positive'), u.flow), u.flow);
  const input: DutyCheckInput = { flow_m3s: flowSI, head_m: head === undefined ? Number.NaN : plausible('head', 'head', toSI(head, u.head), u.head) };
  const notes: string[] = [];
  const stat = read('static');
  if (stat !== undefined) input.static_head_m = toSI(stat, u.head);
  if (fields.system_points !== undefined && fields.system_points.trim() !== '') input.system_points = points(fields.system_points, name('system_points')).map(([q, h]) => [toSI(q, u.flow), toSI(h, u.head)] as const);
  const exp = read('system_exponent', 'positive');
  if (exp !== undefined) input.system_exponent = exp;
  const density = read('density', 'positive');
  if (density !== undefined) input.density_kg_m3 = plausible('density', 'density', density, null);
  const parallel = read('parallel', 'positive');
  if (parallel !== undefined) {
    if (!Number.isInteger(parallel) || parallel > 6) throw new DutyInputError(`${cap(name('parallel'))} must be a whole number from 1 to 6, not ${parallel}.`, 'parallel');
    input.parallel_count = parallel;
  }
  if (fields.at_diameter !== undefined && fields.at_diameter.trim() !== '') {
    input.extra_diameters_m = fields.at_diameter.split(',').map((d) => {
      const v = Number(d.trim());
      if (!(v > 0)) throw new DutyInputError(`${cap(name('at_diameter'))} must be positive numbers separated by commas; "${d.trim()}" is not one.`, 'at_diameter');
      return toSI(v, u.diameter);
    });
  }
  if (fields.variable_speed) input.variable_speed = true;
  input.application = oneOf<NpshApplication>('application', NPSH_APPLICATIONS, 'general');
  input.service = oneOf<Service>('service', SERVICES, 'general');
  input.motor_standard = oneOf<'nema' | 'iec'>('motor', ['nema', 'iec'], system.flow === 'gpm' ? 'nema' : 'iec');

  const siteKeys: DutyField[] = ['elevation', 'site_pressure', 'temperature', 'vapour_pressure', 'suction_static', 'suction_loss'];
  const given = (f: DutyField) => fields[f] !== undefined && String(fields[f]).trim() !== '';
  if (siteKeys.some(given)) {
    const t = read('temperature');
    if (t === undefined) notes.push(`No liquid temperature given: the liquid is taken at 20 °C for vapour pressure and density.`);
    const site: SiteInput = {
      temperature_K: t === undefined ? 293.15 : plausible('temperature', 'temperature', toSI(t, u.temperature), u.temperature, { liquid: density === undefined ? 'water' : 'other' }),
      suction_static_m: toSI(read('suction_static') ?? 0, u.head),
      suction_loss_m: toSI(read('suction_loss', 'non-negative') ?? 0, u.head),
    };
    const elevation = read('elevation');
    if (elevation !== undefined) site.elevation_m = toSI(elevation, u.head);
    const p = read('site_pressure', 'positive');
    if (p !== undefined) site.site_pressure_Pa = plausible('site_pressure', 'pressure', toSI(p, u.pressure), u.pressure);
    const pv = read('vapour_pressure', 'non-negative');
    if (pv !== undefined) site.vapour_pressure_Pa = plausible('vapour_pressure', 'pressure', toSI(pv, u.pressure), u.pressure);
    if (density !== undefined) site.density_kg_m3 = density;
    input.site = site;
  }

  const hours = read('hours', 'non-negative');
  const tariff = read('tariff', 'non-negative');
  const motorEff = percent('motor_efficiency');
  if (hours !== undefined || tariff !== undefined || motorEff !== undefined) {
    if (hours === undefined) throw new DutyInputError(`The energy estimate needs ${name('hours')} as well; add it.`, 'hours');
    if (motorEff === undefined) throw new DutyInputError(`The energy estimate needs ${name('motor_efficiency')} (in %) as well; add it.`, 'motor_efficiency');
    const drive = percent('drive_efficiency');
    input.energy = { hours_per_year: hours, motor_efficiency: motorEff, ...(tariff !== undefined ? { tariff_per_kWh: tariff } : {}), ...(drive !== undefined ? { drive_efficiency: drive } : {}) };
  }
  return { input, notes };
}

function points(text: string, name: string): Array<[number, number]> {
  return text
    .split(',')
    .map((p) => p.trim())
    .filter(Boolean)
    .map((pair) => {
      const parts = pair.split(':').map((x) => Number(x.trim()));
      if (parts.length !== 2 || !parts.every(Number.isFinite) || (parts[0] as number) < 0) {
        throw new DutyInputError(`${cap(name)} take "Q:H" pairs separated by commas; "${pair}" is not one.`, 'system_points');
      }
      return [parts[0] as number, parts[1] as number];
    });
}

function cap(s: string): string {
  return s.startsWith('--') ? s : s.charAt(0).toUpperCase() + s.slice(1);
}

/**
 * The unit system of a curve set's own display units (a US sheet reads and reports gpm and ft),
 * with pressure and temperature from the matching preset.
 */
export function setUnitSystem(display: CurveSet['display_units']): UnitSystem {
  const us = ['gpm', 'igpm'].includes(display.flow) || display.head === 'ft';
  return { ...presetNamed(us ? 'us' : 'si'), ...display };
}
