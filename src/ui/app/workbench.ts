/**
 * The take-off workbench: lays out the screen, keeps the views in step with the store,
 * routes pointer events to the tool of the current step, and hosts the tools (snapping,
 * capture and the magnifier go through here to the worker and the canvas).
 */
import type { Quantity } from '../../model/curveset.ts';
import { parseUnit, toSI } from '../../units/index.ts';
import type { SheetXY } from '../../model/takeoff.ts';
import { h } from '../dom/h.ts';
import { morph } from '../dom/morph.ts';
import { paintScene, type Preview } from '../canvas/overlay.ts';
import { SheetCanvas, type CanvasPointer } from '../canvas/sheetCanvas.ts';
import { Magnifier } from '../canvas/magnifier.ts';
import type { Snap } from '../geometry/snap.ts';
import { Autosave } from '../persist/autosave.ts';
import { setGuides } from '../store/actions/traces.ts';
import { useProposal } from '../store/actions/panels.ts';
import type { AnchorProposal } from '../worker/protocol.ts';
import { bestProposal } from './proposals.ts';
import { plotsOfFrame } from '../geometry/hints.ts';
import type { Draft } from '../store/draft.ts';
import { Store, type Step } from '../store/store.ts';
import { panelAt, targetFor } from '../store/target.ts';
import { AnchorTool } from '../tools/anchorTool.ts';
import { FrameTool } from '../tools/frameTool.ts';
import { PickTool } from '../tools/pickTool.ts';
import { TraceTool } from '../tools/traceTool.ts';
import { snapRadius, type Tool, type ToolHost } from '../tools/tool.ts';
import { SheetWorkerClient } from '../worker/client.ts';
import { axesStep } from '../views/axesStep.ts';
import { emptyStage, keysHelp, statusLine, stepList, topBar } from '../views/chrome.ts';
import { familyChart } from '../views/familyChart.ts';
import { loadStep } from '../views/loadStep.ts';
import { reviewStep } from '../views/reviewStep.ts';
import { saveStep } from '../views/saveStep.ts';
import { traceStep } from '../views/traceStep.ts';
import { num, QUANTITY_NAMES, unitText } from '../views/words.ts';
import { EMPTY_DUTY, runDuty, type DutyForm, type DutyOutcome } from '../views/dutyPanel.ts';
import type { Bench, Derived, LoadedSheet } from './bench.ts';
import { DerivedState } from './derive.ts';
import { bindKeys, SHORTCUTS } from './keys.ts';
import { SheetFlow } from './sheetFlow.ts';
import { Downloads } from './downloads.ts';
import { downloadRecord } from '../views/recordDownload.ts';
import { paintStudyOverlay, studyOverlay } from '../views/recordOverlay.ts';

export class Workbench implements Bench, ToolHost {
  readonly store = new Store();
  readonly worker = new SheetWorkerClient();
  /** A second worker for the review: it replays the whole take-off while the first keeps tracing. */
  readonly reviewWorker = new SheetWorkerClient();
  readonly autosave = new Autosave();
  readonly canvas: SheetCanvas;
  readonly magnifier: Magnifier;
  readonly flow: SheetFlow;
  readonly downloads: Downloads;
  readout = '';
  private readonly derivedState: DerivedState;
  private preview: Preview | null = null;
  private pending: readonly SheetXY[] = [];
  private snapCache: { at: SheetXY; radius: number; snap: Snap | null } | null = null;
  private snapWanted: SheetXY | null = null;
  private snapBusy = false;
  private readonly tools: Record<'frame' | 'anchor' | 'trace' | 'pick', Tool>;
  private readonly proposals = new Map<string, AnchorProposal>();
  private readonly parts: { top: HTMLElement; side: HTMLElement; status: HTMLElement; chart: HTMLElement; stage: HTMLDivElement; keys: HTMLElement; empty: HTMLElement };
  private keysOpen = false;

