/**
 * Figures in findings are quoted in the curve set's display units (a US set says "12 in",
 * not "304.8 mm"). This builds the formatters once per curve set, from the one formatter in
 * src/units. A figure that is not a finite number reads "not available", never "NaN"; a check
 * that can meet one should say why in its own words instead of quoting it.
 */
import type { DisplayUnits, Member } from '../../model/curveset.ts';
import { curveUnits, showChange, showPercent, showSI, showValue } from '../../units/index.ts';

export interface Display {
  flow(si: number): string;
  head(si: number): string;
  npsh(si: number): string;
  power(si: number): string;
  diameter(si: number): string;
  /** Efficiency fraction → "78.4 %". */
  efficiency(fraction: number): string;
  /** Ratio → "+9.1 %". */
  percent(ratio: number, digits?: number): string;
  /** How to name a member: its diameter, else its speed, else its label. */
  member(m: Pick<Member, 'diameter_m' | 'speed_rpm' | 'label'>): string;
  units: { flow: string; head: string; npsh: string; power: string; diameter: string };
}

export function displayFor(units: DisplayUnits): Display {
  const { flow, head, npsh, power, diameter } = curveUnits(units);
  return {
    flow: (v) => showSI(v, flow, 4).text,
    head: (v) => showSI(v, head, 4).text,
    npsh: (v) => showSI(v, npsh, 3).text,
    power: (v) => showSI(v, power, 4).text,
    diameter: (v) => showSI(v, diameter, 4).text,
    efficiency: (f) => showPercent(f, 3).text,
    percent: (r, digits = 1) => showChange(r, digits).text,
    member: (m) => (m.diameter_m !== undefined ? showSI(m.diameter_m, diameter, 4).text : m.label ?? showValue(m.speed_rpm, 'rpm', 4).text),
    units: { flow: flow.label, head: head.label, npsh: npsh.label, power: power.label, diameter: diameter.label },
  };
}

