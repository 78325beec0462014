/**
 * Documents, not one slot: the store keeps the document's id and library entry beside the
 * record; a new sheet starts a new document; autosave records migrate and the choice of what a
 * tab is offered never hands one tab another tab's document.
 */
import { describe, expect, it } from 'vitest';
import { Store, unitSystemOf } from '../../src/ui/store/store.ts';
import { setPump } from '../../src/ui/store/actions/setup.ts';
import { newSheetDraft } from '../../src/ui/store/actions/setup.ts';
import { AUTOSAVE_FORMAT, AUTOSAVE_VERSION, chooseOffer, documentsToPrune, migrateSaved, sheetsToPrune, type SavedDocument } from '../../src/ui/persist/records.ts';
import { refusalSentence, LibraryAnswerError } from '../../src/ui/app/downloads.ts';
import { draftWithPanel } from './fixtures.ts';

function saved(id: string, savedAt: string, extra: Partial<SavedDocument> = {}): SavedDocument {
  return { format: AUTOSAVE_FORMAT, version: AUTOSAVE_VERSION, id, savedAt, draft: draftWithPanel(), library: null, step: 'trace', target: { quantity: 'head', lines: 'curve' }, unitSystem: 'si', sheetKey: 'a'.repeat(64), ...extra };
}

describe('the document in the store', () => {
  it('a new sheet starts a new document: a fresh id, no library entry, nothing of the last pump', () => {
    const store = new Store(draftWithPanel());
    const first = store.doc.id;
    store.setLibrary({ id: 'e1', revision: 2 });
    store.dispatch(setPump({ name: 'First invented pump' }));
    store.setSession({ selectedTrace: 't1', step: 'save' });
    const sheet = { ...draftWithPanel().sheet!, path: 'second.pdf', name: 'second.pdf', sha256: 'd'.repeat(64) };
    store.newDocument(newSheetDraft(sheet, 'second', store.draft), { step: 'axes' });
    expect(store.doc.id).not.toBe(first);
    expect(store.doc.library).toBeNull();
    expect(store.draft.pump.name).toBe('second');
    expect(store.draft.panels).toEqual([]);
    expect(store.draft.sheet_sha256).toBe('d'.repeat(64));
    expect(store.session.selectedTrace).toBeNull();
    expect(store.session.library.state).toBe('idle');
    expect(store.undo()).toBe(false);
  });

  it('the library entry is not part of the undo history', () => {
    const store = new Store(draftWithPanel());
    store.dispatch(setPump({ speed_rpm: 1450 }));
    store.setLibrary({ id: 'e1', revision: 1 });
    store.undo();
    expect(store.doc.library).toEqual({ id: 'e1', revision: 1 });
  });

  it('a restore brings back the kept document with its id and library entry', () => {
    const store = new Store();
    store.replace(draftWithPanel(), { step: 'review' }, { id: 'kept-1', library: { id: 'e7', revision: 3 } });
    expect(store.doc).toEqual({ id: 'kept-1', library: { id: 'e7', revision: 3 } });
    expect(store.session.step).toBe('review');
  });

  it('starts the review in the sheet\'s own unit system', () => {
    expect(unitSystemOf({ ...draftWithPanel(), units: { flow: 'gpm', head: 'ft', diameter: 'in' } })).toBe('us');
    expect(unitSystemOf({ ...draftWithPanel(), units: { flow: 'L/s', head: 'm', diameter: 'mm' } })).toBe('own');
  });
});

