/**
 * What the next guide click traces, and what comes after it. The order follows how an
 * engineer reads a sheet: all head curves largest diameter first, then efficiency, power
 * and NPSHr; efficiency drawn as lines of constant value across the head curves is traced
 * as iso-lines on the head panel.
 */
import type { Quantity } from '../../model/curveset.ts';
import type { SheetXY } from '../../model/takeoff.ts';
import { familyLabels, frameOf, labelField, labelOf, powerUnit, type Draft, type PanelDraft, type TraceDraft, type UnitsDraft } from './draft.ts';
import type { Session, TraceTarget } from './store.ts';
import { QUANTITY_NAMES, QUANTITY_WORDS } from '../views/words.ts';

export const QUANTITY_ORDER: readonly Quantity[] = ['head', 'efficiency', 'power', 'npshr'];

/** The panel a target is traced on, or undefined when no panel suits it. */
export function panelFor(draft: Draft, target: TraceTarget): PanelDraft | undefined {
  if (target.panel) {
    const p = draft.panels.find((x) => x.id === target.panel);
    if (p) return p;
  }
  const own = draft.panels.find((p) => p.plots === target.quantity);
  if (target.lines === 'iso') return own ?? draft.panels.find((p) => p.plots === 'head');
  return own;
}

/** The panel whose frame holds `at` (with a small margin), the smallest if frames overlap. */
export function panelAt(draft: Draft, at: SheetXY): PanelDraft | undefined {
  const holding = draft.panels.filter((p) => {
    const [l, t, r, b] = frameOf(p);
    const mx = 0.02 * (r - l);
    const my = 0.02 * (b - t);
    return at[0] >= l - mx && at[0] <= r + mx && at[1] >= t - my && at[1] <= b + my;
  });
  const area = (p: PanelDraft) => {
    const f = frameOf(p);
    return (f[2] - f[0]) * (f[3] - f[1]);
  };
  holding.sort((a, b) => area(a) - area(b));
  return holding[0];
}

function traced(draft: Draft, quantity: Quantity, label: number): boolean {
  return draft.traces.some((t) => t.quantity === quantity && t.iso === undefined && labelOf(t) === label);
}

/**
 * A curve target for the quantity, labelled as this sheet labels its curves: `diameter` on a
 * sheet of diameters, `speed` (rpm) on a sheet of speeds; without a label while none is known.
 */
export function curveTarget(draft: Pick<Draft, 'family'>, quantity: Quantity, label?: number, panel?: string): TraceTarget {
  return { quantity, lines: 'curve', ...(label !== undefined ? labelField(draft, label) : {}), ...(panel !== undefined ? { panel } : {}) };
}

/** The same target, now for the curve labelled `label` (a diameter or a speed, as the sheet is drawn). */
export function withLabel(draft: Pick<Draft, 'family'>, target: TraceTarget, label: number): TraceTarget {
  const { diameter: _d, speed: _s, iso: _i, ...rest } = target;
  return { ...rest, lines: 'curve', ...labelField(draft, label) };
}

/** The largest diameter (or fastest speed) not yet traced for the quantity, or undefined when all are. */
export function firstUntraced(draft: Draft, quantity: Quantity): number | undefined {
  return familyLabels(draft).find((d) => !traced(draft, quantity, d));
}

/** How efficiency is read on this sheet: as curves on its own panel, or as iso-lines on the head panel. */
function efficiencyLines(draft: Draft): 'curve' | 'iso' {
  return draft.panels.some((p) => p.plots === 'efficiency') ? 'curve' : 'iso';
}

/** A target for a quantity: its first untraced diameter, or an iso-line. */
export function targetFor(draft: Draft, quantity: Quantity): TraceTarget {
  if (quantity === 'efficiency' && efficiencyLines(draft) === 'iso') return { quantity, lines: 'iso' };
  return curveTarget(draft, quantity, firstUntraced(draft, quantity) ?? familyLabels(draft)[0]);
}

/**
 * After a trace is made: the next untraced diameter of the same quantity; when all are done,
 * the next quantity that has a panel. An iso-line is followed by another iso-line of the
 * same quantity, whose value the engineer types.
 */
export function nextTarget(draft: Draft, done: TraceTarget): TraceTarget {
  // Iso-lines come in pairs (either side of the BEP): the same value is proposed again.
  if (done.lines === 'iso') return { ...done };
  const same = firstUntraced(draft, done.quantity);
  if (same !== undefined) return curveTarget(draft, done.quantity, same);
  const start = QUANTITY_ORDER.indexOf(done.quantity);
  for (let k = 1; k < QUANTITY_ORDER.length; k++) {
    const q = QUANTITY_ORDER[(start + k) % QUANTITY_ORDER.length] as Quantity;
    const candidate = targetFor(draft, q);
    if (!panelFor(draft, candidate)) continue;
    if (candidate.lines === 'iso') {
      const hasIso = draft.traces.some((t) => t.quantity === q && t.iso !== undefined);
      if (!hasIso) return candidate;
      continue;
    }
    if (firstUntraced(draft, q) !== undefined) return candidate;
  }
  return { ...done };
}

/**
 * The target for a click that lands in another panel than the target's: the quantity that
 * panel plots, at its first untraced diameter. An iso-line target stays as it is on the head panel.
 */
