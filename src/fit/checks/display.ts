/**
 * Figures in findings are quoted in the curve set's display units (a US set says "12 in",
 * not "304.8 mm"). This builds the formatters once per curve set, from the one formatter in
 * src/units: a figure that is not a finite number is a bug in the check that passes it
 * (`NotFiniteError`), never "NaN" in a sentence.
 */
import type { DisplayUnits, Member } from '../../model/curveset.ts';
import { curveUnits, formatChange, formatPercent, formatSI, formatValue } from '../../units/index.ts';

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
    flow: (v) => formatSI(v, flow, 4),
    head: (v) => formatSI(v, head, 4),
    npsh: (v) => formatSI(v, npsh, 3),
    power: (v) => formatSI(v, power, 4),
    diameter: (v) => formatSI(v, diameter, 4),
    efficiency: (f) => formatPercent(f, 3),
    percent: (r, digits = 1) => formatChange(r, digits),
    member: (m) => (m.diameter_m !== undefined ? formatSI(m.diameter_m, diameter, 4) : m.label ?? formatValue(m.speed_rpm, 'rpm', 4)),
    units: { flow: flow.label, head: head.label, npsh: npsh.label, power: power.label, diameter: diameter.label },
  };
}
