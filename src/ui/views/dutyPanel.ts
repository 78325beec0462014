/**
 * The duty view of the review, now a duty study: the duty, the suction site and pipe runs, and
 * options added with a click (impeller, pumps in parallel, control, pipe size), worked out with the
 * same study engine `pumpscribe study` runs and ranked. The family chart shows the system curves
 * (lowest and highest static head, as one band) and each option's operating points; the table
 * gives the NPSH margin at the duty and at run-out, the allowable eye elevation and the motor,
 * with the cautions beside them.
 */
import { h } from '../dom/h.ts';
import { NPSH_CAUTION, MOTOR_CAUTION, PRELIMINARY, SERVICES, serviceCaution, type Service } from '../../duty/cautions.ts';
import { systemHead } from '../../duty/systemCurve.ts';
import { curveAtSpeedInFamily } from '../../duty/speed.ts';
import { parallelPumps, pumpCurveAtSpeed } from '../../duty/pumpCurve.ts';
import type { CurveSet } from '../../model/curveset.ts';
import { NOT_AVAILABLE, type UnitChoice } from '../../units/index.ts';
import { linspace } from '../../fit/polynomial.ts';
import { runStudy, isFailing, type StudyResult } from '../../study/runStudy.ts';
import type { OptionResult } from '../../study/evaluate.ts';
import { chartUnits, type DutyOverlay } from './familyChart.ts';
import { num, numIn, numPercent, unitText } from './words.ts';
import { EMPTY_DUTY, formOptions, nextOption, studyOfForm, type DutyForm, type FormFamily, type StudyOptionForm } from './studyForm.ts';
import { bracketingSpeeds, NPSH3_SPEED_RULE } from '../../fit/speedFamily.ts';
import { NPSH3_TRIM_RULE } from '../../fit/affinity.ts';

export { EMPTY_DUTY, type DutyForm };

export type DutyOutcome = { result: StudyResult; overlay: DutyOverlay; service: Service } | { error: string } | null;

const SERVICE_WORDS: Record<Service, string> = { general: 'general service', fire: 'fire protection', potable: 'potable water', hazardous: 'hazardous liquid' };

/** Runs the study for the form, or says what is missing or wrong. */
export function runDuty(set: CurveSet, form: DutyForm, choice: UnitChoice): DutyOutcome {
  try {
    const study = studyOfForm(form, chartUnits(set, choice), familyOf(set));
    if (!study) return null;
    const result = runStudy(study, () => set);
    return { result, overlay: overlayOf(set, result), service: form.service };
  } catch (error) {
    return { error: (error as Error).message };
  }
}

/** Which kind of family the set is: impeller diameters at one speed, or one impeller drawn at several speeds. */
function familyOf(set: Pick<CurveSet, 'family'>): FormFamily {
  return set.family === 'speed' ? 'speed' : 'diameter';
}

/** The system curves of the best option as one band (low static out, high static back) and every option's operating points. */
function overlayOf(set: CurveSet, result: StudyResult): DutyOverlay {
  const best = result.ranked[0] as OptionResult;
  const flows = result.ranked.flatMap((r) => [r.operating_points.low?.flow_m3s ?? 0, r.operating_points.high?.flow_m3s ?? 0]);
  const qMax = Math.max(result.ranked[0]?.option.duty.flow_m3s ?? 0, ...flows, ...set.members.map((m) => m.curves.head?.fit?.domain[1] ?? 0)) * 1.05;
  const qs = linspace(0, qMax, 40);
  const low = qs.map((q) => [q, systemHead(best.systems.low, q)] as [number, number]);
  const high = [...qs].reverse().map((q) => [q, systemHead(best.systems.high, q)] as [number, number]);
  const points: DutyOverlay['points'] = [];
  for (const r of result.ranked) {
    const ok = !r.findings.some((f) => f.severity === 'fail' && /NPSH/.test(f.message));
    for (const [key, op] of Object.entries(r.operating_points)) if (op) points.push({ label: `${r.name}, ${key} static`, flow: op.flow_m3s, head: op.head_m, npshMarginOk: ok });
  }
  return { system: best.systems.low.static_head_m === best.systems.high.static_head_m ? low : [...low, ...high], points, curves: speedCurves(set, result) };
}

/**
 * The head curve each variable-speed option runs on at the highest static head (its pumps
 * combined), so that its operating point is seen on a curve: on a speed family the drawn curve
 * nearest in speed scaled by the affinity law (src/duty/speed.ts), else the option's own curve.
 */
