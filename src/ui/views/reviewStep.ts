/**
 * Step 4: findings in plain sentences, each linked to its trace; residuals per trace; the
 * figures of each diameter. The family chart itself sits beside the sheet.
 */
import { bepDoubted } from '../../fit/checks/plausibility.ts';
import { sharedCurves, sharedCurveSentence } from '../store/target.ts';
import { h } from '../dom/h.ts';
import type { Bench } from '../app/bench.ts';
import type { CurveSet, Finding } from '../../model/curveset.ts';
import { tracesOfMember, type TraceMembers } from '../app/review.ts';
import { showValue } from '../../units/index.ts';
import { traceName } from '../store/actions/traces.ts';
import { powerUnit, type Draft } from '../store/draft.ts';
import { chartUnits, memberName } from './familyChart.ts';
import { membersRatedFirst } from '../../duty/speed.ts';
import { dutyPanel } from './dutyPanel.ts';
import { recordButtons } from './recordDownload.ts';
import { num, numIn, numPercent, SAFETY_SENTENCE, unitText } from './words.ts';

const SEVERITY_WORDS = { fail: 'Fails', warn: 'Check', note: 'Note' } as const;

/**
 * The trace a finding is about: named outright, or the one of its quantity among the traces
 * the replay put into the finding's member (`traceMembers`; no diameters compared within a tolerance).
 */
export function traceOfFinding(draft: Draft, f: Finding, set: CurveSet, traceMembers: TraceMembers): string | null {
  if (f.subject.trace && draft.traces.some((t) => t.id === f.subject.trace)) return f.subject.trace;
  const d = f.subject.diameter_m;
  const bySpeed = d === undefined && f.subject.speed_rpm !== undefined ? draft.traces.filter((t) => t.speed === f.subject.speed_rpm) : [];
  if (bySpeed.length) return (bySpeed.find((t) => t.quantity === (f.subject.quantity ?? 'head')) ?? bySpeed[0])?.id ?? null;
  if (d === undefined) return null;
  // The finding names its member by the member's own diameter, copied as it is.
  const index = set.members.findIndex((m) => m.diameter_m === d);
  if (index < 0) return null;
  const linked = new Set(tracesOfMember(traceMembers, index));
  const sameMember = draft.traces.filter((t) => t.iso === undefined && linked.has(t.id));
  const quantity = f.subject.quantity ?? 'head';
  return (sameMember.find((t) => t.quantity === quantity) ?? sameMember.find((t) => t.quantity === 'head') ?? sameMember[0])?.id ?? null;
}

