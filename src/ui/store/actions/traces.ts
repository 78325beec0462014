/** Edits of traces and their points (step 3, "Trace the curves"). */
import type { Quantity } from '../../../model/curveset.ts';
import type { SheetXY } from '../../../model/takeoff.ts';
import { powerUnit, freshId, pointsOf, type CaptureMethod, type Draft, type TraceDraft } from '../draft.ts';
import { edited, EditError, replaceById, requireFinite, requirePositive, type Action } from './action.ts';
import { QUANTITY_WORDS } from '../../views/words.ts';

/** What a new trace is: its panel and quantity, and its label as the take-off file carries it (a diameter or a speed, or an iso value). */
export interface TraceSpec {
  panel: string;
  quantity: Quantity;
  /** Impeller diameter in units.diameter, on a sheet of diameters. */
  diameter?: number;
  /** Speed in rpm, on a sheet of speeds. */
  speed?: number;
  iso?: number;
  method?: CaptureMethod;
}


/** "head 250", "efficiency 78 % iso" — how a trace is named on screen and in the undo list. */
export function traceName(t: Pick<TraceDraft, 'quantity' | 'diameter' | 'speed' | 'iso'>, diameterUnit: string, powerUnit = 'kW'): string {
  if (t.iso !== undefined) return `${QUANTITY_WORDS[t.quantity]} ${t.iso} ${t.quantity === 'efficiency' ? '%' : powerUnit} line`;
  if (t.speed !== undefined) return `${QUANTITY_WORDS[t.quantity]} ${t.speed} rpm`;
  return `${QUANTITY_WORDS[t.quantity]} ${t.diameter ?? '?'} ${diameterUnit}`;
}

function checkSpec(draft: Draft, spec: TraceSpec): void {
  if (!draft.panels.some((p) => p.id === spec.panel)) throw new EditError(`There is no panel "${spec.panel}"; set the axes of a panel first.`);
  if (spec.iso !== undefined) {
    requireFinite(spec.iso, 'The iso value');
    if (spec.quantity !== 'efficiency' && spec.quantity !== 'power') throw new EditError('Only efficiency and power can be traced as lines of constant value.');
  } else if (spec.diameter !== undefined && spec.speed !== undefined) {
    throw new EditError('A curve is labelled by a diameter or by a speed, not both; choose one.');
  } else if (draft.family === 'speed') {
    if (spec.speed === undefined) throw new EditError(spec.diameter === undefined ? 'Choose the speed of the curve before tracing it.' : 'This sheet is drawn for speeds (one impeller); choose the speed of the curve in rpm, not a diameter.');
    requirePositive(spec.speed, 'The speed');
  } else {
    if (spec.diameter === undefined) throw new EditError(spec.speed === undefined ? 'Choose the impeller diameter of the curve before tracing it.' : 'This sheet is drawn for impeller diameters (one speed); choose the diameter of the curve, not a speed, or say above that the curves are drawn for speeds.');
    requirePositive(spec.diameter, 'The diameter');
  }
}

function checkPoints(points: readonly SheetXY[], what: string): void {
  for (const p of points) {
    requireFinite(p[0], what);
    requireFinite(p[1], what);
  }
}

/** A new trace from its first guides and what the tracer made of them. */
export const addTrace = (spec: TraceSpec, guides: readonly SheetXY[], captured: readonly SheetXY[]): Action => (draft) => {
  checkSpec(draft, spec);
  checkPoints(guides, 'A guide');
  checkPoints(captured, 'A captured point');
  const id = freshId('t', draft.traces);
  const trace: TraceDraft = {
    id,
    panel: spec.panel,
    quantity: spec.quantity,
    ...(spec.iso !== undefined ? { iso: spec.iso } : spec.speed !== undefined ? { speed: spec.speed } : { diameter: spec.diameter as number }),
    guides: [...guides],
    method: spec.method ?? 'auto',
    captured: [...captured],
  };
  return edited({ ...draft, traces: [...draft.traces, trace] }, `trace ${traceName(trace, draft.units.diameter, powerUnit(draft.units))}`);
};

function changeTrace(draft: Draft, id: string, change: (t: TraceDraft) => TraceDraft): Draft {
  return { ...draft, traces: replaceById(draft.traces, id, change, 'trace') };
}

function requireEditable(draft: Draft, id: string): TraceDraft {
  const t = draft.traces.find((x) => x.id === id);
  if (!t) throw new EditError(`There is no trace "${id}"; it may have been removed.`);
  if (t.locked) throw new EditError(`The trace ${traceName(t, draft.units.diameter, powerUnit(draft.units))} is locked; unlock it to edit.`);
  return t;
}

