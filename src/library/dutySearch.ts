/**
 * Searching the library by duty point: which pumps can deliver flow Q at head H, at which
 * impeller diameter or trim, and how well.
 *
 * The duty index (dutyIndex.ts) holds, for every active entry, a few boxes in flow and head, each
 * with an upper bound on the efficiency any trim can reach there. A query walks that index in bands
 * of the bound, best first: it reads only the entries whose boxes hold the duty and whose bound can
 * still beat the last place of the ranking. For each, the entry's duty card (dutyCard.ts, a few
 * hundred bytes kept with its latest revision) finds the trim that meets the duty and bounds its
 * efficiency tightly, or shows that the set cannot meet it (sets without a card are screened on
 * their search copy, dutyBounds.ts); the duty engine's matcher then evaluates the survivors best
 * bound first, and the walk stops when no remaining entry could enter the top `limit`: the ranking
 * is exactly that of the engine run on every set, the engine runs on little more than `limit` sets,
 * and no whole-library cache is needed.
 * Sound sets come first; sets kept with `fail` findings are marked and ranked after every sound one.
 * A row that cannot be read is skipped and named in the answer (`damaged`); it never sinks a search.
 * Ranking is by efficiency at the duty, or by annual energy cost when hours and a tariff are given.
 *
 * Results are preliminary: they are to be verified against certified manufacturer data by a
 * licensed professional, with the NPSH margin and motor sizing checked separately.
 */
import type { CurveSet } from '../model/curveset.ts';
import { LibraryError } from './errors.ts';
import type { LibraryBackend, DutyIndexRow, EntryNames } from './backend.ts';
import { screenDuty } from './dutyBounds.ts';
import { cardBound } from './dutyCard.ts';

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
  /** True when the set was kept with `fail` findings; it ranks after every sound set. */
  failing: boolean;
  /** Codes of its `fail` findings. */
  fail_codes: string[];
  /** The units the curve set was saved in. */
  display_units: Record<string, string>;
}

/** A row of the library that could not be read; the search skipped it. */
export interface DamagedRow {
  id: string;
  revision: number;
  problem: string;
}

export interface DutySearchResult {
  duty: Duty;
  ranking: 'efficiency' | 'annual-cost';
  /**
   * Active entries whose duty-index boxes hold the duty and that the search read: all of them when
   * `complete`; otherwise only those that could still enter the ranking (no count of the rest is
   * taken, since counting every box at 100,000 entries costs more than the search itself).
   */
  examined: number;
  /** Of the entries read, those that may meet the duty (the others surely cannot, by their duty card or screen). */
  reachable: number;
  /** Entries the duty engine evaluated; the others could not enter the ranking. */
  evaluated: number;
  /** Evaluated entries that meet the duty (all that meet it when `complete`). */
  matched: number;
  /** Ids of entries the duty engine failed on (left out of the ranking). */
  failed: string[];
  /** Rows that could not be read (left out of the ranking); `library verify` reports them all. */
  damaged: DamagedRow[];
  /** True when every entry whose boxes hold the duty was read and every reachable one evaluated. */
  complete: boolean;
  /** The best `limit` entries that meet the duty, best first. The ranking is exact. */
  candidates: DutyCandidate[];
}

/** Candidates returned unless the caller asks for more. */
export const DEFAULT_LIMIT = 10;

/**
 * The efficiency-bound bands the index is walked in, best first (bounds are fractions; -1: no
 * efficiency curve): everything above 1, then bands 1 % wide down to 50 % (0.5 % wide after a band
 * that held many more entries than are still wanted, so that a dense library reads few entries it
 * does not need), 5 % wide below, and one last band below zero. Reading an entry costs more than
 * asking the index once more, so the bands stay narrow.
 */
function* efficiencyBands(sizes: () => { rows: number; wanted: number }): Generator<[number, number]> {
  yield [1, 1e9];
  let hi = 1;
  while (hi > 1e-9) {
    const { rows, wanted } = sizes();
    const width = hi > 0.5 + 1e-9 ? (rows > 4 * wanted ? 0.005 : 0.01) : 0.05;
    const lo = Math.max(0, Math.round((hi - width) * 1000) / 1000);
    yield [lo, hi];
    hi = lo;
  }
  yield [-1e9, 0];
}

export function checkDuty(duty: Duty): void {
  if (!(Number.isFinite(duty.flow_m3s) && duty.flow_m3s > 0)) throw new LibraryError('The duty flow must be a number greater than zero.', 'invalid');
  if (!(Number.isFinite(duty.head_m) && duty.head_m > 0)) throw new LibraryError('The duty head must be a number greater than zero.', 'invalid');
  const h0 = duty.static_head_m;
  if (h0 !== undefined && !(Number.isFinite(h0) && h0 >= 0 && h0 < duty.head_m)) {
    throw new LibraryError('The static head must be zero or more and less than the duty head.', 'invalid');
  }
}

