/**
 * A study run: every option resolved, worked out and ranked. Options with a `fail` finding rank
 * after sound ones; then the lowest life-cycle cost wins (or, without a tariff, the lowest annual
 * energy). The reason the best wins is said in one sentence. Pure: curve sets are handed in by path.
 */
import type { CurveSet } from '../model/curveset.ts';
import { StudyError, type Study } from '../model/study.ts';
import { MOTOR_CAUTION, NPSH_CAUTION, PRELIMINARY } from '../duty/cautions.ts';
import { NPSH3_TRIM_RULE } from '../fit/affinity.ts';
import { evaluateOption, type OptionResult } from './evaluate.ts';
import { resolveOption, studyUnitSystem } from './resolve.ts';
import { fromSI, parseUnit, roundSignificant } from '../units/index.ts';
import type { SentenceUnits } from './evaluate.ts';

export interface StudyResult {
  study: Study;
  /** Options best first. */
  ranked: OptionResult[];
  why: string;
  notes: string[];
  cautions: string[];
}

/** The figure options are ranked on: life-cycle cost, else annual energy. */
export function rankValue(r: OptionResult): number {
  return r.lcc?.total ?? r.energy?.kWh ?? Number.POSITIVE_INFINITY;
}

export function isFailing(r: OptionResult): boolean {
  return r.findings.some((f) => f.severity === 'fail');
}

/** Orders option results: sound before failing, then by life-cycle cost (or energy), then by name. */
export function rankOptions(results: OptionResult[]): OptionResult[] {
  // An option without an energy figure (a profile step it cannot deliver) ranks after those with one.
  const byValue = (a: OptionResult, b: OptionResult) => {
    const x = rankValue(a);
    const y = rankValue(b);
    if (Number.isFinite(x) && Number.isFinite(y)) return x - y;
    return Number(!Number.isFinite(x)) - Number(!Number.isFinite(y));
  };
  return [...results].sort((a, b) => Number(isFailing(a)) - Number(isFailing(b)) || byValue(a, b) || a.name.localeCompare(b.name));
}

/**
 * @param study    a parsed study
 * @param curveSet the curve set of a path as written in the study (the caller loads it)
 */
export function runStudy(study: Study, curveSet: (path: string) => CurveSet): StudyResult {
  const units = studyUnitSystem(study);
  const headU = parseUnit('head', units.head);
  const flowU = parseUnit('flow', units.flow);
  const words: SentenceUnits = {
    head: (m) => `${roundSignificant(fromSI(m, headU), 4)} ${headU.label}`,
    flow: (q) => `${roundSignificant(fromSI(q, flowU), 4)} ${flowU.label}`,
  };
  const results = study.options.map((option) => {
    const resolved = resolveOption(study, option);
    let set: CurveSet;
    try {
      set = curveSet(resolved.curveset);
    } catch (error) {
      if (error instanceof Error && 'code' in error) throw new StudyError(`Option "${option.name}": ${error.message}`);
      throw error;
    }
    return evaluateOption(set, resolved, words);
  });
  const ranked = rankOptions(results);
  const sound = ranked.filter((r) => !isFailing(r));
  const byCost = sound.length > 0 && sound.every((r) => r.lcc !== undefined);
  return {
    study,
    ranked,
    why: whyBestWins(ranked, byCost) + curveSetFails(ranked),
    notes: [
      'Suction pipe runs belong to each pump; discharge runs carry the total flow. NPSHa is taken at the lowest suction level, the duty head at the highest static head, energy at the mean static head.',
      NPSH3_TRIM_RULE,
      'Run-out is one pump alone at the lowest static head with the valve open: the NPSH margin is judged from minimum flow to there.',
      'Life-cycle cost after the Hydraulic Institute / Europump guide (2001): capital plus the present value of energy and maintenance (annuity factor).',
    ],
    cautions: [PRELIMINARY, NPSH_CAUTION, MOTOR_CAUTION],
  };
}

/** Names the failing findings of the curve sets used, so the headline carries them. */
function curveSetFails(ranked: OptionResult[]): string {
  const sets = new Set(ranked.flatMap((r) => r.findings.filter((f) => f.severity === 'fail' && f.message.startsWith('The curve set has failing findings')).map((f) => `"${r.option.curveset}": ${f.message.replace(/^The curve set has failing findings \(([^)]*)\).*$/, '$1')}`)));
  return sets.size ? ` Curve sets with failing findings: ${[...sets].join('; ')}.` : '';
}

function whyBestWins(ranked: OptionResult[], byCost: boolean): string {
  const best = ranked[0];
  if (!best) return 'No options to compare.';
  if (isFailing(best)) return `No option passes: the least bad, "${best.name}", still fails (${best.findings.find((f) => f.severity === 'fail')?.message ?? ''}).`;
  const measure = byCost ? 'life-cycle cost' : 'annual energy';
  const value = (r: OptionResult) => rankValue(r);
  const sound = ranked.filter((r) => !isFailing(r));
  const failed = ranked.length - sound.length;
  const failWords = failed ? ` ${failed} option${failed > 1 ? 's fail' : ' fails'} a check (NPSH, motor, duty or curve set) and rank${failed > 1 ? '' : 's'} last.` : '';
  const next = sound[1];
  if (!next) return `"${best.name}" is the only option that passes every check.${failWords}`;
  if (!Number.isFinite(value(best))) return `No option that passes every check has a ${measure} figure (see each option's findings), so they are listed by name; "${best.name}" comes first.${failWords}`;
  if (!Number.isFinite(value(next))) return `"${best.name}" is the only option that passes every check with a ${measure} figure; the others lack one (see their findings).${failWords}`;
  const saving = (value(next) - value(best)) / value(next);
  const parts = [`"${best.name}" wins: the lowest ${measure} of the options that pass every check, ${(100 * saving).toFixed(1)} % below "${next.name}"`];
  if (best.energy && next.energy) parts.push(`it uses ${Math.round(best.energy.kWh).toLocaleString('en')} kWh a year against ${Math.round(next.energy.kWh).toLocaleString('en')}`);
  if (best.lcc && next.lcc && best.lcc.capital !== next.lcc.capital) parts.push(`with a capital cost of ${Math.round(best.lcc.capital)} against ${Math.round(next.lcc.capital)}`);
  return `${parts.join('; ')}.${failWords}`;
}
