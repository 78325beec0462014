/**
 * Unit tables. Each unit maps a display number to SI and back; the pair is an exact
 * inverse (affine for temperature, linear for the rest). Factors come from `constants.ts`.
 */
import { FOOT, HORSEPOWER, INCH, PSI, US_GALLON, IMPERIAL_GALLON, CELSIUS_ZERO, CUBIC_FOOT, DAY, METRIC_HORSEPOWER, OIL_BARREL, POUND_MASS } from './constants.ts';

export type QuantityKind =
  | 'flow'
  | 'head'
  | 'power'
  | 'diameter'
  | 'pressure'
  | 'temperature'
  | 'speed'
  | 'efficiency'
  | 'density'
  | 'viscosity';

export interface Unit {
  /** Canonical token, as written in files and on the command line. */
  readonly token: string;
  readonly kind: QuantityKind;
  /** Label for screens and table headers. */
  readonly label: string;
  /** SI value = factor × value + offset. */
  readonly factor: number;
  readonly offset: number;
  /** Other spellings accepted when parsing. */
  readonly aliases: readonly string[];
}

function unit(token: string, kind: QuantityKind, label: string, factor: number, aliases: string[] = [], offset = 0): Unit {
  return Object.freeze({ token, kind, label, factor, offset, aliases: Object.freeze(aliases) });
}

/** SI base of each kind: the unit whose factor is 1. */
export const SI_BASE: Readonly<Record<QuantityKind, string>> = {
  flow: 'm3/s',
  head: 'm',
  power: 'W',
  diameter: 'm',
  pressure: 'Pa',
  temperature: 'K',
  speed: 'rpm',
  efficiency: 'fraction',
  density: 'kg/m3',
  viscosity: 'm2/s',
};

export const UNITS: readonly Unit[] = [
  unit('m3/s', 'flow', 'm³/s', 1, ['m³/s', 'cms']),
  unit('m3/h', 'flow', 'm³/h', 1 / 3600, ['m³/h', 'm3/hr', 'm³/hr', 'm3/hour', 'm³/hour', 'cmh']),
  unit('L/s', 'flow', 'L/s', 1e-3, ['l/s', 'l/sec', 'lps']),
  unit('L/min', 'flow', 'L/min', 1e-3 / 60, ['l/min', 'lpm']),
  unit('m3/min', 'flow', 'm³/min', 1 / 60, ['m³/min']),
  unit('gpm', 'flow', 'gpm', US_GALLON / 60, ['usgpm', 'us gpm', 'gal/min']),
  unit('igpm', 'flow', 'imp gpm', IMPERIAL_GALLON / 60, ['imp gpm', 'impgpm']),
  unit('MGD', 'flow', 'MGD', (1e6 * US_GALLON) / DAY, ['mgd', 'million gal/d', 'us mgd']),
  unit('ft3/s', 'flow', 'ft³/s', CUBIC_FOOT, ['ft³/s', 'cfs', 'cusec']),
  unit('bbl/d', 'flow', 'bbl/d', OIL_BARREL / DAY, ['bpd', 'bbl/day']),

  unit('m', 'head', 'm', 1, ['metre', 'meter', 'metres', 'meters']),
  unit('ft', 'head', 'ft', FOOT, ['feet', 'foot']),

  unit('W', 'power', 'W', 1, ['w']),
  unit('kW', 'power', 'kW', 1e3, ['kw']),
  unit('hp', 'power', 'hp', HORSEPOWER, ['bhp', 'HP']),
  unit('PS', 'power', 'PS', METRIC_HORSEPOWER, ['metric hp', 'hp(M)', 'CV']),

  unit('mm', 'diameter', 'mm', 1e-3),
  unit('in', 'diameter', 'in', INCH, ['inch', 'inches', '"']),
  unit('m', 'diameter', 'm', 1),

  unit('Pa', 'pressure', 'Pa', 1, ['pa']),
  unit('kPa', 'pressure', 'kPa', 1e3, ['kpa']),
  unit('bar', 'pressure', 'bar', 1e5),
  unit('psi', 'pressure', 'psi', PSI, ['lbf/in2', 'psia']),

  unit('K', 'temperature', 'K', 1, ['k', 'kelvin']),
  unit('C', 'temperature', '°C', 1, ['°C', 'degC', 'c', 'celsius'], CELSIUS_ZERO),
  unit('F', 'temperature', '°F', 5 / 9, ['°F', 'degF', 'f', 'fahrenheit'], CELSIUS_ZERO - (32 * 5) / 9),

  unit('rpm', 'speed', 'rpm', 1, ['RPM', 'r/min', '1/min', 'min-1']),

  unit('%', 'efficiency', '%', 1e-2, ['percent', 'pct']),
  unit('fraction', 'efficiency', '', 1),

  unit('kg/m3', 'density', 'kg/m³', 1, ['kg/m³']),
  unit('lb/ft3', 'density', 'lb/ft³', POUND_MASS / CUBIC_FOOT, ['lb/ft³', 'lbm/ft3', 'pcf']),
  unit('g/cm3', 'density', 'g/cm³', 1e3, ['g/cm³', 'g/mL', 'kg/L']),
  unit('m2/s', 'viscosity', 'm²/s', 1, ['m²/s']),
  unit('cSt', 'viscosity', 'cSt', 1e-6, ['cst', 'mm2/s', 'mm²/s']),
];
