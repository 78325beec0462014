/**
 * The duty view of the review: a duty point (and optionally the suction site) typed in the
 * chosen unit system, checked with the same duty check the command line runs. The family
 * chart then shows the system curve and the operating point of each diameter, and the
 * NPSH margin, motor and cautions are listed beside it.
 */
import { h } from '../dom/h.ts';
import { dutyCheck, type DutyCheckInput, type DutyCheckReport } from '../../duty/dutyCheck.ts';
import { systemHead } from '../../duty/systemCurve.ts';
import { SERVICES, type Service } from '../../duty/cautions.ts';
import type { CurveSet } from '../../model/curveset.ts';
import { CELSIUS_ZERO, fromSI, toSI, type Unit } from '../../units/index.ts';
import { linspace } from '../../fit/polynomial.ts';
import { chartUnits, type DutyOverlay } from './familyChart.ts';
import { num, unitText } from './words.ts';

/** What the engineer typed, as typed (numbers in the review's unit system). */
export interface DutyForm {
  flow: string;
  head: string;
  staticHead: string;
  service: Service;
  /** Suction site: all blank means no NPSH check. */
  temperatureC: string;
  elevation: string;
  suctionStatic: string;
  suctionLoss: string;
}

export const EMPTY_DUTY: DutyForm = { flow: '', head: '', staticHead: '', service: 'general', temperatureC: '', elevation: '', suctionStatic: '', suctionLoss: '' };

export type DutyOutcome = { report: DutyCheckReport; overlay: DutyOverlay } | { error: string } | null;

const SERVICE_WORDS: Record<Service, string> = { general: 'general service', fire: 'fire protection', potable: 'potable water', hazardous: 'hazardous liquid' };

function number(text: string): number | undefined {
  const t = text.trim().replace(',', '.');
  if (t === '') return undefined;
  const v = Number(t);
  if (!Number.isFinite(v)) throw new Error(`"${text}" is not a number.`);
  return v;
}

/** Runs the duty check for the form, or says what is missing or wrong. */
export function runDuty(set: CurveSet, form: DutyForm, system: 'si' | 'us'): DutyOutcome {
  const u = chartUnits(system);
  try {
    const flow = number(form.flow);
    const head = number(form.head);
    if (flow === undefined || head === undefined) return null;
    const input: DutyCheckInput = { flow_m3s: toSI(flow, u.flow), head_m: toSI(head, u.head), service: form.service };
    const stat = number(form.staticHead);
    if (stat !== undefined) input.static_head_m = toSI(stat, u.head);
    const temperature = number(form.temperatureC);
    const suctionStatic = number(form.suctionStatic);
    if (temperature !== undefined && suctionStatic !== undefined) {
      const elevation = number(form.elevation);
      input.site = {
        temperature_K: temperature + CELSIUS_ZERO,
        suction_static_m: toSI(suctionStatic, u.head),
        suction_loss_m: toSI(number(form.suctionLoss) ?? 0, u.head),
        ...(elevation !== undefined ? { elevation_m: toSI(elevation, u.head) } : {}),
      };
    }
    const report = dutyCheck(set, input);
    const qMax = Math.max(input.flow_m3s * 1.3, ...set.members.map((m) => m.curves.head?.fit?.domain[1] ?? 0));
    const overlay: DutyOverlay = {
      system: linspace(0, qMax, 40).map((q) => [q, systemHead(report.system, q)] as [number, number]),
      points: report.operating_points.flatMap((op) => (op.result.status === 'ok' ? [{ label: op.label, flow: op.result.point.flow_m3s, head: op.result.point.head_m }] : [])),
    };
    return { report, overlay };
  } catch (error) {
    return { error: (error as Error).message };
  }
}

function input(id: string, label: string, value: string, unit: string, onchange: (v: string) => void): HTMLElement {
  return h('div', { class: 'field' },
    h('label', { for: id }, label),
    h('input', { id, type: 'text', inputmode: 'decimal', value, onchange: (e: Event) => onchange((e.target as HTMLInputElement).value) }),
    h('span', { class: 'unit' }, unit));
}

function figure(v: number | undefined, unit: Unit, digits = 4): string {
  return v === undefined ? '—' : `${num(fromSI(v, unit), digits)} ${unitText(unit.label || unit.token)}`;
}

