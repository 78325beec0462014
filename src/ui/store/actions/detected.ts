/**
 * The automatic take-off in the document: what it found goes in as one undoable edit, next to
 * what the engineer set; an edit of a found part makes it the engineer's; a second detection
 * replaces the found parts and keeps the engineer's.
 */
import type { SheetUnits } from '../../../digitize/detect/detect.ts';
import type { Quantity } from '../../../model/curveset.ts';
import { CURVE_UNIT_KIND, fromSI, parseUnit, toSI } from '../../../units/index.ts';
import type { Panel, Trace } from '../../../model/takeoff.ts';
import type { DetectAnswer } from '../../worker/protocol.ts';
import { familyOfTraces, frameOverlap, type Draft, type PanelDraft, type TraceDraft } from '../draft.ts';
import type { Action } from './action.ts';

/** The label of a trace's curve for "is it the same curve": quantity and diameter, speed or iso level. */
function curveKey(t: Pick<Trace, 'quantity' | 'iso' | 'diameter' | 'speed'>): string {
  return `${t.quantity}|${t.iso !== undefined ? `iso ${t.iso}` : `${t.diameter ?? ''}/${t.speed ?? ''}`}`;
}

function plotsOf(p: Panel, traces: readonly Trace[]): Quantity {
  if (p.quantity) return p.quantity;
  return traces.find((t) => t.panel === p.id && t.iso === undefined)?.quantity ?? 'head';
}

/** The engineer's answers the detection ran with: the family's labels, the iso levels drawn. */
export interface DetectionGiven {
  labels?: readonly number[];
  iso?: readonly number[];
}

/**
 * Puts a detection into the document: the parts of an earlier detection go, the engineer's stay,
 * and a found part the engineer already set is not added again (a found panel with the id of
 * one of the engineer's gives way to it, and its curves lie on the engineer's panel).
 */
export const applyDetection = (found: DetectAnswer, given: DetectionGiven = {}): Action => (draft) => {
  const userPanels = draft.panels.filter((p) => p.origin !== 'detected');
  const userTraces = draft.traces.filter((t) => t.origin !== 'detected');
  const panelIds = new Set(userPanels.map((p) => p.id));
  const panels: PanelDraft[] = [...userPanels];
  /** Found panel id → the engineer's panel drawn over the same plot, which its curves then lie on. */
  const onUserPanel = new Map<string, string>();
  for (const p of found.panels) {
    const plots = plotsOf(p, found.traces);
    const same = userPanels.find((u) => u.id === p.id || (u.plots === plots && p.frame && u.frame && frameOverlap(u.frame, p.frame) > 0.5));
    if (same) {
      onUserPanel.set(p.id, same.id);
      continue;
    }
    panelIds.add(p.id);
    panels.push({ ...p, plots });
  }
  const taken = new Set(userTraces.map(curveKey));
  const ids = new Set(userTraces.map((t) => t.id));
  const traces: TraceDraft[] = [...userTraces];
  for (const found1 of found.traces) {
    const t = { ...found1, panel: onUserPanel.get(found1.panel) ?? found1.panel };
    if (taken.has(curveKey(t)) || !panelIds.has(t.panel)) continue;
    const base = t.id ?? `${t.quantity}`;
    let id = base;
    for (let k = 2; ids.has(id); k++) id = `${base}-${k}`;
    ids.add(id);
    traces.push({ ...t, id, guides: t.guides ?? [] });
  }
  const family = familyOfTraces(traces) ?? draft.family;
  const labels = (field: 'diameter' | 'speed', before: readonly number[]) => {
    const values = new Set(before);
    for (const t of traces) if (t[field] !== undefined) values.add(t[field] as number);
    return [...values].sort((a, b) => b - a);
  };
  const next: Draft = {
    ...draft,
    panels,
    traces,
    family,
    diameters: family === 'diameter' ? labels('diameter', given.labels ?? draft.diameters) : draft.diameters,
    speeds: family === 'speed' ? labels('speed', given.labels ?? draft.speeds) : draft.speeds,
    detected: { by: found.by, questions: [...found.questions] },
    ...(given.labels ? { labelsGiven: true } : {}),
    ...(given.iso ? { iso_levels: [...given.iso] } : {}),
  };
  const added = found.panels.length + found.traces.length;
  return { draft: next, label: `find panels and curves (${added} parts)`, undoable: true, keepsOrigin: true };
};

