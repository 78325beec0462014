/**
 * Drawing a panel's frame: drag from one corner of the plot area to the opposite one (or
 * click both corners). Corners snap to grid-line crossings. States: idle → dragging → idle,
 * or idle → first corner placed → idle.
 */
import type { SheetXY } from '../../model/takeoff.ts';
import type { CanvasPointer } from '../canvas/sheetCanvas.ts';
import { addPanel, frameAnchors, nameCorners } from '../store/actions/panels.ts';
import { anchorAxis, type Frame, type PanelDraft } from '../store/draft.ts';
import { screenDistance, type Tool, type ToolHost } from './tool.ts';

type State = { kind: 'idle' } | { kind: 'dragging'; start: SheetXY; moved: boolean } | { kind: 'second'; start: SheetXY };

const PLOTS = { head: 'head', efficiency: 'efficiency', power: 'power', npshr: 'NPSHr' } as const;

/**
 * x anchors of a panel that shares the flow axis with a new frame (same left and right edges
 * within 1.5 % of the width), moved down onto the new frame's bottom edge with their values.
 */
export function sharedFlowAnchors(panels: readonly PanelDraft[], frame: Frame): PanelDraft['anchors'] | null {
  const width = frame[2] - frame[0];
  for (const p of panels) {
    const same = Math.abs(p.frame[0] - frame[0]) <= 0.015 * width && Math.abs(p.frame[2] - frame[2]) <= 0.015 * width;
    if (!same) continue;
    const xs = p.anchors.filter((a) => a.x !== undefined && a.y === undefined);
    if (xs.length < 2) continue;
    return xs.map((a) => ({ ...a, at: [a.at[0], frame[3]] as SheetXY }));
  }
  return null;
}

export class FrameTool implements Tool {
  readonly name = 'frame';
  readonly cursor = 'crosshair';
  private state: State = { kind: 'idle' };

  constructor(private readonly host: ToolHost) {}

  status(): string {
    const plots = PLOTS[this.host.store.session.framePlots];
    if (this.state.kind === 'idle') return `Drag from one corner of the ${plots} plot area to the opposite corner; corners snap to grid-line crossings.`;
    if (this.state.kind === 'dragging') return 'Release on the opposite corner of the plot area.';
    return `Click the opposite corner of the ${plots} plot area, or press Escape to start again.`;
  }

  /** True when the last pointer event held Alt: corners are placed as they are. */
  private free = false;

  private landing(p: CanvasPointer): { at: SheetXY; snapped: boolean } {
    this.free = p.alt;
    const s = p.alt ? null : this.host.snapNow(p.sheet);
    return s ? { at: s.at, snapped: true } : { at: p.sheet, snapped: false };
  }

  down(p: CanvasPointer): void {
    const { at } = this.landing(p);
    if (this.state.kind === 'second') {
      void this.commit(this.state.start, at);
      return;
    }
    this.state = { kind: 'dragging', start: at, moved: false };
  }

  move(p: CanvasPointer): void {
    void this.host.snap(p.sheet);
    const { at, snapped } = this.landing(p);
    this.host.magnify(p, at, snapped);
    if (this.state.kind === 'idle') {
      this.host.setPreview({ kind: 'snap', at, what: snapped ? 'crossing' : 'free' });
      return;
    }
    if (this.state.kind === 'dragging' && screenDistance(this.host.view(), this.state.start, at) > 4) this.state = { ...this.state, moved: true };
    this.host.setPreview({ kind: 'frame', a: this.state.start, b: at, snapped });
  }

  up(p: CanvasPointer): void {
    if (this.state.kind !== 'dragging') return;
    const { at } = this.landing(p);
    if (!this.state.moved) {
      this.state = { kind: 'second', start: this.state.start };
      return;
    }
    void this.commit(this.state.start, at);
  }

  leave(): void {
    if (this.state.kind === 'idle') this.host.setPreview(null);
  }

  key(event: KeyboardEvent): boolean {
    if (event.key === 'Escape' && this.state.kind !== 'idle') {
      this.state = { kind: 'idle' };
      this.host.setPreview(null);
      return true;
    }
    return false;
  }

  private async commit(a: SheetXY, b: SheetXY): Promise<void> {
    this.state = { kind: 'idle' };
    this.host.setPreview(null);
    const store = this.host.store;
    // The two corners not dragged to are found on the sheet too: a scan turned by a fraction
    // of a degree puts them a few pixels off the rectangle through the dragged ones.
    const guesses: SheetXY[] = [a, b, [b[0], a[1]], [a[0], b[1]]];
    const found = this.free ? guesses.map(() => null) : await Promise.all(guesses.map((g) => this.host.snapOnce(g)));
    const corners = nameCorners(guesses.map((g, i) => (found[i]?.what === 'crossing' ? found[i].at : g)));
    const all = [corners.bottomLeft, corners.bottomRight, corners.topLeft, corners.topRight];
    const xs = all.map((p) => p[0]);
    const ys = all.map((p) => p[1]);
    const frame: Frame = [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)];
    const titled = this.host.guessPlots(frame);
    const chosen = store.session.framePlots;
    const plots = titled ?? chosen;
    const shared = sharedFlowAnchors(store.draft.panels, frame);
    const anchors = frameAnchors(frame, corners);
    const withShared = shared ? [...shared, ...anchors.filter((x) => anchorAxis(x) === 'y')] : anchors;
    const before = store.draft.panels.length;
    if (!store.dispatch(addPanel({ corner1: [frame[0], frame[1]], corner2: [frame[2], frame[3]], plots, anchors: withShared }))) return;
    const panel = store.draft.panels[before];
    if (!panel) return;
    store.setSession({ activePanel: panel.id, drawingFrame: false, framePlots: plots });
    if (titled && titled !== chosen) store.say(`The title beside this frame says it plots ${PLOTS[titled]}; change it in the panel list if not.`, 'info');
    this.host.afterFrame(panel.id);
  }
}
