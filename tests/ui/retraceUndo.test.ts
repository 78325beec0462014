/**
 * The same impeller's other traces, traced again once its head curve is traced (`retraceLeaning`),
 * go back with the head curve's edit on one undo, and stand as an undo step of their own when the
 * engineer edited something else while they were being traced.
 */
import { describe, expect, it } from 'vitest';
import { SheetTools, type SheetToolsDeps } from '../../src/ui/app/sheetTools.ts';
import type { Derived } from '../../src/ui/app/bench.ts';
import type { TraceDraft } from '../../src/ui/store/draft.ts';
import { setPump } from '../../src/ui/store/actions/setup.ts';
import { Store } from '../../src/ui/store/store.ts';
import type { SheetWorkerClient } from '../../src/ui/worker/client.ts';
import { draftWithPanel } from './fixtures.ts';

const trace = (id: string, quantity: TraceDraft['quantity'], guides: [number, number][], captured: [number, number][]): TraceDraft => ({ id, panel: 'head-1', quantity, diameter: 330, guides, captured, method: 'auto' }) as TraceDraft;
const OLD: [number, number][] = [[160, 300], [200, 280]];
const NEW: [number, number][] = [[160, 301], [200, 282], [240, 270]];

/** Tools on a scan whose worker answers every capture with `NEW`, after `during` has run. */
function tools(store: Store, during: () => void = () => {}) {
  const worker = {
    call: async (kind: string) => {
      expect(kind).toBe('capture');
      during();
      return { points: NEW, gaps: [], doubts: [], moved: [] };
    },
  } as unknown as SheetWorkerClient;
  const deps: SheetToolsDeps = { store, worker, canvas: { currentView: undefined as never, redrawOverlay: () => {} }, magnifier: { show: () => {} }, derived: {} as Derived, loadedKind: () => 'image', words: () => [], requestRender: () => {} };
  return new SheetTools(deps);
}

/** A store holding an efficiency trace, then its head curve traced (one undoable edit). */
function headJustTraced(): Store {
  const store = new Store(draftWithPanel({ traces: [trace('e330', 'efficiency', [[160, 300]], OLD)] }));
  store.dispatch((d) => ({ draft: { ...d, traces: [...d.traces, trace('h330', 'head', [[150, 200]], [[150, 200], [300, 190]])] }, label: 'trace head 330', undoable: true }));
  return store;
}
const efficiency = (store: Store) => store.draft.traces.find((t) => t.id === 'e330')?.captured;

describe('re-tracing the traces that lean on a head curve', () => {
  it('takes them back with the head curve on one undo', async () => {
    const store = headJustTraced();
    await tools(store).retraceLeaning('h330');
    expect(efficiency(store)).toEqual(NEW);
    expect(store.history.labels).toEqual(['trace head 330']);
    store.undo();
    expect(store.draft.traces.map((t) => t.id)).toEqual(['e330']);
    expect(efficiency(store)).toEqual(OLD);
    store.redo();
    expect(efficiency(store)).toEqual(NEW);
  });

  it('makes them an undo step of their own when something else was edited while they were traced', async () => {
    const store = headJustTraced();
    await tools(store, () => store.dispatch(setPump({ speed_rpm: 1480 }))).retraceLeaning('h330');
    expect(efficiency(store)).toEqual(NEW);
    expect(store.history.labels).toEqual(['trace head 330', 'set pump speed', "trace again with the head curve's colour"]);
    store.undo();
    expect(efficiency(store)).toEqual(OLD);
    expect(store.draft.pump.speed_rpm).toBe(1480);
    store.undo();
    store.undo();
    expect(store.draft.traces.map((t) => t.id)).toEqual(['e330']);
  });
});
