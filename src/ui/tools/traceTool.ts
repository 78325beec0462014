/**
 * Tracing and editing curves (step 3). A click on an untraced line places a guide: the line
 * is captured at once and the next curve is proposed. Shift-click adds a guide to the
 * selected trace; dragging a guide re-traces; dragging a point moves it; Alt-click on the
 * selected trace inserts a point; Delete removes the selected point.
 * States: idle → capturing → idle; idle → dragging a point or a guide → idle.
 */
import type { SheetXY } from '../../model/takeoff.ts';
import { nearestOnPolyline } from '../../digitize/polyline.ts';
import type { CanvasPointer } from '../canvas/sheetCanvas.ts';
import { addTrace, deletePoint, insertPoint, movePoint, setGuides, traceName } from '../store/actions/traces.ts';
import { powerUnit, pointsOf, type TraceDraft } from '../store/draft.ts';
import { nextTarget, panelAt, panelFor, retargetForPanel, sharedCurveSentence, targetName, targetProblem, tracesOfCurve } from '../store/target.ts';
import { screenDistance, type Tool, type ToolHost } from './tool.ts';

type State =
  | { kind: 'idle' }
  | { kind: 'capturing' }
  | { kind: 'dragging-point'; trace: string; index: number; at: SheetXY; from: SheetXY; moved: boolean }
  | { kind: 'dragging-guide'; trace: string; index: number; at: SheetXY; moved: boolean };

const GRAB_PX = 7;
/** A click this close to a traced line picks that line instead of tracing a new one (zoom in to click between lines). */
const LINE_PX = 4;

type Hover = { kind: 'point'; trace: string; index: number } | { kind: 'guide'; trace: string; index: number } | { kind: 'line'; trace: string; at: SheetXY } | null;

/** Guides kept in order along the flow axis, so that the capture runs from one end to the other. */
export function withGuide(guides: readonly SheetXY[], at: SheetXY): SheetXY[] {
  return [...guides, at].sort((a, b) => a[0] - b[0]);
}

export class TraceTool implements Tool {
  readonly name = 'trace';
  readonly cursor = 'crosshair';
  private state: State = { kind: 'idle' };
  private hover: Hover = null;

  constructor(private readonly host: ToolHost) {}

  private get store() {
    return this.host.store;
  }

  status(): string {
    const { draft, session } = this.store;
    if (this.state.kind === 'capturing') return 'Tracing the line…';
    if (this.state.kind === 'dragging-point') return 'Release where the point belongs.';
    if (this.state.kind === 'dragging-guide') return 'Release the guide on the line; the trace follows it.';
    const selected = draft.traces.find((t) => t.id === (session.selectedTrace ?? session.lastTraced));
    if (this.hover?.kind === 'point') return 'Drag to move this point; press Delete to remove it after clicking it.';
    if (this.hover?.kind === 'guide') return 'Drag this guide along the line to re-trace.';
    if (this.hover?.kind === 'line') {
      const t = draft.traces.find((x) => x.id === this.hover?.trace);
      if (t && t.id === selected?.id) return 'Alt-click to insert a point here; Shift-click to add a guide.';
      if (t) return `Click to select ${traceName(t, draft.units.diameter, powerUnit(draft.units))} for editing.`;
    }
    const problem = targetProblem(draft, session.target);
    if (problem) return problem;
    const extra = selected ? ` Shift-click adds a guide to ${traceName(selected, draft.units.diameter, powerUnit(draft.units))}.` : '';
    return `Click on the ${targetName(session.target, draft.units)} to trace it.${extra}`;
  }

  private findHover(p: CanvasPointer): Hover {
    const { draft, session } = this.store;
    const view = this.host.view();
    const selected = draft.traces.find((t) => t.id === session.selectedTrace && !t.hidden);
    if (selected && !selected.locked) {
      const g = nearestIndex(selected.guides, p.sheet);
      if (g && screenDistance(view, g.at, p.sheet) <= GRAB_PX) return { kind: 'guide', trace: selected.id, index: g.index };
      const pt = nearestIndex(pointsOf(selected), p.sheet);
      if (pt && screenDistance(view, pt.at, p.sheet) <= GRAB_PX) return { kind: 'point', trace: selected.id, index: pt.index };
    }
    let best: { trace: TraceDraft; d: number; at: SheetXY } | null = null;
    for (const t of draft.traces) {
      const pts = pointsOf(t);
      if (t.hidden || pts.length < 2) continue;
      const near = nearestOnPolyline(pts, p.sheet);
      const d = near.distance * view.zoom;
      if (d <= LINE_PX && (!best || d < best.d)) best = { trace: t, d, at: [near.point[0], near.point[1]] };
    }
    return best ? { kind: 'line', trace: best.trace.id, at: best.at } : null;
  }

