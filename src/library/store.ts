/**
 * The office pump library: one SQLite file (WAL mode) of curve-set entries, their revisions
 * and the source sheets they were read from.
 *
 * - Every save is a new revision; nothing is overwritten (triggers enforce it in the file itself).
 * - A revision belongs to its entry: the same pump (maker, model, size and name, trimmed and
 *   compared case-insensitively), unless the caller says explicitly that it is a new revision.
 * - Each revision keeps its findings summary; a set with `fail` findings is kept only when accepted.
 * - Delete means archive; an archived entry can be restored.
 * - Each write is one IMMEDIATE transaction, so writers in other processes queue on the file lock
 *   and the next revision number is taken under that lock: concurrent writers never lose a revision.
 * - A library file (or folder) that cannot be written opens read-only: it lists and searches, and
 *   every write is refused with a sentence. Storage faults become LibraryErrors (storage.ts).
 */
import Database from 'better-sqlite3';
import { accessSync, constants, existsSync, readFileSync, statSync, unlinkSync } from 'node:fs';
import { dirname } from 'node:path';
import type { CurveSet } from '../model/curveset.ts';
import { LruCache } from './cache.ts';
import { LibraryError } from './errors.ts';
import { checkEntryId, newEntryId } from './ids.ts';
import { checkLibraryFile, migrate, SCHEMA_VERSION } from './schema.ts';
import { SheetStore } from './sheets.ts';
import { searchCopy } from './summary.ts';
import { decodeDutyCard } from './dutyCard.ts';
import { insertRevisionRows, prepareStatements, summaryRow, type RevisionFacts } from './storeSql.ts';
import { anyImportRows, checkNoUnfinishedImport, importBusyError, runningImport, SqliteImport, stoppedImportNotices, undoStoppedImports } from './importJournal.ts';
import { fullDiskError, storageFault } from './storage.ts';
import { checkRevision } from './validate.ts';
import { backfillV2, backfillV3 } from './backfill.ts';
import { verifyLibrary, type VerifyReport } from './verify.ts';
import { entryInfoOf, type EntryInfo, type EntryRow, type RevisionInfo, type SavedRevision, type StoredRevision } from './types.ts';
import type { DutyIndexRow, EntryNames, ExportSnapshot, ImportSession, LibraryBackend, ListOptions, WriteOptions } from './backend.ts';

export type { ListOptions, WriteOptions } from './backend.ts';

export interface OpenOptions {
  /** Clock for timestamps (ISO 8601); tests hand in a fixed one. */
  now?: () => string;
  /** How many parsed search copies to keep in memory (a small working set; the index does the rest). */
  cacheSize?: number;
  /** How long a writer waits for another process's lock, ms. */
  busyTimeoutMs?: number;
  /** Open for reading only, even when the file could be written. */
  readonly?: boolean;
}

interface InternalOptions extends OpenOptions {
  /** The disk is full: open for reading, and refuse writes by saying so. */
  diskFull?: boolean;
}

/** Page cache of an import's connection, KiB (peak memory of a 100,000-entry import stays far below 1 GiB). */
const IMPORT_CACHE_KIB = 192 * 1024;

/** Largest read-only library loaded into memory when its folder cannot hold SQLite's shared-memory file. */
const READONLY_IN_MEMORY_LIMIT = 1024 * 2 ** 20;

function writable(path: string): boolean {
  try {
    accessSync(path, constants.W_OK);
    return true;
  } catch {
    return false;
  }
}

/** Same pump: maker, model, size and name, trimmed and compared case-insensitively. */
export function samePump(a: { name: string; maker?: string | null; model?: string | null; size?: string | null }, b: typeof a): boolean {
  const n = (v: string | null | undefined) => (v ?? '').trim().toLowerCase();
  return n(a.name) === n(b.name) && n(a.maker) === n(b.maker) && n(a.model) === n(b.model) && n(a.size) === n(b.size);
}