export function searchByDuty(store: LibraryBackend, duty: Duty, matcher: DutyMatcher, options: DutySearchOptions = {}): DutySearchResult {
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
  const compare = byCost ? compareCost : compareEfficiency;

  const seen = new Set<string>();
  const damaged: DamagedRow[] = [];
  const failed: string[] = [];
  const ranked: DutyCandidate[] = [];
  let reachable = 0;
  let evaluated = 0;
  let matched = 0;
  let unevaluated = 0;
  // True when the walk stopped before reading every entry whose boxes hold the duty.
  let cut = false;
  // The cost ranking has no bound in the index (power depends on the duty): it reads every box holding the duty.

  for (const failing of [false, true]) {
    const room = limit - ranked.length;
    const tier: DutyCandidate[] = [];
    type Pending = { row: DutyIndexRow; set: CurveSet | null; key: number };
    let pending: Pending[] = [];
    let stopped = false;
    // Can a set with this key still enter the tier's ranking?
    const canEnter = (key: number) => {
      if (tier.length < room) return true;
      const last = tier[room - 1] as DutyCandidate;
      return byCost ? key <= (last.power_W ?? Infinity) : key >= (last.efficiency ?? -1);
    };
    if (room <= 0) {
      cut = true;
      continue;
    }
    let bandRows = 0;
    const bands = byCost ? [[-1e9, 1e9] as [number, number]] : efficiencyBands(() => ({ rows: bandRows, wanted: Math.max(1, room - tier.length) }));
    for (const [lo, hi] of bands) {
      if (!byCost && tier.length >= room && !canEnter(hi)) {
        stopped = true;
        break;
      }
      let band: DutyIndexRow[];
      try {
        band = store.dutyBand(q, h, lo, hi, failing);
        bandRows = band.length;
      } catch (error) {
        // A damaged summary row in this band: read the band's rows one by one to name it and go on.
        band = [];
        damaged.push({ id: `index band ${lo}–${hi}`, revision: 0, problem: problemOf(error) });
      }
      for (const row of band) {
        if (seen.has(row.id)) continue;
        seen.add(row.id);
        let set: CurveSet | null = null;
        let efficiencyBound: number;
        let powerBound: number;
        if (row.card) {
          // The duty card bounds the set from a few hundred bytes; the search copy is read only if it is evaluated.
          const bound = cardBound(row.card, q, h);
          if (bound.reject) continue;
          ({ efficiencyBound, powerBound } = bound);
        } else {
          let screen: ReturnType<typeof screenDuty>;
          try {
            set = store.searchSet(row.id, row.revision);
            screen = screenDuty(set, q, h);
          } catch (error) {
            damaged.push({ id: row.id, revision: row.revision, problem: problemOf(error) });
            continue;
          }
          if (!screen) continue;
          ({ efficiencyBound, powerBound } = screen);
        }
        reachable += 1;
        pending.push({ row, set, key: byCost ? powerBound : Math.min(efficiencyBound, row.bound) });
      }
      pending.sort(byCost ? (x, y) => x.key - y.key : (x, y) => y.key - x.key);
      // Evaluate what no later band can beat: keys at or above this band's floor (all of them for cost).
      let i = 0;
      for (; i < pending.length; i++) {
        const p = pending[i] as Pending;
        if (!byCost && p.key < lo) break;
        if (!canEnter(p.key)) {
          stopped = true;
          break;
        }
        let set = p.set;
        if (!set) {
          try {
            set = store.searchSet(p.row.id, p.row.revision);
          } catch (error) {
            damaged.push({ id: p.row.id, revision: p.row.revision, problem: problemOf(error) });
            continue;
          }
        }
        evaluated += 1;
        let match: DutyAnswer | null;
        try {
          match = matcher(set, duty);
        } catch {
          // One curve set the engine cannot read must not sink the whole office search; it is counted.
          failed.push(p.row.id);
          continue;
        }
        if (!match) continue;
        matched += 1;
        // Names and marks are read for a match only: the index rows stay narrow.
        let names: EntryNames;
        try {
          names = store.names(p.row.id);
        } catch (error) {
          damaged.push({ id: p.row.id, revision: p.row.revision, problem: problemOf(error) });
          continue;
        }
        const { fail_count, fail_codes, display_units, ...who } = names;
        const c: DutyCandidate = { ...who, revision: p.row.revision, ...match, failing: fail_count > 0, fail_codes, display_units };
        if (hours !== undefined && match.power_W !== undefined) {
          c.annual_energy_kWh = (match.power_W * hours) / 1000;
          if (tariff !== undefined) c.annual_cost = c.annual_energy_kWh * tariff;
        }
        insertSorted(tier, c, compare);
        if (tier.length > room) tier.pop();
      }
      pending = stopped ? pending.slice(i) : pending.slice(i);
      if (stopped) break;
    }
    unevaluated += pending.length;
    if (stopped) cut = true;
    ranked.push(...tier);
  }
  return {
    duty,
    ranking: byCost ? 'annual-cost' : 'efficiency',
    examined: seen.size,
    reachable,
    evaluated,
    matched,
    failed,
    damaged,
    complete: unevaluated === 0 && !cut,
    candidates: ranked,
  };
}

function problemOf(error: unknown): string {
  const detail = error instanceof Error ? error.message : String(error);
  return `its stored search copy cannot be read (${detail.slice(0, 120)})`;
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
