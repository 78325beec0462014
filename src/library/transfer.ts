/**
 * Moving a whole library as JSON Lines. The first line is a header; then one line per sheet
 * (bytes in base64), per take-off file, and per entry (with all its revisions, oldest first).
 *
 * Import is all or nothing: every line is checked first (curve sets against the schema, sheets
 * against their SHA-256) and only then written, in one transaction. It never overwrites:
 * new ids become new entries with their revision history; revisions of an id already in the
 * library are appended as new revisions unless the same content is already there.
 */
import Database from 'better-sqlite3';
import { z } from 'zod';
import { TOOL_NAME, TOOL_VERSION } from '../version.ts';
import { describeZodError } from '../model/errors.ts';
import { LibraryError } from './errors.ts';
import { isEntryId, isSha256 } from './ids.ts';
import type { LibraryStore } from './store.ts';
import { checkCurveSet, sha256Hex, type CheckedCurveSet } from './validate.ts';

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
  revisions: z.array(z.strictObject({ revision: z.number().int().min(1), saved_at: iso, curveset: z.unknown() })).min(1),
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

/**
 * The export as lines (each without its newline). Reads from its own connection inside one read
 * transaction, so the export is a consistent snapshot while the server keeps taking writes.
 */
export function* exportLines(store: LibraryStore): Generator<string> {
  const ownConnection = store.file !== ':memory:';
  const db = ownConnection ? new Database(store.file, { readonly: true }) : store.db;
  try {
    if (ownConnection) db.exec('BEGIN');
    const count = (sql: string) => (db.prepare(sql).get() as { n: number }).n;
    yield JSON.stringify({
      kind: 'header',
      format: EXPORT_FORMAT,
      version: EXPORT_VERSION,
      exported_at: store.now(),
      tool: { name: TOOL_NAME, version: TOOL_VERSION },
      counts: {
        entries: count('SELECT count(*) AS n FROM entries'),
        revisions: count('SELECT count(*) AS n FROM revisions'),
        sheets: count('SELECT count(*) AS n FROM sheets'),
        takeoffs: count('SELECT count(*) AS n FROM takeoffs'),
      },
    });
    for (const s of db.prepare('SELECT sha256, name, media_type, stored_at, bytes FROM sheets ORDER BY stored_at, sha256').iterate() as Iterable<{
      sha256: string; name: string | null; media_type: string; stored_at: string; bytes: Buffer;
    }>) {
      yield JSON.stringify({ kind: 'sheet', sha256: s.sha256, name: s.name, media_type: s.media_type, stored_at: s.stored_at, data_base64: s.bytes.toString('base64') });
    }
    for (const t of db.prepare('SELECT id, sheet_sha256, name, saved_at, body FROM takeoffs ORDER BY saved_at, id').iterate() as Iterable<{
      id: string; sheet_sha256: string; name: string | null; saved_at: string; body: string;
    }>) {
      yield `{"kind":"takeoff","id":${JSON.stringify(t.id)},"sheet_sha256":${JSON.stringify(t.sheet_sha256)},"name":${JSON.stringify(t.name)},"saved_at":${JSON.stringify(t.saved_at)},"body":${t.body}}`;
    }
    const rows = db
      .prepare(`SELECT e.id, e.created_at, e.archived_at, r.revision, r.saved_at, r.body
        FROM entries e JOIN revisions r ON r.entry_id = e.id ORDER BY e.key, r.revision`)
      .iterate() as Iterable<{ id: string; created_at: string; archived_at: string | null; revision: number; saved_at: string; body: string }>;
    let currentId: string | null = null;
    let head = '';
    let parts: string[] = [];
    for (const r of rows) {
      if (currentId !== r.id) {
        if (currentId !== null) yield `${head}${parts.join(',')}]}`;
        currentId = r.id;
        head = `{"kind":"entry","id":${JSON.stringify(r.id)},"created_at":${JSON.stringify(r.created_at)},"archived_at":${JSON.stringify(r.archived_at)},"revisions":[`;
        parts = [];
      }
      parts.push(`{"revision":${r.revision},"saved_at":${JSON.stringify(r.saved_at)},"curveset":${r.body}}`);
    }
    if (currentId !== null) yield `${head}${parts.join(',')}]}`;
  } finally {
    if (ownConnection) {
      if (db.inTransaction) db.exec('COMMIT');
      db.close();
    }
  }
}

interface ParsedImport {
  sheets: Array<z.infer<typeof SheetLine> & { bytes: Buffer }>;
  takeoffs: Array<z.infer<typeof TakeoffLine>>;
  entries: Array<{ id: string; created_at: string; archived_at: string | null; revisions: Array<{ savedAt: string; checked: CheckedCurveSet }> }>;
}

function lineError(n: number, text: string): LibraryError {
  return new LibraryError(`Line ${n} of the import: ${text} Nothing was imported.`, 'invalid');
}

/** Checks every line; throws LibraryError naming the first bad line. */
export async function parseImport(lines: AsyncIterable<string> | Iterable<string>): Promise<ParsedImport> {
  const out: ParsedImport = { sheets: [], takeoffs: [], entries: [] };
  const seenIds = new Set<string>();
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
      out.sheets.push({ ...rec, bytes });
    } else if (rec.kind === 'takeoff') {
      out.takeoffs.push(rec);
    } else {
      if (seenIds.has(rec.id)) throw lineError(n, `entry ${rec.id} appears twice.`);
      seenIds.add(rec.id);
      const revisions = [...rec.revisions].sort((a, b) => a.revision - b.revision).map((r) => {
        try {
          return { savedAt: r.saved_at, checked: checkCurveSet(r.curveset, `Revision ${r.revision} of entry ${rec.id}`) };
        } catch (error) {
          throw lineError(n, error instanceof Error ? error.message : String(error));
        }
      });
      out.entries.push({ id: rec.id, created_at: rec.created_at, archived_at: rec.archived_at, revisions });
    }
  }
  if (!sawHeader) throw new LibraryError('The import is empty; give a file written by "library export".', 'invalid');
  return out;
}

/** Writes a checked import in one transaction. */
export function applyImport(store: LibraryStore, data: ParsedImport): ImportReport {
  const report: ImportReport = { entries_created: 0, entries_extended: 0, revisions_added: 0, revisions_already_present: 0, sheets_added: 0, takeoffs_added: 0 };
  const write = store.db.transaction(() => {
    for (const s of data.sheets) {
      if (store.sheets.put(s.bytes, s.name, s.stored_at).created) report.sheets_added += 1;
    }
    for (const t of data.takeoffs) {
      if (store.sheets.addTakeoff(t.sheet_sha256, t.body, t.name, t.id, t.saved_at).created) report.takeoffs_added += 1;
    }
    for (const e of data.entries) {
      const known = store.revisionHashes(e.id);
      if (known === null) {
        store.insertImportedEntry(e.id, e.created_at, e.archived_at, e.revisions);
        report.entries_created += 1;
        report.revisions_added += e.revisions.length;
        continue;
      }
      const fresh = e.revisions.filter((r) => !known.has(r.checked.sha256) && (known.add(r.checked.sha256), true));
      report.revisions_already_present += e.revisions.length - fresh.length;
      if (fresh.length) {
        store.appendImportedRevisions(e.id, fresh);
        report.entries_extended += 1;
        report.revisions_added += fresh.length;
      }
    }
  });
  write.immediate();
  return report;
}

export async function importLines(store: LibraryStore, lines: AsyncIterable<string> | Iterable<string>): Promise<ImportReport> {
  return applyImport(store, await parseImport(lines));
}
