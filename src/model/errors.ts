/**
 * The one mark of an error meant for the user: its message is one sentence saying what was
 * wrong and what to do. Every layer's input error extends `UserError`; anything else that
 * reaches a shell is a programmer error. `code` is a stable, machine-readable word for
 * scripts and HTTP bodies.
 */
import type { ZodError } from 'zod';

export class UserError extends Error {
  override name = 'UserError';
  /** A stable word for scripts (kebab-case); subclasses set their own. */
  readonly code: string;

  constructor(message: string, code = 'invalid-input') {
    super(message);
    this.code = code;
  }
}

/** True for an error whose message may be shown to the user as is. */
export function isUserError(error: unknown): error is UserError {
  return error instanceof UserError;
}

/** Turns a zod error into one readable sentence naming the first problems. */
export function describeZodError(error: ZodError, what: string): string {
  const issues = error.issues.slice(0, 3).map((i) => {
    const path = i.path.length ? i.path.join('.') : '(top level)';
    return `${path}: ${i.message}`;
  });
  const more = error.issues.length > 3 ? ` (and ${error.issues.length - 3} more)` : '';
  return `${what} is not valid — ${issues.join('; ')}${more}.`;
}
