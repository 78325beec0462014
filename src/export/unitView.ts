/**
 * Unit choices for exports: the `si` or `us` preset, or the curve set's own display units
 * ("own", the default). The units come from the one map in src/units (`chosenUnits`,
 * `unitOfQuantity`); numbers from the one formatter.
 */
import type { CurveSet, Quantity } from '../model/curveset.ts';
import { chosenUnits, formatNumber, unitChoiceNamed, unitOfQuantity, type CurveUnits, type Unit } from '../units/index.ts';

export type ExportUnits = CurveUnits;

/** `system` is "si", "us", "own", or undefined for the set's own display units. Throws UnitError for another word. */
export function exportUnits(set: Pick<CurveSet, 'display_units'>, system?: string): ExportUnits {
  return chosenUnits(set.display_units, unitChoiceNamed(system));
}

export function unitOf(units: ExportUnits, quantity: Quantity): Unit {
  return unitOfQuantity(units, quantity);
}

/** Up to 6 significant digits, as plain text; an empty cell for a missing figure (the CSV convention). */
export function cell(value: number | undefined): string {
  if (value === undefined || !Number.isFinite(value)) return '';
  return formatNumber(value, 6);
}
