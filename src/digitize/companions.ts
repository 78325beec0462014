/**
 * The same impeller's head trace for a trace of another quantity: for each efficiency, power or
 * NPSHr trace, the guides of the head trace of the same impeller (or the same speed). A sheet in
 * colour mostly draws one impeller's curves in one colour on every panel, and its head curves
 * stand apart where the other quantities bunch (at low flow), so a raster trace whose own guides
 * sit in a bunch can try the colour its head curve was clicked on (`traceRaster`'s
 * `companions`). Only the head curve: the other quantities are often drawn thinner, dashed or
 * dotted, and their samples say little of the line's width. The replay and the workbench both
 * hand them in by this one rule. Pure.
 */
import { sheetPoint, type SheetPoint } from './points.ts';

interface TraceLike {
  quantity: string;
  diameter?: number | undefined;
  speed?: number | undefined;
  iso?: number | undefined;
  limit?: unknown;
  points?: readonly unknown[] | undefined;
  guides?: readonly (readonly [number, number])[] | undefined;
}

const labelOf = (t: TraceLike): string | undefined => (t.iso !== undefined || t.limit !== undefined ? undefined : t.diameter !== undefined ? `d${t.diameter}` : t.speed !== undefined ? `n${t.speed}` : undefined);

/** The companions' guides of trace `index` (none for a head trace, an iso-trace, a limit line or an unlabelled trace). */
export function companionGuidesOf(traces: readonly TraceLike[], index: number): SheetPoint[][] {
  const t = traces[index];
  const own = t && labelOf(t);
  if (!t || own === undefined || t.quantity === 'head') return [];
  return traces
    .filter((o) => o !== t && o.quantity === 'head' && labelOf(o) === own && (o.points?.length ?? 0) === 0 && (o.guides?.length ?? 0) > 0)
    .map((o) => (o.guides ?? []).map(([x, y]) => sheetPoint(x, y)));
}

/** One list of guide lists per trace: its companions' guides. */
export function companionGuides(traces: readonly TraceLike[]): SheetPoint[][][] {
  return traces.map((_, k) => companionGuidesOf(traces, k));
}

/**
 * The traces that take trace `index` as their companion: for a head trace with guides, the same
 * impeller's (or speed's) efficiency, power and NPSHr traces; none for any other trace. When a head
 * trace is traced or its guides move, these are the traces whose capture it changes.
 */
export function tracesLeaningOn(traces: readonly TraceLike[], index: number): number[] {
  const head = traces[index];
  if (!head || head.quantity !== 'head' || labelOf(head) === undefined || (head.points?.length ?? 0) > 0 || (head.guides?.length ?? 0) === 0) return [];
  const out: number[] = [];
  traces.forEach((t, k) => {
    if (k !== index && t.quantity !== 'head' && labelOf(t) === labelOf(head)) out.push(k);
  });
  return out;
}
