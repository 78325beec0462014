/**
 * Storage faults in words: a read-only library file or folder, a full disk, an I/O error.
 * SQLite and Node report them with codes; the library turns them into one LibraryError each,
 * with a sentence saying what is wrong and what to do, and a stable code (`storage-read-only`,
 * `storage-full`, `storage-fault`). Nothing else is caught here.
 */
import { LibraryError } from './errors.ts';

function codeOf(error: unknown): string {
  return typeof (error as { code?: unknown })?.code === 'string' ? (error as { code: string }).code : '';
}

/** The LibraryError for a storage fault, or null when `error` is something else. */
export function storageFault(error: unknown, file: string): LibraryError | null {
  if (error instanceof LibraryError) return null;
  const code = codeOf(error);
  if (code.startsWith('SQLITE_READONLY') || code === 'EROFS' || code === 'EACCES' || code === 'EPERM') {
    return new LibraryError(
      `The library file "${file}" or its folder is read-only, so nothing was changed; it can still be listed and searched. Make the file and its folder writable (or copy the library somewhere writable) to save to it.`,
      'read-only',
    );
  }
  if (code === 'SQLITE_FULL' || code === 'ENOSPC' || code === 'EDQUOT') {
    return new LibraryError(`The disk holding the library file "${file}" is full, so nothing was changed; free some space and try again.`, 'storage-full');
  }
  if (code.startsWith('SQLITE_IOERR') || code === 'EIO') {
    return new LibraryError(`The disk reported an input/output error on the library file "${file}", so nothing was changed; check the disk, then run "library verify".`, 'storage-full', 'storage-fault');
  }
  return null;
}

/** Runs a write, turning storage faults into LibraryErrors. */
export function guardStorage<T>(file: string, body: () => T): T {
  try {
    return body();
  } catch (error) {
    throw storageFault(error, file) ?? error;
  }
}
