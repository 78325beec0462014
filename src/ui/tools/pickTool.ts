/**
 * Review (step 4): a click on the sheet picks the nearest trace and highlights it, so that
 * its residuals and findings show in the review list. Nothing is edited here.
 */
import { nearestOnPolyline } from '../../digitize/polyline.ts';
import type { CanvasPointer } from '../canvas/sheetCanvas.ts';
import { traceName } from '../store/actions/traces.ts';
import { powerUnit, pointsOf } from '../store/draft.ts';
import type { Tool, ToolHost } from './tool.ts';

const PICK_PX = 8;

export class PickTool implements Tool {
  readonly name = 'pick';
  readonly cursor = 'pointer';
  private hover: string | null = null;

  constructor(private readonly host: ToolHost) {}

  status(): string {
    const { draft } = this.host.store;
    const t = draft.traces.find((x) => x.id === this.hover);
    if (t) return `Click to pick out ${traceName(t, draft.units.diameter, powerUnit(draft.units))} and its residuals.`;
    return 'Click a trace to pick it out; dashed magenta lines are the fitted curves drawn back onto the sheet.';
  }

  private nearest(p: CanvasPointer): string | null {
    const view = this.host.view();
    let best: { id: string; d: number } | null = null;
    for (const t of this.host.store.draft.traces) {
      const pts = pointsOf(t);
      if (t.hidden || pts.length < 2) continue;
      const d = nearestOnPolyline(pts, p.sheet).distance * view.zoom;
      if (d <= PICK_PX && (!best || d < best.d)) best = { id: t.id, d };
    }
    return best?.id ?? null;
  }

  down(p: CanvasPointer): void {
    const id = this.nearest(p);
    this.host.store.setSession({ highlightedTrace: id, selectedTrace: id });
  }

  move(p: CanvasPointer): void {
    this.host.magnify(p, p.sheet, false);
    this.hover = this.nearest(p);
  }

  up(): void {}

  leave(): void {
    this.hover = null;
  }

  key(event: KeyboardEvent): boolean {
    if (event.key === 'Escape' && this.host.store.session.highlightedTrace) {
      this.host.store.setSession({ highlightedTrace: null });
      return true;
    }
    return false;
  }
}
