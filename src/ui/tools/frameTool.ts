/**
 * Drawing a panel's frame: drag from one corner of the plot area to the opposite one (or
 * click both corners). Corners snap to grid-line crossings. States: idle → dragging → idle,
 * or idle → first corner placed → idle.
 */
import type { SheetXY } from '../../model/takeoff.ts';
import type { CanvasPointer } from '../canvas/sheetCanvas.ts';
import { addPanel, frameAnchors } from '../store/actions/panels.ts';
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

  private landing(p: CanvasPointer): { at: SheetXY; snapped: boolean } {
    const s = p.alt ? null : this.host.snapNow(p.sheet);
    return s ? { at: s.at, snapped: true } : { at: p.sheet, snapped: false };
  }

  down(p: CanvasPointer): void {
    const { at } = this.landing(p);
    if (this.state.kind === 'second') {
      this.commit(this.state.start, at);
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
    this.commit(this.state.start, at);
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

  private commit(a: SheetXY, b: SheetXY): void {
    this.state = { kind: 'idle' };
    this.host.setPreview(null);
    const store = this.host.store;
    const plots = store.session.framePlots;
    const frame: Frame = [Math.min(a[0], b[0]), Math.min(a[1], b[1]), Math.max(a[0], b[0]), Math.max(a[1], b[1])];
    const shared = sharedFlowAnchors(store.draft.panels, frame);
    const anchors = frameAnchors(frame);
    const withShared = shared ? [...shared, ...anchors.filter((x) => anchorAxis(x) === 'y')] : anchors;
    const before = store.draft.panels.length;
    if (!store.dispatch(addPanel({ corner1: a, corner2: b, plots, anchors: withShared }))) return;
    const panel = store.draft.panels[before];
    if (!panel) return;
    store.setSession({ activePanel: panel.id, drawingFrame: false });
    this.host.afterFrame(panel.id);
  }
}
