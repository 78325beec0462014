/**
 * The SQLite side of an import (schema 4: tables `imports` and `import_rows`).
 *
 * An import writes in batches of IMPORT_BATCH_ENTRIES entries (or IMPORT_BATCH_BYTES of lines), one
 * IMMEDIATE transaction each, so the log (-wal) holds one batch, not the whole file: after each
 * commit a passive checkpoint copies the batch into the library file and the log is reused.
 * Every row a batch writes is journaled in `import_rows` in the same transaction, so:
 * - a finished import marks itself 'finished' in its last batch and then drops its journal;
 * - an import that fails (a bad line, a full disk) undoes what it committed before saying so;
 * - an import whose process died (killed, power cut) is found by the next open of the library for
 *   writing and undone there, in batches too; the store says so in `importNotices`.
 * A running import is told apart from a stopped one by its process: same host and a live pid
 * (in this process: the import is still in ACTIVE). Writes by others wait for it to finish.
 */
import type Database from 'better-sqlite3';
import { hostname } from 'node:os';
import type { CurveSet } from '../model/curveset.ts';
import type { ImportedRevision, ImportSession } from './backend.ts';
import { LibraryError } from './errors.ts';
import { SheetStore } from './sheets.ts';
import { summarizeFindings } from './soundness.ts';
import { insertRevisionRows, prepareStatements, summaryRow } from './storeSql.ts';

/** Entries (or sheet and take-off lines) per import transaction. */
export const IMPORT_BATCH_ENTRIES = 1000;
/** Line bytes per import transaction, whatever their count (sheets can be megabytes each). */
export const IMPORT_BATCH_BYTES = 64 * 2 ** 20;

/** Imports running in this process, by library file and import id. */
const ACTIVE = new Set<string>();
const HOST = hostname();

interface ImportRow {
  id: number;
  source: string;
  started_at: string;
  host: string;
  pid: number;
  state: 'running' | 'finished' | 'undoing';
  entries: number;
}

function activeKey(db: Database.Database, id: number): string {
  return `${db.name}\u0000${id}`;
}

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as { code?: string }).code === 'EPERM';
  }
}

/** True while the import's process is still writing (or undoing) it. On another host we cannot tell, so it counts as running. */
function isRunning(db: Database.Database, row: ImportRow): boolean {
  if (row.state === 'finished') return false;
  if (row.host !== HOST) return true;
  if (row.pid === process.pid) return ACTIVE.has(activeKey(db, row.id));
  return processAlive(row.pid);
}

function importRows(db: Database.Database): ImportRow[] {
  return db.prepare('SELECT * FROM imports ORDER BY id').all() as ImportRow[];
}

/** The import another process (or another part of this one) is writing now, or null. */
export function runningImport(db: Database.Database): ImportRow | null {
  return importRows(db).find((r) => isRunning(db, r)) ?? null;
}

export function importBusyError(row: ImportRow): LibraryError {
  return new LibraryError(
    `An import into this library (from "${row.source}", started ${row.started_at}) is being written; nothing was changed, try again when it has finished.`,
    'conflict',
    'import-busy',
  );
}

/**
 * Refuses an export (a snapshot) while an import is unfinished: the snapshot would hold part of it,
 * without the journal that lets the library remove it, so the backup would be half an import.
 */
export function checkNoUnfinishedImport(db: Database.Database): void {
  const row = importRows(db).find((r) => r.state !== 'finished');
  if (!row) return;
  if (isRunning(db, row)) {
    throw new LibraryError(
      `An import into this library (from "${row.source}", started ${row.started_at}) is being written; export when it has finished, so that the export holds all of it or none.`,
      'conflict',
      'import-busy',
    );
  }
  throw new LibraryError(
    `An import into this library (from "${row.source}", started ${row.started_at}) stopped before it finished and is not yet removed; open the library where it can be written (for example with "library list"), which removes it, then export.`,
    'conflict',
    'import-busy',
  );
}

/** True when some import is not yet cleaned up (cheap: the table is empty almost always). */
export function anyImportRows(db: Database.Database): boolean {
  return db.prepare('SELECT 1 FROM imports LIMIT 1').get() !== undefined;
}

/**
 * Undoes every import that stopped before it finished and drops the journal of finished ones.
 * Returns one sentence per import undone. Imports still running are left alone.
 */
export function undoStoppedImports(db: Database.Database): string[] {
  const notices: string[] = [];
  for (const row of importRows(db)) {
    if (isRunning(db, row)) continue;
    if (row.state === 'finished') {
      dropJournal(db, row.id);
      continue;
    }
    const touched = undoImport(db, row.id);
    notices.push(
      `An import into this library (from "${row.source}", started ${row.started_at}) stopped before it finished; ` +
        `the ${touched} ${touched === 1 ? 'entry' : 'entries'} it had written were removed again, so the library is as it was before that import. Run that import again.`,
    );
  }
  return notices;
}

