/**
 * The automatic take-off in step 2: the "Find panels and curves" button of a page (vector or scan), and
 * the detector's questions, one at a time, each with the one field that answers it. A part the
 * detector found carries a small "found" tag with its confidence in the lists (`originTag`).
 */
import { h } from '../dom/h.ts';
import type { Bench } from '../app/bench.ts';
import { provenance } from '../store/actions/detected.ts';
import type { PartOrigin } from '../../model/takeoff.ts';
import { num } from './words.ts';

/**
 * A question that lists several parts ("Some curves need you: (1) … (2) …") split into its lead
 * and its numbered items, so the box shows a list instead of a wall of text. Only markers
 * numbered 1, 2, 3 … in order count; any other text comes back whole as the lead.
 */
export function questionParts(text: string): { lead: string; items: string[] } {
  const items: string[] = [];
  let rest = text;
  const first = rest.indexOf('(1) ');
  if (first < 0) return { lead: text, items };
  const lead = rest.slice(0, first).trim();
  rest = rest.slice(first + 4);
  for (let n = 2; ; n++) {
    const at = rest.indexOf(` (${n}) `);
    if (at < 0) break;
    items.push(rest.slice(0, at).trim());
    rest = rest.slice(at + ` (${n}) `.length);
  }
  items.push(rest.trim());
  return items.length > 1 ? { lead, items } : { lead: text, items: [] };
}

/** The question's text: one paragraph, or its lead and a numbered list. */
function questionText(text: string): HTMLElement {
  const { lead, items } = questionParts(text);
  if (items.length === 0) return h('p', { class: 'question-text', id: 'detect-question-text' }, text);
  return h('div', { class: 'question-text', id: 'detect-question-text' }, h('p', null, lead), h('ol', null, ...items.map((k) => h('li', null, k))));
}

export function detectBox(bench: Bench): HTMLElement | null {
  const { store } = bench;
  const d = bench.detect;
  if (!d.available && !store.draft.detected) return null;
  const count = provenance(store.draft);
  const q = d.question;
  return h('section', { class: 'card detect-box', 'aria-label': 'Find panels and curves', 'data-key': 'detect-box' },
    h('div', { class: 'buttons' },
      h('button', { type: 'button', id: 'detect-run', class: store.draft.detected ? '' : 'primary', disabled: !d.available || d.running, onclick: () => bench.findPanelsAndCurves() },
        d.running ? 'Finding panels and curves…' : store.draft.detected ? 'Find panels and curves again' : 'Find panels and curves')),
    h('p', { class: 'hint' }, store.draft.detected && count.found === 0 && q
      ? 'Nothing could be named yet: the answer below lets the sheet be read again.'
      : store.draft.detected
      ? `${count.found} part${count.found === 1 ? '' : 's'} found, ${count.set} set by you. A found part you edit becomes yours and is kept when the sheet is read again.`
      : 'Reads the frames, tick labels, drawn curves and their labels from the page; you check and correct what it found.'),
    q && q.kind === 'none' ? h('div', { class: 'detect-question', role: 'group', 'aria-label': 'Question of the automatic take-off' },
      questionText(q.count > 1 ? `Question ${q.index + 1} of ${q.count}: ${q.text}` : q.text),
      h('p', { class: 'hint' }, 'Nothing typed here answers this: do it on the sheet with the usual tools, or save what was found.'),
      q.index + 1 < q.count ? h('div', { class: 'buttons' }, h('button', { type: 'button', id: 'detect-skip', onclick: () => bench.skipQuestion() }, 'Next question')) : null)
    : q ? h('form', {
      class: 'detect-question', role: 'group', 'aria-label': 'Question of the automatic take-off',
      onsubmit: (e: Event) => {
        e.preventDefault();
        const input = (e.target as HTMLFormElement).querySelector('input');
        if (input) bench.answerQuestion(input.value);
      },
    },
      questionText(q.count > 1 ? `Question ${q.index + 1} of ${q.count}: ${q.text}` : q.text),
      h('label', { for: 'detect-answer' }, q.field),
      h('input', { id: 'detect-answer', type: 'text', inputmode: 'decimal', autocomplete: 'off', 'aria-describedby': 'detect-question-text', disabled: d.running }),
      h('div', { class: 'buttons' },
        h('button', { type: 'submit', id: 'detect-answer-go', disabled: d.running }, 'Answer and read again'),
        q.index + 1 < q.count ? h('button', { type: 'button', id: 'detect-skip', onclick: () => bench.skipQuestion() }, 'Next question') : null))
      : null);
}

/** The tag of a found part: "found 92 %"; nothing for a part the engineer set. */
export function originTag(part: { origin?: PartOrigin; confidence?: number }): HTMLElement | null {
  if (part.origin !== 'detected') return null;
  const sure = part.confidence === undefined ? '' : ` ${num(part.confidence * 100, 2)} %`;
  return h('span', { class: 'origin-tag', title: 'Found by “Find panels and curves”; edit it to make it yours' }, `found${sure}`);
}
