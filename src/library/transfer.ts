/**
 * Moving a whole library as JSON Lines. The first line is a header; then one line per sheet
 * (bytes in base64), per take-off file, and per entry (with all its revisions, oldest first).
 *
 * Export writes only what import will take: every revision passes the same gates the importer runs
 * (schema, known units, a head curve, its SHA-256, `fail` findings only where the library accepted
 * them, marked `accept_failing`). A damaged row stops the export with a sentence naming it, or, when
 * asked, its entry is left out and named.
 *
 * Import streams: one line is read, checked and written at a time, so memory is bounded by one
 * entry, whatever the file's size. It is written on its own connection in batches of
 * IMPORT_BATCH_ENTRIES entries, one transaction each, so the log stays the size of one batch; every
 * row is journaled with the import (importJournal.ts), so an import that fails removes what it had
 * committed, and one killed in the middle is removed by the next open of the library for writing:
 * once it has ended, an import is all or nothing. Meanwhile the library stays readable (readers see
 * the batches committed so far), and other writes are refused with a sentence.
 * It never overwrites: new ids become new entries with their revision history; revisions of an id
 * already in the library are appended as new revisions unless the same content is already there.
 */
import { z } from 'zod';
import { TOOL_NAME, TOOL_VERSION } from '../version.ts';
import { describeZodError } from '../model/errors.ts';
import { LibraryError } from './errors.ts';
import { isEntryId, isSha256 } from './ids.ts';
import type { ImportedRevision, LibraryBackend } from './backend.ts';
import { IMPORT_BATCH_ENTRIES, IMPORT_BATCH_BYTES } from './importJournal.ts';
import type { RevisionFacts } from './storeSql.ts';
import { checkRevision, checkTakeoff, sha256Hex } from './validate.ts';
import type { DamagedRow } from './dutySearch.ts';

export const EXPORT_FORMAT = 'pumpscribe.library-export';
export const EXPORT_VERSION = 1;

const iso = z.string().min(1).max(64);
const HeaderLine = z.object({ kind: z.literal('header'), format: z.literal(EXPORT_FORMAT), version: z.number().int() });
const SheetLine = z.strictObject({
  kind: z.literal('sheet'),
  sha256: z.string().refine(isSha256, 'must be 64 lowercase hex digits'),
  name: z.string().max(1000).nullable(),
  media_type: z.string(),
  stored_at: iso,
  data_base64: z.string(),
});
const TakeoffLine = z.strictObject({
  kind: z.literal('takeoff'),
  id: z.string().refine(isEntryId, 'must be 16 hex digits'),
  sheet_sha256: z.string().refine(isSha256, 'must be 64 lowercase hex digits'),
  name: z.string().max(1000).nullable(),
  saved_at: iso,
  body: z.record(z.string(), z.unknown()),
});
const EntryLine = z.strictObject({
  kind: z.literal('entry'),
  id: z.string().refine(isEntryId, 'must be 16 hex digits'),
  created_at: iso,
  archived_at: iso.nullable(),
  revisions: z
    .array(z.strictObject({ revision: z.number().int().min(1), saved_at: iso, accept_failing: z.boolean().optional(), curveset: z.unknown() }))
    .min(1),
});
const AnyLine = z.discriminatedUnion('kind', [SheetLine, TakeoffLine, EntryLine]);

export interface ImportReport {
  entries_created: number;
  entries_extended: number;
  revisions_added: number;
  revisions_already_present: number;
  sheets_added: number;
  takeoffs_added: number;
}


export interface ExportOptions {
  /** Leave out (and name in `skipped`) entries with a damaged revision instead of refusing the export. */
  skipDamaged?: boolean;
  /** Filled with the rows left out. */
  skipped?: DamagedRow[];
}

/** Why a stored revision could not be imported again, or null when it can. */
export function exportProblem(body: string, sha256: string, acceptFailing: boolean): string | null {
  if (sha256Hex(body) !== sha256) return 'its text no longer matches its SHA-256';
  let value: unknown;
  try {
    value = JSON.parse(body);
  } catch {
    return 'its text is not valid JSON';
  }
  try {
    checkRevision(value, { acceptFailing, what: 'it' });
  } catch (error) {
    return error instanceof Error ? error.message : String(error);
  }
  return null;
}

/**
 * The export as lines (each without its newline), from one consistent snapshot of the store (the
 * SQLite store reads it on its own connection inside one read transaction, while the server keeps
 * taking writes).
 * Throws LibraryError (code `damaged-rows`) at the first row import would refuse, unless `skipDamaged`.
 */
