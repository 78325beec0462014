/**
 * What autosave keeps, apart from the browser storage that holds it: the versioned record of
 * one document, its migrations, and the choices made over the kept documents (which one a tab
 * is offered after a reload, which old ones may go). Pure, so that it is tested without a browser.
 */
import type { Draft, SheetRef } from '../store/draft.ts';
import type { UnitChoice } from '../../units/index.ts';
import { unitSystemOf, type LibraryLink, type Step, type TraceTarget } from '../store/store.ts';

export const AUTOSAVE_FORMAT = 'pumpscribe.autosave';
export const AUTOSAVE_VERSION = 2;
/** How many documents a browser keeps; older ones go first, never one open in a tab. */
export const KEEP_DOCUMENTS = 20;

const UNIT_CHOICES: readonly UnitChoice[] = ['own', 'si', 'us'];

/** One kept document: the take-off record being edited, its library entry and where the engineer was. */
export interface SavedDocument {
  format: typeof AUTOSAVE_FORMAT;
  version: typeof AUTOSAVE_VERSION;
  /** The document's own id: the key it is kept under. */
  id: string;
  savedAt: string;
  draft: Draft;
  /** The library entry and revision this document was saved as, if any. */
  library: LibraryLink | null;
  step: Step;
  target: TraceTarget;
  unitSystem: UnitChoice;
  /** Key of the sheet's bytes in the sheet store (the SHA-256 of the sheet). */
  sheetKey: string | null;
}

function isObject(v: unknown): v is Record<string, unknown> {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

/** The version 1 record: one slot, the older draft shape (sheet without its path, notes always present). */
interface SavedWorkV1 {
  format: typeof AUTOSAVE_FORMAT;
  version: 1;
  savedAt: string;
  draft: Omit<Draft, 'sheet' | 'notes'> & { sheet: Omit<SheetRef, 'path'> | null; notes?: string[] };
  step: Step;
  target: TraceTarget;
  sheetKey: string | null;
}

function fromV1(old: SavedWorkV1, id: string): SavedDocument {
  const { sheet, notes, ...rest } = old.draft;
  const draft: Draft = {
    ...rest,
    sheet: sheet ? { ...sheet, path: sheet.name } : null,
    // Version 1 wrote the opened sheet's checksum into every take-off file it made.
    ...(sheet?.sha256 ? { sheet_sha256: sheet.sha256 } : {}),
    ...(notes && notes.length ? { notes } : {}),
  };
  return {
    format: AUTOSAVE_FORMAT,
    version: AUTOSAVE_VERSION,
    id,
    savedAt: old.savedAt,
    draft,
    library: null,
    step: old.step,
    target: old.target,
    unitSystem: unitSystemOf(draft),
    sheetKey: old.sheetKey,
  };
}

/**
 * Brings a kept record up to the current version, or answers null for one that cannot be used
 * (another format, a newer version, a damaged record): such a record is left alone, not guessed at.
 * `newId` names a version 1 record, which had no id of its own.
 */
export function migrateSaved(raw: unknown, newId: () => string): SavedDocument | null {
  if (!isObject(raw) || raw.format !== AUTOSAVE_FORMAT) return null;
  if (!isObject(raw.draft) || !Array.isArray(raw.draft.traces) || !Array.isArray(raw.draft.panels)) return null;
  // The step is checked against the steps of the workbench when the record is restored.
  if (typeof raw.step !== 'string') return null;
  if (raw.version === 1) return fromV1(raw as unknown as SavedWorkV1, newId());
  if (raw.version === AUTOSAVE_VERSION && typeof raw.id === 'string' && raw.id) {
    const doc = raw as unknown as SavedDocument;
    // A unit choice this version does not know falls back to the sheet's own units.
    return UNIT_CHOICES.includes(doc.unitSystem) ? doc : { ...doc, unitSystem: unitSystemOf(doc.draft) };
  }
  return null;
}

/**
 * The document a tab offers to restore: the one this tab had (its id survives a reload in the
 * tab's session storage), else the most recent one no other tab has open. Documents open in
 * another tab are never offered, so two tabs never edit one document.
 */
export function chooseOffer(docs: readonly SavedDocument[], options: { tabDocument: string | null; heldElsewhere: ReadonlySet<string> }): SavedDocument | null {
  const usable = docs.filter((d) => d.draft.sheet !== null && d.sheetKey !== null && !options.heldElsewhere.has(d.id));
  const own = options.tabDocument ? usable.find((d) => d.id === options.tabDocument) : undefined;
  if (own) return own;
  return [...usable].sort((a, b) => b.savedAt.localeCompare(a.savedAt))[0] ?? null;
}

/** The ids of kept documents that may be deleted: the oldest beyond `keep`, never one open in a tab. */
export function documentsToPrune(docs: readonly SavedDocument[], options: { keep?: number; open: ReadonlySet<string> }): string[] {
  const keep = options.keep ?? KEEP_DOCUMENTS;
  const newestFirst = [...docs].sort((a, b) => b.savedAt.localeCompare(a.savedAt));
  return newestFirst.slice(keep).filter((d) => !options.open.has(d.id)).map((d) => d.id);
}

/** The kept sheets no kept document refers to any more. */
export function sheetsToPrune(sheetKeys: readonly string[], docs: readonly SavedDocument[]): string[] {
  const used = new Set(docs.flatMap((d) => (d.sheetKey ? [d.sheetKey] : [])));
  return sheetKeys.filter((k) => !used.has(k));
}
