/**
 * Exit codes and error reporting for the command line.
 * 0 — ok; 1 — the checks found a `fail`; 2 — unusable input.
 * Errors reach the user as one sentence on stderr, never as a stack trace.
 */
import { ZodError } from 'zod';
import { describeZodError, isUserError, UserError } from '../model/errors.ts';

export { describeZodError };

export const EXIT_OK = 0;
export const EXIT_FAILED_CHECKS = 1;
export const EXIT_BAD_INPUT = 2;

/** Input the command cannot use. The message is shown to the user as is. */
export class InputError extends UserError {
  override name = 'InputError';
}


/** One line for any thrown value; programmer errors are flagged as such. */
export function sentenceFor(error: unknown): string {
  if (error instanceof ZodError) return describeZodError(error, 'The input');
  if (error instanceof Error) {
    if (isUserError(error)) return error.message;
    return `Unexpected internal error: ${error.message}. Please report it with the input that caused it.`;
  }
  return `Unexpected internal error: ${String(error)}.`;
}

/** Runs a command body and converts its outcome into an exit code. */
export async function runCommand(body: () => Promise<number> | number): Promise<never> {
  let code: number;
  try {
    code = await body();
  } catch (error) {
    process.stderr.write(`pumpscribe: ${sentenceFor(error).replace(/\s*\n\s*/g, ' ')}\n`); // one line, even when a parser quotes the input
    if (process.env.PUMPSCRIBE_DEBUG && error instanceof Error) process.stderr.write(`${error.stack}\n`);
    code = isProgrammerError(error) ? 3 : EXIT_BAD_INPUT;
  }
  process.exit(code);
}

function isProgrammerError(error: unknown): boolean {
  return error instanceof Error && sentenceFor(error).startsWith('Unexpected internal error');
}
