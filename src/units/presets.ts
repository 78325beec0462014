/**
 * Unit systems for display and input. A curve set records the system it was captured
 * in; screens and exports pick one of these or a mix.
 */
import { parseUnit, UnitError } from './convert.ts';
import type { Unit } from './units.ts';
import { curveUnits, type CurveUnits, type CurveUnitTokens } from './quantityUnits.ts';

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

/** The curve units of a preset system: flow, head, NPSH, power and diameter tokens. */
export function presetCurveTokens(name: PresetName): CurveUnitTokens {
  const { flow, head, npsh, power, diameter } = PRESETS[name];
  return { flow, head, npsh, power, diameter };
}

/**
 * The power unit a curve set shows when its sheet names none: hp for a sheet in gpm, kW
 * otherwise (common practice: US sheets give brake horsepower, metric sheets kW).
 */
export function defaultPowerToken(flowToken: string): 'hp' | 'kW' {
  let token = flowToken;
  try {
    token = parseUnit('flow', flowToken).token;
  } catch {
    // An unknown flow unit is refused where it is read; here it only picks the power unit shown.
  }
  return token === 'gpm' ? 'hp' : 'kW';
}

/**
 * Which units a screen or an export shows: the curve set's own ("own", the default everywhere),
 * or one of the preset systems.
 */
export type UnitChoice = 'own' | PresetName;

/** Reads a unit choice as typed ("own", "si", "us", any case); undefined for a blank. Throws UnitError otherwise. */
export function unitChoiceNamed(name: string | undefined): UnitChoice | undefined {
  const key = name?.trim().toLowerCase();
  if (!key) return undefined;
  if (key === 'own' || key === 'si' || key === 'us') return key;
  throw new UnitError(`Unknown unit system "${name}". Use "own" (the curve set's units), "si" or "us".`);
}

/** The curve units a choice stands for: the set's own tokens, or the preset's. Throws UnitError for a bad own token. */
export function chosenUnits(own: CurveUnitTokens, choice: UnitChoice = 'own'): CurveUnits {
  return curveUnits(choice === 'own' ? own : presetCurveTokens(choice));
}

/** The preset whose curve units are exactly `own` (after canonical spelling), or 'own' when none is. */
export function choiceOf(own: CurveUnitTokens): UnitChoice {
  let units: CurveUnits;
  try {
    units = curveUnits(own);
  } catch {
    return 'own';
  }
  const same = (name: PresetName) => {
    const p = presetCurveTokens(name);
    return units.flow.token === p.flow && units.head.token === p.head && units.npsh.token === p.npsh && units.power.token === p.power && units.diameter.token === p.diameter;
  };
  return same('si') ? 'si' : same('us') ? 'us' : 'own';
}
