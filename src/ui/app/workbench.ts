/**
 * The take-off workbench, as wiring: lays out the screen, keeps the views in step with the
 * store, routes pointer events to the tool the open step names (src/ui/steps), and connects
 * the parts — the sheet flow (opening, restoring, autosave), the sheet tools (snapping,
 * capture, magnifier, proposals), the derived review and the downloads — each through a
 * narrow interface.
 */
import type { Quantity } from '../../model/curveset.ts';
import { parseUnit, toSI } from '../../units/index.ts';
import type { SheetXY } from '../../model/takeoff.ts';
import { h } from '../dom/h.ts';
import { morph } from '../dom/morph.ts';
import { paintScene } from '../canvas/overlay.ts';
import { SheetCanvas, type CanvasPointer } from '../canvas/sheetCanvas.ts';
import { Magnifier } from '../canvas/magnifier.ts';
import { Autosave } from '../persist/autosave.ts';
import { setGuides } from '../store/actions/traces.ts';
import type { AnchorProposal } from '../worker/protocol.ts';
import { axisUnits, frameOf } from '../store/draft.ts';
import { Store, type Step } from '../store/store.ts';
import { STEP_DEFINITIONS, stepDefinition } from '../steps/registry.ts';
import { panelAt } from '../store/target.ts';
import { AnchorTool } from '../tools/anchorTool.ts';
import { FrameTool } from '../tools/frameTool.ts';
import { PickTool } from '../tools/pickTool.ts';
import { TraceTool } from '../tools/traceTool.ts';
import type { Tool } from '../tools/tool.ts';
import { SheetTools } from './sheetTools.ts';
import { SheetWorkerClient } from '../worker/client.ts';
import { emptyStage, keysHelp, statusLine, stepList, topBar } from '../views/chrome.ts';
import { familyChart } from '../views/familyChart.ts';
import { num, QUANTITY_NAMES, unitText } from '../views/words.ts';
import { EMPTY_DUTY, runDuty, type DutyForm, type DutyOutcome } from '../views/dutyPanel.ts';
import type { Bench, Derived, LoadedSheet } from './bench.ts';
import { DerivedState } from './derive.ts';
import { bindKeys, SHORTCUTS } from './keys.ts';
import { SheetFlow } from './sheetFlow.ts';
import { Downloads } from './downloads.ts';
import { Detection, type OpenQuestion } from './detection.ts';
import { downloadRecord } from '../views/recordDownload.ts';
import { paintStudyOverlay, studyOverlay } from '../views/recordOverlay.ts';

export class Workbench implements Bench {
  readonly store = new Store();
  readonly worker = new SheetWorkerClient();
  /** A second worker for the review: it replays the whole take-off while the first keeps tracing. */
  readonly reviewWorker = new SheetWorkerClient();
  readonly autosave = new Autosave();
  readonly canvas: SheetCanvas;
  readonly magnifier: Magnifier;
  readonly flow: SheetFlow;
  readonly downloads: Downloads;
  /** "Find panels and curves": the automatic take-off of a vector page, and its questions. */
  readonly detection: Detection;
  readout = '';
  private readonly derivedState: DerivedState;
  private readonly tools: Record<'frame' | 'anchor' | 'trace' | 'pick', Tool>;
  /** The pointer tools' host: snapping, capture, magnifier, previews and proposed anchors. */
  readonly sheetTools: SheetTools;
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

