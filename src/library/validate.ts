/**
 * The gates every document passes before it is stored: the project's own schemas (with their
 * migrations), nothing looser. The stored text is the canonical JSON of the validated value,
 * so what comes back is exactly what was kept.
 */
import { createHash } from 'node:crypto';
import { ZodError } from 'zod';
import type { CurveSet } from '../model/curveset.ts';
import { toCurveSet } from '../model/curvesetIO.ts';
import { parseTakeoff, type Takeoff } from '../model/takeoff.ts';
import { describeZodError } from '../model/errors.ts';
import { LibraryError } from './errors.ts';

export interface CheckedCurveSet {
  set: CurveSet;
  /** Canonical JSON text, as stored. */
  text: string;
  /** SHA-256 of `text`, lowercase hex. */
  sha256: string;
}

export function sha256Hex(data: string | Uint8Array): string {
  return createHash('sha256').update(data).digest('hex');
}

function asLibraryError(error: unknown, what: string): LibraryError {
  if (error instanceof ZodError) return new LibraryError(describeZodError(error, what), 'invalid');
  if (error instanceof Error) return new LibraryError(error.message, 'invalid');
  return new LibraryError(`${what} is not valid.`, 'invalid');
}

export function checkCurveSet(input: unknown, what = 'The curve set'): CheckedCurveSet {
  let set: CurveSet;
  try {
    set = toCurveSet(input, what);
  } catch (error) {
    throw asLibraryError(error, what);
  }
  const text = JSON.stringify(set);
  return { set, text, sha256: sha256Hex(text) };
}

export function checkTakeoff(input: unknown, what = 'The take-off file'): Takeoff {
  try {
    return parseTakeoff(input);
  } catch (error) {
    throw asLibraryError(error, what);
  }
}
