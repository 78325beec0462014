/**
 * Restoring a library from a backup into a new file: from a copy made by `library backup` (a SQLite
 * file, checked row by row first) or from a `library export` (JSON Lines, imported all or nothing).
 * Never overwrites: the target must not exist. A refused restore leaves no file behind.
 */
import { closeSync, existsSync, openSync, readSync, unlinkSync, createReadStream } from 'node:fs';
import { LibraryError } from './errors.ts';
import { LibraryStore } from './store.ts';
import { importLines, type ImportReport } from './transfer.ts';
import { linesOf } from './lines.ts';

const SQLITE_MAGIC = 'SQLite format 3\u0000';

function isSqlite(file: string): boolean {
  const fd = openSync(file, 'r');
  try {
    const head = Buffer.alloc(16);
    const n = readSync(fd, head, 0, 16, 0);
    return n === 16 && head.toString('latin1') === SQLITE_MAGIC;
  } finally {
    closeSync(fd);
  }
}

export function removeLibraryFiles(file: string): void {
  for (const f of [file, `${file}-wal`, `${file}-shm`, `${file}-journal`]) if (existsSync(f)) unlinkSync(f);
}

export async function restoreLibrary(source: string, target: string, options: { acceptFailing?: boolean } = {}): Promise<{ kind: 'copy' | 'export'; entries: number; import?: ImportReport }> {
  if (!existsSync(source)) throw new LibraryError(`The backup "${source}" does not exist.`, 'not-found');
  if (existsSync(target)) {
    throw new LibraryError(`The library file "${target}" already exists; restore into a new file name, so that nothing is overwritten.`, 'conflict');
  }
  if (isSqlite(source)) {
    const from = LibraryStore.open(source, { readonly: true });
    try {
      const report = from.verify();
      if (report.damaged.length) {
        const first = report.damaged[0]!;
        throw new LibraryError(
          `The backup "${source}" has ${report.damaged.length} damaged row${report.damaged.length === 1 ? '' : 's'} (first: ${first.kind} ${first.id}${first.revision ? ` revision ${first.revision}` : ''}: ${first.problem.replace(/\.$/, '')}); ` +
            'export it with "library export --skip-damaged" and restore from that export instead.',
          'conflict',
          'damaged-rows',
        );
      }
      await from.backup(target);
    } catch (error) {
      if (!(error instanceof LibraryError && error.code === 'conflict')) removeLibraryFiles(target);
      throw error;
    } finally {
      from.close();
    }
    const to = LibraryStore.open(target);
    try {
      return { kind: 'copy', entries: to.counts().entries + to.counts().archived };
    } finally {
      to.close();
    }
  }
  const to = LibraryStore.open(target);
  try {
    const report = await importLines(to, linesOf(createReadStream(source)), { ...options, source });
    return { kind: 'export', entries: report.entries_created, import: report };
  } catch (error) {
    to.close();
    removeLibraryFiles(target);
    throw error;
  } finally {
    to.close();
  }
}
