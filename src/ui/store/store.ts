/**
 * The one store of the workbench: the document (its own id and the library entry it was saved
 * to), the take-off record being edited with its undo history, and the session (what the
 * engineer is doing right now: step, selection, what the next click traces, the state of the
 * last library save). Edits go through `dispatch`, which runs a pure action; rendering only reads.
 */
import type { Quantity } from '../../model/curveset.ts';
import type { Action } from './actions/action.ts';
import { markUserEdits } from './actions/detected.ts';
import { EMPTY_DRAFT, npshUnit, powerUnit, type Draft, type UnitsDraft } from './draft.ts';
import { choiceOf, type CurveUnitTokens, type UnitChoice } from '../../units/index.ts';
import { commit, redo, replacePresent, startHistory, undo, type History } from './history.ts';

import type { Step } from '../steps/registry.ts';

export type { Step };

/**
 * What the next guide click traces. A curve target carries its label as the take-off file's
 * trace does (src/model/takeoff.ts): an impeller `diameter` (in units.diameter) on a sheet of
 * diameters, or a `speed` (rpm) on a sheet of one impeller at several speeds — never both.
 */
export interface TraceTarget {
  quantity: Quantity;
  /** 'curve' for the curve of one diameter or one speed; 'iso' for a line of constant efficiency (%) or power. */
  lines: 'curve' | 'iso';
  /** Impeller diameter in the draft's diameter unit, for a curve target on a sheet of diameters. */
  diameter?: number;
  /** Speed in rpm, for a curve target on a sheet of speeds. */
  speed?: number;
  /** The constant of an 'iso' target, once typed. */
  iso?: number;
  /** The panel to trace on; by default the first panel that plots the quantity. */
  panel?: string;
}

export type Tone = 'info' | 'done' | 'error' | 'caution';

export interface Message {
  text: string;
  tone: Tone;
  /** Increments with every message so that a repeated sentence is still announced. */
  serial: number;
}

export interface Session {
  step: Step;
  /** Panel being set up in step 2. */
  activePanel: string | null;
  /** True while the next drag draws a new panel's frame. */
  drawingFrame: boolean;
  /** What the next panel drawn plots. */
  framePlots: Quantity;
  /** Trace selected for editing (its points and guides can be dragged). */
  selectedTrace: string | null;
  /** The trace made by the last guide click: Shift-click adds guides to it when none is selected. */
  lastTraced: string | null;
  /** Selected point of the selected trace. */
  selectedPoint: number | null;
  /** Trace picked out from a finding, drawn emphasised. */
  highlightedTrace: string | null;
  target: TraceTarget;
  /** How the review, the family chart and the downloads show numbers: the sheet's own units (the default) or a preset. */
  unitSystem: UnitChoice;
  message: Message | null;
  progress: { label: string; fraction: number | null } | null;
  /** True while a capture is running in the worker. */
  busy: boolean;
  /** The last library save of this document. */
  library: LibraryState;
}

export const INITIAL_SESSION: Session = {
  step: 'load',
  activePanel: null,
  drawingFrame: true,
  framePlots: 'head',
  selectedTrace: null,
  lastTraced: null,
  selectedPoint: null,
  highlightedTrace: null,
  target: { quantity: 'head', lines: 'curve' },
  unitSystem: 'own',
  message: null,
  progress: null,
  busy: false,
  library: { state: 'idle', text: '' },
};

/**
 * The units the review starts in: the sheet's own. Named by its preset when the sheet's curve
 * units are exactly a preset's (a gpm, ft, hp, in sheet is "us"), else "own" (an L/s sheet).
 */
/** The curve units the sheet's numbers are in, as the curve set will carry them (power and NPSH filled in). */
export function sheetUnitTokens(units: UnitsDraft): CurveUnitTokens {
  return { flow: units.flow, head: units.head, npsh: npshUnit(units), power: powerUnit(units), diameter: units.diameter };
}

export function unitSystemOf(draft: Draft): UnitChoice {
  return choiceOf(sheetUnitTokens(draft.units));
}

/** Where a document was last saved in the office library: the entry and the revision it made. */
export interface LibraryLink {
  readonly id: string;
  readonly revision: number;
}

/**
 * What makes a take-off one document: its own id (the key it is autosaved under) and the library
 * entry it was saved to. Not part of the undo history: undoing an edit does not unsave it.
 */
export interface DocumentMeta {
  readonly id: string;
  readonly library: LibraryLink | null;
}

/** A fresh document id: random, so that two tabs or two browsers never pick the same one. */
export function newDocumentId(): string {
  const c = (globalThis as { crypto?: { randomUUID?: () => string } }).crypto;
  if (c?.randomUUID) return c.randomUUID();
  return `doc-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 12)}`;
}