export function reviewStep(bench: Bench): HTMLElement {
  const { store, derived } = bench;
  const { draft, session } = store;
  const set = derived.curveSet;
  if (!set) {
    return h('div', { class: 'step-body' },
      h('p', { class: 'hint' }, derived.computing ? 'Fitting the curves…' : derived.problem ?? 'Trace some curves first.'));
  }
  const u = chartUnits(set, session.unitSystem);
  const findings = set.findings;
  const counts = { fail: findings.filter((f) => f.severity === 'fail').length, warn: findings.filter((f) => f.severity === 'warn').length };
  return h('div', { class: 'step-body' },
    h('p', { class: 'caution', role: 'note' }, h('strong', null, 'Caution: '), SAFETY_SENTENCE),
    sharedCurves(draft).map((g) => h('p', { class: 'caution shared-curve', role: 'note' }, sharedCurveSentence(g, unitText(draft.units.diameter)))),
    h('p', { class: 'summary' }, `${set.members.length} ${set.family === 'speed' ? 'speeds' : 'diameters'} · ${counts.fail} failing, ${counts.warn} to check, ${findings.length - counts.fail - counts.warn} notes.`),
    h('h4', null, 'Findings'),
    findings.length === 0 ? h('p', { class: 'hint' }, 'No findings: every check passed.') : h('ol', { class: 'findings' }, findings.map((f) => {
      const trace = traceOfFinding(draft, f, set, derived.traceMembers);
      const picked = trace !== null && session.highlightedTrace === trace;
      return h('li', { class: `finding ${f.severity}${picked ? ' picked' : ''}`, 'data-key': f.id },
        h('span', { class: 'severity' }, SEVERITY_WORDS[f.severity]),
        trace
          ? h('button', { type: 'button', class: 'link finding-text', 'aria-label': `${f.message} — show the trace on the sheet`, onclick: () => bench.showTrace(picked ? null : trace) }, f.message)
          : h('span', { class: 'finding-text' }, f.message));
    })),
    h('h4', null, 'Residuals per trace'),
    h('table', { class: 'residuals' },
      h('thead', null, h('tr', null, h('th', { scope: 'col' }, 'Trace'), h('th', { scope: 'col' }, 'RMS'), h('th', { scope: 'col' }, 'Largest'), h('th', { scope: 'col' }, 'Largest, % of span'))),
      h('tbody', null, draft.traces.map((t) => {
        const r = derived.residuals.get(t.id);
        const name = traceName(t, unitText(draft.units.diameter), unitText(powerUnit(draft.units)));
        return h('tr', { 'data-key': `r-${t.id}`, class: session.highlightedTrace === t.id ? 'picked' : '' },
          h('th', { scope: 'row' }, h('button', { type: 'button', class: 'link', title: r ? `${r.points} points compared with the fitted curve` : 'no fitted curve yet', onclick: () => bench.showTrace(t.id) }, name)),
          h('td', null, showValue(r?.rms, unitText(r?.unit.label || r?.unit.token || ''), 2).text),
          h('td', null, showValue(r?.max, unitText(r?.unit.label || r?.unit.token || ''), 2).text),
          h('td', { class: r && r.percentOfSpan > 1 ? 'warn' : '' }, showValue(r?.percentOfSpan, '%', 2).text));
      }))),
    h('h4', null, set.family === 'speed' ? 'Figures per speed' : 'Figures per diameter'),
    h('table', { class: 'figures' },
      h('thead', null, h('tr', null,
        h('th', { scope: 'col' }, set.family === 'speed' ? 'Speed (share of rated)' : `Diameter [${u.diameter.label}]`),
        h('th', { scope: 'col' }, `Shutoff head [${u.head.label}]`),
        h('th', { scope: 'col' }, `BEP flow [${unitText(u.flow.label)}]`),
        h('th', { scope: 'col' }, `BEP head [${u.head.label}]`),
        h('th', { scope: 'col' }, 'BEP efficiency [%]'))),
      h('tbody', null, membersRatedFirst(set).map((m) => {
        // A BEP the findings doubt (peak not captured, or past the head curve's end) is marked, as the text report does.
        const doubt = bepDoubted(set.findings, m) ? { class: 'warn', title: 'Not reliable: see the findings on this BEP' } : null;
        return h('tr', { 'data-key': `m-${set.family === 'speed' ? `${m.speed_rpm}rpm` : m.diameter_m}` },
          h('th', { scope: 'row' }, set.family === 'speed' || m.diameter_m === undefined ? memberName(set, m, u, true) : numIn(m.diameter_m, u.diameter)),
          h('td', null, numIn(m.derived.shutoff_head_m, u.head)),
          h('td', doubt, numIn(m.derived.bep?.flow_m3s, u.flow)),
          h('td', doubt, numIn(m.derived.bep?.head_m, u.head)),
          h('td', doubt, numPercent(m.derived.bep?.efficiency)));
      }))),
    dutyPanel(set, bench.duty.form, bench.duty.outcome, session.unitSystem, (patch) => bench.setDuty(patch)),
    recordButtons(bench),
    derived.omitted.length ? h('div', { class: 'omitted' }, h('h4', null, 'Left out for now'), h('ul', null, derived.omitted.map((o) => h('li', null, o)))) : null,
  );
}