  toggleKeys(): void {
    this.keysOpen = !this.keysOpen;
    this.requestRender();
    if (!this.keysOpen) document.getElementById('keys')?.focus();
  }
  private frameRequested = false;
  autosaved = '';
  private dutyForm: DutyForm = EMPTY_DUTY;
  private dutyMemo: { key: string; outcome: DutyOutcome } | null = null;
  library: { state: 'idle' | 'saving' | 'saved' | 'failed'; text: string } = { state: 'idle', text: '' };

  constructor(private readonly root: HTMLElement) {
    const stage = h('div', { class: 'stage', tabindex: '0', role: 'application', 'aria-label': 'The sheet. Zoom with the wheel, + and −; pan with the arrow keys or by dragging with the middle button or with Space held.' }) as HTMLDivElement;
    this.parts = { top: h('header'), side: h('aside', { class: 'side' }), status: h('footer'), chart: h('section', { class: 'chart-pane', 'aria-label': 'Family chart' }), stage, keys: h('div', { class: 'keys-host', hidden: true }), empty: emptyStage() };
    this.derivedState = new DerivedState(this.reviewWorker, () => this.requestRender(), () => this.downloads.names());
    root.replaceChildren(
      h('div', { class: 'workbench' },
        this.parts.top,
        h('div', { class: 'main' }, this.parts.side, h('section', { class: 'stage-wrap' }, stage, this.parts.empty, this.parts.chart, this.parts.keys)),
        this.parts.status));
    this.canvas = new SheetCanvas(stage, this.worker, (ctx, view) => {
      paintScene(ctx, view, {
        draft: this.store.draft,
        session: this.store.session,
        calibrated: new Set([...this.derived.calibrations].filter(([, c]) => c.ok).map(([id]) => id)),
        fits: this.derived.fits,
        preview: this.preview,
        pendingGuides: this.pending,
        proposals: this.sceneProposals(),
      });
      if (this.studyOnSheet && this.store.session.step === 'review') paintStudyOverlay(ctx, view, studyOverlay(this.derived.takeoff, this.dutyResult()));
    });
    this.magnifier = new Magnifier(stage, this.canvas);
    this.tools = { frame: new FrameTool(this), anchor: new AnchorTool(this), trace: new TraceTool(this), pick: new PickTool(this) };
    this.canvas.setInput({
      down: (p) => this.activeTool()?.down(p),
      move: (p) => {
        this.updateReadout(p);
        this.activeTool()?.move(p);
        // A pointer move changes the status line and the overlay only, never the step list.
        this.requestRender('light');
      },
      up: (p) => this.activeTool()?.up(p),
      leave: () => {
        this.magnifier.hide();
        this.activeTool()?.leave();
        this.readout = '';
        this.requestRender('light');
      },
    });
    this.canvas.onView(() => this.requestRender('light'));
    this.flow = new SheetFlow(this);
    this.downloads = new Downloads(this);
    this.store.subscribe((_, reason) => {
      if (reason !== 'session') {
        const before = this.calibratedPanels();
        this.derivedState.update(this.store.draft, this.flow.pageReady);
        this.flow.autosaveNow();
        if (reason === 'edit') this.afterCalibration(before);
      }
      this.requestRender();
    });
    bindKeys(this);
    this.bindDrop();
    this.requestRender();
  }

  get sheet(): LoadedSheet | null {
    return this.flow.sheet;
  }

  get derived(): Derived {
    return this.derivedState.current;
  }

  /** Recomputes what follows from the draft (after the worker has read the page). */
  refreshDerived(): void {
    this.derivedState.update(this.store.draft, this.flow.pageReady);
    this.requestRender();
  }

  get zoomPercent(): number {
    return Math.round(this.canvas.currentView.zoom * 100);
  }

