/** Words used on several screens, in one place so that they read the same everywhere. */
import type { Quantity } from '../../model/curveset.ts';
import type { Step } from '../store/store.ts';

export const STEP_TITLES: Record<Step, string> = {
  load: 'Load the sheet',
  axes: 'Set the axes',
  trace: 'Trace the curves',
  review: 'Review',
  save: 'Save',
};

export const QUANTITY_NAMES: Record<Quantity, string> = { head: 'Head', efficiency: 'Efficiency', power: 'Power', npshr: 'NPSHr' };

/** Units offered per axis; every token here parses with src/units. */
export const UNIT_CHOICES = {
  flow: ['m3/h', 'm3/s', 'L/s', 'L/min', 'gpm', 'igpm'],
  head: ['m', 'ft'],
  power: ['kW', 'W', 'hp'],
  efficiency: ['%'],
  diameter: ['mm', 'in', 'm'],
} as const;

export function unitText(token: string): string {
  return token.replace('m3/h', 'm³/h').replace('m3/s', 'm³/s').replace('igpm', 'imp gpm');
}

export const SAFETY_SENTENCE = 'Results are for preliminary work. Check them against the manufacturer’s certified data and the local codes before selecting a pump.';

/** Formats a number for a field or a table: up to `digits` significant figures, no exponent for ordinary sizes. */
export function num(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const magnitude = Math.floor(Math.log10(Math.abs(value)));
  const decimals = Math.max(0, Math.min(6, digits - 1 - magnitude));
  return value.toFixed(decimals).replace(/(\.\d*?)0+$/, '$1').replace(/\.$/, '');
}