describe('kept records', () => {
  it('migrate the one-slot version 1 record into a document of its own', () => {
    const { sheet, sheet_sha256: _sha, ...rest } = draftWithPanel();
    const { path: _path, ...oldSheet } = sheet!;
    const v1 = { format: AUTOSAVE_FORMAT, version: 1, savedAt: '2026-01-01T00:00:00Z', draft: { ...rest, sheet: oldSheet, notes: [] }, step: 'trace', target: { quantity: 'head', lines: 'diameter' }, sheetKey: 'a'.repeat(64) };
    const doc = migrateSaved(v1, () => 'new-id')!;
    expect(doc).toMatchObject({ version: AUTOSAVE_VERSION, id: 'new-id', library: null, step: 'trace', unitSystem: 'si', target: { quantity: 'head', lines: 'curve' } });
    expect(doc.draft.sheet).toMatchObject({ path: 'invented.pdf', name: 'invented.pdf' });
    expect(doc.draft.sheet_sha256).toBe('a'.repeat(64));
    expect(doc.draft.notes).toBeUndefined();
  });

  it('refuse what is not theirs to read: another format, a newer version, a damaged record', () => {
    expect(migrateSaved(null, () => 'x')).toBeNull();
    expect(migrateSaved({ ...saved('a', '2026'), version: AUTOSAVE_VERSION + 1 }, () => 'x')).toBeNull();
    expect(migrateSaved({ ...saved('a', '2026'), format: 'other' }, () => 'x')).toBeNull();
    expect(migrateSaved({ ...saved('a', '2026'), draft: { traces: 3 } }, () => 'x')).toBeNull();
    expect(migrateSaved(saved('a', '2026'), () => 'x')?.id).toBe('a');
  });

  it('a tab is offered the document it had, else the newest no other tab has open', () => {
    const docs = [saved('a', '2026-01-01T10:00:00Z'), saved('b', '2026-01-01T12:00:00Z'), saved('c', '2026-01-01T11:00:00Z')];
    expect(chooseOffer(docs, { tabDocument: 'a', heldElsewhere: new Set(['b']) })?.id).toBe('a');
    expect(chooseOffer(docs, { tabDocument: null, heldElsewhere: new Set() })?.id).toBe('b');
    expect(chooseOffer(docs, { tabDocument: null, heldElsewhere: new Set(['b']) })?.id).toBe('c');
    // Another tab's document is never offered, not even to a tab that once had it.
    expect(chooseOffer(docs, { tabDocument: 'b', heldElsewhere: new Set(['b']) })?.id).toBe('c');
    expect(chooseOffer(docs, { tabDocument: null, heldElsewhere: new Set(['a', 'b', 'c']) })).toBeNull();
    expect(chooseOffer([saved('s', '2026', { sheetKey: null })], { tabDocument: 's', heldElsewhere: new Set() })).toBeNull();
  });

  it('only the oldest beyond the number kept go, never one open in a tab; sheets go with the last document using them', () => {
    const docs = [saved('a', '2026-01-01T01:00:00Z', { sheetKey: 's1' }), saved('b', '2026-01-01T02:00:00Z', { sheetKey: 's2' }), saved('c', '2026-01-01T03:00:00Z', { sheetKey: 's1' })];
    expect(documentsToPrune(docs, { keep: 1, open: new Set(['a']) })).toEqual(['b']);
    expect(documentsToPrune(docs, { keep: 5, open: new Set() })).toEqual([]);
    expect(sheetsToPrune(['s1', 's2'], [docs[2]!])).toEqual(['s2']);
  });
});

describe('a refused library save', () => {
  const entry = { id: 'e1', revision: 2 };
  it('is one sentence that says nothing was stored and the work is kept, and offers a new entry', () => {
    for (const status of [409, 412, 428]) {
      const { text, offerNew } = refusalSentence(new LibraryAnswerError(status, 'conflict', 'The library said no.'), entry);
      expect(text).toMatch(/^Not saved to the library: entry e1 .*nothing was stored; your work is still here/);
      // One sentence: a single full stop, at the end.
      expect(text.match(/[.!?](\s|$)/g)).toHaveLength(1);
      expect(offerNew).toBe(true);
    }
    expect(refusalSentence(new LibraryAnswerError(412, 'stale', 'Stale.'), entry).text).toMatch(/newer revision than 2/);
    expect(refusalSentence(new Error('Network down'), entry)).toEqual({ text: 'Not saved to the library: Network down; your work is still here — download the files to keep them.', offerNew: false });
  });
});