  activeTool(): Tool | null {
    const { session, draft } = this.store;
    if (!draft.sheet || !this.flow.pageReady) return null;
    switch (session.step) {
      case 'axes':
        return session.drawingFrame || draft.panels.length === 0 || !session.activePanel ? this.tools.frame : this.tools.anchor;
      case 'trace':
        return this.tools.trace;
      case 'review':
      case 'save':
        return this.tools.pick;
      default:
        return null;
    }
  }

  nextClick(): string {
    const { draft, session } = this.store;
    if (!draft.sheet) return 'Open a sheet in step 1: click “Open a sheet…” or drop a file on the window.';
    if (session.step === 'load') return this.sheet && this.sheet.pages.length > 1 ? 'Click a page picture to choose the page, or go on to “Set the axes”.' : 'Go on to “Set the axes” (press 2).';
    if (!this.flow.pageReady) return 'Reading the page…';
    return this.activeTool()?.status() ?? '';
  }

  // ── rendering ──────────────────────────────────────────────────────────────

  private pendingScope: 'all' | 'light' = 'light';

  /** Redraws on the next frame: 'light' is the status line and the overlay; 'all' is every view. */
  requestRender(scope: 'all' | 'light' = 'all'): void {
    if (scope === 'all') this.pendingScope = 'all';
    if (this.frameRequested) return;
    this.frameRequested = true;
    requestAnimationFrame(() => {
      this.frameRequested = false;
      const full = this.pendingScope === 'all';
      this.pendingScope = 'light';
      if (full) this.render();
      else this.renderLight();
    });
  }

  private renderLight(): void {
    morph(this.parts.status, statusLine(this));
    this.parts.stage.style.cursor = this.activeTool()?.cursor ?? 'default';
    this.canvas.redrawOverlay();
  }

  private lastStep: Step | null = null;

  private render(): void {
    const step = this.store.session.step;
    morph(this.parts.top, topBar(this, this.autosaved, this.keysOpen, () => this.toggleKeys()));
    this.parts.keys.hidden = !this.keysOpen;
    if (this.keysOpen && !this.parts.keys.firstChild) this.parts.keys.append(keysHelp(SHORTCUTS, () => this.toggleKeys()));
    this.parts.empty.hidden = this.store.draft.sheet !== null;
    morph(this.parts.side, h('aside', { class: 'side' }, stepList(this, { load: loadStep, axes: axesStep, trace: traceStep, review: reviewStep, save: (b) => saveStep(b, this.library) })));
    morph(this.parts.status, statusLine(this));
    const showChart = (this.store.session.step === 'review' || this.store.session.step === 'save') && this.derived.curveSet !== null;
    this.parts.chart.hidden = !showChart;
    if (showChart && this.derived.curveSet) {
      const highlighted = this.store.draft.traces.find((t) => t.id === this.store.session.highlightedTrace);
      const highlight = highlighted?.diameter !== undefined ? { diameter_m: this.diameterSI(highlighted.diameter), quantity: highlighted.quantity } : null;
      const outcome = this.duty.outcome;
      const overlay = outcome && 'overlay' in outcome ? outcome.overlay : null;
      morph(this.parts.chart, h('section', { class: 'chart-pane', 'aria-label': 'Family chart' }, h('h3', null, overlay ? 'Family chart with the duty' : 'Family chart'), familyChart(this.derived.curveSet, this.store.session.unitSystem, overlay, highlight)));
    }
    this.parts.stage.style.cursor = this.activeTool()?.cursor ?? 'default';
    this.canvas.redrawOverlay();
    if (step !== this.lastStep) {
      // A newly opened step starts at its top.
      this.lastStep = step;
      this.parts.side.querySelector(`#step-${step}`)?.scrollIntoView({ block: 'start' });
    }
  }

  private diameterSI(d: number): number | undefined {
    try {
      return toSI(d, parseUnit('diameter', this.store.draft.units.diameter));
    } catch {
      return undefined;
    }
  }

