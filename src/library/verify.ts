/**
 * `library verify`: reads every row of the library and names each one that is damaged, so that a
 * damaged row is found before a backup or a search needs it. Checked:
 * - SQLite's own structure check (`PRAGMA quick_check`);
 * - every revision: its text matches its SHA-256, parses, and passes the curve-set schema;
 * - every entry: its summary row (search copy, duty slices, duty card, units) parses, and its duty
 *   card (and the copy beside the index) is the card of its search copy;
 * - every revision has its findings summary;
 * - every sheet's bytes match their SHA-256.
 */
import type Database from 'better-sqlite3';
import type { CurveSet } from '../model/curveset.ts';
import { checkCurveSet, sha256Hex } from './validate.ts';
import { dutyCardBytes } from './storeSql.ts';
import { decodeDutyCard } from './dutyCard.ts';

export interface DamagedRecord {
  /** 'revision', 'entry', 'sheet' or 'file'. */
  kind: string;
  id: string;
  revision: number | null;
  problem: string;
}

export interface VerifyReport {
  entries: number;
  revisions: number;
  sheets: number;
  damaged: DamagedRecord[];
}

function parses(text: string): boolean {
  try {
    JSON.parse(text);
    return true;
  } catch {
    return false;
  }
}

export function verifyLibrary(db: Database.Database): VerifyReport {
  const damaged: DamagedRecord[] = [];
  const structure = db.pragma('quick_check') as Array<{ quick_check: string }>;
  for (const row of structure) {
    if (row.quick_check !== 'ok') damaged.push({ kind: 'file', id: 'library file', revision: null, problem: `SQLite reports: ${row.quick_check}` });
  }
  let revisions = 0;
  const revs = db.prepare(`SELECT r.entry_id, r.revision, r.sha256, r.body, s.entry_id AS summarized
    FROM revisions r LEFT JOIN revision_summaries s ON s.entry_id = r.entry_id AND s.revision = r.revision ORDER BY r.entry_id, r.revision`);
  for (const r of revs.iterate() as Iterable<{ entry_id: string; revision: number; sha256: string; body: string; summarized: string | null }>) {
    revisions += 1;
    const bad = (problem: string) => damaged.push({ kind: 'revision', id: r.entry_id, revision: r.revision, problem });
    if (sha256Hex(r.body) !== r.sha256) {
      bad('its text no longer matches its SHA-256');
      continue;
    }
    let value: unknown;
    try {
      value = JSON.parse(r.body);
    } catch {
      bad('its text is not valid JSON');
      continue;
    }
    try {
      checkCurveSet(value, 'it');
    } catch (error) {
      bad(error instanceof Error ? error.message : String(error));
      continue;
    }
    if (r.summarized === null) bad('it has no findings summary');
  }
  let entries = 0;
  const entryRows = db.prepare(`SELECT e.id, e.latest_revision, e.search_json, e.slices_json, e.display_units_json, e.fail_codes, e.diameters_json, e.duty_card,
      c.card AS indexed_card, c.revision AS indexed_revision
    FROM entries e LEFT JOIN duty_cards c ON c.entry_key = e.key ORDER BY e.key`);
  for (const e of entryRows.iterate() as Iterable<{
    id: string; latest_revision: number; search_json: string; slices_json: string; display_units_json: string; fail_codes: string; diameters_json: string;
    duty_card: Buffer | null; indexed_card: Buffer | null; indexed_revision: number | null;
  }>) {
    entries += 1;
    const broken: string[] = (['search_json', 'slices_json', 'display_units_json', 'fail_codes', 'diameters_json'] as const).filter((c) => !parses(e[c]));
    if (e.duty_card !== null && !decodeDutyCard(e.duty_card)) broken.push('duty_card');
    if (broken.length) {
      damaged.push({ kind: 'entry', id: e.id, revision: e.latest_revision, problem: `its summary row cannot be read (${broken.join(', ')})` });
      continue;
    }
    // The duty card decides which sets a search evaluates: it must be the card of the set it stands for.
    const same = (a: Buffer | null, b: Buffer | null) => (a === null || b === null ? a === b : a.equals(b));
    let card: Buffer | null;
    try {
      card = dutyCardBytes(JSON.parse(e.search_json) as CurveSet);
    } catch {
      card = e.duty_card;
    }
    if (!same(card, e.duty_card) || !same(e.indexed_card, e.duty_card) || e.indexed_revision !== e.latest_revision) {
      damaged.push({ kind: 'entry', id: e.id, revision: e.latest_revision, problem: 'its duty card does not match its curve set; a duty search could rank it wrongly' });
    }
  }
  let sheets = 0;
  for (const s of db.prepare('SELECT sha256, bytes FROM sheets').iterate() as Iterable<{ sha256: string; bytes: Buffer }>) {
    sheets += 1;
    if (sha256Hex(s.bytes) !== s.sha256) damaged.push({ kind: 'sheet', id: s.sha256, revision: null, problem: 'its bytes no longer match its SHA-256' });
  }
  return { entries, revisions, sheets, damaged };
}
