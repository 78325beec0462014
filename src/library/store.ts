/**
 * The office pump library: one SQLite file (WAL mode) of curve-set entries, their revisions
 * and the source sheets they were read from.
 *
 * - Every save is a new revision; nothing is overwritten (triggers enforce it in the file itself).
 * - Delete means archive; an archived entry can be restored.
 * - Each write is one IMMEDIATE transaction, so writers in other processes queue on the file lock
 *   and the next revision number is taken under that lock: concurrent writers never lose a revision.
 */
import Database from 'better-sqlite3';
import { existsSync } from 'node:fs';
import type { CurveSet } from '../model/curveset.ts';
import { LruCache } from './cache.ts';
import { LibraryError } from './errors.ts';
import { checkEntryId, newEntryId } from './ids.ts';
import { migrate } from './schema.ts';
import { SheetStore } from './sheets.ts';
import { searchCopy } from './summary.ts';
import { prepareStatements, summaryRow } from './storeSql.ts';
import { checkCurveSet, type CheckedCurveSet } from './validate.ts';
import { entryInfoOf, type EntryInfo, type EntryRow, type RevisionInfo, type SavedRevision, type StoredRevision } from './types.ts';

export interface OpenOptions {
  /** Clock for timestamps (ISO 8601); tests hand in a fixed one. */
  now?: () => string;
  /** How many parsed curve sets to keep in memory. */
  cacheSize?: number;
  /** How long a writer waits for another process's lock, ms. */
  busyTimeoutMs?: number;
}

export interface ListOptions {
  q?: string;
  /** false (default): active entries only; true: archived only; 'all': both. */
  archived?: boolean | 'all';
  limit?: number;
  offset?: number;
}

export class LibraryStore {
  readonly db: Database.Database;
  readonly file: string;
  /** True when this open created the library file. */
  readonly isNew: boolean;
  readonly sheets: SheetStore;
  readonly now: () => string;
  private readonly parsed: LruCache<CurveSet>;
  private readonly stmts: ReturnType<typeof prepareStatements>;

  private constructor(file: string, options: OpenOptions) {
    this.file = file;
    this.now = options.now ?? (() => new Date().toISOString());
    this.isNew = file === ':memory:' || !existsSync(file);
    try {
      this.db = new Database(file, { timeout: options.busyTimeoutMs ?? 10_000 });
      this.db.pragma('journal_mode = WAL');
      // FULL: a committed revision survives a power cut, not only a process restart.
      this.db.pragma('synchronous = FULL');
      this.db.pragma('foreign_keys = ON');
      migrate(this.db, this.now());
    } catch (error) {
      if (error instanceof LibraryError) throw error;
      const detail = error instanceof Error ? error.message : String(error);
      throw new LibraryError(`Cannot open the library file "${file}" (${detail}); check the path and that it is a Pumpscribe library.`, 'unusable-file');
    }
    this.parsed = new LruCache<CurveSet>(options.cacheSize ?? 20_000);
    this.sheets = new SheetStore(this.db, this.now);
    this.stmts = prepareStatements(this.db);
  }

  /** Opens (creating if needed) the library in `file`. Throws LibraryError for a file that is not a library. */
  static open(file: string, options: OpenOptions = {}): LibraryStore {
    return new LibraryStore(file, options);
  }

  close(): void {
    if (this.db.open) this.db.close();
  }

  /** Creates an entry from a curve set (validated here). */
  create(input: unknown, options: { id?: string } = {}): SavedRevision {
    const checked = checkCurveSet(input);
    const id = options.id === undefined ? newEntryId() : checkEntryId(options.id);
    const write = this.db.transaction((): SavedRevision => {
      if (this.stmts.entry.get(id)) throw new LibraryError(`An entry with id ${id} already exists; add a revision to it instead.`, 'conflict');
      const at = this.now();
      this.stmts.insertEntry.run({ ...summaryRow(id, 1, checked, at), created_at: at, archived_at: null });
      this.insertRevision(id, 1, at, checked);
      this.stmts.event.run(id, at, 'created', 1);
      return { id, revision: 1, saved_at: at };
    });
    return write.immediate();
  }

