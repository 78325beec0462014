/**
 * The one error class of the fitting room. Its message is a single sentence that says
 * what was wrong with the input and what to do about it; the CLI prints it as is.
 */
import { UserError } from '../model/errors.ts';
export class FitError extends UserError {
  override name = 'FitError';
}
