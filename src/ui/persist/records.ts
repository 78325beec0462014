/**
 * What autosave keeps, apart from the browser storage that holds it: the versioned record of
 * one document, its migrations, and the choices made over the kept documents (which one a tab
 * is offered after a reload, which old ones may go). Pure, so that it is tested without a browser.
 */
import { familyOfTraces, type Draft, type SheetRef } from '../store/draft.ts';
import type { UnitChoice } from '../../units/index.ts';
import { unitSystemOf, type LibraryLink, type Step, type TraceTarget } from '../store/store.ts';

export const AUTOSAVE_FORMAT = 'pumpscribe.autosave';
/** 1: one slot; 2: one record per document; 3: the trace target names a diameter or a speed, as a trace does. */
export const AUTOSAVE_VERSION = 3;
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

/**
 * The trace target of versions 1 and 2: `lines: 'diameter'` for a curve, whose label sat in
 * `diameter` even on a sheet of speeds (where it held the speed in rpm).
 */
interface TraceTargetV2 {
  quantity: TraceTarget['quantity'];
  lines: 'diameter' | 'iso';
  diameter?: number;
  iso?: number;
  panel?: string;
}

/** The version 2 record: a target of the older shape; drafts kept before the family question lack `family` and `speeds`. */
type SavedDocumentV2 = Omit<SavedDocument, 'version' | 'target' | 'draft'> & {
  version: 2;
  target: TraceTargetV2;
  draft: Omit<Draft, 'family' | 'speeds' | 'diameters'> & Partial<Pick<Draft, 'family' | 'speeds' | 'diameters'>>;
};

/** The version 1 record: one slot, the older draft shape (sheet without its path, notes always present). */
interface SavedWorkV1 {
  format: typeof AUTOSAVE_FORMAT;
  version: 1;
  savedAt: string;
  draft: Omit<SavedDocumentV2['draft'], 'sheet' | 'notes'> & { sheet: Omit<SheetRef, 'path'> | null; notes?: string[] };
  step: Step;
  target: TraceTargetV2;
  sheetKey: string | null;
}

/**
 * Version 2 → 3. The draft gets the family kind its traces are labelled by (a draft kept before
 * the family question is a sheet of diameters unless a trace carries a speed), and the target's
 * label moves to the field of that kind: on a sheet of speeds the old `diameter` was the speed
 * in rpm. Traces, guides and captured points are kept as they are.
 */
function fromV2(old: SavedDocumentV2): SavedDocument {
  const family = old.draft.family ?? familyOfTraces(old.draft.traces) ?? 'diameter';
  const draft: Draft = { ...old.draft, family, speeds: old.draft.speeds ?? [], diameters: old.draft.diameters ?? [] };
  return { ...old, version: AUTOSAVE_VERSION, draft, target: targetFromV2(old.target, family) };
}

function targetFromV2(old: TraceTargetV2 | undefined, family: Draft['family']): TraceTarget {
  if (!isObject(old) || typeof old.quantity !== 'string') return { quantity: 'head', lines: 'curve' };
  const { lines, diameter, ...rest } = old;
  if (lines === 'iso') return { ...rest, lines: 'iso' };
  const label = typeof diameter === 'number' ? (family === 'speed' ? { speed: diameter } : { diameter }) : {};
  return { ...rest, lines: 'curve', ...label };
}

function fromV1(old: SavedWorkV1, id: string): SavedDocumentV2 {
  const { sheet, notes, ...rest } = old.draft;
  const draft: SavedDocumentV2['draft'] = {
    ...rest,
    sheet: sheet ? { ...sheet, path: sheet.name } : null,
    // Version 1 wrote the opened sheet's checksum into every take-off file it made.
    ...(sheet?.sha256 ? { sheet_sha256: sheet.sha256 } : {}),
    ...(notes && notes.length ? { notes } : {}),
  };
  return {
    format: AUTOSAVE_FORMAT,
    version: 2,
    id,
    savedAt: old.savedAt,
    draft,
    library: null,
    step: old.step,
    target: old.target,
    unitSystem: unitSystemOf(draft as Draft),
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
  let doc: SavedDocument;
  if (raw.version === 1) doc = fromV2(fromV1(raw as unknown as SavedWorkV1, newId()));
  else if (raw.version === 2 && typeof raw.id === 'string' && raw.id) doc = fromV2(raw as unknown as SavedDocumentV2);
  else if (raw.version === AUTOSAVE_VERSION && typeof raw.id === 'string' && raw.id) doc = raw as unknown as SavedDocument;
  else return null;
  // A unit choice this version does not know falls back to the sheet's own units.
  return UNIT_CHOICES.includes(doc.unitSystem) ? doc : { ...doc, unitSystem: unitSystemOf(doc.draft) };
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