function pumpWords(p: { name: string; maker?: string | null; model?: string | null; size?: string | null }): string {
  return [p.maker, p.model, p.size].filter((w) => w && w.trim()).length
    ? `"${p.name}" (${[p.maker, p.model, p.size].filter((w) => w && w.trim()).join(', ')})`
    : `"${p.name}"`;
}

export class LibraryStore implements LibraryBackend {
  readonly db: Database.Database;
  readonly file: string;
  /** True when this open created the library file. */
  readonly isNew: boolean;
  /** True when the library was opened for reading only (by request, or because it cannot be written). */
  readonly readonly: boolean;
  /** Why the library is read-only (a sentence), or null. */
  readonly readonlyReason: string | null;
  readonly sheets: SheetStore;
  readonly now: () => string;
  private readonly parsed: LruCache<CurveSet>;
  private readonly stmts: ReturnType<typeof prepareStatements>;
  /** Set while an import of this process is being written, on its own connection. */
  importing = false;
  /** Sentences about imports that stopped before they finished (undone when opened for writing). */
  readonly importNotices: string[] = [];

  /** True when opened read-only because the disk is full. */
  readonly diskFull: boolean;

  private constructor(file: string, options: InternalOptions) {
    this.file = file;
    this.now = options.now ?? (() => new Date().toISOString());
    const memory = file === ':memory:';
    this.isNew = memory || !existsSync(file);
    const folder = dirname(file);
    let reason: string | null = null;
    if (!memory) {
      if (this.isNew && !writable(folder)) {
        throw new LibraryError(`The library folder "${folder}" is read-only, so the library file "${file}" cannot be created there; choose a writable folder.`, 'read-only');
      }
      if (options.diskFull) reason = 'the disk holding it is full';
      else if (options.readonly) reason = 'it was opened for reading only';
      else if (!this.isNew && !writable(file)) reason = `the library file "${file}" is read-only`;
      else if (!this.isNew && !writable(folder)) reason = `the library folder "${folder}" is read-only`;
    }
    this.readonly = reason !== null;
    this.readonlyReason = reason;
    this.diskFull = options.diskFull === true;
    const strays = memory ? [] : [`${file}-wal`, `${file}-shm`].filter((f) => !existsSync(f));
    let db: Database.Database | null = null;
    try {
      db = this.readonly ? openReadonly(file) : new Database(file, { timeout: options.busyTimeoutMs ?? 10_000, fileMustExist: !this.isNew });
      const version = checkLibraryFile(db);
      if (this.readonly) {
        if (version < SCHEMA_VERSION) {
          throw new LibraryError(`The library file "${file}" was written by an older Pumpscribe and ${reason}, so it cannot be brought up to date; open it once where it can be written.`, 'read-only');
        }
      } else {
        db.pragma('journal_mode = WAL');
        // FULL: a committed revision survives a power cut, not only a process restart.
        db.pragma('synchronous = FULL');
        db.pragma('foreign_keys = ON');
        migrate(db, this.now(), { 2: backfillV2, 3: backfillV3 });
      }
    } catch (error) {
      // A refused open leaves nothing behind: no empty library, no -wal or -shm beside someone's file.
      try {
        db?.close();
      } catch {
        /* already closed */
      }
      for (const f of [...strays, ...(this.isNew && !memory ? [file] : [])]) if (existsSync(f)) unlinkSync(f);
      if (error instanceof LibraryError) throw error;
      const fault = storageFault(error, file);
      if (fault) throw fault;
      const detail = error instanceof Error ? error.message : String(error);
      throw new LibraryError(`Cannot open the library file "${file}" (${detail}); check the path and that it is a Pumpscribe library.`, 'unusable-file');
    }
    this.db = db;
    if (this.readonly) this.importNotices.push(...stoppedImportNotices(db));
    else this.recoverImports();
    this.parsed = new LruCache<CurveSet>(options.cacheSize ?? 2_000);
    this.sheets = new SheetStore(this.db, this.now, () => this.beforeWrite());
    this.stmts = prepareStatements(this.db);
  }

