/**
 * Unit choices for exports: the `si` or `us` preset, or the curve set's own display units.
 */
import type { CurveSet, Quantity } from '../model/curveset.ts';
import { parseUnit, presetNamed, type Unit } from '../units/index.ts';

export interface ExportUnits {
  flow: Unit;
  head: Unit;
  npsh: Unit;
  power: Unit;
  diameter: Unit;
  efficiency: Unit;
}

/** `system` is "si", "us", or undefined for the set's own display units. */
export function exportUnits(set: Pick<CurveSet, 'display_units'>, system?: string): ExportUnits {
  const base = system ? presetNamed(system) : set.display_units;
  return {
    flow: parseUnit('flow', base.flow),
    head: parseUnit('head', base.head),
    npsh: parseUnit('head', base.npsh),
    power: parseUnit('power', base.power),
    diameter: parseUnit('diameter', base.diameter),
    efficiency: parseUnit('efficiency', '%'),
  };
}

export function unitOf(units: ExportUnits, quantity: Quantity): Unit {
  return quantity === 'npshr' ? units.npsh : quantity === 'efficiency' ? units.efficiency : quantity === 'power' ? units.power : units.head;
}

/** Up to 6 significant digits, as plain text. */
export function cell(value: number | undefined): string {
  if (value === undefined || !Number.isFinite(value)) return '';
  return String(Number(value.toPrecision(6)));
}
