/**
 * The SQL the library store runs, prepared once per connection, and the rows it writes for an
 * entry's latest revision (summary columns, findings summary, display units, duty slices).
 */
import type Database from 'better-sqlite3';
import type { CurveSet } from '../model/curveset.ts';
import { searchCopy, summarize } from './summary.ts';
import { dutySlices } from './dutyIndex.ts';
import { dutyCardOf, encodeDutyCard } from './dutyCard.ts';
import type { FindingsSummary } from './soundness.ts';

/** A checked revision with everything the store writes beside its text. */
export interface RevisionFacts {
  set: CurveSet;
  text: string;
  sha256: string;
  findings: FindingsSummary;
  acceptedFailing: boolean;
}

export function summaryRow(id: string, revision: number, facts: RevisionFacts, at: string) {
  const s = summarize(facts.set);
  return {
    id,
    latest_revision: revision,
    name: s.name,
    maker: s.maker,
    model: s.model,
    size: s.size,
    pump_type: s.pumpType,
    family: s.family,
    speed_rpm: s.speedRpm,
    diameters_json: JSON.stringify(s.diametersM),
    diameter_min_m: s.diameterMinM,
    diameter_max_m: s.diameterMaxM,
    member_count: s.memberCount,
    flow_min_m3s: s.flowMinM3s,
    flow_max_m3s: s.flowMaxM3s,
    head_min_m: s.headMinM,
    head_max_m: s.headMaxM,
    bep_flow_m3s: s.bepFlowM3s,
    bep_head_m: s.bepHeadM,
    bep_efficiency: s.bepEfficiency,
    search_text: s.searchText,
    search_json: JSON.stringify(searchCopy(facts.set)),
    updated_at: at,
    fail_count: facts.findings.fail_count,
    warn_count: facts.findings.warn_count,
    fail_codes: JSON.stringify(facts.findings.fail_codes),
    display_units_json: JSON.stringify(facts.set.display_units),
    slices_json: JSON.stringify(dutySlices(facts.set, s)),
    duty_card: dutyCardBytes(facts.set),
  };
}

/** The stored duty card of a set (dutyCard.ts), or null when the set has none (a speed family). */
export function dutyCardBytes(set: CurveSet): Buffer | null {
  const card = dutyCardOf(set);
  return card ? Buffer.from(encodeDutyCard(card)) : null;
}

/** Writes a revision's text and its findings summary. */
export function insertRevisionRows(stmts: ReturnType<typeof prepareStatements>, id: string, revision: number, at: string, facts: RevisionFacts): void {
  const source = facts.set.provenance.source?.sha256 ?? null;
  stmts.insertRevision.run(id, revision, at, facts.sha256, facts.text, source);
  stmts.insertRevisionSummary.run(id, revision, facts.findings.fail_count, facts.findings.warn_count, JSON.stringify(facts.findings.fail_codes), facts.acceptedFailing ? 1 : 0);
}

const SUMMARY_COLUMNS = [
  'latest_revision', 'name', 'maker', 'model', 'size', 'pump_type', 'family', 'speed_rpm', 'diameters_json', 'diameter_min_m',
  'diameter_max_m', 'member_count', 'flow_min_m3s', 'flow_max_m3s', 'head_min_m', 'head_max_m', 'bep_flow_m3s', 'bep_head_m',
  'bep_efficiency', 'search_text', 'search_json', 'updated_at', 'fail_count', 'warn_count', 'fail_codes', 'display_units_json', 'slices_json',
  'duty_card',
];

export function prepareStatements(db: Database.Database) {
  const insertColumns = ['id', 'created_at', 'archived_at', ...SUMMARY_COLUMNS];
  return {
    entry: db.prepare('SELECT * FROM entries WHERE id = ?'),
    insertEntry: db.prepare(`INSERT INTO entries (${insertColumns.join(', ')}) VALUES (${insertColumns.map((c) => `@${c}`).join(', ')})`),
    updateSummary: db.prepare(`UPDATE entries SET ${SUMMARY_COLUMNS.map((c) => `${c} = @${c}`).join(', ')} WHERE id = @id`),
    insertRevision: db.prepare(`INSERT INTO revisions (entry_id, revision, saved_at, sha256, body, source_sha256)
      VALUES (?, ?, ?, ?, ?, ?)`),
    insertRevisionSummary: db.prepare(`INSERT INTO revision_summaries (entry_id, revision, fail_count, warn_count, fail_codes, accepted_failing)
      VALUES (?, ?, ?, ?, ?, ?)`),
    maxRevision: db.prepare('SELECT max(revision) AS n FROM revisions WHERE entry_id = ?'),
    revision: db.prepare('SELECT * FROM revisions WHERE entry_id = ? AND revision = ?'),
    revisions: db.prepare(`SELECT r.revision, r.saved_at, r.sha256, length(CAST(r.body AS BLOB)) AS bytes,
      s.fail_count, s.warn_count, s.fail_codes, s.accepted_failing
      FROM revisions r LEFT JOIN revision_summaries s ON s.entry_id = r.entry_id AND s.revision = r.revision
      WHERE r.entry_id = ? ORDER BY r.revision`),
    revisionSummary: db.prepare('SELECT fail_count, warn_count, fail_codes, accepted_failing FROM revision_summaries WHERE entry_id = ? AND revision = ?'),
    event: db.prepare('INSERT INTO entry_events (entry_id, at, event, revision) VALUES (?, ?, ?, ?)'),
    setArchived: db.prepare('UPDATE entries SET archived_at = ? WHERE id = ?'),
    /** Index boxes holding (flow, head) with an efficiency bound in [lo, hi); sound or failing sets. */
    dutyBand: db.prepare(`SELECT c.entry_id AS id, c.revision, d.eta_max AS bound, c.card
      FROM duty_index d JOIN duty_cards c ON c.entry_key = d.entry_key
      WHERE d.flow_min <= @q AND d.flow_max >= @q AND d.head_min <= @h AND d.head_max >= @h
        AND d.eta_max >= @lo AND d.eta_min < @hi AND d.failing = @failing`),
    dutyCount: db.prepare(`SELECT count(DISTINCT entry_key) AS n FROM duty_index
      WHERE flow_min <= @q AND flow_max >= @q AND head_min <= @h AND head_max >= @h`),
    names: db.prepare(`SELECT id, name, maker, model, speed_rpm AS rated_speed_rpm, fail_count, fail_codes, display_units_json
      FROM entries WHERE id = ?`),
    searchJson: db.prepare('SELECT search_json FROM entries WHERE id = ? AND latest_revision = ?'),
  };
}
