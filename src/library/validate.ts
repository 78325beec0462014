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
import { checkFailing, checkSound, summarizeFindings } from './soundness.ts';
import type { RevisionFacts } from './storeSql.ts';

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

/**
 * Everything the library asks of a revision before it stores it: the schema, known units, a head
 * curve, and no `fail` finding unless `acceptFailing` (see soundness.ts). Returns what is stored.
 */
export function checkRevision(input: unknown, options: { what?: string; acceptFailing?: boolean; how?: string } = {}): RevisionFacts {
  const what = options.what ?? 'The curve set';
  const checked = checkCurveSet(input, what);
  checkSound(checked.set, what);
  const findings = summarizeFindings(checked.set);
  checkFailing(findings, options.acceptFailing === true, what, options.how);
  return { ...checked, findings, acceptedFailing: findings.fail_count > 0 };
}