function speedCurves(set: CurveSet, result: StudyResult): NonNullable<DutyOverlay['curves']> {
  const curves: NonNullable<DutyOverlay['curves']> = [];
  for (const r of result.ranked) {
    const speed = r.operating_points.high?.speed_rpm;
    if (r.control !== 'speed' || speed === undefined) continue;
    try {
      const single = set.family === 'speed' && !r.viscous ? curveAtSpeedInFamily(set, speed).curve : r.curve ? pumpCurveAtSpeed(r.curve, speed) : undefined;
      if (!single) continue;
      const combined = parallelPumps(single, r.pumps);
      const points = linspace(combined.domain[0], combined.domain[1], 40).map((q) => [q, combined.head(q)] as [number, number]);
      curves.push({ label: `${r.name}: ${num(speed, 4)} rpm`, points });
    } catch {
      // A curve that cannot be drawn is left out; the table and its findings still say why.
    }
  }
  return curves;
}

function input(id: string, label: string, value: string, unit: string, onchange: (v: string) => void, hint?: string): HTMLElement {
  return h('div', { class: 'field' },
    h('label', { for: id }, label),
    h('input', { id, type: 'text', inputmode: 'decimal', value, ...(hint ? { placeholder: hint } : {}), onchange: (e: Event) => onchange((e.target as HTMLInputElement).value) }),
    h('span', { class: 'unit' }, unit));
}

function select<T extends string>(id: string, label: string, value: T, choices: ReadonlyArray<readonly [T, string]>, onchange: (v: T) => void): HTMLElement {
  return h('div', { class: 'field' },
    h('label', { for: id }, label),
    h('select', { id, onchange: (e: Event) => onchange((e.target as HTMLSelectElement).value as T) }, choices.map(([v, words]) => h('option', { value: v, selected: v === value }, words))));
}