export function dutyPanel(form: DutyForm, outcome: DutyOutcome, system: 'si' | 'us', change: (patch: Partial<DutyForm>) => void): HTMLElement {
  const u = chartUnits(system);
  const flowUnit = unitText(u.flow.label);
  const report = outcome && 'report' in outcome ? outcome.report : null;
  return h('section', { class: 'duty', 'aria-labelledby': 'duty-title' },
    h('h4', { id: 'duty-title' }, 'Duty check'),
    h('p', { class: 'hint' }, 'Type a duty point to see the system curve and where each diameter runs on it. Add the suction site to judge the NPSH margin.'),
    input('duty-flow', 'Duty flow', form.flow, flowUnit, (v) => change({ flow: v })),
    input('duty-head', 'Duty head', form.head, u.head.label, (v) => change({ head: v })),
    input('duty-static', 'Static head', form.staticHead, u.head.label, (v) => change({ staticHead: v })),
    h('div', { class: 'field' },
      h('label', { for: 'duty-service' }, 'Service'),
      h('select', { id: 'duty-service', onchange: (e: Event) => change({ service: (e.target as HTMLSelectElement).value as Service }) },
        SERVICES.map((s) => h('option', { value: s, selected: s === form.service }, SERVICE_WORDS[s])))),
    h('fieldset', { class: 'site' },
      h('legend', null, 'Suction site (for the NPSH margin)'),
      input('duty-temperature', 'Liquid temperature', form.temperatureC, '°C', (v) => change({ temperatureC: v })),
      input('duty-elevation', 'Site elevation', form.elevation, u.head.label, (v) => change({ elevation: v })),
      input('duty-suction-static', 'Suction static head', form.suctionStatic, `${u.head.label} (liquid surface above the impeller eye; negative for a lift)`, (v) => change({ suctionStatic: v })),
      input('duty-suction-loss', 'Suction loss at the duty', form.suctionLoss, u.head.label, (v) => change({ suctionLoss: v }))),
    outcome && 'error' in outcome ? h('p', { class: 'cal bad', role: 'alert' }, outcome.error) : null,
    report ? dutyResults(report, u) : null);
}

function dutyResults(report: DutyCheckReport, u: ReturnType<typeof chartUnits>): HTMLElement {
  const npshAt = new Map((report.npsh?.points ?? []).map((p) => [p.where, p]));
  return h('div', { class: 'duty-results' },
    h('p', { class: report.trim.status === 'meets' ? 'summary' : 'summary bad' }, report.trim.message),
    h('table', { class: 'figures' },
      h('caption', { class: 'visually-hidden' }, 'Operating point of each diameter on the system curve'),
      h('thead', null, h('tr', null,
        h('th', { scope: 'col' }, 'Diameter'),
        h('th', { scope: 'col' }, `Flow [${unitText(u.flow.label)}]`),
        h('th', { scope: 'col' }, `Head [${u.head.label}]`),
        h('th', { scope: 'col' }, 'Eff. [%]'),
        h('th', { scope: 'col' }, `Power [${u.power.label}]`),
        h('th', { scope: 'col' }, `NPSH margin`))),
      h('tbody', null, report.operating_points.map((op) => {
        if (op.result.status !== 'ok') return h('tr', null, h('th', { scope: 'row' }, op.label), h('td', { colspan: '5' }, op.result.message));
        const p = op.result.point;
        const npsh = [...npshAt.entries()].find(([where]) => where.endsWith(op.label) || where.includes(op.label))?.[1];
        const j = npsh?.judgement;
        return h('tr', { 'data-key': op.label, class: p.extrapolated.length ? 'extrapolated' : '' },
          h('th', { scope: 'row' }, op.label),
          h('td', null, num(fromSI(p.flow_m3s, u.flow))),
          h('td', null, num(fromSI(p.head_m, u.head))),
          h('td', null, p.efficiency !== undefined ? num(p.efficiency * 100, 3) : '—'),
          h('td', null, p.power_W !== undefined ? num(fromSI(p.power_W, u.power)) : '—'),
          h('td', { class: j && j.verdict !== 'meets-guidance' ? 'warn' : '' }, j ? `${figure(j.margin_m, u.npsh, 3)} (×${num(j.ratio, 3)})` : '—'));
      }))),
    report.operating_points.some((op) => op.result.status === 'ok' && op.result.point.extrapolated.length) ? h('p', { class: 'caution' }, 'Rows in italics read a curve beyond its captured range (extrapolated): treat them as rough.') : null,
    report.problems.length ? h('ul', { class: 'problems' }, report.problems.map((p) => h('li', null, p))) : null,
    report.warnings.length ? h('ul', { class: 'warnings' }, report.warnings.map((w) => h('li', null, w))) : null,
    report.motor ? h('p', null, `Motor: ${report.motor.selection.notes[0] ?? ''}`) : null,
    [...report.cautions, ...(report.npsh ? [report.npsh.caution] : []), ...(report.motor ? [report.motor.caution] : [])].map((c) => h('p', { class: 'caution', role: 'note' }, c)));
}
