/**
 * The one map from a plotted quantity (head, efficiency, power, NPSHr) to its unit. Every layer
 * that shows or reads a curve's values asks here which unit applies: NPSHr takes the NPSH unit,
 * efficiency is always in %, power its power unit, head its head unit.
 */
import { parseUnit } from './convert.ts';
import type { QuantityKind, Unit } from './units.ts';

/** The quantities a curve set plots against flow (the same names as the curve-set model). */
export type CurveQuantity = 'head' | 'efficiency' | 'power' | 'npshr';

/** The unit kind each curve quantity is measured in. */
export const QUANTITY_KIND: Readonly<Record<CurveQuantity, QuantityKind>> = { head: 'head', npshr: 'head', power: 'power', efficiency: 'efficiency' };

/** Unit tokens of a set of curves, as curve sets and take-offs store them (efficiency is always %). */
export interface CurveUnitTokens {
  flow: string;
  head: string;
  npsh: string;
  power: string;
  diameter: string;
}

/** The resolved units of a set of curves. */
export interface CurveUnits {
  flow: Unit;
  head: Unit;
  npsh: Unit;
  power: Unit;
  diameter: Unit;
  efficiency: Unit;
}

/** The unit kind of each member of a bundle of curve unit tokens (NPSH is a head). */
export const CURVE_UNIT_KIND: Readonly<Record<keyof CurveUnitTokens, QuantityKind>> = { flow: 'flow', head: 'head', npsh: 'head', power: 'power', diameter: 'diameter' };

/** Parses every token (throws UnitError naming the first bad one); efficiency is in %. */
export function curveUnits(tokens: CurveUnitTokens): CurveUnits {
  return {
    flow: parseUnit(CURVE_UNIT_KIND.flow, tokens.flow),
    head: parseUnit(CURVE_UNIT_KIND.head, tokens.head),
    npsh: parseUnit(CURVE_UNIT_KIND.npsh, tokens.npsh),
    power: parseUnit(CURVE_UNIT_KIND.power, tokens.power),
    diameter: parseUnit(CURVE_UNIT_KIND.diameter, tokens.diameter),
    efficiency: parseUnit('efficiency', '%'),
  };
}

/** Which member of a unit bundle holds each quantity's unit (NPSHr → npsh). */
export const QUANTITY_UNIT_FIELD: Readonly<Record<CurveQuantity, 'head' | 'npsh' | 'power' | 'efficiency'>> = { head: 'head', npshr: 'npsh', power: 'power', efficiency: 'efficiency' };

/** The unit of a quantity's values. */
export function unitOfQuantity(units: Pick<CurveUnits, 'head' | 'npsh' | 'power' | 'efficiency'>, quantity: CurveQuantity): Unit {
  return units[QUANTITY_UNIT_FIELD[quantity]];
}

/** The unit token of a quantity's values, for records that keep tokens (efficiency is always %). */
export function tokenOfQuantity(tokens: Pick<CurveUnitTokens, 'head' | 'npsh' | 'power'>, quantity: CurveQuantity): string {
  const field = QUANTITY_UNIT_FIELD[quantity];
  return field === 'efficiency' ? '%' : tokens[field];
}
