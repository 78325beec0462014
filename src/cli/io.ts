/**
 * File reading and writing for the command line, with messages a user can act on.
 * Writes go to a temporary file first and are renamed into place, so a failed save never
 * leaves a half-written file where a good one was.
 */
import { existsSync, readFileSync, renameSync, statSync, writeFileSync, unlinkSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import type { CurveSet } from '../model/curveset.ts';
import { parseCurveSetJson } from '../model/curvesetIO.ts';
import { InputError } from './errors.ts';
import { isDecimalText } from '../units/readNumber.ts';

export function readText(path: string, what = 'file'): string {
  if (!existsSync(path)) throw new InputError(`The ${what} "${path}" does not exist.`);
  const stat = statSync(path);
  if (stat.isDirectory()) throw new InputError(`"${path}" is a folder; give the path of the ${what}.`);
  const text = readFileSync(path, 'utf8');
  if (text.trim() === '') throw new InputError(`The ${what} "${path}" is empty.`);
  return text;
}

export function readCurveSet(path: string): CurveSet {
  return parseCurveSetJson(readText(path, 'curve set'), `The file "${path}"`);
}

export function writeTextAtomic(path: string, text: string): void {
  const dir = dirname(path);
  if (!existsSync(dir)) throw new InputError(`Cannot write "${path}": the folder "${dir}" does not exist.`);
  const tmp = join(dir, `.${basename(path)}.${process.pid}.tmp`);
  try {
    writeFileSync(tmp, text);
    renameSync(tmp, path);
  } catch (error) {
    try { unlinkSync(tmp); } catch { /* nothing to clean */ }
    throw new InputError(`Cannot write "${path}": ${(error as Error).message}.`);
  }
}

/** Parses a positive number option, or throws a sentence naming the option. */
export function positiveOption(value: string | undefined, flag: string): number | undefined {
  if (value === undefined) return undefined;
  const v = isDecimalText(value) ? Number(value) : Number.NaN; // decimal only: "0x10" is not 16
  if (!Number.isFinite(v) || v <= 0) throw new InputError(`The option ${flag} must be a positive number, not "${value}".`);
  return v;
}
