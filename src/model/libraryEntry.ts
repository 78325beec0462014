/**
 * A library entry as the library store returns it and the HTTP API lists it (GET /api/curvesets):
 * the summary of the entry's latest revision. SI figures, named with their unit. One type for the
 * store, the command line and the screens (which read it from the HTTP answers).
 */
export interface EntryInfo {
  id: string;
  revision: number;
  name: string;
  maker: string | null;
  model: string | null;
  size: string | null;
  type: string | null;
  family: string;
  speed_rpm: number;
  diameters_m: number[];
  flow_range_m3s: [number, number];
  head_range_m: [number, number];
  bep: { flow_m3s: number; head_m: number; efficiency: number } | null;
  created_at: string;
  updated_at: string;
  archived_at: string | null;
  /** The display units the curve set was saved in (its own units). */
  display_units: Record<string, string>;
  /** Findings summary of the latest revision; a failing entry is marked and ranked last by duty search. */
  findings: { fail_count: number; warn_count: number; fail_codes: string[] };
}