  private updateReadout(p: CanvasPointer): void {
    const { draft } = this.store;
    const panel = panelAt(draft, p.sheet);
    const cal = panel ? this.derived.calibrations.get(panel.id) : undefined;
    if (!panel || !cal?.ok) {
      this.readout = `sheet ${num(p.sheet[0], 4)}, ${num(p.sheet[1], 4)}`;
      return;
    }
    const d = cal.calibration.toData(p.sheet);
    const yName = { head: 'H', efficiency: 'η', power: 'P', npshr: 'NPSHr' }[panel.plots];
    this.readout = `Q ${num(d[0], 4)} ${unitText(panel.units.x)} · ${yName} ${num(d[1], 4)} ${unitText(panel.units.y)} (${QUANTITY_NAMES[panel.plots].toLowerCase()} panel)`;
  }

  private sceneProposals(): { at: SheetXY; axis: 'x' | 'y'; value: number }[] {
    const { session } = this.store;
    if (session.step !== 'axes' || !session.activePanel) return [];
    const p = this.proposals.get(session.activePanel);
    if (!p) return [];
    return p.anchors.map((a) => (a.x !== undefined ? { at: a.at, axis: 'x' as const, value: a.x } : { at: a.at, axis: 'y' as const, value: a.y ?? 0 }));
  }

  private calibratedPanels(): Set<string> {
    return new Set([...this.derived.calibrations].filter(([, c]) => c.ok).map(([id]) => id));
  }

  /** When an edit completes the active panel's axes, the next drag draws the next panel. */
  private afterCalibration(before: Set<string>): void {
    const { session, draft } = this.store;
    const id = session.activePanel;
    if (session.step !== 'axes' || !id || before.has(id) || !this.calibratedPanels().has(id)) return;
    const panel = draft.panels.find((p) => p.id === id);
    const cal = this.derived.calibrations.get(id);
    if (!panel || !cal?.ok) return;
    const order: Quantity[] = ['head', 'efficiency', 'power', 'npshr'];
    const next = order.find((q) => !draft.panels.some((p) => p.plots === q)) ?? 'head';
    this.store.setSession({ drawingFrame: true, activePanel: null, framePlots: next });
    this.store.say(`${QUANTITY_NAMES[panel.plots]} panel set: residual ${num(cal.calibration.maxPercentOfSpan, 2)} % of span. Draw the frame of the next panel, or go on to “Trace the curves”.`, 'done');
  }

  get duty(): { form: DutyForm; outcome: DutyOutcome } {
    const set = this.derived.curveSet;
    if (!set) return { form: this.dutyForm, outcome: null };
    const key = `${this.store.session.unitSystem}|${JSON.stringify(this.dutyForm)}`;
    if (this.dutyMemo?.key !== key || this.dutyMemoSet !== set) {
      this.dutyMemo = { key, outcome: runDuty(set, this.dutyForm, this.store.session.unitSystem) };
      this.dutyMemoSet = set;
    }
    return { form: this.dutyForm, outcome: this.dutyMemo.outcome };
  }

  private dutyMemoSet: unknown = null;

  setDuty(patch: Partial<DutyForm>): void {
    this.dutyForm = { ...this.dutyForm, ...patch };
    this.requestRender();
  }

  studyOnSheet = false;

  showStudyOnSheet(on: boolean): void {
    this.studyOnSheet = on;
    this.requestRender();
  }

  private dutyResult() {
    const o = this.duty.outcome;
    return o && 'result' in o ? o.result : null;
  }

  downloadRecord(paper: 'a4' | 'letter'): void {
    void downloadRecord({ store: this.store, derived: this.derived, outcome: this.duty.outcome, sheetBytes: this.flow.sheetBytes }, paper);
  }

  // ── commands the views call ────────────────────────────────────────────────

  openFiles(files: readonly File[]): void {
    void this.flow.openFiles(files);
  }

  choosePage(page: number): void {
    void this.flow.choosePage(page);
  }

