/**
 * Keyboard shortcuts for the frequent actions. Typing in a field is never intercepted,
 * except for undo and redo, which act on the take-off (a field's own undo is the browser's).
 */
import type { Quantity } from '../../model/curveset.ts';
import { STEP_DEFINITIONS } from '../steps/registry.ts';
import { targetFor, withLabel } from '../store/target.ts';
import { familyLabels, labelOf } from '../store/draft.ts';
import type { Store, Step } from '../store/store.ts';
import type { Tool } from '../tools/tool.ts';

/** What the keyboard reaches of the workbench. */
export interface KeysHost {
  readonly store: Store;
  readonly canvas: { panBy(dx: number, dy: number): void };
  activeTool(): Tool | null;
  goto(step: Step): void;
  download(what: 'takeoff'): void;
  toggleKeys(): void;
  zoom(action: 'in' | 'out' | 'fit'): void;
}

export const SHORTCUTS: readonly [string, string][] = [
  ['Ctrl+Z', 'undo the last edit'],
  ['Ctrl+Shift+Z or Ctrl+Y', 'redo'],
  ['1 … 5', 'open a step'],
  ['+ / −', 'zoom in / out about the centre'],
  ['0', 'fit the page to the window'],
  ['arrow keys', 'pan (with Shift: further)'],
  ['Space + drag', 'pan with the mouse'],
  ['H, E, P, N', 'trace head, efficiency, power, NPSHr next'],
  ['[ and ]', 'previous / next diameter'],
  ['Delete', 'remove the selected point'],
  ['Escape', 'cancel the drag or clear the selection'],
  ['Ctrl+S', 'download the take-off file'],
  ['?', 'show or hide this list'],
];

const QUANTITY_KEYS: Record<string, Quantity> = { h: 'head', e: 'efficiency', p: 'power', n: 'npshr' };

function typing(target: EventTarget | null): boolean {
  return target instanceof HTMLInputElement || target instanceof HTMLTextAreaElement || target instanceof HTMLSelectElement || (target instanceof HTMLElement && target.isContentEditable);
}

export function bindKeys(bench: KeysHost): void {
  document.addEventListener('keydown', (event) => {
    const { store } = bench;
    const ctrl = event.ctrlKey || event.metaKey;
    const key = event.key.toLowerCase();
    if (ctrl && key === 'z' && !typing(event.target)) {
      event.preventDefault();
      if (event.shiftKey) store.redo();
      else store.undo();
      return;
    }
    if (ctrl && key === 'y' && !typing(event.target)) {
      event.preventDefault();
      store.redo();
      return;
    }
    if (ctrl && key === 's') {
      event.preventDefault();
      bench.download('takeoff');
      return;
    }
    if (typing(event.target) || ctrl || event.altKey) return;
    if (event.key === '?') {
      bench.toggleKeys();
      event.preventDefault();
      return;
    }
    if (bench.activeTool()?.key(event)) {
      event.preventDefault();
      return;
    }
    const stepIndex = Number(event.key) - 1;
    const step = Number.isInteger(stepIndex) ? STEP_DEFINITIONS[stepIndex] : undefined;
    if (step) {
      bench.goto(step.id);
      return;
    }
    const pan = event.shiftKey ? 200 : 50;
    switch (event.key) {
      case '+':
      case '=':
        bench.zoom('in');
        break;
      case '-':
      case '_':
        bench.zoom('out');
        break;
      case '0':
        bench.zoom('fit');
        break;
      case 'ArrowLeft':
        bench.canvas.panBy(pan, 0);
        break;
      case 'ArrowRight':
        bench.canvas.panBy(-pan, 0);
        break;
      case 'ArrowUp':
        bench.canvas.panBy(0, pan);
        break;
      case 'ArrowDown':
        bench.canvas.panBy(0, -pan);
        break;
      case '[':
      case ']': {
        const { draft, session } = store;
        const list = familyLabels(draft);
        if (list.length === 0 || session.target.lines !== 'curve') return;
        const at = list.indexOf(labelOf(session.target) ?? NaN);
        const next = list[(at + (event.key === ']' ? 1 : -1) + list.length) % list.length];
        if (next !== undefined) store.setSession({ target: withLabel(draft, session.target, next) });
        break;
      }
      default: {
        const q = QUANTITY_KEYS[key];
        if (q && store.session.step === 'trace') store.setSession({ target: targetFor(store.draft, q) });
        else return;
      }
    }
    event.preventDefault();
  });
}
