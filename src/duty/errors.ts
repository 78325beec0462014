/** Thrown when a duty check is asked for with input it cannot use; the message says what to fix. */
export class DutyError extends Error {
  override name = 'DutyError';
}