  /** Opens (creating if needed) the library in `file`. Throws LibraryError for a file that is not a library. */
  static open(file: string, options: OpenOptions = {}): LibraryStore {
    try {
      return new LibraryStore(file, options);
    } catch (error) {
      // A library on a full disk can still be read: open it read-only, and let every write say why.
      if (error instanceof LibraryError && error.code === 'storage-full' && !options.readonly && file !== ':memory:' && existsSync(file)) {
        return new LibraryStore(file, { ...options, diskFull: true });
      }
      throw error;
    }
  }

  close(): void {
    if (this.db.open) this.db.close();
  }

  /** Refuses a write on a read-only library, or while an import holds the write lock. */
  beforeWrite(): void {
    if (this.diskFull) throw fullDiskError(this.file);
    if (this.readonly) {
      throw new LibraryError(`The library is read-only because ${this.readonlyReason}, so nothing was changed; it can still be listed and searched. Make it writable to save to it.`, 'read-only');
    }
    if (this.importing) throw new LibraryError('An import is being written to this library; nothing was changed, try again when it has finished.', 'conflict', 'import-busy');
    if (anyImportRows(this.db)) {
      const busy = runningImport(this.db);
      if (busy) throw importBusyError(busy);
      this.recoverImports();
    }
  }

  /** Undoes imports that stopped before they finished (their process is gone); says so in `importNotices`. */
  private recoverImports(): void {
    if (!anyImportRows(this.db)) return;
    try {
      this.importNotices.push(...undoStoppedImports(this.db));
    } catch (error) {
      const fault = storageFault(error, this.file);
      this.importNotices.push(
        `An import into this library stopped before it finished, and what it wrote could not be removed yet (${(fault ?? (error as Error)).message.replace(/\.$/, '')}); it is removed the next time the library is opened for writing.`,
      );
    }
  }

  /** Runs one IMMEDIATE write transaction, turning storage faults into sentences. */
  write<T>(body: () => T): T {
    this.beforeWrite();
    try {
      return this.db
        .transaction(() => {
          // Checked again under the write lock: an import of another process may have begun meanwhile.
          const busy = anyImportRows(this.db) ? runningImport(this.db) : null;
          if (busy) throw importBusyError(busy);
          return body();
        })
        .immediate();
    } catch (error) {
      throw storageFault(error, this.file) ?? error;
    }
  }

  /** Creates an entry from a curve set (validated here). */
  create(input: unknown, options: WriteOptions & { id?: string } = {}): SavedRevision {
    this.beforeWrite();
    const facts = checkRevision(input, { acceptFailing: options.acceptFailing === true });
    const id = options.id === undefined ? newEntryId() : checkEntryId(options.id);
    return this.write((): SavedRevision => {
      if (this.stmts.entry.get(id)) throw new LibraryError(`An entry with id ${id} already exists; add a revision to it instead.`, 'conflict');
      const at = this.now();
      this.stmts.insertEntry.run({ ...summaryRow(id, 1, facts, at), created_at: at, archived_at: null });
      this.insertRevision(id, 1, at, facts);
      this.stmts.event.run(id, at, 'created', 1);
      return { id, revision: 1, saved_at: at };
    });
  }

