/**
 * The one error class of the fitting room. Its message is a single sentence that says
 * what was wrong with the input and what to do about it; the CLI prints it as is.
 */
export class FitError extends Error {
  override name = 'FitError';
}
