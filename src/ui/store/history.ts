/**
 * Undo and redo over immutable states: the past, the present and the undone future.
 * Committing a new state forgets the future, as every editor does.
 */
export interface History<T> {
  readonly past: readonly T[];
  readonly present: T;
  readonly future: readonly T[];
  /** What each past step did, newest last, for the undo button's label. */
  readonly labels: readonly string[];
  readonly futureLabels: readonly string[];
}

export const HISTORY_LIMIT = 500;

export function startHistory<T>(present: T): History<T> {
  return { past: [], present, future: [], labels: [], futureLabels: [] };
}

export function commit<T>(h: History<T>, next: T, label: string, limit = HISTORY_LIMIT): History<T> {
  const past = [...h.past, h.present];
  const labels = [...h.labels, label];
  const drop = Math.max(0, past.length - limit);
  return { past: past.slice(drop), present: next, future: [], labels: labels.slice(drop), futureLabels: [] };
}

/** Replaces the present without an undo step (for changes that are not edits). */
export function replacePresent<T>(h: History<T>, next: T): History<T> {
  return { ...h, present: next };
}

export function undo<T>(h: History<T>): History<T> {
  if (h.past.length === 0) return h;
  const previous = h.past[h.past.length - 1] as T;
  return {
    past: h.past.slice(0, -1),
    present: previous,
    future: [h.present, ...h.future],
    labels: h.labels.slice(0, -1),
    futureLabels: [h.labels[h.labels.length - 1] ?? '', ...h.futureLabels],
  };
}

export function redo<T>(h: History<T>): History<T> {
  if (h.future.length === 0) return h;
  const next = h.future[0] as T;
  return {
    past: [...h.past, h.present],
    present: next,
    future: h.future.slice(1),
    labels: [...h.labels, h.futureLabels[0] ?? ''],
    futureLabels: h.futureLabels.slice(1),
  };
}