export function retargetForPanel(draft: Draft, target: TraceTarget, panel: PanelDraft): TraceTarget {
  const current = panelFor(draft, target);
  if (current?.id === panel.id) return target;
  if (target.lines === 'iso' && panel.plots === 'head') return { ...target, panel: panel.id };
  return { ...targetFor(draft, panel.plots), panel: panel.id };
}

/** Whether the target can be traced now, or the sentence that says what is missing. */
export function targetProblem(draft: Draft, target: TraceTarget): string | null {
  if (!panelFor(draft, target)) return `No panel plots ${target.quantity === 'npshr' ? 'NPSHr' : target.quantity} yet; draw its frame in "Set the axes" first.`;
  if (target.lines === 'iso' && target.iso === undefined) return `Type the value of the ${target.quantity} line to trace (for example 70 %).`;
  if (target.lines === 'curve' && labelOf(target) === undefined) return draft.family === 'speed' ? 'Type the speeds of the family first (for example 1450 1200 950, or 100 90 80 70 %).' : 'Type the impeller diameters of the family first (for example 250 235 220 205).';
  return null;
}


/** "head curve of 250 mm", "head curve of 1450 rpm", "70 % efficiency line": the target in words, for the status line. */
export function targetName(target: TraceTarget, units: UnitsDraft): string {
  if (target.lines === 'iso') {
    const unit = target.quantity === 'efficiency' ? '%' : powerUnit(units);
    return target.iso === undefined ? `line of constant ${QUANTITY_WORDS[target.quantity]}` : `${target.iso} ${unit} ${QUANTITY_WORDS[target.quantity]} line`;
  }
  if (target.speed !== undefined) return `${QUANTITY_WORDS[target.quantity]} curve of ${target.speed} rpm`;
  return target.diameter === undefined ? `${QUANTITY_WORDS[target.quantity]} curve` : `${QUANTITY_WORDS[target.quantity]} curve of ${target.diameter} ${units.diameter}`;
}

/** The target that traces this trace's curve again: its quantity, its diameter or speed (or iso value) and its panel. */
export function targetOfTrace(t: Pick<TraceDraft, 'quantity' | 'diameter' | 'speed' | 'iso' | 'panel'>): TraceTarget {
  if (t.iso !== undefined) return { quantity: t.quantity, lines: 'iso', iso: t.iso, panel: t.panel };
  return { quantity: t.quantity, lines: 'curve', ...(t.diameter !== undefined ? { diameter: t.diameter } : {}), ...(t.speed !== undefined ? { speed: t.speed } : {}), panel: t.panel };
}

/**
 * The screen state after a trace was deleted: the next click re-does that curve (its quantity
 * and diameter), not the curve proposed after it; a selection of the deleted trace is cleared.
 */
export function afterRemoval(session: Pick<Session, 'selectedTrace' | 'lastTraced' | 'highlightedTrace'>, removed: TraceDraft): Partial<Session> {
  return {
    target: targetOfTrace(removed),
    ...(session.selectedTrace === removed.id ? { selectedTrace: null, selectedPoint: null } : {}),
    ...(session.lastTraced === removed.id ? { lastTraced: null } : {}),
    ...(session.highlightedTrace === removed.id ? { highlightedTrace: null } : {}),
  };
}

/** Traces already filed under the curve a target would trace (same quantity, same diameter or speed; not iso-lines). */
export function tracesOfCurve(draft: Draft, target: Pick<TraceTarget, 'quantity' | 'lines' | 'diameter' | 'speed'>): TraceDraft[] {
  if (target.lines !== 'curve' || labelOf(target) === undefined) return [];
  return draft.traces.filter((t) => t.quantity === target.quantity && t.iso === undefined && t.diameter === target.diameter && t.speed === target.speed);
}

/** A curve drawn by more than one trace: its quantity, its label (diameter or speed) and the traces. */
export interface SharedCurve {
  quantity: Quantity;
  diameter?: number;
  speed?: number;
  ids: string[];
}

/**
 * Curves with more than one trace: the replay fits their points together as one curve. Said on
 * screen, so that a trace filed under the wrong diameter (or speed) is never merged silently.
 */
export function sharedCurves(draft: Draft): SharedCurve[] {
  const groups = new Map<string, SharedCurve>();
  for (const t of draft.traces) {
    if (t.iso !== undefined || labelOf(t) === undefined) continue;
    const key = `${t.quantity}|${t.diameter ?? ''}|${t.speed ?? ''}`;
    const g = groups.get(key) ?? { quantity: t.quantity, ...(t.diameter !== undefined ? { diameter: t.diameter } : {}), ...(t.speed !== undefined ? { speed: t.speed } : {}), ids: [] };
    g.ids.push(t.id);
    groups.set(key, g);
  }
  return [...groups.values()].filter((g) => g.ids.length > 1);
}

/** "Head 235 mm has 2 traces (t2, t5): …", "Head 1450 rpm has 2 traces …" — the sentence for a shared curve. */
export function sharedCurveSentence(g: SharedCurve, diameterUnit: string): string {
  const bySpeed = g.speed !== undefined;
  const name = `${QUANTITY_NAMES[g.quantity]} ${bySpeed ? `${g.speed} rpm` : `${g.diameter} ${diameterUnit}`}`;
  return `${name} has ${g.ids.length} traces (${g.ids.join(', ')}); their points are fitted together as one curve. If one belongs to another ${bySpeed ? 'speed' : 'diameter'}, relabel or delete it.`;
}
