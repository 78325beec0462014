/**
 * The one error class the library throws for unusable input, refused requests and storage faults.
 * `reason` lets the server pick an HTTP status without parsing the message; `code` (from UserError)
 * is the stable word scripts and HTTP bodies carry.
 */
import { UserError } from '../model/errors.ts';

export type LibraryErrorReason =
  | 'invalid'
  | 'not-found'
  | 'conflict'
  | 'too-large'
  | 'unusable-file'
  /** A write that must name the revision it edits (If-Match) did not. */
  | 'precondition-required'
  /** The revision named is no longer the latest. */
  | 'precondition-failed'
  /** The library file or its folder cannot be written. */
  | 'read-only'
  /** The disk (or the file's size limit) is full. */
  | 'storage-full';

/** Stable codes, one per kind of refusal. */
export type LibraryErrorCode =
  | 'invalid-input'
  | 'not-found'
  | 'conflict'
  | 'too-large'
  | 'unusable-file'
  | 'revision-required'
  | 'revision-stale'
  | 'other-pump'
  | 'failing-set'
  | 'unsound-set'
  | 'import-busy'
  | 'damaged-rows'
  | 'storage-read-only'
  | 'storage-full'
  | 'storage-fault';

const DEFAULT_CODE: Record<LibraryErrorReason, LibraryErrorCode> = {
  invalid: 'invalid-input',
  'not-found': 'not-found',
  conflict: 'conflict',
  'too-large': 'too-large',
  'unusable-file': 'unusable-file',
  'precondition-required': 'revision-required',
  'precondition-failed': 'revision-stale',
  'read-only': 'storage-read-only',
  'storage-full': 'storage-full',
};

export class LibraryError extends UserError {
  override name = 'LibraryError';
  readonly reason: LibraryErrorReason;
  declare readonly code: LibraryErrorCode;

  constructor(message: string, reason: LibraryErrorReason = 'invalid', code?: LibraryErrorCode) {
    super(message, code ?? DEFAULT_CODE[reason]);
    this.reason = reason;
  }
}