  down(p: CanvasPointer): void {
    if (this.state.kind !== 'idle') return;
    const hover = this.findHover(p);
    const { session } = this.store;
    if (hover?.kind === 'point') {
      this.store.setSession({ selectedPoint: hover.index });
      this.state = { kind: 'dragging-point', trace: hover.trace, index: hover.index, at: p.sheet, from: p.sheet, moved: false };
      return;
    }
    if (hover?.kind === 'guide') {
      this.state = { kind: 'dragging-guide', trace: hover.trace, index: hover.index, at: p.sheet, moved: false };
      return;
    }
    const selected = session.selectedTrace;
    if (p.alt && hover?.kind === 'line' && hover.trace === selected) {
      this.store.dispatch(insertPoint(hover.trace, hover.at));
      return;
    }
    const guided = selected ?? session.lastTraced;
    if (p.shift && guided) {
      void this.addGuide(guided, p.sheet);
      return;
    }
    if (hover?.kind === 'line') {
      this.store.setSession({ selectedTrace: hover.trace, selectedPoint: null });
      return;
    }
    void this.traceNew(p.sheet);
  }

  move(p: CanvasPointer): void {
    this.host.magnify(p, p.sheet, false);
    if (this.state.kind === 'dragging-point') {
      const moved = this.state.moved || screenDistance(this.host.view(), this.state.from, p.sheet) > 2;
      this.state = { ...this.state, at: p.sheet, moved };
      this.host.setPreview({ kind: 'drag', trace: this.state.trace, index: this.state.index, at: p.sheet });
      return;
    }
    if (this.state.kind === 'dragging-guide') {
      const moved = this.state.moved || screenDistance(this.host.view(), this.state.at, p.sheet) > 2;
      this.state = { ...this.state, at: p.sheet, moved };
      this.host.setPreview({ kind: 'drag-guide', trace: this.state.trace, index: this.state.index, at: p.sheet });
      return;
    }
    if (this.state.kind !== 'idle') return;
    this.hover = this.findHover(p);
    const h = this.hover;
    if (h?.kind === 'point') this.host.setPreview({ kind: 'point', trace: h.trace, index: h.index });
    else if (h?.kind === 'line' && p.alt && h.trace === this.store.session.selectedTrace) this.host.setPreview({ kind: 'segment', trace: h.trace, at: h.at });
    else this.host.setPreview(null);
  }

  up(p: CanvasPointer): void {
    const s = this.state;
    if (s.kind === 'dragging-point') {
      this.state = { kind: 'idle' };
      this.host.setPreview(null);
      // A press without a move only selects the point (for Delete); it does not edit.
      if (s.moved) this.store.dispatch(movePoint(s.trace, s.index, p.sheet));
      return;
    }
    if (s.kind === 'dragging-guide') {
      this.state = { kind: 'idle' };
      this.host.setPreview(null);
      if (!s.moved) {
        this.store.setSession({ selectedTrace: s.trace });
        return;
      }
      const trace = this.store.draft.traces.find((t) => t.id === s.trace);
      if (!trace) return;
      const guides = trace.guides.map((g, i) => (i === s.index ? p.sheet : g)).sort((a, b) => a[0] - b[0]);
      void this.recapture(trace, guides, 'move guide');
    }
  }

  leave(): void {
    this.hover = null;
    if (this.state.kind === 'idle') this.host.setPreview(null);
  }

  key(event: KeyboardEvent): boolean {
    const { session } = this.store;
    if ((event.key === 'Delete' || event.key === 'Backspace') && session.selectedTrace && session.selectedPoint !== null) {
      if (this.store.dispatch(deletePoint(session.selectedTrace, session.selectedPoint))) this.store.setSession({ selectedPoint: null });
      return true;
    }
    if (event.key === 'Escape') {
      if (this.state.kind === 'dragging-point' || this.state.kind === 'dragging-guide') {
        this.state = { kind: 'idle' };
        this.host.setPreview(null);
        return true;
      }
      if (session.selectedTrace) {
        this.store.setSession({ selectedTrace: null, selectedPoint: null });
        return true;
      }
    }
    return false;
  }

