import { describe, expect, it } from 'vitest';
import { Store } from '../../src/ui/store/store.ts';
import { readFromSheet, setPump } from '../../src/ui/store/actions/setup.ts';
import { speedNotGiven } from '../../src/ui/views/words.ts';
import { EMPTY_DRAFT } from '../../src/ui/store/draft.ts';

describe('the workbench store', () => {
  it('runs an edit, records it for undo and tells the listeners', () => {
    const store = new Store();
    const reasons: string[] = [];
    store.subscribe((_, reason) => reasons.push(reason));
    expect(store.dispatch(setPump({ speed_rpm: 1480 }))).toBe(true);
    expect(store.draft.pump.speed_rpm).toBe(1480);
    expect(store.history.labels).toEqual(['set pump speed']);
    expect(reasons).toEqual(['edit']);
    store.undo();
    expect(store.draft.pump.speed_rpm).toBe(EMPTY_DRAFT.pump.speed_rpm);
    expect(store.session.message?.text).toBe('Undone: set pump speed.');
  });

  it('leaves the draft as it was when an edit is refused, and says why on the status line', () => {
    const store = new Store();
    const before = store.draft;
    expect(store.dispatch(setPump({ speed_rpm: -3 }))).toBe(false);
    expect(store.draft).toBe(before);
    expect(store.session.message).toMatchObject({ tone: 'error', text: 'The speed must be greater than zero.' });
    expect(store.history.past).toHaveLength(0);
  });

  it('an edit that changes nothing adds no undo step', () => {
    const store = new Store();
    expect(store.dispatch(setPump({ name: EMPTY_DRAFT.pump.name }))).toBe(false);
    expect(store.history.past).toHaveLength(0);
  });

  it('the starting speed is not taken as given: typing it, even unchanged, or reading it from the sheet vouches for it', () => {
    const store = new Store();
    expect(store.draft.speedGiven).toBeUndefined();
    expect(speedNotGiven(store.draft.pump.speed_rpm)).toMatch(/^The pump's speed, 2900 rpm, is only the workbench's starting value: .* Type the speed printed on the sheet in step 3/);
    expect(store.dispatch(setPump({ speed_rpm: EMPTY_DRAFT.pump.speed_rpm }))).toBe(true);
    expect(store.draft.speedGiven).toBe(true);
    expect(store.dispatch(setPump({ speed_rpm: EMPTY_DRAFT.pump.speed_rpm }))).toBe(false);
    const read = new Store();
    expect(read.dispatch(readFromSheet({ speed_rpm: 1450 }))).toBe(true);
    expect(read.draft).toMatchObject({ pump: { speed_rpm: 1450 }, speedGiven: true });
    const other = new Store();
    other.dispatch(readFromSheet({ units: { flow: 'gpm' } }));
    expect(other.draft.speedGiven).toBeUndefined();
  });

  it('replacing the draft (a restore) starts a fresh history', () => {
    const store = new Store();
    store.dispatch(setPump({ name: 'x' }));
    store.replace({ ...EMPTY_DRAFT, pump: { ...EMPTY_DRAFT.pump, name: 'restored' } }, { step: 'trace' });
    expect(store.draft.pump.name).toBe('restored');
    expect(store.session.step).toBe('trace');
    expect(store.undo()).toBe(false);
  });
});
