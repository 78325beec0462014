/**
 * Units of a take-off: which unit each number read off a panel is in. The take-off's `units`
 * give the defaults; a panel may name its own x (flow) and y units. Efficiency is in % unless a
 * panel says otherwise. Every token is checked against its kind, so a head unit on a power
 * panel is refused with a sentence, not converted wrongly.
 */
import type { DisplayUnits, Quantity } from '../model/curveset.ts';
import { TakeoffError, type Takeoff, type Trace } from '../model/takeoff.ts';
import { defaultPowerToken, parseUnit, QUANTITY_KIND, type Unit } from '../units/index.ts';

export interface ResolvedTakeoffUnits {
  flow: Unit;
  head: Unit;
  npsh: Unit;
  power: Unit | null;
  diameter: Unit;
  /** Canonical tokens for the curve set's display units. */
  display: DisplayUnits;
}

export function resolveTakeoffUnits(takeoff: Takeoff): ResolvedTakeoffUnits {
  const u = takeoff.units;
  const flow = parseUnit('flow', u.flow);
  const head = parseUnit('head', u.head);
  const npsh = parseUnit('head', u.npsh ?? u.head);
  const power = u.power !== undefined ? parseUnit('power', u.power) : null;
  const diameter = parseUnit('diameter', u.diameter);
  const shownPower = power?.token ?? defaultPowerToken(flow.token);
  return { flow, head, npsh, power, diameter, display: { flow: flow.token, head: head.token, npsh: npsh.token, power: shownPower, diameter: diameter.token } };
}

/** The flow unit of the trace's panel and the unit of the values the trace carries. */
export function traceUnits(takeoff: Takeoff, units: ResolvedTakeoffUnits, trace: Trace): { flow: Unit; value: Unit } {
  const panel = takeoff.panels.find((p) => p.id === trace.panel);
  if (!panel) throw new TakeoffError(`Trace on panel "${trace.panel}": the take-off defines no such panel.`);
  const flow = panel.units?.x !== undefined ? parseUnit('flow', panel.units.x) : units.flow;
  const q = trace.quantity;
  // An iso-trace's value is its `iso` number (efficiency in %, power in the take-off's power unit);
  // the panel's y unit belongs to the curves it crosses.
  const panelY = trace.iso === undefined ? panel.units?.y : undefined;
  if (panelY !== undefined) return { flow, value: parseUnit(QUANTITY_KIND[q], panelY) };
  switch (q) {
    case 'head':
      return { flow, value: units.head };
    case 'npshr':
      return { flow, value: units.npsh };
    case 'efficiency':
      return { flow, value: parseUnit('efficiency', '%') };
    case 'power':
      if (!units.power) throw new TakeoffError(`A power trace on panel "${trace.panel}" needs a power unit: add "power" (hp, kW or W) to the take-off's units or the panel's y unit.`);
      return { flow, value: units.power };
  }
}
