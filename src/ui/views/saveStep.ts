/** Step 5: download the take-off file, the curve set and the CSV table; save to the library. */
import { h } from '../dom/h.ts';
import type { Bench } from '../app/bench.ts';
import { chartUnits } from './familyChart.ts';
import { choiceWords, speedNotGiven } from './words.ts';

export function saveStep(bench: Bench): HTMLElement {
  const { derived, store } = bench;
  const library = store.session.library;
  const entry = store.doc.library;
  const set = derived.curveSet;
  const ready = set !== null;
  const hasTakeoff = derived.takeoff !== null;
  return h('div', { class: 'step-body' },
    h('p', { class: 'hint' }, 'The take-off file keeps the anchors, guides and points, so the work can be resumed, checked and replayed. Keep it next to its sheet.'),
    store.draft.speedGiven ? null : h('p', { class: 'cal bad', id: 'speed-not-given', role: 'alert' }, speedNotGiven(store.draft.pump.speed_rpm)),
    h('div', { class: 'buttons' },
      h('button', { type: 'button', id: 'download-takeoff', class: 'primary', disabled: !hasTakeoff, onclick: () => bench.download('takeoff') }, 'Download the take-off file'),
      h('button', { type: 'button', id: 'download-curveset', disabled: !ready, onclick: () => bench.download('curveset') }, 'Download the curve set'),
      h('button', { type: 'button', id: 'download-csv', disabled: !ready, onclick: () => bench.download('csv') }, `Download the CSV table (${set ? choiceWords(store.session.unitSystem, chartUnits(set, store.session.unitSystem)) : 'its own units'})`),
      h('button', { type: 'button', id: 'save-library', disabled: !ready || library.state === 'saving', onclick: () => bench.saveToLibrary() }, library.state === 'saving' ? 'Saving to the library…' : entry ? `Save to the library (a new revision of ${entry.id})` : 'Save to the library'),
      library.offerNew ? h('button', { type: 'button', id: 'save-library-new', disabled: !ready, onclick: () => bench.saveToLibrary(true) }, 'Save as a new entry') : null),
    library.text ? h('p', { class: `library-state ${library.state}`, role: 'status' }, library.text) : null,
    !hasTakeoff ? h('p', { class: 'hint' }, derived.problem ?? 'Set the axes of a panel and trace a curve first.') : null,
    h('p', { class: 'hint' }, 'To resume later, open the take-off file together with its sheet in step 1. The work is also kept in this browser after every edit.'),
  );
}

