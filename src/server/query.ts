/** Reading query strings and headers strictly: anything unexpected is a 400 with a clear sentence. */
import { LibraryError } from '../library/errors.ts';
import { readDecimal } from '../units/readNumber.ts';

export type Query = Record<string, unknown>;

function single(query: Query, key: string): string | undefined {
  const v = query[key];
  if (v === undefined) return undefined;
  if (typeof v !== 'string') throw new LibraryError(`Give "${key}" once in the query.`, 'invalid');
  return v;
}

export function text(query: Query, key: string, max = 200): string | undefined {
  const v = single(query, key);
  if (v !== undefined && v.length > max) throw new LibraryError(`"${key}" is longer than ${max} characters.`, 'invalid');
  return v;
}

/** A finite decimal number by the one reader (src/units/readNumber.ts), or undefined when absent or empty. */
export function number(query: Query, key: string, what: string): number | undefined {
  const v = single(query, key);
  if (v === undefined || v.trim() === '') return undefined;
  try {
    return readDecimal(v, what);
  } catch (error) {
    throw new LibraryError((error as Error).message, 'invalid');
  }
}

export function required(value: number | undefined, what: string): number {
  if (value === undefined) throw new LibraryError(`${what} is missing from the query.`, 'invalid');
  return value;
}

export function integer(query: Query, key: string, what: string, min: number, max: number): number | undefined {
  const v = number(query, key, what);
  if (v === undefined) return undefined;
  if (!Number.isInteger(v) || v < min || v > max) throw new LibraryError(`${what} must be a whole number from ${min} to ${max}.`, 'invalid');
  return v;
}

export function flag(query: Query, key: string): boolean | undefined {
  const v = single(query, key);
  if (v === undefined) return undefined;
  if (v === 'true' || v === '1' || v === '') return true;
  if (v === 'false' || v === '0') return false;
  throw new LibraryError(`"${key}" must be true or false.`, 'invalid');
}

/** `If-Match: "3"` or `If-Match: 3` → 3. */
export function expectedRevision(header: string | string[] | undefined): number | undefined {
  if (header === undefined) return undefined;
  const raw = (Array.isArray(header) ? header[0] ?? '' : header).trim().replace(/^W\//, '').replace(/^"(.*)"$/, '$1');
  const m = /^(?:[0-9a-f]{16}:)?(\d+)$/.exec(raw);
  if (!m) throw new LibraryError('If-Match must name the revision you edited, e.g. If-Match: "3".', 'invalid');
  return Number(m[1]);
}