export function dutyPanel(set: CurveSet, form: DutyForm, outcome: DutyOutcome, choice: UnitChoice, change: (patch: Partial<DutyForm>) => void): HTMLElement {
  const u = chartUnits(set, choice);
  const flowUnit = unitText(u.flow.label);
  const family = familyOf(set);
  const options = formOptions(form, family);
  const setOption = (i: number, patch: Partial<StudyOptionForm>) => change({ options: options.map((o, j) => (j === i ? { ...o, ...patch } : o)) });
  const rated = `${num(set.speed_rpm, 6)} rpm`;
  const controls = family === 'speed'
    ? ([['speed', 'variable speed'], ['throttle', `throttling valve, at the rated ${rated}`]] as const)
    : ([['throttle', 'throttling valve'], ['speed', 'variable speed']] as const);
  return h('section', { class: 'duty', 'aria-labelledby': 'duty-title' },
    h('h4', { id: 'duty-title' }, 'Duty study'),
    h('p', { class: 'hint' }, 'Type the duty and the pipe runs, then add options to compare. Each option is worked out at the lowest and highest static head, with the NPSH margin to run-out, the motor and the life-cycle cost.'),
    family === 'speed' ? h('p', { class: 'hint', id: 'duty-speed-family' }, `This sheet draws one impeller at ${set.members.length} speeds (rated ${rated}), so no impeller trim is offered: a variable-speed option finds the speed that meets the duty from the drawn speeds on either side of it.`) : null,
    input('duty-flow', 'Duty flow', form.flow, flowUnit, (v) => change({ flow: v })),
    input('duty-head', 'Duty head', form.head, u.head.label, (v) => change({ head: v }), 'from the pipe runs'),
    input('duty-static', 'Static head, lowest', form.staticHead, u.head.label, (v) => change({ staticHead: v })),
    input('duty-static-high', 'Static head, highest', form.staticHigh, u.head.label, (v) => change({ staticHigh: v }), 'same as lowest'),
    select('duty-service', 'Service', form.service, SERVICES.map((s) => [s, SERVICE_WORDS[s]] as const), (v) => change({ service: v })),
    h('fieldset', { class: 'site' },
      h('legend', null, 'Suction site (for the NPSH margin)'),
      input('duty-temperature', 'Liquid temperature', form.temperatureC, '°C', (v) => change({ temperatureC: v }), '20'),
      input('duty-elevation', 'Site elevation', form.elevation, u.head.label, (v) => change({ elevation: v }), '0'),
      input('duty-suction-static', 'Lowest liquid level above the impeller eye', form.suctionStatic, `${u.head.label} (negative for a lift)`, (v) => change({ suctionStatic: v })),
      input('duty-suction-diameter', 'Suction pipe inside diameter', form.suctionDiameter, u.diameter.label, (v) => change({ suctionDiameter: v })),
      input('duty-suction-length', 'Suction pipe length', form.suctionLength, u.head.label, (v) => change({ suctionLength: v })),
      input('duty-suction-k', 'Suction fittings, sum of K', form.suctionK, '', (v) => change({ suctionK: v })),
      input('duty-suction-loss', 'Suction loss at the duty, per pump (without a suction pipe)', form.suctionLoss, u.head.label, (v) => change({ suctionLoss: v }))),
    h('fieldset', { class: 'site' },
      h('legend', null, 'Discharge pipe and operation'),
      input('duty-discharge-diameter', 'Discharge pipe inside diameter', form.dischargeDiameter, u.diameter.label, (v) => change({ dischargeDiameter: v })),
      input('duty-discharge-length', 'Discharge pipe length', form.dischargeLength, u.head.label, (v) => change({ dischargeLength: v })),
      input('duty-discharge-k', 'Discharge fittings, sum of K', form.dischargeK, '', (v) => change({ dischargeK: v })),
      input('duty-roughness', 'Pipe roughness', form.roughness, u.diameter.label, (v) => change({ roughness: v }), 'new steel'),
      input('duty-hours', 'Running hours', form.hours, 'h/year', (v) => change({ hours: v })),
      input('duty-tariff', 'Tariff', form.tariff, 'per kWh', (v) => change({ tariff: v })),
      input('duty-motor-efficiency', 'Motor efficiency', form.motorEfficiency, '%', (v) => change({ motorEfficiency: v }))),
    h('fieldset', { class: 'study-options' },
      h('legend', null, 'Options'),
      options.map((o, i) => h('div', { class: 'study-option', 'data-key': `option-${i}` },
        input(`option-${i}-name`, 'Name', o.name, '', (v) => setOption(i, { name: v })),
        // A speed family has one impeller: nothing to choose, unless an option still asks for a trim (then the study says why it cannot).
        family === 'speed' && o.impeller === 'drawn'
          ? h('div', { class: 'field' }, h('span', { class: 'label' }, 'Impeller'), h('span', { id: `option-${i}-impeller`, class: 'value' }, 'the one drawn (no trim on a speed family)'))
          : select(`option-${i}-impeller`, 'Impeller', o.impeller, family === 'speed' ? [['drawn', 'the one drawn'], [o.impeller, `${o.impeller === 'trim' ? 'trimmed' : 'given diameter'} (not possible on a speed family)`]] as const : [['trim', 'trimmed to the duty'], ['drawn', 'drawn (largest, or the diameter)'], ['given', 'given diameter']] as const, (v) => setOption(i, { impeller: v })),
        o.impeller === 'trim' || family === 'speed' ? null : input(`option-${i}-diameter`, 'Diameter', o.diameter, u.diameter.label, (v) => setOption(i, { diameter: v })),
        select(`option-${i}-pumps`, 'Pumps in parallel', o.pumps, [['1', '1'], ['2', '2'], ['3', '3']] as const, (v) => setOption(i, { pumps: v })),
        select(`option-${i}-control`, 'Control', o.control, controls, (v) => setOption(i, { control: v })),
        input(`option-${i}-pipe`, 'Discharge pipe diameter', o.pipe, u.diameter.label, (v) => setOption(i, { pipe: v }), 'as above'),
        options.length > 1 ? h('button', { type: 'button', class: 'remove-option', onclick: () => change({ options: options.filter((_, j) => j !== i) }) }, 'Remove') : null)),
      h('button', { type: 'button', id: 'study-add-option', onclick: () => change({ options: [...options, nextOption(options, family)] }) }, 'Add an option')),
    outcome && 'error' in outcome ? h('p', { class: 'cal bad', role: 'alert' }, outcome.error) : null,
    outcome && 'result' in outcome ? studyResults(set, outcome.result, outcome.service, u) : null);
}

/**
 * Where a variable-speed option runs, in words: its speed at the lowest and highest static head,
 * as a share of the rated speed, and on a speed family the drawn speeds on either side of it.
 */
export function speedSentence(set: CurveSet, r: OptionResult): string | null {
  if (r.control !== 'speed') return null;
  const rated = r.rated_speed_rpm ?? set.speed_rpm;
  const at = (key: 'low' | 'high') => r.operating_points[key]?.speed_rpm;
  const high = at('high');
  const low = at('low');
  if (high === undefined && low === undefined) return `${r.name}: no speed meets the duty (see below).`;
  const words = (n: number) => `${num(n, 4)} rpm (${num((100 * n) / rated, 3)} % of the rated ${num(rated, 6)} rpm)`;
  const where = [high !== undefined ? `${words(high)} at the highest static head` : null, low !== undefined && low !== high ? `${words(low)} at the lowest` : null].filter(Boolean).join(', ');
  let between = '';
  if (set.family === 'speed' && high !== undefined) {
    const { below, above } = bracketingSpeeds(set, high);
    if (below && above && below !== above) between = `, between the drawn ${num(below.speed_rpm, 6)} rpm and ${num(above.speed_rpm, 6)} rpm curves`;
    else if (below === above && below) between = `, on the drawn ${num(below.speed_rpm, 6)} rpm curve`;
    else between = ', outside the drawn speeds (an extrapolation)';
  }
  return `${r.name}: the pump${r.pumps > 1 ? 's run' : ' runs'} at ${where}${between}.`;
}

