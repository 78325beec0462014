/**
 * The SQL the library store runs, prepared once per connection, and the summary row it writes
 * for an entry's latest revision.
 */
import type Database from 'better-sqlite3';
import { searchCopy, summarize } from './summary.ts';
import type { CheckedCurveSet } from './validate.ts';

export function summaryRow(id: string, revision: number, checked: CheckedCurveSet, at: string) {
  const s = summarize(checked.set);
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
    search_json: JSON.stringify(searchCopy(checked.set)),
    updated_at: at,
  };
}

export function prepareStatements(db: Database.Database) {
  return {
    entry: db.prepare('SELECT * FROM entries WHERE id = ?'),
    insertEntry: db.prepare(`INSERT INTO entries (id, created_at, archived_at, latest_revision, name, maker, model, size, pump_type, family,
      speed_rpm, diameters_json, diameter_min_m, diameter_max_m, member_count, flow_min_m3s, flow_max_m3s, head_min_m, head_max_m,
      bep_flow_m3s, bep_head_m, bep_efficiency, search_text, search_json, updated_at)
      VALUES (@id, @created_at, @archived_at, @latest_revision, @name, @maker, @model, @size, @pump_type, @family,
      @speed_rpm, @diameters_json, @diameter_min_m, @diameter_max_m, @member_count, @flow_min_m3s, @flow_max_m3s, @head_min_m, @head_max_m,
      @bep_flow_m3s, @bep_head_m, @bep_efficiency, @search_text, @search_json, @updated_at)`),
    updateSummary: db.prepare(`UPDATE entries SET latest_revision = @latest_revision, name = @name, maker = @maker, model = @model,
      size = @size, pump_type = @pump_type, family = @family, speed_rpm = @speed_rpm, diameters_json = @diameters_json,
      diameter_min_m = @diameter_min_m, diameter_max_m = @diameter_max_m, member_count = @member_count,
      flow_min_m3s = @flow_min_m3s, flow_max_m3s = @flow_max_m3s, head_min_m = @head_min_m, head_max_m = @head_max_m,
      bep_flow_m3s = @bep_flow_m3s, bep_head_m = @bep_head_m, bep_efficiency = @bep_efficiency, search_text = @search_text,
      search_json = @search_json, updated_at = @updated_at WHERE id = @id`),
    insertRevision: db.prepare(`INSERT INTO revisions (entry_id, revision, saved_at, sha256, body, source_sha256)
      VALUES (?, ?, ?, ?, ?, ?)`),
    maxRevision: db.prepare('SELECT max(revision) AS n FROM revisions WHERE entry_id = ?'),
    revision: db.prepare('SELECT * FROM revisions WHERE entry_id = ? AND revision = ?'),
    revisions: db.prepare('SELECT revision, saved_at, sha256, length(CAST(body AS BLOB)) AS bytes FROM revisions WHERE entry_id = ? ORDER BY revision'),
    event: db.prepare('INSERT INTO entry_events (entry_id, at, event, revision) VALUES (?, ?, ?, ?)'),
    setArchived: db.prepare('UPDATE entries SET archived_at = ? WHERE id = ?'),
    envelope: db.prepare(`SELECT entry_id AS id, revision FROM entries_envelope
      WHERE flow_min <= ? AND flow_max >= ? AND head_min <= ? AND head_max >= ?`),
    names: db.prepare('SELECT id, name, maker, model, speed_rpm AS rated_speed_rpm FROM entries WHERE id = ?'),
    searchJson: db.prepare('SELECT search_json FROM entries WHERE id = ? AND latest_revision = ?'),
    activeAfter: db.prepare('SELECT id, latest_revision FROM entries WHERE archived_at IS NULL AND id > ? ORDER BY id LIMIT ?'),
  };
}
