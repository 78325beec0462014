/** A tool host that answers from plain data, so that pointer tools can be driven without a browser. */
import type { SheetXY } from '../../src/model/takeoff.ts';
import type { CanvasPointer } from '../../src/ui/canvas/sheetCanvas.ts';
import type { Preview } from '../../src/ui/canvas/overlay.ts';
import type { Snap } from '../../src/ui/geometry/snap.ts';
import { Store } from '../../src/ui/store/store.ts';
import type { Draft } from '../../src/ui/store/draft.ts';
import type { ToolHost } from '../../src/ui/tools/tool.ts';
import type { TraceSpec } from '../../src/ui/store/actions/traces.ts';
import type { Quantity } from '../../src/model/curveset.ts';

export class FakeHost implements ToolHost {
  readonly store: Store;
  preview: Preview | null = null;
  pending: readonly SheetXY[] = [];
  captures: SheetXY[][] = [];
  focused: [string, number] | null = null;
  /** Snaps to the nearest of these points within 5 units. */
  crossings: SheetXY[] = [];
  /** What a capture answers for the guides it is given. */
  tracer: (guides: readonly SheetXY[]) => SheetXY[] = (g) => [[g[0]![0] - 50, g[0]![1]], [g[0]![0] + 50, g[0]![1]]];
  plots: Quantity | null = null;
  /** Sentences a capture says about guides read elsewhere than clicked. */
  moved: string[] = [];

  constructor(draft: Draft) {
    this.store = new Store(draft, { step: 'trace' });
  }

  view() {
    return { zoom: 1, offsetX: 0, offsetY: 0 };
  }

  private nearest(at: SheetXY, radius = 5): Snap | null {
    const c = this.crossings.find((p) => Math.hypot(p[0] - at[0], p[1] - at[1]) <= radius);
    return c ? { at: [c[0], c[1]], what: 'crossing' } : null;
  }

  async snap(at: SheetXY) { return this.nearest(at); }
  snapNow(at: SheetXY) { return this.nearest(at); }
  async snapOnce(at: SheetXY, radius?: number) { return this.nearest(at, radius ?? 5); }
  setPreview(p: Preview | null) { this.preview = p; }
  setPending(g: readonly SheetXY[]) { this.pending = g; }
  /** What each capture was asked for besides its guides: the panel, the trace captured again, the curve of a new trace. */
  captureAsked: { panel?: string | undefined; traceId?: string | undefined; curve?: TraceSpec | undefined }[] = [];
  async capture(guides: readonly SheetXY[], _method?: string, _extent?: string, panel?: string, traceId?: string, curve?: TraceSpec) {
    this.captures.push([...guides]);
    this.captureAsked.push({ panel, traceId, curve });
    const points = this.tracer(guides);
    if (points.length < 2) throw new Error('No line could be followed from this click.');
    return { points, gaps: [], moved: this.moved };
  }
  /** The head traces after whose capture the traces leaning on them were asked to be traced again. */
  leaningAsked: string[] = [];
  async retraceLeaning(headId: string) { this.leaningAsked.push(headId); }
  magnify() {}
  /** What every panel reads as flow at any point: null for uncalibrated panels. */
  flow: number | null = null;
  flowAt(): number | null { return this.flow; }
  guessPlots() { return this.plots; }
  afterFrame() {}
  focusAnchorValue(panelId: string, index: number) { this.focused = [panelId, index]; }
}

export function pointer(x: number, y: number, mods: Partial<CanvasPointer> = {}): CanvasPointer {
  return { sheet: [x, y], screen: [x, y], button: 0, shift: false, alt: false, ctrl: false, ...mods };
}

/** Lets pending promises (captures, snaps) finish. */
export const settle = () => new Promise((r) => setTimeout(r, 0));
