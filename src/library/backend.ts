/**
 * What the rest of Pumpscribe asks of a library store. The SQLite file (store.ts) implements it
 * today; a server database could implement the same calls later (the duty index is a box query on
 * flow, head and an efficiency bound, plus a per-revision summary row and duty card: any database
 * with a spatial or plain B-tree index can answer it).
 */
import type { CurveSet } from '../model/curveset.ts';
import type { EntryInfo, RevisionInfo, SavedRevision, StoredRevision } from './types.ts';
import type { DutyCard } from './dutyCard.ts';

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

export interface LibraryBackend {
  readonly readonly: boolean;
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
  close(): void;
}
