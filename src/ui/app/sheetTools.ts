/**
 * The host of the pointer tools: snapping, capture and the magnifier go through here to the
 * worker and the canvas, and it keeps what the tools show beside the record (the preview, the
 * guides waiting for their capture, anchors proposed from the sheet's text). It reaches the
 * workbench only through the narrow `SheetToolsDeps`.
 */
import type { Quantity } from '../../model/curveset.ts';
import type { SheetXY } from '../../model/takeoff.ts';
import type { Preview } from '../canvas/overlay.ts';
import type { CanvasPointer, SheetCanvas } from '../canvas/sheetCanvas.ts';
import type { Magnifier } from '../canvas/magnifier.ts';
import { plotsOfFrame, type TextItem } from '../geometry/hints.ts';
import type { Snap } from '../geometry/snap.ts';
import { useProposal } from '../store/actions/panels.ts';
import { frameOf, pointsOf, powerUnit } from '../store/draft.ts';
import type { Store } from '../store/store.ts';
import { snapRadius, type ToolHost } from '../tools/tool.ts';
import type { TraceSpec } from '../store/actions/traces.ts';
import type { AnchorProposal } from '../worker/protocol.ts';
import type { SheetWorkerClient } from '../worker/client.ts';
import type { SheetKind } from '../../digitize/sheet.ts';
import { tracesLeaningOn } from '../../digitize/companions.ts';
import { captureContext } from './captureContext.ts';
import { traceName } from '../store/actions/traces.ts';
import { num } from '../views/words.ts';
import type { Derived } from './bench.ts';
import { bestProposal } from './proposals.ts';

export interface SheetToolsDeps {
  readonly store: Store;
  readonly worker: SheetWorkerClient;
  readonly canvas: Pick<SheetCanvas, 'currentView' | 'redrawOverlay'>;
  readonly magnifier: Pick<Magnifier, 'show'>;
  readonly derived: Derived;
  /** What the chosen page turned out to be, once read. */
  loadedKind(): SheetKind | null;
  /** The text layer of the chosen page. */
  words(): readonly TextItem[];
  requestRender(): void;
}

export class SheetTools implements ToolHost {
  /** What the overlay previews (a drag, a point under the pointer). */
  preview: Preview | null = null;
  /** Guides placed and waiting for their capture. */
  pending: readonly SheetXY[] = [];
  private snapCache: { at: SheetXY; radius: number; snap: Snap | null } | null = null;
  private snapWanted: SheetXY | null = null;
  private snapBusy = false;
  private readonly proposals = new Map<string, AnchorProposal>();

  constructor(private readonly host: SheetToolsDeps) {}

  get store(): Store {
    return this.host.store;
  }

  /** Anchors proposed for the panels of another document do not apply to this one. */
  forgetProposals(): void {
    this.proposals.clear();
  }

  view() {
    return this.host.canvas.currentView;
  }

  setPreview(preview: Preview | null): void {
    this.preview = preview;
    this.host.canvas.redrawOverlay();
  }

  setPending(guides: readonly SheetXY[]): void {
    this.pending = guides;
    this.host.canvas.redrawOverlay();
  }

  snapNow(at: SheetXY): Snap | null {
    const c = this.snapCache;
    if (!c) return null;
    const near = Math.hypot(c.at[0] - at[0], c.at[1] - at[1]) <= c.radius * 0.3;
    if (!near || !c.snap) return null;
    return Math.hypot(c.snap.at[0] - at[0], c.snap.at[1] - at[1]) <= c.radius ? c.snap : null;
  }

  async snapOnce(at: SheetXY, radius?: number): Promise<Snap | null> {
    return this.host.worker.call('snap', { at: [at[0], at[1]], radius: radius ?? snapRadius(this.view()) }).catch(() => null);
  }

  /** Asks the worker where `at` snaps; one request at a time, the latest position wins. */
  async snap(at: SheetXY): Promise<Snap | null> {
    this.snapWanted = at;
    if (this.snapBusy) return this.snapNow(at);
    this.snapBusy = true;
    try {
      while (this.snapWanted) {
        const want = this.snapWanted;
        this.snapWanted = null;
        const radius = snapRadius(this.view());
        const snap = await this.host.worker.call('snap', { at: [want[0], want[1]], radius }).catch(() => null);
        this.snapCache = { at: want, radius, snap };
      }
    } finally {
      this.snapBusy = false;
    }
    return this.snapNow(at);
  }

  async capture(guides: readonly SheetXY[], method: 'auto' | 'vector' | 'raster', extent?: 'guides' | 'line', panel?: string, traceId?: string, curve?: TraceSpec): Promise<{ points: SheetXY[]; gaps: string[]; moved: string[] }> {
    this.host.store.setSession({ busy: true, progress: { label: 'Tracing…', fraction: null } });
    try {
      // The panel's frame, the other traces' guides and the same impeller's head trace, as the replay hands them in.
      const answer = await this.host.worker.call('capture', { guides: guides.map((g) => [g[0], g[1]]), method, ...(extent ? { extent } : {}), ...captureContext(this.host.store.draft, panel, traceId, curve) }, (p) => this.host.store.setSession({ progress: { label: p.label, fraction: p.fraction } }));
      if (answer.points.length < 2) {
        const why = answer.gaps.length ? ` (${answer.gaps.join(' ')})` : '';
        throw new Error(`No line could be followed from this click${why}; click right on the line, zoom in if lines run close, or add guides with Shift-click.`);
      }
      return { points: answer.points, gaps: [...answer.gaps, ...answer.doubts], moved: answer.moved };
    } finally {
      this.host.store.setSession({ busy: false, progress: null });
    }
  }