  /**
   * Adds a new revision to an existing, active entry. The set must be of the same pump, unless
   * `asNewRevision`. With `expectedRevision`, refuses when someone else saved in between, so that an
   * editor never bases work on a stale copy unknowingly.
   */
  addRevision(id: string, input: unknown, options: WriteOptions & { expectedRevision?: number; asNewRevision?: boolean } = {}): SavedRevision {
    checkEntryId(id);
    this.beforeWrite();
    const facts = checkRevision(input, { acceptFailing: options.acceptFailing === true });
    return this.write((): SavedRevision => {
      const entry = this.entryRow(id);
      if (entry.archived_at !== null) {
        throw new LibraryError(`Entry ${id} is archived; restore it before adding a revision.`, 'conflict');
      }
      const latest = (this.stmts.maxRevision.get(id) as { n: number }).n;
      if (options.expectedRevision !== undefined && options.expectedRevision !== latest) {
        throw new LibraryError(`Entry ${id} is at revision ${latest}, not ${options.expectedRevision}; reload it and apply your changes again.`, 'precondition-failed');
      }
      if (!options.asNewRevision && !samePump(entry, facts.set.pump)) {
        throw new LibraryError(
          `The curve set is for ${pumpWords(facts.set.pump)}, but entry ${id} holds ${pumpWords({ name: entry.name, maker: entry.maker, model: entry.model, size: entry.size })}; ` +
            `save it as a new entry, or say explicitly that it is a new revision of this entry (--as-new-revision-of ${id}, or ?as_new_revision=true).`,
          'conflict',
          'other-pump',
        );
      }
      const revision = latest + 1;
      const at = this.now();
      this.insertRevision(id, revision, at, facts);
      this.stmts.updateSummary.run(summaryRow(id, revision, facts, at));
      this.stmts.event.run(id, at, 'revised', revision);
      return { id, revision, saved_at: at };
    });
  }

  /** Stored text and facts of one revision (the latest when `revision` is omitted). */
  get(id: string, revision?: number): StoredRevision {
    checkEntryId(id);
    const entry = this.entryRow(id);
    const n = revision ?? entry.latest_revision;
    const row = this.stmts.revision.get(id, n) as { revision: number; saved_at: string; sha256: string; body: string } | undefined;
    if (!row) throw new LibraryError(`Entry ${id} has no revision ${n}; it has revisions 1 to ${entry.latest_revision}.`, 'not-found');
    return { id, revision: row.revision, saved_at: row.saved_at, sha256: row.sha256, body: row.body, archived_at: entry.archived_at };
  }

  /**
   * The search copy (see `searchCopy`) of an entry's revision, parsed from the summary kept beside
   * the entry (an older revision from its stored body). A few recent ones stay parsed. Throws a
   * SyntaxError or TypeError for a damaged row; the search names it and goes on.
   */
  searchSet(id: string, revision: number): CurveSet {
    const key = `${id}:${revision}`;
    const hit = this.parsed.get(key);
    if (hit) return hit;
    const row = this.stmts.searchJson.get(id, revision) as { search_json: string } | undefined;
    // Stored documents passed the schema when written; parsing the JSON is enough here.
    const set = row ? (JSON.parse(row.search_json) as CurveSet) : searchCopy(JSON.parse(this.get(id, revision).body) as CurveSet);
    if (!set || !Array.isArray(set.members)) throw new TypeError('the stored search copy is not a curve set');
    this.parsed.set(key, set);
    return set;
  }

  /** Kept for callers that warmed the old whole-library cache; the index needs no warming now. */
  async warmSearchCache(): Promise<number> {
    return 0;
  }

  revisions(id: string): RevisionInfo[] {
    checkEntryId(id);
    this.entryRow(id);
    return (this.stmts.revisions.all(id) as RawRevision[]).map(revisionInfoOf);
  }

  info(id: string): EntryInfo {
    checkEntryId(id);
    return entryInfoOf(this.entryRow(id));
  }

  archive(id: string): EntryInfo {
    return this.setArchived(id, true);
  }

  restore(id: string): EntryInfo {
    return this.setArchived(id, false);
  }

  /** Entries whose names contain every word of `q` (case-insensitive), newest first within a name. */
  list(options: ListOptions = {}): { total: number; entries: EntryInfo[] } {
    const where: string[] = [];
    const params: unknown[] = [];
    const archived = options.archived ?? false;
    if (archived === false) where.push('archived_at IS NULL');
    else if (archived === true) where.push('archived_at IS NOT NULL');
    const words = (options.q ?? '').toLowerCase().split(/\s+/).filter(Boolean).slice(0, 12);
    for (const w of words) {
      where.push(`search_text LIKE ? ESCAPE '\\'`);
      params.push(`%${w.replace(/[\\%_]/g, (c) => `\\${c}`)}%`);
    }
    const clause = where.length ? `WHERE ${where.join(' AND ')}` : '';
    const limit = Math.min(Math.max(Math.trunc(options.limit ?? 100), 1), 1000);
    const offset = Math.max(Math.trunc(options.offset ?? 0), 0);
    const total = (this.db.prepare(`SELECT count(*) AS n FROM entries ${clause}`).get(...params) as { n: number }).n;
    const rows = this.db
      .prepare(`SELECT * FROM entries ${clause} ORDER BY name COLLATE NOCASE, updated_at DESC, id LIMIT ? OFFSET ?`)
      .all(...params, limit, offset) as EntryRow[];
    return { total, entries: rows.map(entryInfoOf) };
  }

