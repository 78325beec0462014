/** Formatting numbers with their units for screens, reports and findings. */
import { fromSI } from './convert.ts';
import type { Unit } from './units.ts';

/** Rounds to `digits` significant figures, without exponent notation for ordinary magnitudes. */
export function roundSignificant(value: number, digits = 4): number {
  if (!Number.isFinite(value) || value === 0) return value;
  const magnitude = Math.floor(Math.log10(Math.abs(value)));
  const factor = 10 ** (digits - 1 - magnitude);
  return Math.round(value * factor) / factor;
}

/** "12 in", "45.2 m³/h", "68.5 °F". The value is SI; the unit chooses the display. */
export function formatSI(si: number, unit: Unit, digits = 4): string {
  const shown = roundSignificant(fromSI(si, unit), digits);
  const text = Number.isFinite(shown) ? String(shown) : '—';
  return unit.label ? `${text} ${unit.label}` : text;
}
