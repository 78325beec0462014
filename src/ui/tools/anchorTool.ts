/**
 * Placing anchors on the active panel: drag an anchor onto a labelled grid line or tick
 * (it snaps), or click a labelled tick to add an anchor there. An anchor near the bottom
 * or top edge reads the flow axis (x); one near the left or right edge reads the y axis.
 * States: idle → dragging an anchor → idle.
 */
import type { SheetXY } from '../../model/takeoff.ts';
import type { CanvasPointer } from '../canvas/sheetCanvas.ts';
import { addAnchor, moveAnchor } from '../store/actions/panels.ts';
import { frameOf, type Frame, type PanelDraft } from '../store/draft.ts';
import { screenDistance, type Tool, type ToolHost } from './tool.ts';

type State = { kind: 'idle' } | { kind: 'dragging'; panel: string; index: number; at: SheetXY };

const GRAB_PX = 9;

/** Which axis a new anchor at `at` reads: the nearer of the bottom/top edges (x) and left/right edges (y). */
export function axisNear(frame: Frame, at: SheetXY): 'x' | 'y' {
  const [l, t, r, b] = frame;
  const toHorizontalEdge = Math.min(Math.abs(at[1] - b), Math.abs(at[1] - t)) / Math.max(1e-9, b - t);
  const toVerticalEdge = Math.min(Math.abs(at[0] - l), Math.abs(at[0] - r)) / Math.max(1e-9, r - l);
  return toHorizontalEdge <= toVerticalEdge ? 'x' : 'y';
}

export class AnchorTool implements Tool {
  readonly name = 'anchor';
  readonly cursor = 'crosshair';
  private state: State = { kind: 'idle' };
  private hover: number | null = null;

  constructor(private readonly host: ToolHost) {}

  private panel(): PanelDraft | undefined {
    const { draft, session } = this.host.store;
    return draft.panels.find((p) => p.id === session.activePanel);
  }

  status(): string {
    const panel = this.panel();
    if (!panel) return 'Choose a panel in the list, or draw a new frame.';
    if (this.state.kind === 'dragging') return 'Release on a labelled grid line or tick; the anchor snaps to it. Hold Alt to place it freely.';
    if (this.hover !== null) return 'Drag this anchor onto a labelled grid line or tick, then type its value.';
    const missing = panel.anchors.findIndex((a) => a.x === undefined && a.y === undefined);
    if (missing >= 0) return `Type the value of anchor ${missing + 1} (${panel.anchors[missing]?.label ?? 'anchor'}) in the panel list, or drag it to a labelled tick first.`;
    return 'Click a labelled tick to add an anchor, or drag an anchor to move it; the residual updates as you go.';
  }

  private grab(p: CanvasPointer): number | null {
    const panel = this.panel();
    if (!panel) return null;
    let best: number | null = null;
    let bestD = GRAB_PX;
    panel.anchors.forEach((a, i) => {
      const d = screenDistance(this.host.view(), a.at, p.sheet);
      if (d <= bestD) {
        bestD = d;
        best = i;
      }
    });
    return best;
  }

  private landing(p: CanvasPointer): { at: SheetXY; snapped: boolean } {
    const s = p.alt ? null : this.host.snapNow(p.sheet);
    return s ? { at: s.at, snapped: true } : { at: p.sheet, snapped: false };
  }

  down(p: CanvasPointer): void {
    const panel = this.panel();
    if (!panel) return;
    const index = this.grab(p);
    if (index !== null) {
      this.state = { kind: 'dragging', panel: panel.id, index, at: panel.anchors[index]?.at ?? p.sheet };
      return;
    }
    const { at } = this.landing(p);
    const axis = axisNear(frameOf(panel), at);
    const count = panel.anchors.length;
    if (this.host.store.dispatch(addAnchor(panel.id, at, axis))) this.host.focusAnchorValue(panel.id, count);
  }

  move(p: CanvasPointer): void {
    void this.host.snap(p.sheet);
    const { at, snapped } = this.landing(p);
    this.host.magnify(p, at, snapped);
    if (this.state.kind === 'dragging') {
      this.state = { ...this.state, at };
      this.host.setPreview({ kind: 'snap', at, what: snapped ? 'crossing' : 'free' });
      return;
    }
    this.hover = this.grab(p);
    this.host.setPreview(this.hover !== null ? null : { kind: 'snap', at, what: snapped ? 'crossing' : 'free' });
  }

  up(p: CanvasPointer): void {
    if (this.state.kind !== 'dragging') return;
    const { panel, index } = this.state;
    const { at } = this.landing(p);
    this.state = { kind: 'idle' };
    this.host.setPreview(null);
    this.host.store.dispatch(moveAnchor(panel, index, at));
  }

  leave(): void {
    this.hover = null;
    if (this.state.kind === 'idle') this.host.setPreview(null);
  }

  key(event: KeyboardEvent): boolean {
    if (event.key === 'Escape' && this.state.kind === 'dragging') {
      this.state = { kind: 'idle' };
      this.host.setPreview(null);
      return true;
    }
    return false;
  }
}
