/** Rows and replies of the library store. Figures are SI, named with their unit. */
import type { EntryInfo } from '../model/libraryEntry.ts';

/** One row of the `entries` table. */
export interface EntryRow {
  id: string;
  created_at: string;
  archived_at: string | null;
  latest_revision: number;
  name: string;
  maker: string | null;
  model: string | null;
  size: string | null;
  pump_type: string | null;
  family: string;
  speed_rpm: number;
  diameters_json: string;
  diameter_min_m: number | null;
  diameter_max_m: number | null;
  member_count: number;
  flow_min_m3s: number;
  flow_max_m3s: number;
  head_min_m: number;
  head_max_m: number;
  bep_flow_m3s: number | null;
  bep_head_m: number | null;
  bep_efficiency: number | null;
  search_text: string;
  updated_at: string;
  fail_count: number;
  warn_count: number;
  fail_codes: string;
  display_units_json: string;
  slices_json: string;
  /** The duty card of the latest revision (dutyCard.ts), or null for a set without one. */
  duty_card: Buffer | null;
}

/** The summary of an entry as the API, the CLI and the screens show it (one type, in the model layer). */
export type { EntryInfo } from '../model/libraryEntry.ts';

export interface SavedRevision {
  id: string;
  revision: number;
  saved_at: string;
}

export interface StoredRevision extends SavedRevision {
  sha256: string;
  /** The curve set's JSON text exactly as stored. */
  body: string;
  archived_at: string | null;
}

export interface RevisionInfo {
  revision: number;
  saved_at: string;
  sha256: string;
  bytes: number;
  /** Findings summary kept with the revision: the stored findings and the checks run again on saving. */
  fail_count: number;
  warn_count: number;
  fail_codes: string[];
  /** True when the revision has `fail` findings and was kept because the caller accepted them. */
  accepted_failing: boolean;
}

export function entryInfoOf(row: EntryRow): EntryInfo {
  const bep =
    row.bep_flow_m3s !== null && row.bep_head_m !== null && row.bep_efficiency !== null
      ? { flow_m3s: row.bep_flow_m3s, head_m: row.bep_head_m, efficiency: row.bep_efficiency }
      : null;
  return {
    id: row.id,
    revision: row.latest_revision,
    name: row.name,
    maker: row.maker,
    model: row.model,
    size: row.size,
    type: row.pump_type,
    family: row.family,
    speed_rpm: row.speed_rpm,
    diameters_m: parseOr(row.diameters_json, [] as number[]),
    flow_range_m3s: [row.flow_min_m3s, row.flow_max_m3s],
    head_range_m: [row.head_min_m, row.head_max_m],
    bep,
    created_at: row.created_at,
    updated_at: row.updated_at,
    archived_at: row.archived_at,
    display_units: parseOr(row.display_units_json, {}),
    findings: { fail_count: row.fail_count, warn_count: row.warn_count, fail_codes: parseOr(row.fail_codes, []) },
  };
}

function parseOr<T>(text: string, fallback: T): T {
  try {
    return JSON.parse(text) as T;
  } catch {
    return fallback;
  }
}
