/**
 * Drawing a panel's frame: drag from one corner of the plot area to the opposite one (or
 * click both corners). Corners snap to grid-line crossings. States: idle → dragging → idle,
 * or idle → first corner placed → idle.
 */
import type { SheetXY } from '../../model/takeoff.ts';
import type { CanvasPointer } from '../canvas/sheetCanvas.ts';
import { addPanel, frameAnchors, nameCorners, type FrameCorners } from '../store/actions/panels.ts';
import { frameOf, anchorAxis, type AnchorDraft, type Frame, type PanelDraft } from '../store/draft.ts';
import { screenDistance, snapRadius, type Tool, type ToolHost } from './tool.ts';
import { roundSignificant } from '../../units/format.ts';
import { QUANTITY_WORDS } from '../views/words.ts';

type State = { kind: 'idle' } | { kind: 'dragging'; start: SheetXY; moved: boolean } | { kind: 'second'; start: SheetXY };


/**
 * Flow values for the bottom corners of a new frame, from a panel already set that shares the
 * flow axis (its frame spans the same width within 1.5 %): the flow that panel's calibration
 * reads at each corner, taken as the round value of one of its anchors when within 0.5 % of
 * the span (stacked panels usually share their end values), else as read. A scan turned by a
 * degree moves the flow axis sideways between panels, so the values are read, not copied.
 */
export function sharedFlowAnchors(
  panels: readonly PanelDraft[],
  frame: Frame,
  corners: Pick<FrameCorners, 'bottomLeft' | 'bottomRight'>,
  flowAt: (panelId: string, at: SheetXY) => number | null,
): AnchorDraft[] | null {
  const width = frame[2] - frame[0];
  for (const p of panels) {
    const f = frameOf(p);
    const same = Math.abs(f[0] - frame[0]) <= 0.015 * width && Math.abs(f[2] - frame[2]) <= 0.015 * width;
    const values = p.anchors.flatMap((a) => (a.x !== undefined && a.y === undefined ? [a.x] : []));
    if (!same || values.length < 2) continue;
    const x0 = flowAt(p.id, corners.bottomLeft);
    const x1 = flowAt(p.id, corners.bottomRight);
    if (x0 === null || x1 === null || x0 === x1) continue;
    const span = Math.abs(x1 - x0);
    const settle = (x: number) => {
      const near = values.reduce((best, v) => (Math.abs(v - x) < Math.abs(best - x) ? v : best), values[0] as number);
      return Math.abs(near - x) <= 0.005 * span ? near : roundSignificant(x, 4);
    };
    return [
      { at: corners.bottomLeft, label: 'x left', x: settle(x0) },
      { at: corners.bottomRight, label: 'x right', x: settle(x1) },
    ];
  }
  return null;
}

export class FrameTool implements Tool {
  readonly name = 'frame';
  readonly cursor = 'crosshair';
  private state: State = { kind: 'idle' };

  constructor(private readonly host: ToolHost) {}

  status(): string {
    const plots = QUANTITY_WORDS[this.host.store.session.framePlots];
    if (this.state.kind === 'idle') {
      const { panels } = this.host.store.draft;
      // Every panel calibrated (found by the detector, or set by hand): the next step is tracing, not another frame.
      const set = panels.filter((p) => { const f = frameOf(p); return this.host.flowAt(p.id, [f[0], f[3]] as SheetXY) !== null; }).length;
      if (panels.length > 0 && set === panels.length) return `All ${panels.length} panel${panels.length === 1 ? ' is' : 's are'} calibrated: go on to “Trace the curves” (3), or drag over another ${plots} plot area to add a panel.`;
      const more = panels.length > 0 ? ' When every panel is set, go on to “Trace the curves” (3).' : '';
      return `Drag from one corner of the ${plots} plot area to the opposite corner; corners snap to grid-line crossings.${more}`;
    }
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
    // A turn of one degree moves a far corner by almost 2 % of the frame: search the two
    // corners not dragged to over 4 % of the frame's diagonal.
    const reach = Math.max(snapRadius(this.host.view()), 0.04 * Math.hypot(b[0] - a[0], b[1] - a[1]));
    const find = async (g: SheetXY, wide: boolean): Promise<SheetXY> => {
      const first = await this.host.snapOnce(g, wide ? reach : undefined);
      if (!first || first.what === 'line') return g;
      if (first.what === 'crossing') return first.at;
      // Found from afar: look again close by, where the two lines show as a crossing.
      const close = await this.host.snapOnce(first.at);
      return close && close.what !== 'line' ? close.at : first.at;
    };
    const corners = nameCorners(this.free ? guesses : await Promise.all(guesses.map((g, i) => find(g, i >= 2))));
    const all = [corners.bottomLeft, corners.bottomRight, corners.topLeft, corners.topRight];
    const xs = all.map((p) => p[0]);
    const ys = all.map((p) => p[1]);
    const frame: Frame = [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)];
    const titled = this.host.guessPlots(frame);
    const chosen = store.session.framePlots;
    const plots = titled ?? chosen;
    const shared = sharedFlowAnchors(store.draft.panels, frame, corners, (id, at) => this.host.flowAt(id, at));
    const anchors = frameAnchors(frame, corners);
    const withShared = shared ? [...shared, ...anchors.filter((x) => anchorAxis(x) === 'y')] : anchors;
    const before = store.draft.panels.length;
    if (!store.dispatch(addPanel({ corner1: [frame[0], frame[1]], corner2: [frame[2], frame[3]], plots, anchors: withShared }))) return;
    const panel = store.draft.panels[before];
    if (!panel) return;
    store.setSession({ activePanel: panel.id, drawingFrame: false, framePlots: plots });
    if (titled && titled !== chosen) store.say(`The title beside this frame says it plots ${QUANTITY_WORDS[titled]}; change it in the panel list if not.`, 'info');
    this.host.afterFrame(panel.id);
  }
}
