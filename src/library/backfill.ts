/**
 * Filling the columns a schema migration adds from what is already stored.
 *
 * Version 2: filling schema version 2's new columns from the documents already stored: every revision gets its
 * findings summary, every entry the summary columns, units and duty slices of its latest revision.
 * A revision that no longer passes today's gates (unknown units, no head curve, `fail` findings) is
 * kept as it is, with its summary saying so; a row that cannot be read at all is left for
 * `library verify` to report.
 */
import type Database from 'better-sqlite3';
import type { CurveSet } from '../model/curveset.ts';
import { summarizeFindings } from './soundness.ts';
import { dutyCardBytes, summaryRow } from './storeSql.ts';

export function backfillV2(db: Database.Database): void {
  // In chunks by rowid: one connection cannot write while a read is still stepping, and memory stays small.
  const chunk = db.prepare('SELECT rowid, entry_id, revision, sha256, body FROM revisions WHERE rowid > ? ORDER BY rowid LIMIT 200');
  function* revisionsInChunks(): Generator<{ entry_id: string; revision: number; sha256: string; body: string }> {
    let after = 0;
    for (;;) {
      const rows = chunk.all(after) as Array<{ rowid: number; entry_id: string; revision: number; sha256: string; body: string }>;
      if (rows.length === 0) return;
      yield* rows;
      after = (rows[rows.length - 1] as { rowid: number }).rowid;
    }
  }
  const revisions = revisionsInChunks();
  const latest = db.prepare('SELECT latest_revision, updated_at FROM entries WHERE id = ?');
  const putSummary = db.prepare(`INSERT INTO revision_summaries (entry_id, revision, fail_count, warn_count, fail_codes, accepted_failing) VALUES (?, ?, ?, ?, ?, ?)`);
  const updates: Array<ReturnType<typeof summaryRow>> = [];
  for (const r of revisions) {
    let set: CurveSet;
    try {
      set = JSON.parse(r.body) as CurveSet;
    } catch {
      continue;
    }
    let findings;
    try {
      findings = summarizeFindings(set);
    } catch {
      continue;
    }
    putSummary.run(r.entry_id, r.revision, findings.fail_count, findings.warn_count, JSON.stringify(findings.fail_codes), findings.fail_count > 0 ? 1 : 0);
    const entry = latest.get(r.entry_id) as { latest_revision: number; updated_at: string } | undefined;
    if (entry && entry.latest_revision === r.revision) {
      try {
        updates.push(summaryRow(r.entry_id, r.revision, { set, text: r.body, sha256: r.sha256, findings, acceptedFailing: findings.fail_count > 0 }, entry.updated_at));
      } catch {
        /* left for verify */
      }
    }
  }
  const cols = ['fail_count', 'warn_count', 'fail_codes', 'display_units_json', 'slices_json'];
  const update = db.prepare(`UPDATE entries SET ${cols.map((c) => `${c} = @${c}`).join(', ')} WHERE id = @id`);
  for (const u of updates) update.run({ id: u.id, fail_count: u.fail_count, warn_count: u.warn_count, fail_codes: u.fail_codes, display_units_json: u.display_units_json, slices_json: u.slices_json });
}

/**
 * Version 3: every entry gets the duty card of its latest revision, made from the search copy kept
 * beside it (the fits are the same). In chunks by key, so memory stays small at any size. A row
 * whose search copy cannot be read gets no card: the search then reads the copy itself and
 * names the row as damaged, and `library verify` reports it.
 */
export function backfillV3(db: Database.Database): void {
  const chunk = db.prepare('SELECT key, search_json FROM entries WHERE key > ? ORDER BY key LIMIT 500');
  const update = db.prepare('UPDATE entries SET duty_card = ? WHERE key = ?');
  let after = 0;
  for (;;) {
    const rows = chunk.all(after) as Array<{ key: number; search_json: string }>;
    if (rows.length === 0) return;
    for (const r of rows) {
      let card: Buffer | null = null;
      try {
        card = dutyCardBytes(JSON.parse(r.search_json) as CurveSet);
      } catch {
        card = null;
      }
      update.run(card, r.key);
    }
    after = (rows[rows.length - 1] as { key: number }).key;
  }
}
