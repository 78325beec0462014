/**
 * The one error class the library throws for unusable input or requests.
 * `reason` lets the server pick an HTTP status without parsing the message.
 */
import { UserError } from '../model/errors.ts';
export type LibraryErrorReason = 'invalid' | 'not-found' | 'conflict' | 'too-large' | 'unusable-file';

export class LibraryError extends UserError {
  override name = 'LibraryError';
  readonly reason: LibraryErrorReason;

  constructor(message: string, reason: LibraryErrorReason = 'invalid') {
    super(message);
    this.reason = reason;
  }
}
