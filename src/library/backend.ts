/**
 * What the rest of Pumpscribe asks of a library store. The SQLite file (store.ts) implements it
 * today; a server database could implement the same calls later (the duty index is a box query on
 * flow, head and an efficiency bound, plus a per-revision summary row and duty card: any database
 * with a spatial or plain B-tree index can answer it).
 */
import type { CurveSet } from '../model/curveset.ts';
import type { EntryInfo, RevisionInfo, SavedRevision, StoredRevision } from './types.ts';
import type { DutyCard } from './dutyCard.ts';
import type { RevisionFacts } from './storeSql.ts';
import type { VerifyReport } from './verify.ts';

export interface ListOptions {
  q?: string;
  /** false (default): active entries only; true: archived only; 'all': both. */
  archived?: boolean | 'all';
  limit?: number;
  offset?: number;
}

export interface WriteOptions {
  /** Keep a set with `fail` findings (marked, and ranked last by duty search). */
  acceptFailing?: boolean;
}

/** One entry the duty index returns for a duty: its latest revision and the efficiency bound of the box that held the duty. */
export interface DutyIndexRow {
  id: string;
  revision: number;
  bound: number;
  /** The revision's duty card (null for a speed family, or a row whose card is missing or damaged). */
  card: DutyCard | null;
}

export interface EntryNames {
  id: string;
  name: string;
  maker: string | null;
  model: string | null;
  rated_speed_rpm: number;
  fail_count: number;
  fail_codes: string[];
  display_units: Record<string, string>;
}

/** A revision checked by the importer, with the time it was first saved. */
export interface ImportedRevision {
  savedAt: string;
  facts: RevisionFacts;
}

/**
 * One import being written (transfer.ts drives it; importJournal.ts is the SQLite side). Work is
 * written in batches: `commit` makes everything so far durable and starts the next batch. Until
 * `finish`, every row written is journaled with the import, so `abort` (or, after a crash, the
 * next open of the library) removes all of it again: to a reader of the finished library an
 * import is all or nothing.
 */
export interface ImportSession {
  /** Content hashes of an entry's revisions, or null when the library has no such entry. */
  revisionHashes(id: string): Set<string> | null;
  createEntry(id: string, createdAt: string, archivedAt: string | null, revisions: ImportedRevision[]): void;
  /** Appends revisions to an existing entry, numbered after its latest. */
  appendRevisions(id: string, revisions: ImportedRevision[]): void;
  /** Stores a sheet unless one with the same SHA-256 is kept; true when it was stored now. */
  putSheet(bytes: Buffer, name: string | null, storedAt: string): boolean;
  /** Keeps a take-off file beside its sheet; true when it was stored now. Throws LibraryError for a bad one. */
  addTakeoff(sheetSha256: string, body: unknown, name: string | null, id: string, savedAt: string): boolean;
  /** Ends the batch: what was written so far is durable (and still journaled); the next batch begins. */
  commit(): void;
  /** Ends the import: the last batch is committed and the journal dropped. */
  finish(): void;
  /** Removes everything this import wrote (committed batches included); returns how many entries it touched. */
  abort(): number;
}

/** The stored rows an export writes, read as one consistent snapshot (transfer.ts turns them into lines). */
export interface ExportSnapshot {
  counts: { entries: number; revisions: number; sheets: number; takeoffs: number };
  sheets(): Iterable<{ sha256: string; name: string | null; media_type: string; stored_at: string; bytes: Buffer }>;
  /** Take-off files with their stored text. */
  takeoffs(): Iterable<{ id: string; sheet_sha256: string; name: string | null; saved_at: string; body: string }>;
  /** Every revision of every entry, grouped by entry, oldest revision first. */
  revisions(): Iterable<{ id: string; created_at: string; archived_at: string | null; revision: number; saved_at: string; sha256: string; body: string; accepted_failing: boolean }>;
  /** Ends the snapshot (always called, also when the export stops early). */
  close(): void;
}

export interface LibraryBackend {
  readonly readonly: boolean;
  /** Why the library is read-only (a sentence), or null. */
  readonly readonlyReason: string | null;
  /** Sentences about imports that stopped before they finished, found when the library was opened. */
  readonly importNotices: readonly string[];
  now(): string;
  create(input: unknown, options?: WriteOptions & { id?: string }): SavedRevision;
  addRevision(id: string, input: unknown, options?: WriteOptions & { expectedRevision?: number; asNewRevision?: boolean }): SavedRevision;
  get(id: string, revision?: number): StoredRevision;
  info(id: string): EntryInfo;
  revisions(id: string): RevisionInfo[];
  list(options?: ListOptions): { total: number; entries: EntryInfo[] };
  archive(id: string): EntryInfo;
  restore(id: string): EntryInfo;
  /** The duty search's view of a revision (fits and figures, no points). Throws for a damaged row. */
  searchSet(id: string, revision: number): CurveSet;
  dutyBand(flowM3s: number, headM: number, lo: number, hi: number, failing: boolean): DutyIndexRow[];
  dutyCount(flowM3s: number, headM: number): number;
  names(id: string): EntryNames;
  counts(): { entries: number; archived: number; revisions: number; sheets: number };
  /** Reads every row and names each damaged one. */
  verify(): VerifyReport;
  /** A copy of the whole library in a new file, while it stays in use. */
  backup(destination: string): Promise<{ pages: number }>;
  /** A consistent snapshot of everything stored, for an export. */
  exportSnapshot(): ExportSnapshot;
  /** Starts an import from `source` (a file name or "upload", shown if it has to be undone later). */
  beginImport(source: string): ImportSession;
  close(): void;
}