/** For a library opened read-only: one sentence per import that stopped before it finished. */
export function stoppedImportNotices(db: Database.Database): string[] {
  return importRows(db)
    .filter((r) => r.state !== 'finished' && !isRunning(db, r))
    .map(
      (r) =>
        `An import into this library (from "${r.source}", started ${r.started_at}) stopped before it finished; ${r.entries} of its entries are in the library ` +
        'until it is opened where it can be written, which removes them.',
    );
}

function dropJournal(db: Database.Database, id: number): void {
  const chunk = db.prepare('DELETE FROM import_rows WHERE rowid IN (SELECT rowid FROM import_rows WHERE import_id = ? LIMIT ?)');
  while (db.transaction(() => chunk.run(id, IMPORT_BATCH_ENTRIES * 5).changes).immediate() > 0) checkpoint(db);
  db.transaction(() => db.prepare('DELETE FROM imports WHERE id = ?').run(id)).immediate();
  checkpoint(db);
}

/** Lets the log be reused from its start: copies committed pages into the library file, never waiting on readers. */
function checkpoint(db: Database.Database): void {
  if (db.name !== ':memory:') db.pragma('wal_checkpoint(PASSIVE)');
}

interface JournalRow {
  kind: 'entry' | 'revisions' | 'sheet' | 'takeoff';
  key: string;
  before_revision: number | null;
  before_updated_at: string | null;
}

/**
 * Removes every row import `id` wrote, in batches (each its own transaction, so a crash in the middle
 * leaves the rest for the next open). Take-off files go before their sheets, revisions before their
 * entries. An entry the import only added revisions to gets its earlier summary back. Returns how
 * many entries the import had created or extended.
 */
export function undoImport(db: Database.Database, id: number): number {
  db.transaction(() => db.prepare(`UPDATE imports SET state = 'undoing' WHERE id = ?`).run(id)).immediate();
  const touched = (db.prepare(`SELECT count(*) AS n FROM import_rows WHERE import_id = ? AND kind IN ('entry', 'revisions')`).get(id) as { n: number }).n;
  const stmts = prepareStatements(db);
  const next = db.prepare('SELECT kind, key, before_revision, before_updated_at FROM import_rows WHERE import_id = ? AND kind = ? LIMIT ?');
  const forget = db.prepare('DELETE FROM import_rows WHERE import_id = ? AND kind = ? AND key = ?');
  const sql = {
    takeoff: db.prepare('DELETE FROM takeoffs WHERE id = ?'),
    sheet: db.prepare('DELETE FROM sheets WHERE sha256 = ?'),
    events: db.prepare('DELETE FROM entry_events WHERE entry_id = ?'),
    summaries: db.prepare('DELETE FROM revision_summaries WHERE entry_id = ?'),
    revisions: db.prepare('DELETE FROM revisions WHERE entry_id = ?'),
    entry: db.prepare('DELETE FROM entries WHERE id = ?'),
    laterEvents: db.prepare(`DELETE FROM entry_events WHERE entry_id = ? AND event = 'imported' AND revision > ?`),
    laterSummaries: db.prepare('DELETE FROM revision_summaries WHERE entry_id = ? AND revision > ?'),
    laterRevisions: db.prepare('DELETE FROM revisions WHERE entry_id = ? AND revision > ?'),
    bareLatest: db.prepare('UPDATE entries SET latest_revision = ?, updated_at = ? WHERE id = ?'),
  };
  const undoRow = (r: JournalRow) => {
    if (r.kind === 'takeoff') sql.takeoff.run(r.key);
    else if (r.kind === 'sheet') sql.sheet.run(r.key);
    else if (r.kind === 'entry') {
      for (const s of [sql.events, sql.summaries, sql.revisions, sql.entry]) s.run(r.key);
    } else {
      const before = r.before_revision ?? 0;
      for (const s of [sql.laterEvents, sql.laterSummaries, sql.laterRevisions]) s.run(r.key, before);
      restoreSummary(stmts, sql.bareLatest, r.key, before, r.before_updated_at ?? '');
    }
    forget.run(id, r.kind, r.key);
  };
  for (const kind of ['takeoff', 'entry', 'revisions', 'sheet'] as const) {
    for (;;) {
      const n = db.transaction(() => {
        const rows = next.all(id, kind, IMPORT_BATCH_ENTRIES) as JournalRow[];
        rows.forEach(undoRow);
        return rows.length;
      }).immediate();
      checkpoint(db);
      if (n === 0) break;
    }
  }
  db.transaction(() => db.prepare('DELETE FROM imports WHERE id = ?').run(id)).immediate();
  checkpoint(db);
  return touched;
}

