/**
 * Step 3: the kind of family and its diameters or speeds, what the next click traces, and the list of traces
 * with their state (points, residual) and their switches (hide, lock, re-trace, delete).
 */
import { h } from '../dom/h.ts';
import type { Bench } from '../app/bench.ts';
import type { Quantity } from '../../model/curveset.ts';
import { setPump } from '../store/actions/setup.ts';
import { typedNumber } from '../store/actions/action.ts';
import { isDecimalText, readDecimal } from '../../units/readNumber.ts';
import { discardEdits, removeTrace, setHidden, setLocked, setTraceSpec, traceName } from '../store/actions/traces.ts';
import { familyLabels, labelField, labelOf, powerUnit, pointsOf, type TraceDraft } from '../store/draft.ts';
import { afterRemoval, curveTarget, firstUntraced, panelFor, sharedCurves, sharedCurveSentence, targetFor, withLabel } from '../store/target.ts';
import { QUANTITY_INK } from '../canvas/overlay.ts';
import { QUANTITY_NAMES, num, unitText } from './words.ts';
import { familyKindFields, labelUnit, speedText } from './familyKind.ts';
import { field } from './loadStep.ts';
import { originTag } from './detectBox.ts';

const ORDER: Quantity[] = ['head', 'efficiency', 'power', 'npshr'];

export function traceStep(bench: Bench): HTMLElement {
  const { store } = bench;
  const { draft, session } = store;
  const target = session.target;
  const quantityButtons = h('div', { class: 'segmented', role: 'group', 'aria-label': 'Quantity to trace next' },
    ORDER.map((q) => h('button', {
      type: 'button',
      'data-key': `q-${q}`,
      'aria-pressed': target.quantity === q ? 'true' : 'false',
      style: { borderBottomColor: QUANTITY_INK[q] },
      disabled: !panelFor(draft, targetFor(draft, q)),
      onclick: () => store.setSession({ target: targetFor(draft, q) }),
    }, QUANTITY_NAMES[q])));

  const linesChoice = target.quantity === 'efficiency' || target.quantity === 'power'
    ? h('div', { class: 'segmented small', role: 'group', 'aria-label': 'How the quantity is drawn' },
        h('button', { type: 'button', 'aria-pressed': target.lines === 'curve' ? 'true' : 'false', onclick: () => store.setSession({ target: curveTarget(draft, target.quantity, firstUntraced(draft, target.quantity)) }) }, draft.family === 'speed' ? 'one curve per speed' : 'one curve per diameter'),
        h('button', { type: 'button', 'aria-pressed': target.lines === 'iso' ? 'true' : 'false', onclick: () => store.setSession({ target: { quantity: target.quantity, lines: 'iso' } }) }, 'lines of constant value'))
    : null;

  const which = target.lines === 'iso'
    ? field(`Value of the line`, h('input', {
        id: 'iso-value',
        type: 'text',
        inputmode: 'decimal',
        value: target.iso === undefined ? '' : String(target.iso),
        placeholder: target.quantity === 'efficiency' ? 'e.g. 70' : 'e.g. 15',
        onchange: (e: Event) => {
          const text = (e.target as HTMLInputElement).value.trim();
          const v = isDecimalText(text) ? readDecimal(text, 'The value of the line') : undefined;
          if (v === undefined) {
            store.setSession({ target: { quantity: target.quantity, lines: 'iso' } });
            if (text !== '') store.say(`"${text}" is not a decimal number; type the value written on the line, e.g. 70 or 72.5.`, 'error');
          } else store.setSession({ target: { ...target, iso: v } });
        },
      }), target.quantity === 'efficiency' ? '%' : unitText(powerUnit(draft.units)))
    : h('div', { class: 'chips', role: 'group', 'aria-label': draft.family === 'speed' ? 'Speed to trace next' : 'Diameter to trace next' },
        familyLabels(draft).length === 0 ? h('span', { class: 'hint' }, draft.family === 'speed' ? 'Type the speeds above first.' : 'Type the diameters above first.') : null,
        familyLabels(draft).map((d) => {
          const done = draft.traces.some((t) => t.quantity === target.quantity && t.iso === undefined && labelOf(t) === d);
          return h('button', { type: 'button', class: `chip${done ? ' done' : ''}`, 'data-key': `d-${d}`, 'aria-pressed': labelOf(target) === d ? 'true' : 'false', onclick: () => store.setSession({ target: withLabel(draft, target, d) }) },
            draft.family === 'speed' ? speedText(draft, d) : `${d} ${unitText(draft.units.diameter)}`, done ? h('span', { class: 'tick', 'aria-label': 'traced' }, ' ✓') : null);
        }));

  return h('div', { class: 'step-body' },
    h('div', { class: 'field' }, h('label', { for: 'pump-speed' }, 'Speed'),
      h('input', { id: 'pump-speed', type: 'number', min: '1', step: 'any', value: draft.speedGiven ? String(draft.pump.speed_rpm) : '', placeholder: draft.speedGiven ? '' : `${draft.pump.speed_rpm}, not yet given`, onchange: (e: Event) => store.dispatch(typedNumber((e.target as HTMLInputElement).value, 'The speed', (v) => setPump({ speed_rpm: v }), { sign: 'positive' })) }),
      h('span', { class: 'unit' }, 'rpm, as stated on the sheet')),
    ...familyKindFields(bench),
    h('fieldset', { class: 'next' },
      h('legend', null, 'Next click traces'),
      quantityButtons,
      linesChoice,
      which),
    h('p', { class: 'hint keys' },
      'Click on a line: it is traced at once, and the next curve is proposed. ',
      h('kbd', null, 'Shift'), '-click adds a guide to the selected trace; drag a guide to re-trace; drag a point to move it; ',
      h('kbd', null, 'Alt'), '-click on the selected trace inserts a point; ', h('kbd', null, 'Delete'), ' removes the selected point.'),
    traceList(bench),
  );
}

