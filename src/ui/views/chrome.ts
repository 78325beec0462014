/** The frame around the sheet: the top bar, the list of steps and the status line. */
import { h } from '../dom/h.ts';
import type { Bench } from '../app/bench.ts';
import type { StepDefinition } from '../steps/step.ts';
import type { Step } from '../steps/registry.ts';
import type { Draft } from '../store/draft.ts';
import { unitSystemOf } from '../store/store.ts';
import type { UnitChoice } from '../../units/index.ts';

export function topBar(bench: Bench, autosaved: string, keysOpen: boolean, toggleKeys: () => void): HTMLElement {
  const { store } = bench;
  const h0 = store.history;
  const undoLabel = h0.labels[h0.labels.length - 1];
  const redoLabel = h0.futureLabels[0];
  return h('header', { class: 'topbar' },
    h('div', { class: 'brand' }, h('span', { class: 'wordmark' }, 'Pumpscribe'), h('span', { class: 'subtitle' }, 'take-off workbench')),
    h('div', { class: 'sheet-name' }, store.draft.sheet ? `${store.draft.sheet.name} · page ${store.draft.sheet.page}` : 'No sheet loaded'),
    h('div', { class: 'tools' },
      h('button', { type: 'button', id: 'undo', disabled: !undoLabel, title: undoLabel ? `Undo ${undoLabel} (Ctrl+Z)` : 'Nothing to undo', 'aria-label': undoLabel ? `Undo ${undoLabel}` : 'Undo', onclick: () => store.undo() }, '↶ Undo'),
      h('button', { type: 'button', id: 'redo', disabled: !redoLabel, title: redoLabel ? `Redo ${redoLabel} (Ctrl+Shift+Z)` : 'Nothing to redo', 'aria-label': redoLabel ? `Redo ${redoLabel}` : 'Redo', onclick: () => store.redo() }, 'Redo ↷'),
      h('span', { class: 'units-label', id: 'units-shown' }, 'Review in'),
      h('div', { class: 'segmented small', role: 'group', 'aria-labelledby': 'units-shown' },
        unitChoices(store.draft, store.session.unitSystem).map((s) => h('button', { type: 'button', 'data-key': `shown-${s}`, 'aria-pressed': store.session.unitSystem === s ? 'true' : 'false', title: s === 'own' ? 'the units the sheet is drawn in' : undefined, onclick: () => store.setSession({ unitSystem: s }) }, s === 'own' ? 'Sheet' : s.toUpperCase()))),
      h('span', { class: 'autosaved', role: 'status' }, autosaved),
      h('button', { type: 'button', id: 'keys', 'aria-expanded': keysOpen ? 'true' : 'false', 'aria-controls': 'keys-help', onclick: toggleKeys }, 'Keys'),
      h('a', { href: '#/library', class: 'nav' }, 'Library')));
}

/** The unit choices offered: the sheet's own units when they are no preset's (an L/s sheet), then SI and US. */
function unitChoices(draft: Draft, shown: UnitChoice): UnitChoice[] {
  return unitSystemOf(draft) === 'own' || shown === 'own' ? ['own', 'si', 'us'] : ['si', 'us'];
}

/** The list of steps: each one's number, title and summary; the open one with its panel. */
export function stepList(bench: Bench, steps: readonly StepDefinition<Step>[]): HTMLElement {
  const current = bench.store.session.step;
  return h('nav', { class: 'steps', 'aria-label': 'Steps of the take-off' },
    h('ol', null, steps.map((step, i) => {
      const open = step.id === current;
      return h('li', { class: `step${open ? ' open' : ''}`, 'data-key': `step-${step.id}` },
        h('button', { type: 'button', class: 'step-head', id: `step-${step.id}`, 'aria-expanded': open ? 'true' : 'false', 'aria-controls': `step-${step.id}-body`, onclick: () => bench.goto(step.id) },
          h('span', { class: 'step-number' }, String(i + 1)),
          h('span', { class: 'step-title' }, step.title),
          h('span', { class: 'step-summary' }, step.summary(bench))),
        open ? h('div', { id: `step-${step.id}-body`, role: 'region', 'aria-labelledby': `step-${step.id}` }, step.body(bench)) : null);
    })));
}

export function statusLine(bench: Bench): HTMLElement {
  const { session } = bench.store;
  const m = session.message;
  return h('footer', { class: 'statusline' },
    h('div', { class: 'next', id: 'next-click', 'aria-live': 'polite' }, h('span', { class: 'label' }, 'Next click: '), bench.nextClick()),
    h('div', { class: `message ${m?.tone ?? ''}`, id: 'message', role: m?.tone === 'error' ? 'alert' : 'status', title: m?.text ?? '' }, m?.text ?? ''),
    session.progress
      ? h('div', { class: 'progress', role: 'progressbar', 'aria-label': session.progress.label, ...(session.progress.fraction !== null ? { 'aria-valuenow': String(Math.round(session.progress.fraction * 100)), 'aria-valuemin': '0', 'aria-valuemax': '100' } : {}) },
          h('span', null, session.progress.label), h('span', { class: `bar${session.progress.fraction === null ? ' indeterminate' : ''}`, style: { width: session.progress.fraction === null ? '' : `${Math.round(session.progress.fraction * 100)}%` } }))
      : null,
    h('div', { class: 'readout', id: 'readout' }, bench.readout),
    h('div', { class: 'zoom', role: 'group', 'aria-label': 'Zoom' },
      h('button', { type: 'button', 'aria-label': 'Zoom out (−)', onclick: () => bench.zoom('out') }, '−'),
      h('button', { type: 'button', 'aria-label': 'Fit the page (0)', onclick: () => bench.zoom('fit') }, `${bench.zoomPercent} %`),
      h('button', { type: 'button', 'aria-label': 'Zoom in (+)', onclick: () => bench.zoom('in') }, '+')));
}

/** The list of keyboard shortcuts, shown from the top bar. */
export function keysHelp(shortcuts: readonly (readonly [string, string])[], close: () => void): HTMLElement {
  return h('div', { class: 'keys-help', id: 'keys-help', role: 'dialog', 'aria-label': 'Keyboard shortcuts' },
    h('h3', null, 'Keyboard shortcuts'),
    h('dl', null, shortcuts.map(([k, what]) => [h('dt', null, h('kbd', null, k)), h('dd', null, what)])),
    h('button', { type: 'button', onclick: close }, 'Close'));
}

/** What the empty sheet area says before a sheet is loaded. */
export function emptyStage(): HTMLElement {
  return h('div', { class: 'empty-stage' },
    h('p', { class: 'big' }, 'Drop a performance sheet here'),
    h('p', null, 'PDF, PNG or JPEG — or a take-off file together with its sheet, to resume.'),
    h('button', { type: 'button', class: 'primary', onclick: () => document.getElementById('sheet-file')?.click() }, 'Open a sheet…'));
}
