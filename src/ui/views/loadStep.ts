/** Step 1: open a sheet (or a take-off file with its sheet), pick the page, name the pump. */
import { h } from '../dom/h.ts';
import type { Bench } from '../app/bench.ts';
import { setPump } from '../store/actions/setup.ts';
import { typedNumber } from '../store/actions/action.ts';

const ACCEPT = '.pdf,.png,.jpg,.jpeg,.json,application/pdf,image/png,image/jpeg,application/json';

export function loadStep(bench: Bench): HTMLElement {
  const { store, sheet } = bench;
  const { draft } = store;
  const input = h('input', {
    type: 'file',
    id: 'sheet-file',
    accept: ACCEPT,
    multiple: true,
    class: 'visually-hidden',
    onchange: (e: Event) => {
      const el = e.target as HTMLInputElement;
      if (el.files?.length) bench.openFiles([...el.files]);
      el.value = '';
    },
  });
  const pages = sheet && sheet.pages.length > 1
    ? h('fieldset', { class: 'pages', 'data-key': 'pages' },
        h('legend', null, `Pick the page (${sheet.pages.length} pages)`),
        h('div', { class: 'thumbs' },
          sheet.pages.map((_, i) => {
            const n = i + 1;
            const chosen = draft.sheet?.page === n;
            const src = sheet.thumbnails.get(n);
            return h('button', { type: 'button', class: `thumb${chosen ? ' chosen' : ''}`, 'aria-pressed': chosen ? 'true' : 'false', 'data-key': `page-${n}`, onclick: () => bench.choosePage(n) },
              src ? h('img', { src, alt: '' }) : h('span', { class: 'thumb-blank' }, '…'),
              h('span', null, `Page ${n}`));
          })))
    : null;
  const sheetLine = draft.sheet
    ? h('p', { class: 'sheet-line' }, h('strong', null, draft.sheet.name), ` — page ${draft.sheet.page} of ${draft.sheet.pageCount}`, sheet?.loadedKind ? `, ${kindWords(sheet.loadedKind, sheet.texts)}` : '')
    : null;
  return h('div', { class: 'step-body' },
    h('p', { class: 'hint' }, 'Open a performance sheet: a PDF, PNG or JPEG. To resume, open a take-off file together with its sheet.'),
    h('div', { class: 'drop', id: 'drop-zone' },
      input,
      h('label', { for: 'sheet-file', class: 'button primary' }, 'Open a sheet…'),
      h('span', { class: 'hint' }, 'or drop the file anywhere on the window')),
    sheetLine,
    pages,
    h('fieldset', { class: 'pump' },
      h('legend', null, 'Pump'),
      field('Name', h('input', { id: 'pump-name', type: 'text', value: draft.pump.name, placeholder: 'e.g. invented end-suction 4-stage', onchange: (e: Event) => store.dispatch(setPump({ name: (e.target as HTMLInputElement).value })) })),
      field('Specific gravity', h('input', { id: 'pump-sg', type: 'number', min: '0.1', step: 'any', value: String(draft.pump.specific_gravity), onchange: (e: Event) => store.dispatch(typedNumber((e.target as HTMLInputElement).value, 'Specific gravity', (v) => setPump({ specific_gravity: v }), { sign: 'positive' })) }), 'of the liquid the sheet is drawn for')),
  );
}

function kindWords(kind: string, texts: number): string {
  if (kind === 'vector-pdf') return `drawn as vectors (exact capture; ${texts} text items)`;
  if (kind === 'raster-pdf') return 'a scan inside a PDF (lines are followed on the picture)';
  return 'a picture (lines are followed on the pixels)';
}

export function field(labelText: string, control: HTMLElement, unit?: string): HTMLElement {
  const id = control.id;
  return h('div', { class: 'field' },
    h('label', { for: id }, labelText),
    control,
    unit ? h('span', { class: 'unit' }, unit) : null);
}
