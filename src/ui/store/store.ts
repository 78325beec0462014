/**
 * The one store of the workbench: the draft with its undo history, and the session (what
 * the engineer is doing right now: step, selection, what the next click traces). Edits go
 * through `dispatch`, which runs a pure action; rendering only reads.
 */
import type { Quantity } from '../../model/curveset.ts';
import type { Action } from './actions/action.ts';
import { EMPTY_DRAFT, type Draft } from './draft.ts';
import { commit, redo, replacePresent, startHistory, undo, type History } from './history.ts';

export type Step = 'load' | 'axes' | 'trace' | 'review' | 'save';
export const STEPS: readonly Step[] = ['load', 'axes', 'trace', 'review', 'save'];

/** What the next guide click traces. */
export interface TraceTarget {
  quantity: Quantity;
  /** 'diameter' for a curve of one impeller diameter; 'iso' for a line of constant efficiency (%) or power. */
  lines: 'diameter' | 'iso';
  /** Diameter in the draft's unit, for a 'diameter' target. */
  diameter?: number;
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
  /** How the review and the family chart show numbers. */
  unitSystem: 'si' | 'us';
  message: Message | null;
  progress: { label: string; fraction: number | null } | null;
  /** True while a capture is running in the worker. */
  busy: boolean;
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
  target: { quantity: 'head', lines: 'diameter' },
  unitSystem: 'si',
  message: null,
  progress: null,
  busy: false,
};

export interface StoreState {
  history: History<Draft>;
  session: Session;
}

export type Listener = (state: StoreState, reason: 'edit' | 'undo' | 'redo' | 'session' | 'replace') => void;

export class Store {
  private state: StoreState;
  private readonly listeners = new Set<Listener>();
  private serial = 0;

  constructor(draft: Draft = EMPTY_DRAFT, session: Partial<Session> = {}) {
    this.state = { history: startHistory(draft), session: { ...INITIAL_SESSION, ...session } };
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
    const history = result.undoable ? commit(this.state.history, result.draft, result.label) : replacePresent(this.state.history, result.draft);
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

  /** Starts afresh from a draft (a restored autosave): no undo history across it. */
  replace(draft: Draft, session: Partial<Session> = {}): void {
    this.state = { history: startHistory(draft), session: { ...this.state.session, ...session } };
    this.emit('replace');
  }

  setSession(patch: Partial<Session>): void {
    this.state = { ...this.state, session: { ...this.state.session, ...patch } };
    this.emit('session');
  }

  say(text: string, tone: Tone = 'info', emit = true): void {
    this.serial += 1;
    this.state = { ...this.state, session: { ...this.state.session, message: { text, tone, serial: this.serial } } };
    if (emit) this.emit('session');
  }
}
