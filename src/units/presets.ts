/**
 * Unit systems for display and input. A curve set records the system it was captured
 * in; screens and exports pick one of these or a mix.
 */
import { parseUnit, UnitError } from './convert.ts';
import type { Unit } from './units.ts';
import { curveUnits, type CurveUnits } from './quantityUnits.ts';

/** Display units of the quantities a pump engineer reads off a sheet. */
export interface UnitSystem {
  flow: string;
  head: string;
  npsh: string;
  power: string;
  diameter: string;
  pressure: string;
  temperature: string;
  speed: string;
}

export const PRESETS = {
  si: { flow: 'm3/h', head: 'm', npsh: 'm', power: 'kW', diameter: 'mm', pressure: 'kPa', temperature: 'C', speed: 'rpm' },
  us: { flow: 'gpm', head: 'ft', npsh: 'ft', power: 'hp', diameter: 'in', pressure: 'psi', temperature: 'F', speed: 'rpm' },
} as const satisfies Record<string, UnitSystem>;

export type PresetName = keyof typeof PRESETS;

export function presetNamed(name: string): UnitSystem {
  const key = name.trim().toLowerCase();
  if (key === 'si' || key === 'us') return { ...PRESETS[key] };
  throw new UnitError(`Unknown unit system "${name}". Use "si" or "us".`);
}

/** Resolved units of a system, each checked against its kind: the curve units and the site's. */
export interface ResolvedUnits extends CurveUnits {
  pressure: Unit;
  temperature: Unit;
  speed: Unit;
}

/** Parses every token of a system; throws UnitError naming the first bad one. */
export function resolveUnits(system: UnitSystem): ResolvedUnits {
  return {
    ...curveUnits(system),
    pressure: parseUnit('pressure', system.pressure),
    temperature: parseUnit('temperature', system.temperature),
    speed: parseUnit('speed', system.speed),
  };
}

/** Canonicalises a system's tokens (so "m³/h" is stored as "m3/h"). */
export function canonicalUnits(system: UnitSystem): UnitSystem {
  const r = resolveUnits(system);
  return {
    flow: r.flow.token,
    head: r.head.token,
    npsh: r.npsh.token,
    power: r.power.token,
    diameter: r.diameter.token,
    pressure: r.pressure.token,
    temperature: r.temperature.token,
    speed: r.speed.token,
  };
}
