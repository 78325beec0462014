/**
 * Head given as a pressure. Sheets and duty sheets sometimes state head in kPa, psi or bar; a
 * pressure becomes a head of the pumped liquid only at a stated density:
 *
 *   H = p / (ρ · g_n)      H [m], p [Pa], ρ [kg/m³], g_n = 9.80665 m/s² (exact, CGPM)
 *
 * Valid for an incompressible liquid at rest (hydrostatics); any density > 0. Source: the
 * hydrostatic equation, in every fluid-mechanics text; "2.31 ft of water per psi" at SG 1 is
 * the trade's check value (common practice).
 */
import { STANDARD_GRAVITY } from './constants.ts';
import { fromSI, parseUnit, toSI, tokensOf, UnitError } from './convert.ts';
import type { Unit } from './units.ts';

function checkDensity(densityKgM3: number | undefined, unit: Unit): number {
  if (densityKgM3 === undefined) {
    throw new UnitError(`A head given in ${unit.label} is a pressure; state the liquid's density (or specific gravity) to turn it into a head.`);
  }
  if (!(densityKgM3 > 0) || !Number.isFinite(densityKgM3)) throw new UnitError(`The density for a head given in ${unit.label} must be a positive number of kg/m³, not ${densityKgM3}.`);
  return densityKgM3;
}

/** Head [m] of a liquid of density ρ [kg/m³] for a pressure p [Pa]. */
export function headFromPressure(pressurePa: number, densityKgM3: number): number {
  return pressurePa / (densityKgM3 * STANDARD_GRAVITY);
}

/** Pressure [Pa] of a column of head H [m] of a liquid of density ρ [kg/m³]. */
export function pressureFromHead(headM: number, densityKgM3: number): number {
  return headM * densityKgM3 * STANDARD_GRAVITY;
}

/** The unit of a head token: a head unit (m, ft) or a pressure unit (kPa, psi, bar, Pa). */
export function parseHeadUnit(token: string): Unit {
  try {
    return parseUnit('head', token);
  } catch {
    try {
      return parseUnit('pressure', token);
    } catch {
      throw new UnitError(`Unknown head unit "${token}". Use one of: ${[...tokensOf('head'), ...tokensOf('pressure')].join(', ')} (a pressure needs the liquid's density).`);
    }
  }
}

/** A head value in `token` → metres. A pressure token needs the density [kg/m³]. */
export function headToSI(value: number, token: string, densityKgM3?: number): number {
  const unit = parseHeadUnit(token);
  if (unit.kind === 'head') return toSI(value, unit);
  return headFromPressure(toSI(value, unit), checkDensity(densityKgM3, unit));
}

/** Metres of head → a value in `token`. A pressure token needs the density [kg/m³]. */
export function headFromSI(headM: number, token: string, densityKgM3?: number): number {
  const unit = parseHeadUnit(token);
  if (unit.kind === 'head') return fromSI(headM, unit);
  return fromSI(pressureFromHead(headM, checkDensity(densityKgM3, unit)), unit);
}
