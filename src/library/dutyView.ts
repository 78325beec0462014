/**
 * A duty search in a unit system's display units (si: m³/h, m, mm, kW; us: gpm, ft, in, hp),
 * as the API returns it and the CLI and the library page show it. The only place where the
 * search's SI figures meet display units.
 */
import { parseUnit, presetNamed, resolveUnits, siOf, fromSI, type PresetName, type Unit } from '../units/index.ts';
import { LibraryError } from './errors.ts';
import type { DamagedRow, Duty, DutySearchResult, PorPlace } from './dutySearch.ts';

export const PRELIMINARY_NOTICE =
  'Preliminary selection from digitised curves: verify the duty, NPSH margin and motor size against certified manufacturer data and local codes with a licensed professional before relying on it.';

export interface DutyCandidateView {
  id: string;
  revision: number;
  name: string;
  maker: string | null;
  model: string | null;
  /** 'trim' (a diameter or trim) or 'speed' (a variable-speed family). */
  method: 'trim' | 'speed';
  /** Speed at the duty, rpm. */
  speed_rpm: number;
  /** The diameter (or trim) that meets the duty, in the system's diameter unit; null for a speed family without diameters. */
  diameter: number | null;
  trimmed: boolean;
  /** Percent. */
  efficiency: number | null;
  power: number | null;
  npshr: number | null;
  por: { position: PorPlace; flow_to_bep_percent: number | null };
  annual_energy_kWh: number | null;
  annual_cost: number | null;
  message: string;
  warnings: string[];
  /** True when the set was kept with `fail` findings: ranked after every sound set. */
  failing: boolean;
  fail_codes: string[];
  /** The units of this candidate's figures. */
  units: { flow: string; head: string; diameter: string; power: string; npshr: string };
}

/** The search's counts and marks, as the search gives them (dutySearch.ts). */
type SearchCounts = Pick<DutySearchResult, 'ranking' | 'examined' | 'reachable' | 'evaluated' | 'matched' | 'failed' | 'damaged' | 'complete'>;

export interface DutySearchView extends SearchCounts {
  units: { flow: string; head: string; diameter: string; power: string; npshr: string; efficiency: '%' };
  duty: { flow: number; head: number; static_head: number | null };
  candidates: DutyCandidateView[];
  notice: string;
}

/** "3 of the 12 pumps spanning the duty can meet it", or "at least …" when the search stopped early. */
export function matchSentence(view: Pick<DutySearchView, 'matched' | 'examined' | 'complete' | 'ranking' | 'failed' | 'damaged' | 'candidates'>): string {
  const ranked = view.ranking === 'efficiency' ? 'efficiency at the duty' : 'annual energy cost';
  const head = view.complete
    ? `${view.matched} of the ${view.examined} pumps spanning the duty can meet it, ranked by ${ranked}`
    : `at least ${view.matched} pumps can meet the duty (${view.examined} of those spanning it were read), ranked by ${ranked}`;
  const failed = view.failed.length ? ` ${view.failed.length} entries could not be evaluated (${view.failed.slice(0, 5).join(', ')}); check them with a duty check.` : '';
  const damaged = view.damaged.length
    ? ` ${view.damaged.length} damaged ${view.damaged.length === 1 ? 'entry was' : 'entries were'} skipped (${view.damaged.slice(0, 5).map((d) => d.id).join(', ')}); run "library verify".`
    : '';
  const failing = view.candidates.filter((c) => c.failing).length;
  const marked = failing ? ` ${failing} of them ${failing === 1 ? 'was' : 'were'} kept with failing checks and ${failing === 1 ? 'is' : 'are'} ranked after every sound pump.` : '';
  return (view.complete ? `${head}.` : `${head}; the ranking shown is exact, the pumps that could not enter it were not evaluated.`) + marked + failed + damaged;
}

export function unitSystemNamed(name: string | undefined): PresetName {
  if (name === 'si' || name === 'us') return name;
  throw new LibraryError('Say which units the duty is in: "si" (flow m³/h, head m) or "us" (flow gpm, head ft).', 'invalid');
}

/** A duty given in display units → SI. */
export function dutyFromDisplay(system: PresetName, flow: number, head: number, staticHead?: number): Duty {
  const u = presetNamed(system);
  const duty: Duty = { flow_m3s: siOf('flow', flow, u.flow), head_m: siOf('head', head, u.head) };
  if (staticHead !== undefined) duty.static_head_m = siOf('head', staticHead, u.head);
  return duty;
}

type Labels = { flow: Unit; head: Unit; diameter: Unit; power: Unit; npsh: Unit };

function ownUnits(display: Record<string, string>, fallback: Labels): Labels {
  const pick = (kind: 'flow' | 'head' | 'diameter' | 'power', token: string | undefined, or: Unit): Unit => {
    try {
      return token ? parseUnit(kind, token) : or;
    } catch {
      return or;
    }
  };
  return {
    flow: pick('flow', display.flow, fallback.flow),
    head: pick('head', display.head, fallback.head),
    diameter: pick('diameter', display.diameter, fallback.diameter),
    power: pick('power', display.power, fallback.power),
    npsh: pick('head', display.npsh, fallback.npsh),
  };
}

/**
 * The search in display units: every figure in `system`, or, with `'own'`, each candidate's figures
 * in the units its curve set was saved in (the duty then in `dutySystem`, the units it was given in).
 */
export function dutySearchView(result: DutySearchResult, system: PresetName | 'own', dutySystem: PresetName = system === 'own' ? 'si' : system): DutySearchView {
  const u = resolveUnits(presetNamed(system === 'own' ? dutySystem : system));
  const opt = (v: number | undefined, f: (x: number) => number) => (v === undefined ? null : f(v));
  return {
    units: { flow: u.flow.label, head: u.head.label, diameter: u.diameter.label, power: u.power.label, npshr: u.npsh.label, efficiency: '%' },
    duty: {
      flow: fromSI(result.duty.flow_m3s, u.flow),
      head: fromSI(result.duty.head_m, u.head),
      static_head: opt(result.duty.static_head_m, (v) => fromSI(v, u.head)),
    },
    ranking: result.ranking,
    examined: result.examined,
    reachable: result.reachable,
    evaluated: result.evaluated,
    matched: result.matched,
    failed: result.failed,
    damaged: result.damaged,
    complete: result.complete,
    candidates: result.candidates.map((c) => {
      const cu = system === 'own' ? ownUnits(c.display_units, u) : u;
      return {
        id: c.id,
        revision: c.revision,
        name: c.name,
        maker: c.maker,
        model: c.model,
        method: c.method,
        speed_rpm: c.speed_rpm,
        diameter: c.diameter_m === null ? null : fromSI(c.diameter_m, cu.diameter),
        trimmed: c.trimmed,
        efficiency: opt(c.efficiency, (v) => v * 100),
        power: opt(c.power_W, (v) => fromSI(v, cu.power)),
        npshr: opt(c.npshr_m, (v) => fromSI(v, cu.npsh)),
        por: { position: c.por_position, flow_to_bep_percent: opt(c.flow_to_bep, (v) => v * 100) },
        annual_energy_kWh: c.annual_energy_kWh ?? null,
        annual_cost: c.annual_cost ?? null,
        message: c.message,
        warnings: c.warnings,
        failing: c.failing,
        fail_codes: c.fail_codes,
        units: { flow: cu.flow.label, head: cu.head.label, diameter: cu.diameter.label, power: cu.power.label, npshr: cu.npsh.label },
      };
    }),
    notice: PRELIMINARY_NOTICE,
  };
}
