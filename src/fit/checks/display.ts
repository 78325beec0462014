/**
 * Figures in findings are quoted in the curve set's display units (a US set says "12 in",
 * not "304.8 mm"). This builds the formatters once per curve set.
 */
import type { DisplayUnits, Member } from '../../model/curveset.ts';
import { formatSI, parseUnit, roundSignificant } from '../../units/index.ts';

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
  const flow = parseUnit('flow', units.flow);
  const head = parseUnit('head', units.head);
  const npsh = parseUnit('head', units.npsh);
  const power = parseUnit('power', units.power);
  const diameter = parseUnit('diameter', units.diameter);
  return {
    flow: (v) => formatSI(v, flow, 4),
    head: (v) => formatSI(v, head, 4),
    npsh: (v) => formatSI(v, npsh, 3),
    power: (v) => formatSI(v, power, 4),
    diameter: (v) => formatSI(v, diameter, 4),
    efficiency: (f) => `${roundSignificant(f * 100, 3)} %`,
    percent: (r, digits = 1) => `${r >= 0 ? '+' : '−'}${Math.abs(r * 100).toFixed(digits)} %`,
    member: (m) => (m.diameter_m !== undefined ? formatSI(m.diameter_m, diameter, 4) : m.label ?? `${roundSignificant(m.speed_rpm, 4)} rpm`),
    units: { flow: flow.label, head: head.label, npsh: npsh.label, power: power.label, diameter: diameter.label },
  };
}
