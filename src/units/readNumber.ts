/**
 * The one reader of a number typed by a user (a CLI option, a form field, a query parameter,
 * a table cell). Decimal notation only: "12", "-3.5", ".5", "1e3", "2.5E-4". Refused with a
 * sentence naming the field: "" and blanks, hexadecimal and other prefixes ("0x10", "0b1"),
 * a dangling exponent ("1e"), trailing text ("12abc"), "Infinity", "NaN", digit separators
 * ("1_000"), and a decimal comma ("1,5" — the sentence says to write 1.5).
 * JavaScript's `Number()` would read "0x10" as 16 and "" as 0; this never does.
 */
import { UserError } from '../model/errors.ts';

/** A text that is not a decimal number, or a number of the wrong sign. */
export class NumberTextError extends UserError {
  override name = 'NumberTextError';
  constructor(message: string) {
    super(message, 'not-a-number');
  }
}

const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

export type Sign = 'any' | 'positive' | 'non-negative';

export interface ReadDecimalOptions {
  /** Which values are allowed; "any" by default. */
  sign?: Sign;
}

/** True when `text` (trimmed) is a decimal number in the notation above. */
export function isDecimalText(text: string): boolean {
  return DECIMAL.test(text.trim());
}

/**
 * Reads a decimal number from `text`, or throws NumberTextError with one sentence naming
 * `field` as the user wrote it ("--speed", "Flow", "row 4, column head").
 */
export function readDecimal(text: string, field: string, options: ReadDecimalOptions = {}): number {
  const t = String(text).trim();
  if (t === '') throw new NumberTextError(`${field} needs a number; it was left empty.`);
  if (!DECIMAL.test(t)) {
    const comma = /^[+-]?\d*,\d+$/.test(t) ? ` (write the decimal mark as a dot: ${t.replace(',', '.')})` : '';
    throw new NumberTextError(`${field} must be a decimal number such as 12.5 or 1e3, not "${clip(t)}"${comma}.`);
  }
  const value = Number(t);
  if (!Number.isFinite(value)) throw new NumberTextError(`${field} is too large a number ("${clip(t)}").`);
  const sign = options.sign ?? 'any';
  if (sign === 'positive' && !(value > 0)) throw new NumberTextError(`${field} must be greater than zero, not ${t}.`);
  if (sign === 'non-negative' && !(value >= 0)) throw new NumberTextError(`${field} must be zero or more, not ${t}.`);
  return value === 0 ? 0 : value;
}

function clip(text: string): string {
  return text.length > 40 ? `${text.slice(0, 37)}…` : text;
}
