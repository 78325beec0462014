/**
 * Entry of the browser app. "#/library" and "#/compare" show the library screens; anything
 * else is the take-off workbench. On start the workbench offers to restore the kept document
 * this tab had (or the most recent one no other tab has open).
 */
import './styles.css';
import { h } from './dom/h.ts';
import { Workbench } from './app/workbench.ts';
import type { SavedDocument } from './persist/records.ts';

const root = document.getElementById('app') as HTMLElement;
const benchRoot = h('div', { class: 'bench-root' });
const libraryRoot = h('div', { class: 'library-root', hidden: true });
root.replaceChildren(benchRoot, libraryRoot);
let bench: Workbench | null = null;

/** One line naming a kept take-off: its sheet, pump and when it was kept. */
function describeKept(saved: SavedDocument): string {
  const when = new Date(saved.savedAt);
  return `${saved.draft.sheet?.name ?? 'a sheet'} (${saved.draft.pump.name || 'unnamed pump'}), ${when.toLocaleDateString()} ${when.toLocaleTimeString()}`;
}

function restoreBanner(wb: Workbench, saved: SavedDocument, others: readonly SavedDocument[]): HTMLElement {
  const when = new Date(saved.savedAt);
  const points = saved.draft.traces.reduce((s, t) => s + (t.points ?? t.captured ?? []).length, 0);
  const banner = h('div', { class: 'restore', 'data-document': saved.id, role: 'dialog', 'aria-modal': 'false', 'aria-labelledby': 'restore-title' },
    h('p', { id: 'restore-title' }, h('strong', null, 'Unfinished take-off found. '),
      `${saved.draft.sheet?.name ?? 'A sheet'}: ${saved.draft.panels.length} panels, ${saved.draft.traces.length} traces, ${points} points — kept in this browser on ${when.toLocaleDateString()} at ${when.toLocaleTimeString()}.`),
    h('div', { class: 'buttons' },
      h('button', { type: 'button', class: 'primary', id: 'restore-yes', onclick: () => { banner.remove(); void wb.flow.restore(saved); } }, 'Restore it'),
      h('button', { type: 'button', id: 'restore-no', onclick: () => { banner.remove(); wb.autosave.release(); wb.store.say('Starting afresh. The unfinished take-off stays kept in this browser; reload to be offered it again.', 'info'); } }, 'Start afresh')),
    // The other take-offs kept in this browser that no tab has open, to go back to one of them.
    others.length
      ? h('details', { class: 'kept-others' },
          h('summary', null, `${others.length} other take-off${others.length === 1 ? '' : 's'} kept in this browser`),
          h('ul', null, others.map((o) => h('li', null,
            h('button', { type: 'button', class: 'link', 'data-document': o.id, onclick: () => { banner.remove(); void wb.flow.restore(o); } }, `Restore ${describeKept(o)}`)))))
      : null);
  return banner;
}

async function showWorkbench(): Promise<void> {
  if (bench) return;
  bench = new Workbench(benchRoot);
  const saved = await bench.flow.offerRestore();
  if (saved) {
    const wb = bench;
    const others = await wb.flow.otherKept(saved.id);
    const banner = restoreBanner(wb, saved, others);
    document.body.append(banner);
    (banner.querySelector('#restore-yes') as HTMLButtonElement | null)?.focus();
    // Opening another sheet answers the question: the offer goes away.
    const stop = wb.store.subscribe(() => {
      if (wb.store.draft.sheet && banner.isConnected && !wb.flow.restoring) {
        banner.remove();
        stop();
      }
    });
  }
}

async function route(): Promise<void> {
  const hash = location.hash;
  const library = hash.startsWith('#/library') || hash.startsWith('#/compare');
  benchRoot.hidden = library;
  libraryRoot.hidden = !library;
  if (library) {
    const { showLibrary } = await import('./pages/library.ts');
    showLibrary(libraryRoot, hash, bench);
    return;
  }
  await showWorkbench();
}

window.addEventListener('hashchange', () => void route());
void route();

// For the browser tests: the workbench of this page.
(window as unknown as { pumpscribe?: () => Workbench | null }).pumpscribe = () => bench;
