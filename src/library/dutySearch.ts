/**
 * Searching the library by duty point: which pumps can deliver flow Q at head H, at which
 * impeller diameter or trim, and how well.
 *
 * Three stages. SQL first keeps only the entries whose head-curve envelope (summary columns)
 * contains the duty, with a margin. A screen on the captured head curves (dutyBounds.ts) drops those
 * whose diameters cannot reach the duty and bounds the efficiency (or power) any trim can have there.
 * Then the duty engine's matcher evaluates the survivors (search copies, parsed once per revision and
 * cached) best bound first, and stops when no remaining set could enter the top `limit`: the ranking
 * is exact without evaluating every pump that spans the duty.
 * Ranking is by efficiency at the duty, or by annual energy cost when hours and a tariff are given.
 *
 * Results are preliminary: they are to be verified against certified manufacturer data by a
 * licensed professional, with the NPSH margin and motor sizing checked separately.
 */
import type { CurveSet } from '../model/curveset.ts';
import { LibraryError } from './errors.ts';
import type { LibraryStore } from './store.ts';
import { screenDuty } from './dutyBounds.ts';

export type PorPlace = 'below' | 'within' | 'above' | 'unknown';

export interface Duty {
  flow_m3s: number;
  head_m: number;
  /** Static part of the system head, m; the rest rises with Q² through the duty point. */
  static_head_m?: number;
}

/** What the library needs to know about one curve set that can meet the duty. */
export interface DutyAnswer {
  /** 'trim': a diameter (captured, or a trim between captured ones); 'speed': a variable-speed family. */
  method: 'trim' | 'speed';
  /** Diameter whose curve meets the duty, m (null for a speed family without diameters). */
  diameter_m: number | null;
  /** True when the diameter is a trim between captured diameters rather than one of them. */
  trimmed: boolean;
  /** Speed at the duty, rpm. */
  speed_rpm: number;
  /** Fraction 0…1. */
  efficiency?: number;
  power_W?: number;
  npshr_m?: number;
  por_position: PorPlace;
  /** Q / Q_BEP of the diameter that meets the duty. */
  flow_to_bep?: number;
  /** One sentence from the duty engine, and plain-language cautions (extrapolated readings). */
  message: string;
  warnings: string[];
}

/** Finds how one curve set meets a duty, or null when it does not qualify. */
export type DutyMatcher = (set: CurveSet, duty: Duty) => DutyAnswer | null;

export interface DutySearchOptions {
  /** Operating hours per year; with `tariffPerKWh`, ranks by annual energy cost. */
  hoursPerYear?: number;
  /** Energy price per kWh, in the office's currency. */
  tariffPerKWh?: number;
  /** Most candidates to return (default 10, at most 500). */
  limit?: number;
}

export interface DutyCandidate extends DutyAnswer {
  id: string;
  revision: number;
  name: string;
  maker: string | null;
  model: string | null;
  /** Rated speed of the curve set, rpm. */
  rated_speed_rpm: number;
  /** Shaft energy per year, kWh (power × hours); motor and drive losses not included. */
  annual_energy_kWh?: number;
  /** annual_energy_kWh × tariff. */
  annual_cost?: number;
}

export interface DutySearchResult {
  duty: Duty;
  ranking: 'efficiency' | 'annual-cost';
  /** Active entries whose head-curve envelope contains the duty (SQL prefilter). */
  examined: number;
  /** Of those, entries whose captured diameters bracket the duty: the most that can meet it. */
  reachable: number;
  /** Entries the duty engine evaluated; the others could not enter the ranking. */
  evaluated: number;
  /** Evaluated entries that meet the duty (all that meet it when `complete`). */
  matched: number;
  /** Ids of entries the duty engine failed on (left out of the ranking). */
  failed: string[];
  /** True when every reachable entry was evaluated. */
  complete: boolean;
  /** The best `limit` entries that meet the duty, best first. The ranking is exact. */
  candidates: DutyCandidate[];
}

/** Candidates returned unless the caller asks for more. */
export const DEFAULT_LIMIT = 10;

/** Relative margin on the SQL envelope, so that a trim between diameters is never filtered out early. */
const ENVELOPE_MARGIN = 0.05;

