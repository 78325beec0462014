/**
 * Physical plausibility of the numbers a user types, for every shell (CLI options, form fields,
 * study files) to use. A value outside the range of its quantity is refused with one sentence
 * that names the field as the user wrote it; where the number suggests another unit, the
 * sentence says which ("1 kg/m³ looks like a specific gravity; did you mean 1000 kg/m³ (or --sg 1)?").
 *
 * The ranges are wide on purpose: they catch unit slips, not unusual duties. Each bound is
 * common practice in the pump trade unless a source is named beside it.
 */
import { UserError } from '../model/errors.ts';
import { fromSI, parseUnit, toSI } from './convert.ts';
import { formatNumber } from './format.ts';
import { readDecimal, type Sign } from './readNumber.ts';
import { SI_BASE, type QuantityKind, type Unit } from './units.ts';

/** A number that reads, but cannot be what the field asks for. */
export class ImplausibleValueError extends UserError {
  override name = 'ImplausibleValueError';
  constructor(message: string) {
    super(message, 'implausible-value');
  }
}

export type PlausibleKind = 'density' | 'specific-gravity' | 'viscosity' | 'temperature' | 'pressure' | 'speed' | 'flow' | 'head' | 'efficiency';

export interface PlausibleRange {
  /** SI bounds (kg/m³, –, m²/s, K, Pa, rpm, m³/s, m, fraction). */
  readonly min: number;
  readonly max: number;
  /** True when `min` itself is refused (a zero efficiency, say). */
  readonly minExclusive?: boolean;
  /** What the range covers, for the sentence. */
  readonly what: string;
}

/** The unit kind of each plausibility kind; specific gravity has none. */
const UNIT_KIND: Readonly<Record<PlausibleKind, QuantityKind | null>> = {
  density: 'density',
  'specific-gravity': null,
  viscosity: 'viscosity',
  temperature: 'temperature',
  pressure: 'pressure',
  speed: 'speed',
  flow: 'flow',
  head: 'head',
  efficiency: 'efficiency',
};

export const PLAUSIBLE_RANGES: Readonly<Record<PlausibleKind, PlausibleRange>> = {
  // Liquefied gases (LNG about 450 kg/m³) to heavy slurries and drilling muds (about 2400 kg/m³).
  density: { min: 350, max: 3000, what: 'pumped liquids' },
  'specific-gravity': { min: 0.35, max: 3, what: 'pumped liquids' },
  // 0.1 cSt (light hydrocarbons, hot water) to 10 000 cSt; centrifugal pumps are rarely used
  // above a few thousand cSt (ANSI/HI 9.6.7 corrections stop well below; from memory).
  viscosity: { min: 1e-7, max: 1e-2, what: 'liquids a centrifugal pump handles' },
  // Cryogenic service (LNG at −162 °C) to hot-oil service (about 400 °C).
  temperature: { min: 73.15, max: 673.15, what: 'pumped liquids' },
  // Absolute pressures: a vacuum to 1000 bar.
  pressure: { min: 0, max: 1e8, what: 'absolute pressures in pumping systems' },
  // Large slow pumps (about 150 rpm) to high-speed pumps (about 30 000 rpm).
  speed: { min: 100, max: 30_000, what: 'pump speeds' },
  // Zero (a point of a system curve) to the largest pumps built (about 60 m³/s), with room.
  flow: { min: 0, max: 200, what: 'pump flows' },
  // A suction lift (negative) to multistage boiler-feed heads (about 3000 m), with room.
  head: { min: -2000, max: 5000, what: 'heads in pumping systems' },
  // Pump, motor and drive efficiencies: 5 % to 100 %.
  efficiency: { min: 0.05, max: 1, what: 'pump, motor and drive efficiencies' },
};

/**
 * Water as a liquid: 0 °C (it freezes below) to 250 °C (boiler-feed service reaches about
 * 250 °C; from memory). 300 °C water is a slip of unit more often than a duty.
 */