function traceList(bench: Bench): HTMLElement {
  const { store } = bench;
  const { draft, session } = store;
  const groups = ORDER.map((q) => ({ q, traces: draft.traces.filter((t) => t.quantity === q) })).filter((g) => g.traces.length);
  if (groups.length === 0) return h('p', { class: 'hint' }, 'No traces yet.');
  const shared = sharedCurves(draft);
  return h('div', { class: 'trace-list' },
    shared.map((g) => h('p', { class: 'shared-curve caution', role: 'note', 'data-key': `shared-${g.quantity}-${labelOf(g)}` }, sharedCurveSentence(g, unitText(draft.units.diameter)))),
    groups.map((g) =>
    h('section', { 'data-key': `group-${g.q}`, 'aria-label': `${QUANTITY_NAMES[g.q]} traces` },
      h('h4', null, h('span', { class: 'swatch', style: { background: QUANTITY_INK[g.q] } }), `${QUANTITY_NAMES[g.q]} (${g.traces.length})`),
      h('ul', null, g.traces.map((t) => traceRow(bench, t, session.selectedTrace === t.id))))));
}

function traceRow(bench: Bench, t: TraceDraft, selected: boolean): HTMLElement {
  const { store } = bench;
  const { draft } = store;
  const name = traceName(t, unitText(draft.units.diameter), unitText(powerUnit(draft.units)));
  const r = bench.derived.residuals.get(t.id);
  const count = pointsOf(t).length;
  return h('li', { class: `trace-row${selected ? ' selected' : ''}${t.hidden ? ' hidden-trace' : ''}${t.origin === 'detected' ? ' found' : ''}`, 'data-key': t.id },
    h('button', { type: 'button', class: 'link trace-name', onclick: () => { store.setSession({ selectedTrace: t.id, selectedPoint: null }); bench.showTrace(t.id); } }, name),
    originTag(t),
    h('span', { class: 'trace-meta' }, `${count} pts${t.edited ? ', edited' : ''}${r ? ` · ±${num(r.max, 2)} ${unitText(r.unit.token)}` : ''}`),
    h('span', { class: 'trace-actions' },
      t.iso === undefined && t.limit === undefined && familyLabels(draft).length > 1
        ? h('select', { class: 'relabel', 'aria-label': `${draft.family === 'speed' ? 'Speed' : 'Diameter'} of ${name}`, title: `The ${draft.family === 'speed' ? 'speed' : 'diameter'} this curve belongs to`, disabled: t.locked, onchange: (e: Event) => store.dispatch(setTraceSpec(t.id, labelField(draft, Number((e.target as HTMLSelectElement).value)))) },
            familyLabels(draft).map((d) => h('option', { value: String(d), selected: d === labelOf(t) }, `${d} ${labelUnit(draft)}`)))
        : null,
      h('button', { type: 'button', class: 'icon', 'aria-pressed': t.hidden ? 'true' : 'false', title: t.hidden ? 'Show this trace' : 'Hide this trace', 'aria-label': `${t.hidden ? 'Show' : 'Hide'} ${name}`, onclick: () => store.dispatch(setHidden(t.id, !t.hidden)) }, t.hidden ? 'show' : 'hide'),
      h('button', { type: 'button', class: 'icon', 'aria-pressed': t.locked ? 'true' : 'false', title: t.locked ? 'Unlock this trace' : 'Lock this trace against edits', 'aria-label': `${t.locked ? 'Unlock' : 'Lock'} ${name}`, onclick: () => store.dispatch(setLocked(t.id, !t.locked)) }, t.locked ? 'unlock' : 'lock'),
      h('button', { type: 'button', class: 'icon', title: 'Trace the line again from its guides', 'aria-label': `Re-trace ${name}`, disabled: t.locked || t.guides.length === 0, onclick: () => bench.retrace(t.id) }, 're-trace'),
      t.edited ? h('button', { type: 'button', class: 'icon', title: 'Drop the hand edits', 'aria-label': `Drop hand edits of ${name}`, disabled: t.locked, onclick: () => store.dispatch(discardEdits(t.id)) }, 'undo edits') : null,
      h('button', { type: 'button', class: 'icon danger', title: 'Delete this trace', 'aria-label': `Delete ${name}`, disabled: t.locked, onclick: () => {
        // The next click re-does the deleted curve, not the one proposed after it.
        if (!store.dispatch(removeTrace(t.id))) return;
        store.setSession(afterRemoval(store.session, t));
        store.say(`Deleted ${name}. The next click traces it again; choose another curve above to trace something else.`, 'info');
      } }, 'delete')));
}