  async retraceLeaning(headId: string): Promise<void> {
    if (this.host.loadedKind() === 'vector-pdf') return;
    const draft = this.host.store.draft;
    const leaning = tracesLeaningOn(draft.traces, draft.traces.findIndex((t) => t.id === headId))
      .map((k) => draft.traces[k])
      .filter((t): t is NonNullable<typeof t> => t !== undefined && t.guides.length > 0 && !t.locked && !t.edited && t.points === undefined);
    const changed: string[] = [];
    // The re-traces belong to the head curve's edit, and one undo takes both back, while nothing
    // else was edited meanwhile. After another edit they are an undo step of their own: folded
    // into that edit instead, undoing it would take them back and leave the head curve traced.
    let ours = draft;
    for (const t of leaning) {
      try {
        const { points } = await this.capture(t.guides, t.method, t.extent, t.panel, t.id);
        const now = this.host.store.draft;
        const current = now.traces.find((x) => x.id === t.id);
        // Left as it is when the user changed it meanwhile, or when the capture came out the same.
        if (!current || current.guides !== t.guides || current.points !== undefined || samePoints(pointsOf(current), points)) continue;
        const folded = now === ours;
        this.host.store.dispatch(() => ({ draft: { ...now, traces: now.traces.map((x) => (x.id === t.id ? { ...x, captured: points } : x)) }, label: "trace again with the head curve's colour", undoable: !folded, keepsOrigin: true }));
        ours = this.host.store.draft;
        changed.push(traceName(t, now.units.diameter, powerUnit(now.units)));
      } catch {
        // A trace whose line is not found again keeps its points; its own re-trace says why.
      }
    }
    if (changed.length) this.host.store.say(`Traced again with the head curve's colour, as the take-off replays them: ${changed.join(', ')}.`, 'info');
  }

  magnify(p: CanvasPointer, mark: SheetXY | null, snapped: boolean): void {
    this.host.magnifier.show(p.sheet, p.screen, mark, snapped);
  }

  afterFrame(panelId: string): void {
    const panel = this.host.store.draft.panels.find((p) => p.id === panelId);
    if (!panel) return;
    const missing = panel.anchors.findIndex((a) => a.x === undefined && a.y === undefined);
    if (this.host.loadedKind() !== 'vector-pdf') {
      if (missing >= 0) this.focusAnchorValue(panelId, missing);
      return;
    }
    void this.host.worker.call('propose', {}).then((all) => {
      const best = bestProposal(all, frameOf(panel));
      if (best) {
        this.proposals.set(panelId, best);
        this.host.store.say(`Anchors were read from the sheet's text for this panel (residual ${num(best.residual, 2)} % of span). Check them, then click “Use the proposed anchors”.`, 'info');
        this.host.requestRender();
        requestAnimationFrame(() => requestAnimationFrame(() => (document.getElementById(`use-proposal-${panelId}`) as HTMLButtonElement | null)?.focus()));
      } else if (missing >= 0) this.focusAnchorValue(panelId, missing);
    }, () => {
      if (missing >= 0) this.focusAnchorValue(panelId, missing);
    });
  }

  flowAt(panelId: string, at: SheetXY): number | null {
    const c = this.host.derived.calibrations.get(panelId);
    return c?.ok ? c.calibration.toData(at)[0] : null;
  }

  guessPlots(frame: readonly [number, number, number, number]): Quantity | null {
    return plotsOfFrame(this.host.words(), frame);
  }

  proposalFor(panelId: string): AnchorProposal | null {
    return this.proposals.get(panelId) ?? null;
  }

  useProposal(panelId: string): void {
    const p = this.proposals.get(panelId);
    if (!p) return;
    const anchors = p.anchors.map((a) => ({ at: a.at, ...(a.x !== undefined ? { x: a.x, label: 'x' } : {}), ...(a.y !== undefined ? { y: a.y, label: 'y' } : {}) }));
    if (this.host.store.dispatch(useProposal(panelId, anchors, p.xScale, p.yScale))) {
      this.proposals.delete(panelId);
      this.host.store.say(`Took ${anchors.length} anchors from the sheet's text.`, 'done');
    }
  }

  focusAnchorValue(panelId: string, index: number): void {
    // The field appears with the next render.
    requestAnimationFrame(() => requestAnimationFrame(() => {
      const el = document.getElementById(`anchor-${panelId}-${index}`) as HTMLInputElement | null;
      el?.focus();
      el?.select();
    }));
  }
}

function samePoints(a: readonly SheetXY[], b: readonly SheetXY[]): boolean {
  return a.length === b.length && a.every((p, i) => p[0] === b[i]?.[0] && p[1] === b[i]?.[1]);
}