export function* exportLines(store: LibraryBackend, options: ExportOptions = {}): Generator<string> {
  const snapshot = store.exportSnapshot();
  try {
    yield JSON.stringify({
      kind: 'header',
      format: EXPORT_FORMAT,
      version: EXPORT_VERSION,
      exported_at: store.now(),
      tool: { name: TOOL_NAME, version: TOOL_VERSION },
      counts: snapshot.counts,
    });
    const sheetsKept = new Set<string>();
    for (const s of snapshot.sheets()) {
      if (sha256Hex(s.bytes) !== s.sha256) {
        if (!options.skipDamaged) throw damagedError(`sheet ${s.sha256}`, 'its bytes no longer match its SHA-256');
        options.skipped?.push({ id: `sheet ${s.sha256}`, revision: 0, problem: 'its bytes no longer match its SHA-256' });
        continue;
      }
      sheetsKept.add(s.sha256);
      yield JSON.stringify({ kind: 'sheet', sha256: s.sha256, name: s.name, media_type: s.media_type, stored_at: s.stored_at, data_base64: s.bytes.toString('base64') });
    }
    for (const t of snapshot.takeoffs()) {
      let problem: string | null = sheetsKept.has(t.sheet_sha256) ? null : 'its sheet is missing or damaged';
      if (!problem) {
        try {
          checkTakeoff(JSON.parse(t.body));
        } catch (error) {
          problem = error instanceof Error ? error.message : String(error);
        }
      }
      if (problem) {
        if (!options.skipDamaged) throw damagedError(`take-off file ${t.id}`, problem);
        options.skipped?.push({ id: `take-off ${t.id}`, revision: 0, problem });
        continue;
      }
      yield `{"kind":"takeoff","id":${JSON.stringify(t.id)},"sheet_sha256":${JSON.stringify(t.sheet_sha256)},"name":${JSON.stringify(t.name)},"saved_at":${JSON.stringify(t.saved_at)},"body":${t.body}}`;
    }
    let currentId: string | null = null;
    let head = '';
    let parts: string[] = [];
    let bad = false;
    for (const r of snapshot.revisions()) {
      if (currentId !== r.id) {
        if (currentId !== null && !bad) yield `${head}${parts.join(',')}]}`;
        currentId = r.id;
        bad = false;
        head = `{"kind":"entry","id":${JSON.stringify(r.id)},"created_at":${JSON.stringify(r.created_at)},"archived_at":${JSON.stringify(r.archived_at)},"revisions":[`;
        parts = [];
      }
      if (bad) continue;
      const problem = exportProblem(r.body, r.sha256, r.accepted_failing);
      if (problem) {
        if (!options.skipDamaged) throw damagedError(`entry ${r.id} revision ${r.revision}`, problem);
        options.skipped?.push({ id: r.id, revision: r.revision, problem });
        bad = true;
        continue;
      }
      parts.push(`{"revision":${r.revision},"saved_at":${JSON.stringify(r.saved_at)},${r.accepted_failing ? '"accept_failing":true,' : ''}"curveset":${r.body}}`);
    }
    if (currentId !== null && !bad) yield `${head}${parts.join(',')}]}`;
  } finally {
    snapshot.close();
  }
}

function damagedError(what: string, problem: string): LibraryError {
  return new LibraryError(
    `The export stopped at ${what} (${problem.replace(/\.$/, '')}), so a backup written now could not be imported again; run "library verify" to list every damaged row, or export with --skip-damaged to leave those entries out.`,
    'conflict',
    'damaged-rows',
  );
}

function lineError(n: number, text: string): LibraryError {
  return new LibraryError(`Line ${n} of the import: ${text} Nothing was imported.`, 'invalid');
}

export interface ImportOptions {
  /** Take revisions with `fail` findings even when their line does not say `accept_failing`. */
  acceptFailing?: boolean;
  /** Called after each entry is written (progress). */
  onEntry?: (count: number) => void;
  /** Called after each batch is committed, with the entries written so far (progress; tests stop here). */
  onBatch?: (count: number) => void;
  /** Entries per transaction (default IMPORT_BATCH_ENTRIES). */
  batchEntries?: number;
  /** Where the lines come from, named if the import has to be undone later (a file name, or "upload"). */
  source?: string;
}

/**
 * Reads, checks and writes an export line by line, in batches of transactions (importJournal.ts).
 * Throws LibraryError naming the first bad line, after removing everything the import had written:
 * whatever happens, the import is all or nothing once it has ended (a crash is undone at the next open).
 */