/** The state of the last "Save to the library" of this document, as the save step shows it. */
export interface LibraryState {
  state: 'idle' | 'saving' | 'saved' | 'failed';
  text: string;
  /** True when the entry refused the save as another pump's or as stale: a new entry is offered. */
  offerNew?: boolean;
}

export interface StoreState {
  doc: DocumentMeta;
  history: History<Draft>;
  session: Session;
}

export type Listener = (state: StoreState, reason: 'edit' | 'undo' | 'redo' | 'session' | 'replace' | 'document') => void;

export class Store {
  private state: StoreState;
  private readonly listeners = new Set<Listener>();
  private serial = 0;

  constructor(draft: Draft = EMPTY_DRAFT, session: Partial<Session> = {}, doc: DocumentMeta = { id: newDocumentId(), library: null }) {
    this.state = { doc, history: startHistory(draft), session: { ...INITIAL_SESSION, ...session } };
  }

  get doc(): DocumentMeta {
    return this.state.doc;
  }

  get draft(): Draft {
    return this.state.history.present;
  }

  get session(): Session {
    return this.state.session;
  }

  get history(): History<Draft> {
    return this.state.history;
  }

  subscribe(listener: Listener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  private emit(reason: Parameters<Listener>[1]): void {
    for (const l of this.listeners) l(this.state, reason);
  }

  /**
   * Runs an edit. Returns true when the draft changed. An edit that throws leaves the draft
   * untouched and puts its sentence on the status line.
   */
  dispatch(action: Action): boolean {
    let result;
    try {
      result = action(this.draft);
    } catch (error) {
      this.say(error instanceof Error ? error.message : String(error), 'error');
      return false;
    }
    if (!result) return false;
    // An edit of a found part makes it the engineer's, so that a second detection keeps it.
    const next = result.undoable && !result.keepsOrigin ? markUserEdits(this.draft, result.draft) : result.draft;
    const history = result.undoable ? commit(this.state.history, next, result.label) : replacePresent(this.state.history, next);
    this.state = { ...this.state, history };
    this.emit('edit');
    return true;
  }

  undo(): boolean {
    if (this.state.history.past.length === 0) return false;
    const label = this.state.history.labels[this.state.history.labels.length - 1];
    this.state = { ...this.state, history: undo(this.state.history) };
    this.say(`Undone: ${label}.`, 'info', false);
    this.emit('undo');
    return true;
  }

  redo(): boolean {
    if (this.state.history.future.length === 0) return false;
    const label = this.state.history.futureLabels[0];
    this.state = { ...this.state, history: redo(this.state.history) };
    this.say(`Redone: ${label}.`, 'info', false);
    this.emit('redo');
    return true;
  }

  /**
   * Brings back a kept document (a restored autosave) as it was: its id, its library entry,
   * its record and screen state. No undo history across it.
   */
  replace(draft: Draft, session: Partial<Session> = {}, doc: DocumentMeta = this.state.doc): void {
    this.state = { doc, history: startHistory(draft), session: { ...this.state.session, ...resetSession(draft), ...session } };
    this.emit('replace');
  }

  /**
   * Starts a new document (a new sheet, or a take-off file opened): a fresh id, no library
   * entry, no undo history, and the screen state of a fresh start.
   */
  newDocument(draft: Draft, session: Partial<Session> = {}): void {
    this.state = { doc: { id: newDocumentId(), library: null }, history: startHistory(draft), session: { ...this.state.session, ...resetSession(draft), ...session } };
    this.emit('replace');
  }

  /** Records the library entry and revision this document was saved as (kept with the document). */
  setLibrary(library: LibraryLink | null): void {
    this.state = { ...this.state, doc: { ...this.state.doc, library } };
    this.emit('document');
  }

  setSession(patch: Partial<Session>): void {
    this.state = { ...this.state, session: { ...this.state.session, ...patch } };
    this.emit('session');
  }

  setLibraryState(library: LibraryState): void {
    this.setSession({ library });
  }

  say(text: string, tone: Tone = 'info', emit = true): void {
    this.serial += 1;
    this.state = { ...this.state, session: { ...this.state.session, message: { text, tone, serial: this.serial } } };
    if (emit) this.emit('session');
  }
}

/** The screen state that belongs to one document and must not leak into the next. */
function resetSession(draft: Draft): Partial<Session> {
  return {
    activePanel: null,
    selectedTrace: null,
    lastTraced: null,
    selectedPoint: null,
    highlightedTrace: null,
    target: INITIAL_SESSION.target,
    unitSystem: unitSystemOf(draft),
    library: { state: 'idle', text: '' },
  };
}
