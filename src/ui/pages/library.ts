/** The library screens (search, entry, revisions, compare), through the HTTP API only. */
import { h } from '../dom/h.ts';

export function showLibrary(root: HTMLElement, hash: string, _bench: unknown): void {
  root.replaceChildren(h('main', { class: 'library' }, h('p', null, `Library: ${hash}`), h('a', { href: '#/' }, 'Back to the workbench')));
}
