/**
 * Storage faults in words: a read-only library file or folder, a full disk, an I/O error.
 * SQLite and Node report them with codes; the library turns them into one LibraryError each,
 * with a sentence saying what is wrong and what to do, and a stable code (`storage-read-only`,
 * `storage-full`, `storage-fault`). Nothing else is caught here.
 */
import { statfsSync } from 'node:fs';
import { dirname } from 'node:path';
import { LibraryError } from './errors.ts';

/** Below this much free space, an I/O error on the library is taken for a full disk. */
const NEARLY_FULL_BYTES = 256 * 1024;

/** True when the file system holding `file` has (almost) no space left for this user. */
export function diskFull(file: string): boolean {
  try {
    const s = statfsSync(dirname(file));
    return s.bavail * s.bsize < NEARLY_FULL_BYTES;
  } catch {
    return false;
  }
}

export function fullDiskError(file: string): LibraryError {
  return new LibraryError(`The disk holding the library file "${file}" is full, so nothing was changed; free some space and try again.`, 'storage-full');
}

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
  if (code === 'SQLITE_FULL' || code === 'ENOSPC' || code === 'EDQUOT') return fullDiskError(file);
  if (code.startsWith('SQLITE_IOERR') || code === 'EIO' || code === 'SQLITE_CANTOPEN') {
    // SQLite reports a full disk while growing its shared-memory or log file as an I/O error.
    if (diskFull(file)) return fullDiskError(file);
    if (code === 'SQLITE_CANTOPEN') return null;
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