  /**
   * Active entries with an index box holding (flow, head) whose efficiency bound lies in [lo, hi),
   * sound (`failing` false) or failing ones; each entry once, with its highest bound.
   */
  dutyBand(flowM3s: number, headM: number, lo: number, hi: number, failing: boolean): DutyIndexRow[] {
    type Raw = { id: string; revision: number; bound: number; card: Buffer | null };
    const rows = this.stmts.dutyBand.all({ q: flowM3s, h: headM, lo, hi, failing: failing ? 1 : 0 }) as Raw[];
    const best = new Map<string, Raw>();
    for (const r of rows) {
      const seen = best.get(r.id);
      if (!seen || r.bound > seen.bound) best.set(r.id, r);
    }
    return [...best.values()].map((r) => ({ id: r.id, revision: r.revision, bound: r.bound, card: decodeDutyCard(r.card) }));
  }

  /** How many active entries have an index box holding (flow, head). */
  dutyCount(flowM3s: number, headM: number): number {
    return (this.stmts.dutyCount.get({ q: flowM3s, h: headM }) as { n: number }).n;
  }

  /** The names and marks a search result shows for an entry. */
  names(id: string): EntryNames {
    const row = this.stmts.names.get(id) as
      | { id: string; name: string; maker: string | null; model: string | null; rated_speed_rpm: number; fail_count: number; fail_codes: string; display_units_json: string }
      | undefined;
    if (!row) throw new LibraryError(`No library entry has the id ${id}.`, 'not-found');
    return namesOf(row);
  }

  /** Reads every row and names each damaged one (verify.ts). */
  verify(): VerifyReport {
    return verifyLibrary(this.db);
  }

  /** Counts for status lines. */
  counts(): { entries: number; archived: number; revisions: number; sheets: number } {
    const one = (sql: string) => (this.db.prepare(sql).get() as { n: number }).n;
    return {
      entries: one('SELECT count(*) AS n FROM entries WHERE archived_at IS NULL'),
      archived: one('SELECT count(*) AS n FROM entries WHERE archived_at IS NOT NULL'),
      revisions: one('SELECT count(*) AS n FROM revisions'),
      sheets: one('SELECT count(*) AS n FROM sheets'),
    };
  }