  goto(step: Step): void {
    const { draft, session } = this.store;
    const patch: Partial<typeof session> = { step, highlightedTrace: step === 'review' ? session.highlightedTrace : null };
    if (step === 'axes' && !session.activePanel && draft.panels.length === 0) patch.drawingFrame = true;
    if (step === 'trace') {
      const t = session.target;
      if (!draft.panels.some((p) => p.plots === t.quantity) && !(t.lines === 'iso' && draft.panels.some((p) => p.plots === 'head'))) patch.target = targetFor(draft, draft.panels[0]?.plots ?? 'head');
      else if (t.lines === 'diameter' && (t.diameter === undefined || !draft.diameters.includes(t.diameter))) patch.target = targetFor(draft, t.quantity);
    }
    this.store.setSession(patch);
    this.magnifier.hide();
    this.preview = null;
  }

  startFrame(plots: Quantity): void {
    this.store.setSession({ step: 'axes', drawingFrame: true, framePlots: plots });
    this.parts.stage.focus({ preventScroll: true });
  }

  selectPanel(id: string): void {
    const panel = this.store.draft.panels.find((p) => p.id === id);
    this.store.setSession({ activePanel: this.store.session.activePanel === id ? null : id, drawingFrame: false });
    if (panel) {
      const [l, t, r, b] = panel.frame;
      this.canvas.showRect([l, t, r - l, b - t], 60);
    }
  }

  showTrace(id: string | null): void {
    this.store.setSession({ highlightedTrace: id });
    const trace = this.store.draft.traces.find((t) => t.id === id);
    const panel = trace ? this.store.draft.panels.find((p) => p.id === trace.panel) : undefined;
    if (panel) {
      const [l, t, r, b] = panel.frame;
      this.canvas.showRect([l, t, r - l, b - t], 40);
    }
  }

  retrace(id: string): void {
    const trace = this.store.draft.traces.find((t) => t.id === id);
    if (!trace || trace.guides.length === 0) return;
    void this.capture(trace.guides, trace.method).then(
      ({ points, gaps }) => {
        this.store.dispatch(setGuides(id, trace.guides, points, 're-trace'));
        this.store.say(gaps.length ? gaps.join(' ') : `Re-traced: ${points.length} points.`, gaps.length ? 'caution' : 'done');
      },
      (error: Error) => this.store.say(error.message, 'error'),
    );
  }

  download(what: 'takeoff' | 'curveset' | 'csv'): void {
    this.downloads.download(what);
  }

  saveToLibrary(): void {
    void this.downloads.saveToLibrary();
  }

  zoom(action: 'in' | 'out' | 'fit'): void {
    if (action === 'fit') this.canvas.fitPage();
    else this.canvas.zoomBy(action === 'in' ? 1.25 : 0.8);
  }

  // ── tool host ──────────────────────────────────────────────────────────────

  view() {
    return this.canvas.currentView;
  }

  setPreview(preview: Preview | null): void {
    this.preview = preview;
    this.canvas.redrawOverlay();
  }

  setPending(guides: readonly SheetXY[]): void {
    this.pending = guides;
    this.canvas.redrawOverlay();
  }

  snapNow(at: SheetXY): Snap | null {
    const c = this.snapCache;
    if (!c) return null;
    const near = Math.hypot(c.at[0] - at[0], c.at[1] - at[1]) <= c.radius * 0.3;
    if (!near || !c.snap) return null;
    return Math.hypot(c.snap.at[0] - at[0], c.snap.at[1] - at[1]) <= c.radius ? c.snap : null;
  }