/**
 * After a detection, the record takes the units the sheet prints (flow, head, power, NPSH,
 * diameter), so that the review and the saved take-off speak the sheet's units (10.5 in, not
 * 266.7 mm). Only while the record holds nothing the engineer set in the old units: no panel or
 * trace of their own, no minimum flow typed. The found panels read their axes in their own
 * units, so only the diameters change number: converted to the sheet's unit. Null when nothing
 * changes or the engineer's own parts are there.
 */
export const adoptSheetUnits = (units: SheetUnits): Action => (draft) => {
  if (draft.panels.some((p) => p.origin !== 'detected') || draft.traces.some((t) => t.origin !== 'detected') || draft.min_flow !== undefined) return null;
  const canonical: Partial<Record<keyof SheetUnits, string>> = {};
  for (const [key, token] of Object.entries(units) as [keyof SheetUnits, string | undefined][]) {
    if (token === undefined) continue;
    try {
      canonical[key] = parseUnit(CURVE_UNIT_KIND[key], token).token;
    } catch {
      // A unit the tables do not know stays the engineer's to choose.
    }
  }
  const next = { ...draft.units, ...canonical };
  if (JSON.stringify(next) === JSON.stringify(draft.units)) return null;
  const [from, to] = [parseUnit('diameter', draft.units.diameter), parseUnit('diameter', next.diameter)];
  const convert = (d: number) => (from.token === to.token ? d : Number(fromSI(toSI(d, from), to).toPrecision(10)));
  // A found trace named after its diameter ("head-266.7") takes the converted name ("head-10.5").
  const traces = draft.traces.map((t) => {
    if (t.diameter === undefined) return t;
    const diameter = convert(t.diameter);
    const named = `${t.quantity}-${t.diameter}`;
    const id = t.id === named || t.id.startsWith(`${named}-`) ? `${t.quantity}-${diameter}${t.id.slice(named.length)}` : t.id;
    return { ...t, id, diameter };
  });
  if (new Set(traces.map((t) => t.id)).size !== traces.length) return null;
  return {
    draft: { ...draft, units: next, traces, diameters: draft.diameters.map(convert) },
    label: 'take the units the sheet prints',
    undoable: true,
    keepsOrigin: true,
  };
};

/** View-only fields of a part: changing them is not an edit of what was found. */
const VIEW_ONLY = new Set(['hidden', 'locked', 'plots']);

function sameRecord(a: object, b: object): boolean {
  if (a === b) return true;
  const strip = (o: object) => JSON.stringify(Object.entries(o).filter(([k]) => !VIEW_ONLY.has(k)));
  return strip(a) === strip(b);
}

/**
 * After an edit: a found part (origin "detected") that the edit changed becomes the engineer's
 * (origin "user", no confidence), so that a second detection keeps it.
 */
export function markUserEdits(before: Draft, after: Draft): Draft {
  const mark = <T extends { id: string; origin?: string; confidence?: number }>(list: readonly T[], old: readonly T[]): { list: T[]; changed: boolean } => {
    let changed = false;
    const byId = new Map(old.map((x) => [x.id, x]));
    const next = list.map((x) => {
      if (x.origin !== 'detected') return x;
      const prev = byId.get(x.id);
      if (!prev || sameRecord(prev, x)) return x;
      changed = true;
      const { confidence: _c, ...rest } = x;
      return { ...rest, origin: 'user' } as T;
    });
    return { list: next, changed };
  };
  const panels = mark(after.panels, before.panels);
  const traces = mark(after.traces, before.traces);
  if (!panels.changed && !traces.changed) return after;
  return { ...after, panels: panels.list, traces: traces.list };
}

/**
 * What answers a detector's question: the family's labels (diameters or speeds), the iso levels
 * drawn, or nothing typed (`none`: the question asks for work by hand on the sheet — a curve to
 * trace, anchors to place — and a list typed here would not change what is read).
 */
export type AnswerKind = 'labels' | 'iso' | 'none';

export function answerKind(question: string): AnswerKind {
  if (/by hand|place its anchors|look at (it|them)/i.test(question) && !/\b(give|which)\b|\?/i.test(question)) return 'none';
  // The flow unit is set with the units of step 2, and what a panel plots with the panel tools, not typed as values.
  if (/flow unit|^What does the panel/i.test(question) && !/diameters|speeds|iso/i.test(question)) return 'none';
  return /iso[-_ ]?(line|level)/i.test(question) ? 'iso' : 'labels';
}

/** Counts found and engineer-set parts, for the summary line. */
export function provenance(draft: Pick<Draft, 'panels' | 'traces'>): { found: number; set: number } {
  const all = [...draft.panels, ...draft.traces];
  const found = all.filter((p) => p.origin === 'detected').length;
  return { found, set: all.length - found };
}