/** Puts back the summary columns of an entry's revision `revision` (its latest again). */
function restoreSummary(stmts: ReturnType<typeof prepareStatements>, bareLatest: Database.Statement, id: string, revision: number, updatedAt: string): void {
  const row = stmts.revision.get(id, revision) as { body: string; sha256: string } | undefined;
  const accepted = stmts.revisionSummary.get(id, revision) as { accepted_failing: number } | undefined;
  try {
    if (!row) throw new Error('missing');
    const set = JSON.parse(row.body) as CurveSet;
    const findings = summarizeFindings(set);
    stmts.updateSummary.run(summaryRow(id, revision, { set, text: row.body, sha256: row.sha256, findings, acceptedFailing: accepted?.accepted_failing === 1 }, updatedAt));
  } catch {
    // A row that can no longer be read keeps its number right; "library verify" names it.
    bareLatest.run(revision, updatedAt, id);
  }
}

/** One import on its own connection `db` (see the file comment). */
export class SqliteImport implements ImportSession {
  readonly id: number;
  private readonly stmts: ReturnType<typeof prepareStatements>;
  private readonly sheets: SheetStore;
  private readonly journal: Database.Statement;
  private readonly countEntries: Database.Statement;
  private entriesInBatch = 0;
  private done = false;

  constructor(private readonly db: Database.Database, source: string, private readonly now: () => string) {
    this.stmts = prepareStatements(db);
    this.sheets = new SheetStore(db, now);
    this.journal = db.prepare('INSERT OR IGNORE INTO import_rows (import_id, kind, key, before_revision, before_updated_at) VALUES (?, ?, ?, ?, ?)');
    this.countEntries = db.prepare('UPDATE imports SET entries = entries + ? WHERE id = ?');
    this.id = db.transaction(() => {
      const busy = runningImport(db);
      if (busy) throw importBusyError(busy);
      return Number(db.prepare(`INSERT INTO imports (source, started_at, host, pid, state) VALUES (?, ?, ?, ?, 'running')`).run(source, now(), HOST, process.pid).lastInsertRowid);
    }).immediate();
    ACTIVE.add(activeKey(db, this.id));
    db.exec('BEGIN IMMEDIATE');
  }

  revisionHashes(id: string): Set<string> | null {
    if (!this.stmts.entry.get(id)) return null;
    return new Set((this.stmts.revisions.all(id) as Array<{ sha256: string }>).map((r) => r.sha256));
  }

  createEntry(id: string, createdAt: string, archivedAt: string | null, revisions: ImportedRevision[]): void {
    const last = revisions[revisions.length - 1];
    if (!last) return;
    this.journal.run(this.id, 'entry', id, null, null);
    this.stmts.insertEntry.run({ ...summaryRow(id, revisions.length, last.facts, last.savedAt), created_at: createdAt, archived_at: archivedAt });
    revisions.forEach((r, i) => insertRevisionRows(this.stmts, id, i + 1, r.savedAt, r.facts));
    this.stmts.event.run(id, this.now(), 'imported', revisions.length);
    this.entriesInBatch += 1;
  }

  appendRevisions(id: string, revisions: ImportedRevision[]): void {
    if (!revisions.length) return;
    const before = this.stmts.entry.get(id) as { latest_revision: number; updated_at: string };
    this.journal.run(this.id, 'revisions', id, before.latest_revision, before.updated_at);
    let n = (this.stmts.maxRevision.get(id) as { n: number }).n;
    for (const r of revisions) {
      n += 1;
      insertRevisionRows(this.stmts, id, n, r.savedAt, r.facts);
      this.stmts.updateSummary.run(summaryRow(id, n, r.facts, this.now()));
    }
    this.stmts.event.run(id, this.now(), 'imported', n);
    this.entriesInBatch += 1;
  }

  putSheet(bytes: Buffer, name: string | null, storedAt: string): boolean {
    const put = this.sheets.put(bytes, name, storedAt);
    if (put.created) this.journal.run(this.id, 'sheet', put.sha256, null, null);
    return put.created;
  }

  addTakeoff(sheetSha256: string, body: unknown, name: string | null, id: string, savedAt: string): boolean {
    const added = this.sheets.addTakeoff(sheetSha256, body, name, id, savedAt);
    if (added.created) this.journal.run(this.id, 'takeoff', added.id, null, null);
    return added.created;
  }

  commit(): void {
    this.countEntries.run(this.entriesInBatch, this.id);
    this.entriesInBatch = 0;
    this.db.exec('COMMIT');
    checkpoint(this.db);
    this.db.exec('BEGIN IMMEDIATE');
  }

  finish(): void {
    this.countEntries.run(this.entriesInBatch, this.id);
    this.db.prepare(`UPDATE imports SET state = 'finished' WHERE id = ?`).run(this.id);
    this.db.exec('COMMIT');
    this.done = true;
    ACTIVE.delete(activeKey(this.db, this.id));
    try {
      dropJournal(this.db, this.id);
    } catch {
      // The import is complete; the next open of the library drops the journal of a finished import.
    }
  }

  abort(): number {
    if (this.db.inTransaction) this.db.exec('ROLLBACK');
    ACTIVE.delete(activeKey(this.db, this.id));
    if (this.done) return 0;
    this.done = true;
    return undoImport(this.db, this.id);
  }
}