  /**
   * Adds a new revision to an existing, active entry. With `expectedRevision`, refuses (conflict)
   * when someone else saved in between, so that an editor never bases work on a stale copy unknowingly.
   */
  addRevision(id: string, input: unknown, options: { expectedRevision?: number } = {}): SavedRevision {
    checkEntryId(id);
    const checked = checkCurveSet(input);
    const write = this.db.transaction((): SavedRevision => {
      const entry = this.entryRow(id);
      if (entry.archived_at !== null) {
        throw new LibraryError(`Entry ${id} is archived; restore it before adding a revision.`, 'conflict');
      }
      const latest = (this.stmts.maxRevision.get(id) as { n: number }).n;
      if (options.expectedRevision !== undefined && options.expectedRevision !== latest) {
        throw new LibraryError(
          `Entry ${id} is at revision ${latest}, not ${options.expectedRevision}; reload it and apply your changes again.`,
          'conflict',
        );
      }
      const revision = latest + 1;
      const at = this.now();
      this.insertRevision(id, revision, at, checked);
      this.stmts.updateSummary.run(summaryRow(id, revision, checked, at));
      this.stmts.event.run(id, at, 'revised', revision);
      return { id, revision, saved_at: at };
    });
    return write.immediate();
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
   * The search copy (see `searchCopy`) of an entry's latest revision, parsed once and cached by
   * "id:revision"; an older revision is taken from its stored body.
   */
  searchSet(id: string, revision: number): CurveSet {
    const key = `${id}:${revision}`;
    const hit = this.parsed.get(key);
    if (hit) return hit;
    const row = this.stmts.searchJson.get(id, revision) as { search_json: string } | undefined;
    // Stored documents passed the schema when written; parsing the JSON is enough here.
    const set = row ? (JSON.parse(row.search_json) as CurveSet) : searchCopy(JSON.parse(this.get(id, revision).body) as CurveSet);
    this.parsed.set(key, set);
    return set;
  }

  /**
   * Fills the search cache with active entries, `batch` at a time, yielding between batches so a
   * server stays responsive; returns how many were parsed. Stops early if the store closes.
   */
  async warmSearchCache(batch = 200): Promise<number> {
    let done = 0;
    let after = '';
    for (;;) {
      if (!this.db.open) return done;
      const rows = this.stmts.activeAfter.all(after, batch) as Array<{ id: string; latest_revision: number }>;
      if (rows.length === 0) return done;
      for (const r of rows) this.searchSet(r.id, r.latest_revision);
      done += rows.length;
      after = (rows[rows.length - 1] as { id: string }).id;
      await new Promise((resolve) => setImmediate(resolve));
    }
  }

  revisions(id: string): RevisionInfo[] {
    checkEntryId(id);
    this.entryRow(id);
    return this.stmts.revisions.all(id) as RevisionInfo[];
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
   * Active entries whose head-curve envelope contains (flow, head), each side widened by
   * `margin` (relative). The R*Tree stores 32-bit bounds rounded outwards, so nothing is lost.
   */
  envelopeContaining(flowM3s: number, headM: number, margin: number): Array<{ id: string; revision: number }> {
    return this.stmts.envelope.all(flowM3s * (1 + margin), flowM3s * (1 - margin), headM * (1 + margin), headM * (1 - margin)) as Array<{ id: string; revision: number }>;
  }

  /** The names a search result shows for an entry. */
  names(id: string): { id: string; name: string; maker: string | null; model: string | null; rated_speed_rpm: number } {
    const row = this.stmts.names.get(id) as { id: string; name: string; maker: string | null; model: string | null; rated_speed_rpm: number } | undefined;
    if (!row) throw new LibraryError(`No library entry has the id ${id}.`, 'not-found');
    return row;
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

  /** Online backup to a new file, while other connections keep reading and writing. */
  async backup(destination: string): Promise<{ pages: number }> {
    if (existsSync(destination)) {
      throw new LibraryError(`The backup file "${destination}" already exists; choose a new name so that no earlier backup is overwritten.`, 'conflict');
    }
    const result = await this.db.backup(destination);
    return { pages: result.totalPages };
  }

  /** Used by the importer, inside its own transaction. */
  insertImportedEntry(id: string, createdAt: string, archivedAt: string | null, revisions: Array<{ savedAt: string; checked: CheckedCurveSet }>): void {
    const last = revisions[revisions.length - 1];
    if (!last) return;
    this.stmts.insertEntry.run({ ...summaryRow(id, revisions.length, last.checked, last.savedAt), created_at: createdAt, archived_at: archivedAt });
    revisions.forEach((r, i) => this.insertRevision(id, i + 1, r.savedAt, r.checked));
    this.stmts.event.run(id, this.now(), 'imported', revisions.length);
  }

  /** Used by the importer: appends revisions to an existing entry, numbering them after its latest. */
  appendImportedRevisions(id: string, revisions: Array<{ savedAt: string; checked: CheckedCurveSet }>): void {
    let n = (this.stmts.maxRevision.get(id) as { n: number }).n;
    for (const r of revisions) {
      n += 1;
      this.insertRevision(id, n, r.savedAt, r.checked);
      this.stmts.updateSummary.run(summaryRow(id, n, r.checked, this.now()));
    }
    if (revisions.length) this.stmts.event.run(id, this.now(), 'imported', n);
  }

  /** Content hashes of an entry's revisions, or null when the entry does not exist. */
  revisionHashes(id: string): Set<string> | null {
    if (!this.stmts.entry.get(id)) return null;
    return new Set((this.stmts.revisions.all(id) as RevisionInfo[]).map((r) => r.sha256));
  }

  private insertRevision(id: string, revision: number, at: string, checked: CheckedCurveSet): void {
    const source = checked.set.provenance.source?.sha256 ?? null;
    this.stmts.insertRevision.run(id, revision, at, checked.sha256, checked.text, source);
  }

  private entryRow(id: string): EntryRow {
    const row = this.stmts.entry.get(id) as EntryRow | undefined;
    if (!row) throw new LibraryError(`No library entry has the id ${id}; "library list" shows the ids.`, 'not-found');
    return row;
  }

  private setArchived(id: string, archived: boolean): EntryInfo {
    checkEntryId(id);
    const write = this.db.transaction((): EntryInfo => {
      const row = this.entryRow(id);
      if (archived === (row.archived_at !== null)) return entryInfoOf(row);
      const at = this.now();
      this.stmts.setArchived.run(archived ? at : null, id);
      this.stmts.event.run(id, at, archived ? 'archived' : 'restored', row.latest_revision);
      return entryInfoOf(this.entryRow(id));
    });
    return write.immediate();
  }
}