export const WATER_TEMPERATURE: PlausibleRange = { min: 273.15, max: 523.15, what: 'water as a pumped liquid' };

export interface PlausibleOptions {
  /** The field as the user wrote it: "--density", "Density", "row 4, density". */
  field: string;
  /** Unit token the number was given in; the SI unit of the kind by default. */
  unit?: string;
  /** The number as typed (shown back in the sentence); formatted from the value otherwise. */
  text?: string;
  /** "water" narrows the temperature range to water's. */
  liquid?: 'water' | 'other';
  /** How this shell names a specific gravity and a density, for hints ("--sg", "--density"). */
  sgField?: string;
  densityField?: string;
  /** A narrower range for this field (a site pressure, say), SI. */
  range?: PlausibleRange;
}

const fmt = (v: number) => formatNumber(v, 4);

function unitFor(kind: PlausibleKind, token: string | undefined): Unit | null {
  const k = UNIT_KIND[kind];
  return k === null ? null : parseUnit(k, token ?? SI_BASE[k]);
}

function withUnit(value: number, unit: Unit | null, digits = 4): string {
  const text = formatNumber(value, digits);
  return unit?.label ? `${text} ${unit.label}` : text;
}

function inside(range: PlausibleRange, si: number): boolean {
  return (range.minExclusive ? si > range.min : si >= range.min) && si <= range.max;
}

/** The range that applies to this field. */
export function plausibleRange(kind: PlausibleKind, options: Pick<PlausibleOptions, 'liquid' | 'range'> = {}): PlausibleRange {
  if (options.range) return options.range;
  if (kind === 'temperature' && options.liquid === 'water') return WATER_TEMPERATURE;
  return PLAUSIBLE_RANGES[kind];
}

/** A sentence naming the unit the number suggests, or null. `v` is the number as given in `unit`. */
function hintFor(kind: PlausibleKind, v: number, unit: Unit | null, range: PlausibleRange, o: PlausibleOptions): string | null {
  const sg = o.sgField ?? 'a specific gravity of';
  const token = unit?.token;
  const alt = (other: string) => {
    const u = unitFor(kind, other);
    return u && inside(range, toSI(v, u)) ? u : null;
  };
  switch (kind) {
    case 'density':
      if (v >= 0.35 && v <= 3 && token !== 'g/cm3') return `${withUnit(v, unit, 6)} looks like a specific gravity; did you mean ${fmt(v * 1000)} kg/m³ (or ${sg} ${fmt(v)})?`;
      if (token === 'kg/m3' && alt('lb/ft3')) return `${withUnit(v, unit, 6)} looks like a density in lb/ft³; did you mean ${fmt(toSI(v, parseUnit('density', 'lb/ft3')))} kg/m³?`;
      if (token === 'lb/ft3' && alt('kg/m3')) return `${withUnit(v, unit, 6)} looks like a density in kg/m³; did you mean ${fmt(fromSI(v, parseUnit('density', 'lb/ft3')))} lb/ft³?`;
      return null;
    case 'specific-gravity':
      if (v >= 350 && v <= 3000) return `a specific gravity of ${formatNumber(v, 6)} looks like a density in kg/m³; did you mean ${o.sgField ?? 'a specific gravity of'} ${fmt(v / 1000)}${o.densityField ? ` (or ${o.densityField} ${fmt(v)})` : ''}?`;
      return null;
    case 'viscosity':
      if (token === 'm2/s' && alt('cSt')) return `${withUnit(v, unit, 6)} looks like centistokes; did you mean ${fmt(v)} cSt (${formatNumber(v * 1e-6, 4)} m²/s)?`;
      if (token === 'cSt' && alt('m2/s')) return `${withUnit(v, unit, 6)} looks like m²/s; did you mean ${formatNumber(v * 1e6, 4)} cSt?`;
      return null;
    case 'temperature': {
      const others = ['C', 'F', 'K'].filter((t) => t !== token).map(alt).filter((u): u is Unit => u !== null);
      if (!others.length) return null;
      const c = parseUnit('temperature', 'C');
      return `${withUnit(v, unit, 6)} is outside the range of ${range.what} (${rangeText(range, unit)}); did you mean ${others.map((u) => `${withUnit(v, u, 6)} (${withUnit(fromSI(toSI(v, u), c), c)})`).join(' or ')}?`;
    }
    case 'pressure': {
      const u = ['Pa', 'kPa', 'bar', 'psi'].filter((t) => t !== token).map(alt).find((x) => x !== null);
      return u ? `${withUnit(v, unit, 6)} is more than any pressure in a pumping system; did you mean ${withUnit(v, u, 6)}?` : null;
    }
    case 'speed':
      if (v === 50 || v === 60) return `${formatNumber(v, 6)} rpm looks like the mains frequency in Hz; give the pump speed in rpm (a 2-pole motor runs near ${v === 50 ? 2900 : 3500} rpm, a 4-pole near ${v === 50 ? 1450 : 1750} rpm).`;
      if (v > 0 && v < 100 && v * 60 >= range.min && v * 60 <= range.max) return `${formatNumber(v, 6)} rpm looks like revolutions per second; did you mean ${fmt(v * 60)} rpm?`;
      return null;
    case 'flow': {
      const u = token === 'm3/s' ? alt('m3/h') : null;
      return u ? `${withUnit(v, unit, 6)} is more than any pump delivers; did you mean ${withUnit(v, u, 6)}?` : null;
    }
    case 'efficiency':
      if (token === '%' && v > 0 && v <= 1) return `${formatNumber(v, 6)} % looks like a fraction; did you mean ${fmt(v * 100)} %?`;
      if (token === 'fraction' && v > 1 && v <= 100) return `${fmt(v)} looks like a percentage; did you mean ${fmt(v / 100)} (${fmt(v)} %)?`;
      return null;
    case 'head':
      return null;
  }
}

