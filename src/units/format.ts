/**
 * The one number formatter for screens, reports, findings and pages: significant figures,
 * the unit beside every number, and never "NaN" or "Infinity".
 *
 * - `formatNumber`, `formatSI`, `formatValue`, `formatPercent`, `formatChange` take a finite number
 *   and throw `NotFiniteError` (a programmer error) otherwise: code that may hold no number must
 *   say so with one of the `show…` functions instead.
 * - `showNumber`, `showSI`, `showValue` return a typed result: `{ ok: true, text }` or
 *   `{ ok: false, text: 'not available' }`, so a missing figure is visible to the caller and to the reader.
 *   The formatter owns that mark (`NOT_AVAILABLE.text`): no screen, page or report writes its own
 *   placeholder ("—", "-", "n/a") for a figure it does not have.
 * - `formatPrecision` keeps the trailing zeros that show the precision ("0.30 m"), and
 *   `formatFixed` writes a fixed number of decimals ("0.84"), for texts that have always read so.
 */
import { fromSI } from './convert.ts';
import type { Unit } from './units.ts';

/** A figure that cannot be shown reached a formatter: a bug in the caller, not a user error. */
export class NotFiniteError extends Error {
  override name = 'NotFiniteError';
  constructor(value: unknown) {
    super(`Only a finite number can be formatted, not ${String(value)}; the caller must check for a missing figure first.`);
  }
}

/** What a figure looks like on the page: its text, or the plain words "not available". */
export type Shown = { readonly ok: true; readonly text: string } | { readonly ok: false; readonly text: 'not available' };

export const NOT_AVAILABLE = { ok: false, text: 'not available' } as const satisfies Shown;

/** Rounds to `digits` significant figures (correctly rounded in decimal). */
export function roundSignificant(value: number, digits = 4): number {
  if (!Number.isFinite(value) || value === 0) return value;
  return Number(value.toPrecision(digits));
}

function requireFinite(value: number): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new NotFiniteError(value);
}

/**
 * `value` to `digits` significant figures, as plain text without exponent for ordinary sizes
 * (1e-6 ≤ |v| < 1e21), with an exponent (1.23e-7) beyond. No trailing zeros; "-0" is "0".
 */
export function formatNumber(value: number, digits = 4): string {
  requireFinite(value);
  if (!Number.isInteger(digits) || digits < 1 || digits > 17) throw new RangeError(`Significant figures must be a whole number from 1 to 17, not ${digits}.`);
  const rounded = roundSignificant(value, digits);
  if (rounded === 0) return '0';
  const text = String(rounded);
  return text.includes('e') ? rounded.toExponential(Math.max(0, digits - 1)).replace(/\.?0+e/, 'e') : text;
}

/** A value already in its display unit, with the unit's label beside it: "45.2 m³/h". */
export function formatValue(value: number, label: string, digits = 4): string {
  const text = formatNumber(value, digits);
  return label ? `${text} ${label}` : text;
}

/** An SI value shown in `unit`: "12 in", "45.2 m³/h", "68 °F". */
export function formatSI(si: number, unit: Unit, digits = 4): string {
  requireFinite(si);
  return formatValue(fromSI(si, unit), unit.label, digits);
}

/** A fraction as a percentage: 0.784 → "78.4 %". */
export function formatPercent(fraction: number, digits = 3): string {
  requireFinite(fraction);
  return formatValue(fraction * 100, '%', digits);
}

/** A relative change with its sign, to fixed decimals: 0.0912 → "+9.1 %", −0.05 → "−5.0 %". */
export function formatChange(ratio: number, decimals = 1): string {
  requireFinite(ratio);
  return `${ratio >= 0 ? '+' : '−'}${Math.abs(ratio * 100).toFixed(decimals)} %`;
}

/**
 * `value` to `digits` significant figures keeping the trailing zeros that show the precision
 * ("0.30", "2.0", "48"); a value that needs more whole digits than that is rounded to a whole
 * number ("148", never "1.5e+2"). An exponent only for magnitudes below 1e-6 ("1.0e-7").
 */
export function formatPrecision(value: number, digits = 2): string {
  requireFinite(value);
  if (!Number.isInteger(digits) || digits < 1 || digits > 17) throw new RangeError(`Significant figures must be a whole number from 1 to 17, not ${digits}.`);
  if (value === 0) return '0';
  if (Math.abs(roundSignificant(value, digits)) >= 10 ** digits) return String(Math.round(value) || 0);
  return value.toPrecision(digits);
}

/** `value` with exactly `decimals` decimals ("0.84", "12.0"); "-0.0" is written "0.0". */
export function formatFixed(value: number, decimals = 1): string {
  requireFinite(value);
  if (!Number.isInteger(decimals) || decimals < 0 || decimals > 20) throw new RangeError(`Decimals must be a whole number from 0 to 20, not ${decimals}.`);
  const text = value.toFixed(decimals);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

const isFigure = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

/** `formatNumber`, or "not available" for a missing or non-finite figure. */
export function showNumber(value: number | null | undefined, digits = 4): Shown {
  return isFigure(value) ? { ok: true, text: formatNumber(value, digits) } : NOT_AVAILABLE;
}

/** `formatValue`, or "not available". */
export function showValue(value: number | null | undefined, label: string, digits = 4): Shown {
  return isFigure(value) ? { ok: true, text: formatValue(value, label, digits) } : NOT_AVAILABLE;
}

/** `formatSI`, or "not available". */
export function showSI(si: number | null | undefined, unit: Unit, digits = 4): Shown {
  return isFigure(si) ? { ok: true, text: formatSI(si, unit, digits) } : NOT_AVAILABLE;
}

/** `formatPercent`, or "not available". */
export function showPercent(fraction: number | null | undefined, digits = 3): Shown {
  return isFigure(fraction) ? { ok: true, text: formatPercent(fraction, digits) } : NOT_AVAILABLE;
}

/** `formatChange`, or "not available". */
export function showChange(ratio: number | null | undefined, decimals = 1): Shown {
  return isFigure(ratio) ? { ok: true, text: formatChange(ratio, decimals) } : NOT_AVAILABLE;
}

/** `formatFixed` with the label beside it ("78.4 %"), or "not available". */
export function showFixed(value: number | null | undefined, decimals = 1, label = ''): Shown {
  return isFigure(value) ? { ok: true, text: label ? `${formatFixed(value, decimals)} ${label}` : formatFixed(value, decimals) } : NOT_AVAILABLE;
}