export function checkDuty(duty: Duty): void {
  if (!(Number.isFinite(duty.flow_m3s) && duty.flow_m3s > 0)) throw new LibraryError('The duty flow must be a number greater than zero.', 'invalid');
  if (!(Number.isFinite(duty.head_m) && duty.head_m > 0)) throw new LibraryError('The duty head must be a number greater than zero.', 'invalid');
  const h0 = duty.static_head_m;
  if (h0 !== undefined && !(Number.isFinite(h0) && h0 >= 0 && h0 < duty.head_m)) {
    throw new LibraryError('The static head must be zero or more and less than the duty head.', 'invalid');
  }
}

export function searchByDuty(store: LibraryStore, duty: Duty, matcher: DutyMatcher, options: DutySearchOptions = {}): DutySearchResult {
  checkDuty(duty);
  const { hoursPerYear: hours, tariffPerKWh: tariff } = options;
  if (hours !== undefined && !(Number.isFinite(hours) && hours > 0 && hours <= 8784)) {
    throw new LibraryError('Operating hours per year must be more than 0 and at most 8784.', 'invalid');
  }
  if (tariff !== undefined && !(Number.isFinite(tariff) && tariff >= 0)) {
    throw new LibraryError('The energy tariff must be zero or a positive price per kWh.', 'invalid');
  }
  const limit = Math.min(Math.max(Math.trunc(options.limit ?? DEFAULT_LIMIT), 1), 500);
  // A zero tariff makes every cost zero; efficiency then decides.
  const byCost = hours !== undefined && tariff !== undefined && tariff > 0;

  const q = duty.flow_m3s;
  const h = duty.head_m;
  const rows = store.envelopeContaining(q, h, ENVELOPE_MARGIN);

  // Screen every set in the envelope (cheap), then evaluate in the order of the ranking bounds.
  const screened: Array<{ row: (typeof rows)[number]; set: CurveSet; key: number }> = [];
  for (const row of rows) {
    const set = store.searchSet(row.id, row.revision);
    const screen = screenDuty(set, q, h);
    if (!screen) continue;
    screened.push({ row, set, key: byCost ? screen.powerBound : screen.efficiencyBound });
  }
  screened.sort(byCost ? (a, b) => a.key - b.key : (a, b) => b.key - a.key);

  const candidates: DutyCandidate[] = [];
  let evaluated = 0;
  let matched = 0;
  const failed: string[] = [];
  for (const { row, set, key } of screened) {
    if (candidates.length >= limit) {
      // The ranking so far is complete when no remaining set can beat the last place.
      const last = candidates[limit - 1] as DutyCandidate;
      if (byCost ? key > (last.power_W ?? Infinity) : key < (last.efficiency ?? -1)) break;
    }
    evaluated += 1;
    let match: DutyAnswer | null;
    try {
      match = matcher(set, duty);
    } catch {
      // One curve set the engine cannot read must not sink the whole office search; it is counted.
      failed.push(row.id);
      continue;
    }
    if (!match) continue;
    matched += 1;
    const c: DutyCandidate = { ...store.names(row.id), revision: row.revision, ...match };
    if (hours !== undefined && match.power_W !== undefined) {
      c.annual_energy_kWh = (match.power_W * hours) / 1000;
      if (tariff !== undefined) c.annual_cost = c.annual_energy_kWh * tariff;
    }
    insertSorted(candidates, c, byCost ? compareCost : compareEfficiency);
    if (candidates.length > limit) candidates.pop();
  }
  return {
    duty,
    ranking: byCost ? 'annual-cost' : 'efficiency',
    examined: rows.length,
    reachable: screened.length,
    evaluated,
    matched,
    failed,
    complete: evaluated === screened.length,
    candidates,
  };
}

function insertSorted<T>(list: T[], item: T, compare: (a: T, b: T) => number): void {
  let i = list.length;
  while (i > 0 && compare(list[i - 1] as T, item) > 0) i--;
  list.splice(i, 0, item);
}

function compareEfficiency(a: DutyCandidate, b: DutyCandidate): number {
  return (b.efficiency ?? -1) - (a.efficiency ?? -1) || a.name.localeCompare(b.name) || a.id.localeCompare(b.id);
}

function compareCost(a: DutyCandidate, b: DutyCandidate): number {
  const ca = a.annual_cost ?? Infinity;
  const cb = b.annual_cost ?? Infinity;
  if (ca !== cb) return ca < cb ? -1 : 1;
  return compareEfficiency(a, b);
}
