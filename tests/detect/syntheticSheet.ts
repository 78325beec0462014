/**
 * A small INVENTED vector sheet built as paths and text (no PDF): one or more framed panels
 * with grid, tick labels and titles, curves given as functions, and free text. For the
 * detector's rules, where each case needs one thing changed.
 */
import type { PathSegment, SheetText, VectorPath } from '../../src/digitize/sheet.ts';
import { sheetPoint } from '../../src/digitize/points.ts';

export interface PanelSpec {
  title: string;
  frame: [number, number, number, number];
  x: { min: number; max: number; step: number };
  y: { min: number; max: number; step: number };
  /** Curves as value(flow) over [0, end], with a stroke colour. */
  curves: { value: (q: number) => number; end: number; stroke?: string; from?: number }[];
  /** Tick labels printed as these texts instead of the values (for unreadable axes). */
  yTexts?: string[];
}

const P = (x: number, y: number) => sheetPoint(x, y);
const path = (points: [number, number][], stroke: string, lineWidth: number, close = false): VectorPath => ({
  segments: [{ kind: 'move', to: P(...points[0]!) }, ...points.slice(1).map((p): PathSegment => ({ kind: 'line', to: P(...p) })), ...(close ? [{ kind: 'close' } as PathSegment] : [])],
  stroke,
  fill: null,
  lineWidth,
  dashed: false,
});
const text = (t: string, x: number, y: number, size = 8, angle = 0): SheetText => ({ text: t, at: P(x, y), size, width: 0.5 * size * t.length, angle });

export function toSheet(p: PanelSpec, q: number, v: number): [number, number] {
  const [l, t, r, b] = p.frame;
  return [l + ((q - p.x.min) / (p.x.max - p.x.min)) * (r - l), b - ((v - p.y.min) / (p.y.max - p.y.min)) * (b - t)];
}

export function syntheticSheet(panels: readonly PanelSpec[], extraText: SheetText[] = [], flowTitle = 'Flow (m3/h)'): { paths: VectorPath[]; text: SheetText[] } {
  const paths: VectorPath[] = [];
  const texts: SheetText[] = [...extraText];
  panels.forEach((p, k) => {
    const [l, t, r, b] = p.frame;
    for (let v = p.x.min; v <= p.x.max + 1e-9; v += p.x.step) {
      const [x] = toSheet(p, v, p.y.min);
      paths.push(path([[x, t], [x, b]], '#c0c0c0', 0.4));
      const s = String(Number(v.toPrecision(10)));
      texts.push(text(s, x - 2 * s.length, b + 10));
    }
    let i = 0;
    for (let v = p.y.min; v <= p.y.max + 1e-9; v += p.y.step, i++) {
      const [, y] = toSheet(p, p.x.min, v);
      paths.push(path([[l, y], [r, y]], '#c0c0c0', 0.4));
      const s = p.yTexts?.[i] ?? String(Number(v.toPrecision(10)));
      texts.push(text(s, l - 4 - 4 * s.length, y + 2.8));
    }
    paths.push(path([[l, t], [r, t], [r, b], [l, b]], '#000000', 0.8, true));
    texts.push(text(p.title, l - 30, (t + b) / 2 + 20, 8, -Math.PI / 2));
    texts.push(text(flowTitle, (l + r) / 2 - 20, b + 22));
    for (const [j, c] of p.curves.entries()) {
      const pts: [number, number][] = [];
      const from = c.from ?? 0;
      for (let n = 0; n <= 120; n++) {
        const q = from + ((c.end - from) * n) / 120;
        pts.push(toSheet(p, q, c.value(q)));
      }
      paths.push(path(pts, c.stroke ?? ['#cc0000', '#0000cc', '#008800', '#884400'][(j + k) % 4]!, 1.2));
    }
  });
  return { paths, text: texts };
}

/** Text at a point of a panel, centred on it (a label sitting on a curve). */
export function labelOn(p: PanelSpec, q: number, v: number, words: string, size = 7): SheetText {
  const [x, y] = toSheet(p, q, v);
  return text(words, x - 0.25 * size * words.length, y + 0.35 * size, size);
}

/** Text just past a curve's end (a label beside it). */
export function labelBeside(p: PanelSpec, q: number, v: number, words: string, size = 7): SheetText {
  const [x, y] = toSheet(p, q, v);
  return text(words, x + 3, y + 0.35 * size - 4, size);
}