function rangeText(range: PlausibleRange, unit: Unit | null): string {
  const lo = unit ? fromSI(range.min, unit) : range.min;
  const hi = unit ? fromSI(range.max, unit) : range.max;
  return `${fmt(Math.min(lo, hi))} … ${withUnit(Math.max(lo, hi), unit)}`;
}

/**
 * Returns `si` when it is a plausible value of `kind`, or throws ImplausibleValueError with
 * one sentence naming the field and, where the number suggests another unit, that unit.
 */
export function checkPlausible(kind: PlausibleKind, si: number, options: PlausibleOptions): number {
  const range = plausibleRange(kind, options);
  if (Number.isFinite(si) && inside(range, si)) return si;
  const unit = unitFor(kind, options.unit);
  const v = unit ? fromSI(si, unit) : si;
  if (!Number.isFinite(si)) throw new ImplausibleValueError(`${options.field} ${options.text?.trim() ?? String(v)}: that is not a finite number.`);
  const typed = `${options.field} ${options.text?.trim() ?? formatNumber(v, 6)}`;
  const hint = hintFor(kind, v, unit, range, options);
  if (hint) throw new ImplausibleValueError(`${typed}: ${hint}`);
  throw new ImplausibleValueError(`${typed}: ${withUnit(v, unit, 6)} is outside the range of ${range.what}, ${rangeText(range, unit)}; check the number and its unit.`);
}

/**
 * Reads a decimal number typed in `options.unit` (decimal notation only, see readDecimal),
 * converts it to SI and checks it is plausible. Returns the SI value.
 */
export function readPlausible(kind: PlausibleKind, text: string, options: PlausibleOptions & { sign?: Sign }): number {
  const value = readDecimal(text, options.field, options.sign ? { sign: options.sign } : {});
  const unit = unitFor(kind, options.unit);
  const si = unit ? toSI(value, unit) : value;
  return checkPlausible(kind, si, { ...options, text });
}