  constructor(root: HTMLElement) {
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
        // The canvas paints once while the workbench is still being built, before its tools exist.
        preview: (this.sheetTools as SheetTools | undefined)?.preview ?? null,
        pendingGuides: (this.sheetTools as SheetTools | undefined)?.pending ?? [],
        proposals: this.sceneProposals(),
        layers: stepDefinition(this.store.session.step).layers,
      });
      if (this.studyOnSheet && this.store.session.step === 'review') paintStudyOverlay(ctx, view, studyOverlay(this.derived.takeoff, this.dutyResult()));
    });
    this.magnifier = new Magnifier(stage, this.canvas);
    const bench = this;
    this.sheetTools = new SheetTools({
      store: this.store,
      worker: this.worker,
      canvas: this.canvas,
      magnifier: this.magnifier,
      get derived() {
        return bench.derived;
      },
      loadedKind: () => this.sheet?.loadedKind ?? null,
      words: () => this.flow.words,
      requestRender: () => this.requestRender(),
    });
    const host = this.sheetTools;
    this.tools = { frame: new FrameTool(host), anchor: new AnchorTool(host), trace: new TraceTool(host), pick: new PickTool(host) };
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
    this.detection = new Detection({
      store: this.store,
      worker: this.worker,
      pageReady: () => this.flow.pageReady && (this.flow.sheet?.loadedKind ?? null) !== null,
      ocrBase: () => new URL('ocr/', document.baseURI).href,
      requestRender: () => this.requestRender(),
      goto: (step) => this.goto(step),
    });
    let kept = { step: this.store.session.step, target: this.store.session.target, unitSystem: this.store.session.unitSystem };
    this.store.subscribe((_, reason) => {
      const { step, target, unitSystem } = this.store.session;
      if (reason === 'session' && (step !== kept.step || target !== kept.target || unitSystem !== kept.unitSystem)) {
        // Where the engineer is belongs to the document too: a reload comes back to it.
        kept = { step, target, unitSystem };
        this.flow.autosaveNow();
      }
      if (reason === 'replace') {
        this.sheetTools.forgetProposals();
        this.detection.reset();
      }
      if (reason === 'document') this.flow.autosaveNow();
      else if (reason !== 'session') {
        const before = this.calibratedPanels();
        this.derivedState.update(this.store.draft, this.flow.pageReady);
        this.flow.autosaveNow();
        if (reason === 'edit') this.afterCalibration(before);
      }
      this.requestRender();
    });
    bindKeys(this);
    // A write still waiting when the page goes (a reload, a closed tab) is made at once.
    window.addEventListener('pagehide', () => void this.autosave.flush());
    this.bindDrop();
    this.requestRender();
  }

  get sheet(): LoadedSheet | null {
    return this.flow.sheet;
  }

  get sheetBytes() {
    return this.flow.sheetBytes;
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
    const name = stepDefinition(session.step).tool(draft, session);
    return name ? this.tools[name] : null;
  }

  nextClick(): string {
    const { draft, session } = this.store;
    if (!draft.sheet) return 'Open a sheet in step 1: click “Open a sheet…” or drop a file on the window.';
    const step = stepDefinition(session.step);
    if (!step.tool(draft, session) && step.hint) return step.hint(this);
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
    morph(this.parts.side, h('aside', { class: 'side' }, stepList(this, STEP_DEFINITIONS)));
    morph(this.parts.status, statusLine(this));
    const showChart = stepDefinition(step).chart && this.derived.curveSet !== null;
    this.parts.chart.hidden = !showChart;
    if (showChart && this.derived.curveSet) {
      const highlighted = this.store.draft.traces.find((t) => t.id === this.store.session.highlightedTrace);
      const highlight = highlighted?.diameter !== undefined ? { diameter_m: this.diameterSI(highlighted.diameter), quantity: highlighted.quantity } : highlighted?.speed !== undefined ? { speed_rpm: highlighted.speed, quantity: highlighted.quantity } : null;
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
    this.readout = `Q ${num(d[0], 4)} ${unitText(axisUnits(draft.units, panel).x)} · ${yName} ${num(d[1], 4)} ${unitText(axisUnits(draft.units, panel).y)} (${QUANTITY_NAMES[panel.plots].toLowerCase()} panel)`;
  }

  private sceneProposals(): { at: SheetXY; axis: 'x' | 'y'; value: number }[] {
    const { session } = this.store;
    if (session.step !== 'axes' || !session.activePanel) return [];
    const p = this.sheetTools.proposalFor(session.activePanel);
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
    this.store.setSession({ step, highlightedTrace: null, ...stepDefinition(step).enter?.(draft, session) });
    this.magnifier.hide();
    this.sheetTools.preview = null;
  }

  startFrame(plots: Quantity): void {
    this.store.setSession({ step: 'axes', drawingFrame: true, framePlots: plots });
    this.parts.stage.focus({ preventScroll: true });
  }

  selectPanel(id: string): void {
    const panel = this.store.draft.panels.find((p) => p.id === id);
    this.store.setSession({ activePanel: this.store.session.activePanel === id ? null : id, drawingFrame: false });
    if (panel) {
      const [l, t, r, b] = frameOf(panel);
      this.canvas.showRect([l, t, r - l, b - t], 60);
    }
  }

  showTrace(id: string | null): void {
    this.store.setSession({ highlightedTrace: id });
    const trace = this.store.draft.traces.find((t) => t.id === id);
    const panel = trace ? this.store.draft.panels.find((p) => p.id === trace.panel) : undefined;
    if (panel) {
      const [l, t, r, b] = frameOf(panel);
      this.canvas.showRect([l, t, r - l, b - t], 40);
    }
  }

  retrace(id: string): void {
    const trace = this.store.draft.traces.find((t) => t.id === id);
    if (!trace || trace.guides.length === 0) return;
    void this.sheetTools.capture(trace.guides, trace.method, trace.extent, trace.panel, id).then(
      ({ points, gaps, moved }) => {
        this.store.dispatch(setGuides(id, trace.guides, points, 're-trace'));
        this.store.say(gaps.length ? [...gaps, ...moved].join(' ') : [`Re-traced: ${points.length} points.`, ...moved].join(' '), gaps.length ? 'caution' : 'done');
        // A head curve lends its colour to the same impeller's other traces, as in the trace tool.
        if (trace.quantity === 'head' && points.length >= 2) void this.sheetTools.retraceLeaning(id);
      },
      (error: Error) => this.store.say(error.message, 'error'),
    );
  }

  download(what: 'takeoff' | 'curveset' | 'csv'): void {
    this.downloads.download(what);
  }

  saveToLibrary(asNew = false): void {
    void this.downloads.saveToLibrary(asNew);
  }

  zoom(action: 'in' | 'out' | 'fit'): void {
    if (action === 'fit') this.canvas.fitPage();
    else this.canvas.zoomBy(action === 'in' ? 1.25 : 0.8);
  }

  // ── the automatic take-off ─────────────────────────────────────────────────

  get detect(): { available: boolean; running: boolean; question: OpenQuestion | null } {
    return { available: this.detection.available, running: this.detection.running, question: this.detection.question() };
  }

  findPanelsAndCurves(): void {
    void this.detection.run();
  }

  answerQuestion(text: string): void {
    void this.detection.answer(text);
  }

  skipQuestion(): void {
    this.detection.skip();
  }

  // ── proposals (held by the sheet tools) ───────────────────────────────────

  proposalFor(panelId: string): AnchorProposal | null {
    return this.sheetTools.proposalFor(panelId);
  }

  useProposal(panelId: string): void {
    this.sheetTools.useProposal(panelId);
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