export async function importLines(store: LibraryBackend, lines: AsyncIterable<string> | Iterable<string>, options: ImportOptions = {}): Promise<ImportReport> {
  const report: ImportReport = { entries_created: 0, entries_extended: 0, revisions_added: 0, revisions_already_present: 0, sheets_added: 0, takeoffs_added: 0 };
  const batchEntries = Math.max(1, Math.trunc(options.batchEntries ?? IMPORT_BATCH_ENTRIES));
  const session = store.beginImport(options.source ?? 'an import');
  const seenIds = new Set<string>();
  let inBatch = 0;
  let bytesInBatch = 0;
  let written = 0;
  try {
    let n = 0;
    let sawHeader = false;
    for await (const raw of lines) {
      n += 1;
      const line = raw.trim();
      if (!line) continue;
      let value: unknown;
      try {
        value = JSON.parse(line);
      } catch {
        throw lineError(n, 'it is not valid JSON; each line of a library export is one JSON object.');
      }
      if (!sawHeader) {
        const header = HeaderLine.safeParse(value);
        if (!header.success) throw lineError(n, `the first line must be the export header with "format": "${EXPORT_FORMAT}".`);
        if (header.data.version > EXPORT_VERSION) throw lineError(n, `the export has version ${header.data.version}, newer than this Pumpscribe reads (${EXPORT_VERSION}); update Pumpscribe.`);
        sawHeader = true;
        continue;
      }
      const parsed = AnyLine.safeParse(value);
      if (!parsed.success) throw lineError(n, describeZodError(parsed.error, 'the record'));
      const rec = parsed.data;
      if (rec.kind === 'sheet') {
        const bytes = Buffer.from(rec.data_base64, 'base64');
        if (sha256Hex(bytes) !== rec.sha256) throw lineError(n, `the sheet's bytes do not match its SHA-256 ${rec.sha256}; the file is damaged.`);
        if (session.putSheet(bytes, rec.name, rec.stored_at)) report.sheets_added += 1;
      } else if (rec.kind === 'takeoff') {
        try {
          if (session.addTakeoff(rec.sheet_sha256, rec.body, rec.name, rec.id, rec.saved_at)) report.takeoffs_added += 1;
        } catch (error) {
          if (!(error instanceof LibraryError)) throw error;
          throw lineError(n, error.message);
        }
      } else {
        if (seenIds.has(rec.id)) throw lineError(n, `entry ${rec.id} appears twice.`);
        seenIds.add(rec.id);
        const revisions = [...rec.revisions].sort((a, b) => a.revision - b.revision).map((r): ImportedRevision => {
          try {
            const facts: RevisionFacts = checkRevision(r.curveset, {
              what: `Revision ${r.revision} of entry ${rec.id}`,
              acceptFailing: options.acceptFailing === true || r.accept_failing === true,
              how: 'import with --accept-failing',
            });
            return { savedAt: r.saved_at, facts };
          } catch (error) {
            throw lineError(n, error instanceof Error ? error.message : String(error));
          }
        });
        const known = session.revisionHashes(rec.id);
        if (known === null) {
          session.createEntry(rec.id, rec.created_at, rec.archived_at, revisions);
          report.entries_created += 1;
          report.revisions_added += revisions.length;
        } else {
          const fresh = revisions.filter((r) => !known.has(r.facts.sha256) && (known.add(r.facts.sha256), true));
          report.revisions_already_present += revisions.length - fresh.length;
          if (fresh.length) {
            session.appendRevisions(rec.id, fresh);
            report.entries_extended += 1;
            report.revisions_added += fresh.length;
          }
        }
        written = report.entries_created + report.entries_extended;
        options.onEntry?.(written);
      }
      inBatch += 1;
      bytesInBatch += line.length;
      if (inBatch >= batchEntries || bytesInBatch >= IMPORT_BATCH_BYTES) {
        session.commit();
        inBatch = 0;
        bytesInBatch = 0;
        options.onBatch?.(written);
      }
    }
    if (!sawHeader) throw new LibraryError('The import is empty; give a file written by "library export".', 'invalid');
    session.finish();
    return report;
  } catch (error) {
    let undone = true;
    try {
      session.abort();
    } catch {
      undone = false;
    }
    const fault = error instanceof LibraryError ? error : null;
    if (!undone) {
      // Removing rows writes too: on a full disk it may have to wait until there is room again.
      const why = fault ? fault.message.replace(/\.$/, '') : error instanceof Error ? error.message : String(error);
      throw new LibraryError(
        fault?.reason === 'storage-full'
          ? 'The disk holding the library is full, so the import stopped, and what it had written so far could not be removed yet; free some space, then open the library (for example with "library list"), which removes it, and run the import again.'
          : `The import stopped (${why}), and what it had written so far could not be removed yet; it is removed the next time the library is opened for writing (for example by "library list"), which leaves the library as it was before the import.`,
        fault?.reason ?? 'invalid',
        fault?.code,
      );
    }
    throw fault ?? error;
  }
}
