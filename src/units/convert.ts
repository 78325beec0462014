/**
 * Parsing unit tokens and converting between display numbers and SI.
 * The only place where a display unit turns into SI or back.
 */
import { UserError } from '../model/errors.ts';
import { UNITS, type QuantityKind, type Unit } from './units.ts';

/** Thrown for a unit token that is not known for the quantity asked for. */
export class UnitError extends UserError {
  override name = 'UnitError';
}

/** One spelling per token: spaces collapsed and dropped around "/", "^3" written "3". */
function normalize(token: string): string {
  return token.trim().replace(/\s+/g, ' ').replace(/\s*\/\s*/g, '/').replace(/\^([23])/g, '$1');
}

/** Case-insensitive form for the second pass ("GPM", "M3/H", "Ft" and "KW" all match). */
const loose = (token: string) => normalize(token).toLowerCase();

/** Known tokens of one kind, for messages. */
export function tokensOf(kind: QuantityKind): string[] {
  return UNITS.filter((u) => u.kind === kind).map((u) => u.token);
}

/**
 * Finds the unit for `token` among the units of `kind`. Matches the canonical token
 * exactly, then the aliases, then either case-insensitively.
 * Throws UnitError with the list of accepted tokens when nothing matches.
 */
export function parseUnit(kind: QuantityKind, token: string): Unit {
  const t = normalize(token);
  const candidates = UNITS.filter((u) => u.kind === kind);
  const exact = candidates.find((u) => u.token === t || u.aliases.includes(t));
  if (exact) return exact;
  const lower = loose(t);
  const found = candidates.find((u) => loose(u.token) === lower || u.aliases.some((a) => loose(a) === lower));
  if (found) return found;
  throw new UnitError(`Unknown ${kind} unit "${token}". Use one of: ${tokensOf(kind).join(', ')}.`);
}

/**
 * The screen label of a unit token of any kind ("m3/h" → "m³/h", "igpm" → "imp gpm"); a token
 * that names no unit comes back as it is.
 */
export function labelOf(token: string): string {
  const t = normalize(token);
  const lower = loose(t);
  const unit = UNITS.find((u) => u.token === t) ?? UNITS.find((u) => loose(u.token) === lower || u.aliases.some((a) => loose(a) === lower));
  return unit ? unit.label || unit.token : token;
}

/** Display value in `unit` → SI. */
export function toSI(value: number, unit: Unit): number {
  return value * unit.factor + unit.offset;
}

/** SI → display value in `unit`. Exact inverse of `toSI` up to rounding. */
export function fromSI(value: number, unit: Unit): number {
  return (value - unit.offset) / unit.factor;
}

/** Converts a value between two units of the same kind. */
export function convert(value: number, from: Unit, to: Unit): number {
  if (from.kind !== to.kind) throw new UnitError(`Cannot convert ${from.kind} (${from.token}) to ${to.kind} (${to.token}).`);
  return fromSI(toSI(value, from), to);
}

/** Shorthand: parse the token and convert to SI. */
export function siOf(kind: QuantityKind, value: number, token: string): number {
  return toSI(value, parseUnit(kind, token));
}

/** Shorthand: parse the token and convert from SI. */
export function displayOf(kind: QuantityKind, si: number, token: string): number {
  return fromSI(si, parseUnit(kind, token));
}
