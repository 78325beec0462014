/** Thrown when a duty check is asked for with input it cannot use; the message says what to fix. */
import { UserError } from '../model/errors.ts';
export class DutyError extends UserError {
  override name = 'DutyError';
}