  /** A guide on an untraced line: capture it as the target curve, then propose the next one. */
  private async traceNew(at: SheetXY): Promise<void> {
    const { draft, session } = this.store;
    let target = session.target;
    const clicked = panelAt(draft, at);
    if (clicked) target = retargetForPanel(draft, target, clicked);
    const problem = targetProblem(draft, target);
    if (problem) {
      this.store.setSession({ target });
      this.store.say(problem, 'error');
      return;
    }
    const panel = panelFor(draft, target);
    if (!panel) return;
    this.state = { kind: 'capturing' };
    this.host.setPending([at]);
    try {
      let points: SheetXY[] = [];
      let gaps: string[] = [];
      let moved: string[] = [];
      let failure: string | null = null;
      const spec = { panel: panel.id, quantity: target.quantity, ...(target.lines === 'iso' ? { iso: target.iso as number } : target.speed !== undefined ? { speed: target.speed } : { diameter: target.diameter as number }) };
      try {
        // With its panel (whose frame stops a raster trace) and its curve (whose head trace lends
        // its colour where lines run together), as the headless replay traces it.
        ({ points, gaps, moved } = await this.host.capture([at], 'auto', undefined, panel.id, undefined, spec));
      } catch (error) {
        failure = (error as Error).message;
      }
      const before = this.store.draft.traces.length;
      const already = tracesOfCurve(this.store.draft, target);
      // The guide is kept even when no line was found from it alone: more guides may find it.
      if (this.store.dispatch(addTrace(spec, [at], points))) {
        const made = this.store.draft.traces[before];
        const next = nextTarget(this.store.draft, target);
        // The new trace is not selected for editing, so that its points do not catch the next click.
        this.store.setSession({ lastTraced: made?.id ?? null, selectedTrace: null, selectedPoint: null, target: next });
        const name = made ? traceName(made, this.store.draft.units.diameter, powerUnit(this.store.draft.units)) : 'the curve';
        // Where the guide was read elsewhere than clicked (on a label over the line), the sentence says so.
        const where = moved.length ? ` ${moved.join(' ')}` : '';
        const shared = already.length && made ? ` ${sharedCurveSentence({ quantity: made.quantity, ...(made.diameter !== undefined ? { diameter: made.diameter } : {}), ...(made.speed !== undefined ? { speed: made.speed } : {}), ids: [...already.map((t) => t.id), made.id] }, this.store.draft.units.diameter)}` : '';
        if (failure) this.store.say(`${failure} The guide for ${name} is kept: Shift-click further guides along its line, or drag this guide onto it.${shared}`, 'caution');
        else if (shared) this.store.say(`Traced ${name}: ${points.length} points.${where}${shared}`, 'caution');
        else if (gaps.length) this.store.say(`Traced ${name} with ${points.length} points, but ${gaps.join(' ')} Add a guide beyond the gap with Shift-click.${where}`, 'caution');
        else this.store.say(`Traced ${name}: ${points.length} points.${where}`, 'done');
        if (made && made.quantity === 'head' && points.length >= 2) await this.host.retraceLeaning(made.id);
      }
    } finally {
      this.state = { kind: 'idle' };
      this.host.setPending([]);
    }
  }

  private async addGuide(traceId: string, at: SheetXY): Promise<void> {
    const trace = this.store.draft.traces.find((t) => t.id === traceId);
    if (!trace) return;
    if (trace.locked) {
      this.store.say('This trace is locked; unlock it in the list to add guides.', 'error');
      return;
    }
    if (trace.guides.length >= 3) {
      this.store.say('A trace takes at most three guides; drag one of them instead.', 'error');
      return;
    }
    await this.recapture(trace, withGuide(trace.guides, at), 'add guide');
  }

  private async recapture(trace: TraceDraft, guides: SheetXY[], label: string): Promise<void> {
    this.state = { kind: 'capturing' };
    this.host.setPending(guides);
    try {
      const { points, gaps, moved } = await this.host.capture(guides, trace.method, trace.extent, trace.panel, trace.id);
      this.store.dispatch(setGuides(trace.id, guides, points, label));
      if (gaps.length) this.store.say([...gaps, ...moved].join(' '), 'caution');
      else this.store.say([`Re-traced: ${points.length} points.`, ...moved].join(' '), 'done');
      if (trace.quantity === 'head' && points.length >= 2) await this.host.retraceLeaning(trace.id);
    } catch (error) {
      // The guides stay where they were placed; the points wait for a guide that finds the line.
      this.store.dispatch(setGuides(trace.id, guides, [], label));
      this.store.say(`${(error as Error).message} The guides are kept.`, 'caution');
    } finally {
      this.state = { kind: 'idle' };
      this.host.setPending([]);
    }
  }
}

function nearestIndex(points: readonly SheetXY[], p: SheetXY): { index: number; at: SheetXY } | null {
  let best: { index: number; at: SheetXY; d: number } | null = null;
  points.forEach((q, index) => {
    const d = Math.hypot(q[0] - p[0], q[1] - p[1]);
    if (!best || d < best.d) best = { index, at: q, d };
  });
  return best ? { index: (best as { index: number }).index, at: (best as { at: SheetXY }).at } : null;
}