  async snapOnce(at: SheetXY, radius?: number): Promise<Snap | null> {
    return this.worker.call('snap', { at: [at[0], at[1]], radius: radius ?? snapRadius(this.view()) }).catch(() => null);
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
        const snap = await this.worker.call('snap', { at: [want[0], want[1]], radius }).catch(() => null);
        this.snapCache = { at: want, radius, snap };
      }
    } finally {
      this.snapBusy = false;
    }
    return this.snapNow(at);
  }

  async capture(guides: readonly SheetXY[], method: 'auto' | 'vector' | 'raster'): Promise<{ points: SheetXY[]; gaps: string[] }> {
    this.store.setSession({ busy: true, progress: { label: 'Tracing…', fraction: null } });
    try {
      const answer = await this.worker.call('capture', { guides: guides.map((g) => [g[0], g[1]]), method }, (p) => this.store.setSession({ progress: { label: p.label, fraction: p.fraction } }));
      if (answer.points.length < 2) {
        const why = answer.gaps.length ? ` (${answer.gaps.join(' ')})` : '';
        throw new Error(`No line could be followed from this click${why}; click right on the line, zoom in if lines run close, or add guides with Shift-click.`);
      }
      return { points: answer.points, gaps: answer.gaps };
    } finally {
      this.store.setSession({ busy: false, progress: null });
    }
  }

  magnify(p: CanvasPointer, mark: SheetXY | null, snapped: boolean): void {
    this.magnifier.show(p.sheet, p.screen, mark, snapped);
  }

  afterFrame(panelId: string): void {
    const panel = this.store.draft.panels.find((p) => p.id === panelId);
    if (!panel) return;
    const missing = panel.anchors.findIndex((a) => a.x === undefined && a.y === undefined);
    if (this.sheet?.loadedKind !== 'vector-pdf') {
      if (missing >= 0) this.focusAnchorValue(panelId, missing);
      return;
    }
    void this.worker.call('propose', {}).then((all) => {
      const best = bestProposal(all, panel.frame);
      if (best) {
        this.proposals.set(panelId, best);
        this.store.say(`Anchors were read from the sheet's text for this panel (residual ${num(best.residual, 2)} % of span). Check them, then click “Use the proposed anchors”.`, 'info');
        this.requestRender();
        requestAnimationFrame(() => requestAnimationFrame(() => (document.getElementById(`use-proposal-${panelId}`) as HTMLButtonElement | null)?.focus()));
      } else if (missing >= 0) this.focusAnchorValue(panelId, missing);
    }, () => {
      if (missing >= 0) this.focusAnchorValue(panelId, missing);
    });
  }

  flowAt(panelId: string, at: SheetXY): number | null {
    const c = this.derived.calibrations.get(panelId);
    return c?.ok ? c.calibration.toData(at)[0] : null;
  }

  guessPlots(frame: readonly [number, number, number, number]): Quantity | null {
    return plotsOfFrame(this.flow.words, frame);
  }

  proposalFor(panelId: string): AnchorProposal | null {
    return this.proposals.get(panelId) ?? null;
  }

  useProposal(panelId: string): void {
    const p = this.proposals.get(panelId);
    if (!p) return;
    const anchors = p.anchors.map((a) => ({ at: a.at, ...(a.x !== undefined ? { x: a.x, label: 'x' } : {}), ...(a.y !== undefined ? { y: a.y, label: 'y' } : {}) }));
    if (this.store.dispatch(useProposal(panelId, anchors, p.xScale, p.yScale))) {
      this.proposals.delete(panelId);
      this.store.say(`Took ${anchors.length} anchors from the sheet's text.`, 'done');
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

  restoreDraft(draft: Draft, step: Step): void {
    this.store.replace(draft, { step });
  }

  private bindDrop(): void {
    const body = document.body;
    body.addEventListener('dragover', (e) => {
      if (!e.dataTransfer?.types.includes('Files')) return;
      e.preventDefault();
      body.classList.add('dropping');
    });
    body.addEventListener('dragleave', (e) => {
      if (e.target === body || !(e.relatedTarget instanceof Node)) body.classList.remove('dropping');
    });
    body.addEventListener('drop', (e) => {
      e.preventDefault();
      body.classList.remove('dropping');
      const files = [...(e.dataTransfer?.files ?? [])];
      if (files.length) this.openFiles(files);
    });
  }

  get stageElement(): HTMLDivElement {
    return this.parts.stage;
  }

}