function studyResults(set: CurveSet, result: StudyResult, service: Service, u: ReturnType<typeof chartUnits>): HTMLElement {
  const best = result.ranked[0];
  const code = serviceCaution(service);
  const showSpeed = set.family === 'speed' || result.ranked.some((r) => r.control === 'speed');
  return h('div', { class: 'duty-results study-results' },
    h('p', { class: best && !isFailing(best) ? 'summary' : 'summary bad' }, result.why),
    h('table', { class: 'figures study-table' },
      h('caption', { class: 'visually-hidden' }, 'Options ranked by life-cycle cost'),
      h('thead', null, h('tr', null,
        ['#', 'Option', ...(showSpeed ? ['Speed [rpm]'] : []), `Flow [${unitText(u.flow.label)}]`, `Head [${u.head.label}]`, 'Eff. [%]', `Power [${u.power.label}]`, 'Motor', `NPSHa [${u.npsh.label}]`, `NPSH3 [${u.npsh.label}]`, 'Margin ratio', 'Run-out ratio', `Eye at most [${u.npsh.label}] above the lowest level`, 'Energy [kWh/year]', 'Life-cycle cost', 'Result'].map((c) => h('th', { scope: 'col' }, c)))),
      h('tbody', null, result.ranked.map((r, i) => {
        const duty = r.npsh?.duty;
        const run = r.npsh?.run_out;
        const failing = isFailing(r);
        return h('tr', { 'data-key': r.name, class: failing ? 'fail' : '' },
          h('td', null, String(i + 1)),
          h('th', { scope: 'row' }, r.name),
          showSpeed ? h('td', { class: 'speed' }, num(r.control === 'speed' ? r.speed_rpm : r.rated_speed_rpm, 4)) : null,
          h('td', null, numIn(r.duty?.flow_m3s, u.flow)),
          h('td', null, numIn(r.duty?.head_m, u.head)),
          h('td', null, numPercent(r.duty?.efficiency)),
          h('td', null, numIn(r.duty?.power_W, u.power)),
          h('td', { class: 'motor' }, r.motor?.selection.rating?.label ?? NOT_AVAILABLE.text),
          h('td', { class: 'npsha' }, numIn(duty?.npsha_m, u.npsh, 3)),
          h('td', { class: 'npsh3' }, numIn(duty?.npsh3_m, u.npsh, 3)),
          h('td', { class: `margin${duty && duty.judgement.verdict !== 'meets-guidance' ? ' warn' : ''}` }, num(duty?.judgement.ratio, 3)),
          h('td', { class: `runout${run && run.judgement.verdict !== 'meets-guidance' ? ' warn' : ''}` }, num(run?.judgement.ratio, 3)),
          h('td', { class: 'eye' }, numIn(r.npsh?.max_eye_elevation_m, u.npsh, 3)),
          h('td', null, num(r.energy?.kWh, 4)),
          h('td', null, num(r.lcc?.total, 4)),
          h('td', null, failing ? 'fails' : 'passes'));
      }))),
    result.ranked.map((r) => speedSentence(set, r)).filter((t): t is string => t !== null).map((t) => h('p', { class: 'speed-result' }, t)),
    h('ul', { class: 'study-findings' }, result.ranked.flatMap((r) => r.findings.filter((x) => x.severity !== 'note').map((x) => h('li', { class: x.severity }, `${r.name}: ${x.message}`)))),
    h('p', { class: 'caution', role: 'note' }, `NPSH: ${NPSH_CAUTION}`),
    h('p', { class: 'caution', role: 'note' }, `Motor: ${MOTOR_CAUTION}`),
    code ? h('p', { class: 'caution', role: 'note' }, code) : null,
    h('p', { class: 'caution', role: 'note' }, PRELIMINARY),
    // On a speed family no impeller is trimmed: the note on NPSH3 is the speed family's rule.
    result.notes.map((n) => h('p', { class: 'hint' }, set.family === 'speed' && n === NPSH3_TRIM_RULE ? NPSH3_SPEED_RULE : n)));
}