  /**
   * The rows of an export, read on a connection of its own inside one read transaction (a
   * consistent snapshot while this connection keeps writing); in memory or read-only, on this one.
   */
  exportSnapshot(): ExportSnapshot {
    const own = this.file !== ':memory:' && !this.readonly;
    const db = own ? new Database(this.file, { readonly: true }) : this.db;
    if (own) db.exec('BEGIN');
    const count = (sql: string) => (db.prepare(sql).get() as { n: number }).n;
    try {
      checkNoUnfinishedImport(db);
      return {
        counts: {
          entries: count('SELECT count(*) AS n FROM entries'),
          revisions: count('SELECT count(*) AS n FROM revisions'),
          sheets: count('SELECT count(*) AS n FROM sheets'),
          takeoffs: count('SELECT count(*) AS n FROM takeoffs'),
        },
        sheets: () =>
          db.prepare('SELECT sha256, name, media_type, stored_at, bytes FROM sheets ORDER BY stored_at, sha256').iterate() as Iterable<{
            sha256: string; name: string | null; media_type: string; stored_at: string; bytes: Buffer;
          }>,
        takeoffs: () =>
          db.prepare('SELECT id, sheet_sha256, name, saved_at, body FROM takeoffs ORDER BY saved_at, id').iterate() as Iterable<{
            id: string; sheet_sha256: string; name: string | null; saved_at: string; body: string;
          }>,
        revisions: function* () {
          const rows = db
            .prepare(`SELECT e.id, e.created_at, e.archived_at, r.revision, r.saved_at, r.sha256, r.body, s.accepted_failing
              FROM entries e JOIN revisions r ON r.entry_id = e.id
              LEFT JOIN revision_summaries s ON s.entry_id = r.entry_id AND s.revision = r.revision
              ORDER BY e.key, r.revision`)
            .iterate() as Iterable<{ id: string; created_at: string; archived_at: string | null; revision: number; saved_at: string; sha256: string; body: string; accepted_failing: number | null }>;
          for (const r of rows) yield { ...r, accepted_failing: r.accepted_failing === 1 };
        },
        close: () => {
          if (!own) return;
          if (db.inTransaction) db.exec('COMMIT');
          db.close();
        },
      };
    } catch (error) {
      if (own) db.close();
      throw error;
    }
  }

  /** Online backup to a new file, while other connections keep reading and writing. */
  async backup(destination: string): Promise<{ pages: number }> {
    if (existsSync(destination)) {
      throw new LibraryError(`The backup file "${destination}" already exists; choose a new name so that no earlier backup is overwritten.`, 'conflict');
    }
    try {
      const result = await this.db.backup(destination);
      return { pages: result.totalPages };
    } catch (error) {
      if (existsSync(destination)) unlinkSync(destination);
      throw storageFault(error, destination) ?? error;
    }
  }

  private insertRevision(id: string, revision: number, at: string, facts: RevisionFacts): void {
    insertRevisionRows(this.stmts, id, revision, at, facts);
  }

  /**
   * Starts an import on a connection of its own (importJournal.ts), so that this connection stays
   * free for reading meanwhile; writes through this store are refused until it ends.
   */
  beginImport(source: string): ImportSession {
    this.beforeWrite();
    const own = this.file !== ':memory:';
    let db: Database.Database;
    try {
      db = own ? new Database(this.file, { timeout: 10_000, fileMustExist: true }) : this.db;
      if (own) {
        db.pragma('synchronous = FULL');
        db.pragma('foreign_keys = ON');
      }
      // A batch touches the duty index and the entry indexes all over; a larger page cache keeps
      // their pages in memory between batches (bounded: IMPORT_CACHE_KIB).
      db.pragma(`cache_size = -${IMPORT_CACHE_KIB}`);
    } catch (error) {
      throw storageFault(error, this.file) ?? error;
    }
    let session: SqliteImport;
    try {
      session = new SqliteImport(db, source, this.now);
    } catch (error) {
      if (own) db.close();
      throw storageFault(error, this.file) ?? error;
    }
    this.importing = true;
    const end = () => {
      this.importing = false;
      if (own && db.open) db.close();
    };
    const guard = <T>(body: () => T): T => {
      try {
        return body();
      } catch (error) {
        throw storageFault(error, this.file) ?? error;
      }
    };
    return {
      revisionHashes: (id) => guard(() => session.revisionHashes(id)),
      createEntry: (...a) => guard(() => session.createEntry(...a)),
      appendRevisions: (...a) => guard(() => session.appendRevisions(...a)),
      putSheet: (...a) => guard(() => session.putSheet(...a)),
      addTakeoff: (...a) => guard(() => session.addTakeoff(...a)),
      commit: () => guard(() => session.commit()),
      finish: () => {
        try {
          guard(() => session.finish());
        } finally {
          if (!db.inTransaction) end();
        }
      },
      abort: () => {
        try {
          return guard(() => session.abort());
        } finally {
          end();
        }
      },
    };
  }

  private entryRow(id: string): EntryRow {
    const row = this.stmts.entry.get(id) as EntryRow | undefined;
    if (!row) throw new LibraryError(`No library entry has the id ${id}; "library list" shows the ids.`, 'not-found');
    return row;
  }

