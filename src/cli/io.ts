/**
 * File reading and writing for the command line, with messages a user can act on.
 *
 * `-` means standard input (when read) or standard output (when written), for every command
 * that reads or writes through this file. When the result goes to standard output, the
 * human-readable report goes to standard error (see `reportStream`), so a pipe carries only
 * the result: `pumpscribe build t.csv -o - --units us --speed 1780 | pumpscribe check -`.
 *
 * Writes to a file go to a temporary file first and are renamed into place, so a failed save
 * never leaves a half-written file where a good one was.
 */
import { existsSync, readFileSync, readSync, renameSync, statSync, writeFileSync, writeSync, unlinkSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import type { CurveSet } from '../model/curveset.ts';
import { parseCurveSetJson } from '../model/curvesetIO.ts';
import { InputError } from './errors.ts';
import { isDecimalText } from '../units/readNumber.ts';

/** The name that stands for standard input or output. */
export const STDIO = '-';

export function isStdio(path: string | undefined): boolean {
  return path === STDIO;
}

/** How a path is named in messages: "-" reads as standard input. */
export function describePath(path: string): string {
  return isStdio(path) ? 'standard input' : `"${path}"`;
}

let stdinText: string | undefined;

/** All of standard input as text (read once; a second read gets the same text). */
function readStdin(what: string): string {
  if (stdinText !== undefined) return stdinText;
  const chunks: Buffer[] = [];
  const chunk = Buffer.alloc(1 << 16);
  const pause = new Int32Array(new SharedArrayBuffer(4));
  for (;;) {
    let n: number;
    try {
      n = readSync(0, chunk, 0, chunk.length, null);
    } catch (error) {
      const code = (error as NodeJS.ErrnoException).code;
      if (code === 'EAGAIN') {
        Atomics.wait(pause, 0, 0, 5); // a non-blocking pipe with nothing yet: wait for the writer
        continue;
      }
      if (code === 'EOF') break;
      throw new InputError(`Cannot read the ${what} from standard input: ${(error as Error).message}.`);
    }
    if (n === 0) break;
    chunks.push(Buffer.from(chunk.subarray(0, n)));
  }
  stdinText = Buffer.concat(chunks).toString('utf8');
  return stdinText;
}

export function readText(path: string, what = 'file'): string {
  if (isStdio(path)) {
    if (process.stdin.isTTY) throw new InputError(`The ${what} is "-" (standard input), but nothing is piped in; pipe a file into the command or give its path.`);
    const text = readStdin(what);
    if (text.trim() === '') throw new InputError(`The ${what} on standard input is empty.`);
    return text;
  }
  if (!existsSync(path)) throw new InputError(`The ${what} "${path}" does not exist.`);
  const stat = statSync(path);
  if (stat.isDirectory()) throw new InputError(`"${path}" is a folder; give the path of the ${what}.`);
  const text = readFileSync(path, 'utf8');
  if (text.trim() === '') throw new InputError(`The ${what} "${path}" is empty.`);
  return text;
}

export function readCurveSet(path: string): CurveSet {
  return parseCurveSetJson(readText(path, 'curve set'), isStdio(path) ? 'The curve set on standard input' : `The file "${path}"`);
}

/** Writes all of `text` to standard output, synchronously; a closed pipe ends quietly. */
export function writeStdout(text: string): void {
  writeAll(1, text);
}

/** Where an in-process runner (the fuzz tests, an embedding script) collects what commands print; null writes to the descriptors. */
type OutputSink = (fd: 1 | 2, text: string) => void;
let sink: OutputSink | null = null;

/** Sends standard output and error of the commands to `next` until called again with null. */
export function captureOutput(next: OutputSink | null): void {
  sink = next;
}

function writeAll(fd: number, text: string): void {
  if (sink && (fd === 1 || fd === 2)) {
    sink(fd, text);
    return;
  }
  const bytes = Buffer.from(text, 'utf8');
  let at = 0;
  while (at < bytes.length) {
    try {
      at += writeSync(fd, bytes, at, bytes.length - at);
    } catch (error) {
      const code = (error as NodeJS.ErrnoException).code;
      if (code === 'EAGAIN') continue; // a non-blocking pipe that is full: try again
      if (code === 'EPIPE') process.exit(0); // the reader has gone (e.g. `| head`); nothing left to say
      throw error;
    }
  }
}

export function writeTextAtomic(path: string, text: string): void {
  if (isStdio(path)) {
    writeStdout(text);
    return;
  }
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

/**
 * Where the human-readable report goes: standard output, unless the result itself is written
 * there (`-o -`), in which case the report moves to standard error.
 */
export function reportStream(output: string | undefined): { write(text: string): void } {
  return isStdio(output) ? { write: (t: string) => writeAll(2, t) } : { write: writeStdout };
}

/**
 * Prints a command's report: JSON (`--json`) or text. With `-o -` the result owns standard
 * output, so the report (either form) goes to standard error.
 */
export function emitReport(options: { json?: boolean; quiet?: boolean; output?: string }, json: () => unknown, text: () => string): void {
  const stream = reportStream(options.output);
  if (options.json) stream.write(`${JSON.stringify(json(), null, 2)}\n`);
  else if (!options.quiet) stream.write(text());
}

/**
 * Progress for long work, on standard error and only when it is a terminal (a pipe or a log
 * file gets nothing). Returns a function taking a short phrase; `done()` clears the line.
 */
export function progressLine(enabled = process.stderr.isTTY === true && !process.env.CI): { step(text: string): void; done(): void } {
  if (!enabled) return { step: () => undefined, done: () => undefined };
  const started = Date.now();
  return {
    step: (text: string) => process.stderr.write(`\r\x1b[2K${((Date.now() - started) / 1000).toFixed(1)} s  ${text}`),
    done: () => process.stderr.write('\r\x1b[2K'),
  };
}

/** Parses a positive number option, or throws a sentence naming the option. */
export function positiveOption(value: string | undefined, flag: string): number | undefined {
  if (value === undefined) return undefined;
  const v = isDecimalText(value) ? Number(value) : Number.NaN; // decimal only: "0x10" is not 16
  if (!Number.isFinite(v) || v <= 0) throw new InputError(`The option ${flag} must be a positive number, not "${value}".`);
  return v;
}

/**
 * Curve sets named inside a study file, by paths relative to that file, each read once.
 * `load` is what the study asks for; `loaded` lists what was read (for the exit code).
 */
export function curveSetsBeside(studyFile: string): { load(path: string): CurveSet; loaded(): CurveSet[] } {
  const base = dirname(resolve(studyFile));
  const cache = new Map<string, CurveSet>();
  return {
    load(path: string): CurveSet {
      const full = resolve(base, path);
      let set = cache.get(full);
      if (!set) {
        set = readCurveSet(full);
        cache.set(full, set);
      }
      return set;
    },
    loaded: () => [...cache.values()],
  };
}