/** New guides and the capture they gave; hand edits are dropped because the line was re-traced. */
export const setGuides = (id: string, guides: readonly SheetXY[], captured: readonly SheetXY[], label = 'move guides'): Action => (draft) => {
  requireEditable(draft, id);
  checkPoints(guides, 'A guide');
  checkPoints(captured, 'A captured point');
  // The capture is new: hand edits and the record of how the old capture was found no longer apply.
  return edited(changeTrace(draft, id, ({ points: _dropped, edited: _edited, captured_by: _by, ...t }) => ({ ...t, guides: [...guides], captured: [...captured] })), label);
};

export const setTraceSpec = (id: string, spec: Partial<Pick<TraceDraft, 'quantity' | 'diameter' | 'speed' | 'iso' | 'panel' | 'method'>>): Action => (draft) => {
  const t = requireEditable(draft, id);
  const merged = { ...t, ...spec };
  checkSpec(draft, { panel: merged.panel, quantity: merged.quantity, ...(merged.iso !== undefined ? { iso: merged.iso } : {}), ...(merged.diameter !== undefined ? { diameter: merged.diameter } : {}), ...(merged.speed !== undefined ? { speed: merged.speed } : {}) });
  return edited(changeTrace(draft, id, () => merged), `relabel as ${traceName(merged, draft.units.diameter, powerUnit(draft.units))}`);
};

function editPoints(draft: Draft, id: string, change: (pts: SheetXY[]) => SheetXY[], label: string): ReturnType<Action> {
  const t = requireEditable(draft, id);
  const points = change([...pointsOf(t)]);
  checkPoints(points, 'A point');
  return edited(changeTrace(draft, id, (x) => ({ ...x, points, edited: true })), label);
}

export const movePoint = (id: string, index: number, at: SheetXY): Action => (draft) =>
  editPoints(draft, id, (pts) => {
    if (!pts[index]) throw new EditError(`The trace has no point ${index + 1}.`);
    pts[index] = at;
    return pts;
  }, 'move point');

/** Inserts a point where it belongs along the line: between its two nearest neighbours in order. */
export const insertPoint = (id: string, at: SheetXY): Action => (draft) =>
  editPoints(draft, id, (pts) => {
    const i = insertionIndex(pts, at);
    pts.splice(i, 0, at);
    return pts;
  }, 'insert point');

export const deletePoint = (id: string, index: number): Action => (draft) =>
  editPoints(draft, id, (pts) => {
    if (!pts[index]) throw new EditError(`The trace has no point ${index + 1}.`);
    pts.splice(index, 1);
    return pts;
  }, 'delete point');

/** Drops the hand edits and goes back to what the tracer captured. */
export const discardEdits = (id: string): Action => (draft) => {
  const t = requireEditable(draft, id);
  if (!t.points || !t.edited) return null;
  return edited(changeTrace(draft, id, ({ points: _dropped, edited: _edited, ...x }) => x), 'discard point edits');
};

export const setHidden = (id: string, hidden: boolean): Action => (draft) =>
  edited(changeTrace(draft, id, (t) => ({ ...t, hidden })), hidden ? 'hide trace' : 'show trace');

export const setLocked = (id: string, locked: boolean): Action => (draft) =>
  edited(changeTrace(draft, id, (t) => ({ ...t, locked })), locked ? 'lock trace' : 'unlock trace');

export const removeTrace = (id: string): Action => (draft) => {
  const t = requireEditable(draft, id);
  return edited({ ...draft, traces: draft.traces.filter((x) => x.id !== id) }, `delete ${traceName(t, draft.units.diameter, powerUnit(draft.units))}`);
};

/**
 * Where a new point goes in an ordered polyline: the position that adds the least length.
 * Before the first or after the last point when it lies beyond an end.
 */
export function insertionIndex(pts: readonly SheetXY[], at: SheetXY): number {
  if (pts.length === 0) return 0;
  const d = (a: SheetXY, b: SheetXY) => Math.hypot(a[0] - b[0], a[1] - b[1]);
  let best = 0;
  let bestCost = d(at, pts[0] as SheetXY);
  for (let i = 1; i < pts.length; i++) {
    const a = pts[i - 1] as SheetXY;
    const b = pts[i] as SheetXY;
    const cost = d(a, at) + d(at, b) - d(a, b);
    if (cost < bestCost) {
      bestCost = cost;
      best = i;
    }
  }
  const endCost = d(pts[pts.length - 1] as SheetXY, at);
  if (endCost < bestCost) best = pts.length;
  return best;
}
