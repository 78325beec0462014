/**
 * Reading and writing curve-set JSON. Reading validates and migrates; writing emits the
 * fields in schema order with two-space indentation, so files diff cleanly.
 */
import { UserError } from './errors.ts';
import { ZodError } from 'zod';
import { CURVESET_FORMAT, CURVESET_VERSION, CurveSet } from './curveset.ts';
import { checkCurveSetDocumentLimits } from './limits.ts';

export class CurveSetFormatError extends UserError {
  override name = 'CurveSetInputError';
}

/**
 * Migrations, keyed by the version they upgrade FROM. Each takes the parsed JSON of that
 * version and returns the next version's JSON.
 */
export const MIGRATIONS: Record<number, (old: Record<string, unknown>) => Record<string, unknown>> = {
  // Version 2 only names the optional `drawn_as` of a curve and `limits`: a version 1 file is a valid version 2 file.
  1: (old) => ({ ...old, version: 2 }),
};

function firstIssues(error: ZodError): string {
  return error.issues
    .slice(0, 3)
    .map((i) => `${i.path.length ? i.path.join('.') : '(top level)'}: ${i.message}`)
    .join('; ');
}

/** Validates (and migrates) a parsed JSON value into a curve set. */
export function toCurveSet(value: unknown, source = 'The file'): CurveSet {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) throw new CurveSetFormatError(`${source} is not a curve set: it holds no JSON object.`);
  let doc = value as Record<string, unknown>;
  if (doc.format !== CURVESET_FORMAT) throw new CurveSetFormatError(`${source} is not a curve set: its "format" is ${JSON.stringify(doc.format) ?? 'missing'}, expected "${CURVESET_FORMAT}".`);
  const stated = doc.version;
  if (typeof stated !== 'number' || !Number.isInteger(stated) || stated < 1) throw new CurveSetFormatError(`${source} has no valid curve-set version.`);
  let version: number = stated;
  if (version > CURVESET_VERSION) throw new CurveSetFormatError(`${source} is curve-set version ${version}, newer than this Pumpscribe reads (${CURVESET_VERSION}); update Pumpscribe.`);
  while (version < CURVESET_VERSION) {
    const step = MIGRATIONS[version];
    if (!step) throw new CurveSetFormatError(`${source} is curve-set version ${version}, which cannot be upgraded.`);
    doc = step(doc);
    version = doc.version as number;
  }
  checkCurveSetDocumentLimits(doc, source); // model/limits.ts: refuse what no sheet holds, before validating it
  const parsed = CurveSet.safeParse(doc);
  if (!parsed.success) throw new CurveSetFormatError(`${source} is not a valid curve set — ${firstIssues(parsed.error)}.`);
  return parsed.data;
}

export function parseCurveSetJson(text: string, source = 'The file'): CurveSet {
  if (text.trim() === '') throw new CurveSetFormatError(`${source} is empty.`);
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (error) {
    throw new CurveSetFormatError(`${source} is not valid JSON (${(error as Error).message}).`);
  }
  return toCurveSet(value, source);
}

export function stringifyCurveSet(set: CurveSet): string {
  return `${JSON.stringify(CurveSet.parse(set), null, 2)}\n`;
}