  private setArchived(id: string, archived: boolean): EntryInfo {
    checkEntryId(id);
    return this.write((): EntryInfo => {
      const row = this.entryRow(id);
      if (archived === (row.archived_at !== null)) return entryInfoOf(row);
      const at = this.now();
      this.stmts.setArchived.run(archived ? at : null, id);
      this.stmts.event.run(id, at, archived ? 'archived' : 'restored', row.latest_revision);
      return entryInfoOf(this.entryRow(id));
    });
  }
}

/** The names and marks of an entry row; an unreadable JSON column reads as empty (verify names the row). */
function namesOf(r: { id: string; name: string; maker: string | null; model: string | null; rated_speed_rpm: number; fail_count: number; fail_codes: string; display_units_json: string }): EntryNames {
  return {
    id: r.id,
    name: r.name,
    maker: r.maker,
    model: r.model,
    rated_speed_rpm: r.rated_speed_rpm,
    fail_count: r.fail_count,
    fail_codes: parseOr<string[]>(r.fail_codes, []),
    display_units: parseOr<Record<string, string>>(r.display_units_json, {}),
  };
}

function parseOr<T>(text: string, fallback: T): T {
  try {
    return JSON.parse(text) as T;
  } catch {
    return fallback;
  }
}

interface RawRevision {
  revision: number;
  saved_at: string;
  sha256: string;
  bytes: number;
  fail_count: number | null;
  warn_count: number | null;
  fail_codes: string | null;
  accepted_failing: number | null;
}

function revisionInfoOf(r: RawRevision): RevisionInfo {
  return {
    revision: r.revision,
    saved_at: r.saved_at,
    sha256: r.sha256,
    bytes: r.bytes,
    fail_count: r.fail_count ?? 0,
    warn_count: r.warn_count ?? 0,
    fail_codes: r.fail_codes ? (JSON.parse(r.fail_codes) as string[]) : [],
    accepted_failing: r.accepted_failing === 1,
  };
}

/**
 * A read-only connection. SQLite needs the shared-memory file beside a WAL library even to read it;
 * in a read-only folder that file cannot be made, so the library is read into memory instead
 * (up to READONLY_IN_MEMORY_LIMIT), which is exact as long as no unsaved log (-wal) lies beside it.
 */
function openReadonly(file: string): Database.Database {
  try {
    const db = new Database(file, { readonly: true, fileMustExist: true });
    db.pragma('user_version');
    db.prepare('SELECT count(*) FROM sqlite_schema').get();
    return db;
  } catch (error) {
    const code = (error as { code?: string }).code ?? '';
    // Read-only media and folders refuse the shared-memory file; a full disk has no room for it.
    if (!code.startsWith('SQLITE_READONLY') && code !== 'SQLITE_CANTOPEN' && !code.startsWith('SQLITE_IOERR') && code !== 'SQLITE_FULL') throw error;
  }
  const wal = `${file}-wal`;
  if (existsSync(wal) && statSync(wal).size > 0) {
    throw new LibraryError(`The library file "${file}" has unsaved changes in "${wal}" and its folder is read-only, so it cannot be read safely; open it once where the folder is writable.`, 'read-only');
  }
  const size = statSync(file).size;
  if (size > READONLY_IN_MEMORY_LIMIT) {
    throw new LibraryError(`The library file "${file}" sits in a read-only folder and is larger than ${READONLY_IN_MEMORY_LIMIT / 2 ** 20} MiB, too large to read into memory; copy it to a writable folder.`, 'read-only');
  }
  const bytes = readFileSync(file);
  // Bytes 18 and 19 of the header say WAL (2); an in-memory copy reads as a rollback-journal file (1).
  if (bytes.length >= 100 && bytes[18] === 2 && bytes[19] === 2) {
    bytes[18] = 1;
    bytes[19] = 1;
  }
  return new Database(bytes, { readonly: true });
}
