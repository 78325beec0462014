/**
 * Entry identifiers: 16 lowercase hex digits (64 random bits). The strict shape means an
 * id taken from a URL or a command line can never carry a path, a quote or markup.
 */
import { randomBytes } from 'node:crypto';
import { LibraryError } from './errors.ts';

const ENTRY_ID = /^[0-9a-f]{16}$/;
const SHA256 = /^[0-9a-f]{64}$/;

export function newEntryId(): string {
  return randomBytes(8).toString('hex');
}

export function isEntryId(value: string): boolean {
  return ENTRY_ID.test(value);
}

export function isSha256(value: string): boolean {
  return SHA256.test(value);
}

/** Throws a not-found LibraryError for anything that is not shaped like an entry id. */
export function checkEntryId(value: string): string {
  if (!isEntryId(value)) {
    throw new LibraryError(`No library entry has the id "${clip(value)}"; ids are 16 hexadecimal digits, as listed by "library list".`, 'not-found');
  }
  return value;
}

export function checkSha256(value: string): string {
  if (!isSha256(value)) {
    throw new LibraryError(`"${clip(value)}" is not a SHA-256 digest; give the 64 lowercase hexadecimal digits returned when the sheet was stored.`, 'not-found');
  }
  return value;
}

/** Keeps echoed user input short in messages. */
export function clip(value: string, max = 40): string {
  const flat = value.replace(/[\u0000-\u001f\u007f]/g, '?');
  return flat.length > max ? `${flat.slice(0, max)}…` : flat;
}
