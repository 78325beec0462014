/**
 * A bridge through a bunch laid along the bunch's own edges. Where a line runs together with
 * others, the follower cannot see it, and its two ends outside the bunch are joined by a smooth
 * curve. The bunch itself is drawn, though: its edges are the outer lines' own edges. Across the
 * bridge, the run of ink (any colour) around each bridge point is the bunch; the line keeps its
 * place in it: as far from the edge it lies beside at both ends of the bridge (moving evenly
 * from the one distance to the other), or at the same share of the bunch's width when it lies
 * beside different edges at the two ends. Pure: pixel coordinates in and out.
 */
import { colourDistance } from './colour.ts';
import { findRuns, sampleInkSection, type ReadCounter, type Run } from './lineProfile.ts';
import type { LineStyle } from './lineFollow.ts';
import type { RasterImage } from './raster.ts';

type Px = [number, number];

/** Widest bunch, in line widths, that a bridge is laid along. */
const MAX_BAND_WIDTHS = 8;

/**
 * The points of a bridge from `points[0]` to its last point, each moved across the bridge to its
 * place in the bunch (see the file comment); the points as given where the bunch cannot be seen
 * at either end, and each point as given where no bunch lies under it.
 */
export function alongBand(image: RasterImage, style: LineStyle, points: readonly Px[], counter: ReadCounter): Px[] {
  const n = points.length;
  if (n < 5) return [...points];
  const normals = points.map((_, i) => {
    const a = points[Math.max(0, i - 1)] as Px;
    const b = points[Math.min(n - 1, i + 1)] as Px;
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1;
    return [-(b[1] - a[1]) / len, (b[0] - a[0]) / len] as Px;
  });
  const bands = points.map((p, i) => bandAt(image, style, p, normals[i] as Px, counter));
  const first = bands[0];
  const last = bands[n - 1];
  if (!first || !last) return [...points];
  // Which edge of the bunch the line lies beside at each end. An end where the line stands alone
  // (the bunch there no wider than the line) says nothing: it takes the other end's side. With
  // no bunch at either end, or the line beside different edges at the two ends, nothing tells
  // where the line runs inside the bunch, and the bridge is left as it is.
  const real0 = first.high - first.low >= 0.5 * style.width;
  const real1 = last.high - last.low >= 0.5 * style.width;
  if (!real0 && !real1) return [...points];
  const low0 = -first.low <= first.high;
  const low1 = -last.low <= last.high;
  const side0 = real0 ? low0 : low1;
  const side1 = real1 ? low1 : low0;
  if (side0 !== side1) return [...points];
  const laid = points.map((p, i): Px => {
    const band = bands[i];
    if (!band || i === 0 || i === n - 1) return p;
    const t = i / (n - 1);
    const offset = side0 ? band.low + (1 - t) * -first.low + t * -last.low : band.high - ((1 - t) * first.high + t * last.high);
    const nx = (normals[i] as Px)[0];
    const ny = (normals[i] as Px)[1];
    return [p[0] + nx * offset, p[1] + ny * offset];
  });
  return laid.every((p) => Number.isFinite(p[0]) && Number.isFinite(p[1])) ? laid : [...points];
}

/**
 * The run of ink (any colour at least the line's threshold of its contrast with the paper) across
 * `normal` through `p` that covers `p` or lies within a width of it, as offsets of its edges from
 * `p`, inner by half a line width (the centres of the outer lines); undefined when none does or it
 * is wider than `MAX_BAND_WIDTHS` widths.
 */
function bandAt(image: RasterImage, style: LineStyle, p: Px, normal: Px, counter: ReadCounter): { low: number; high: number } | undefined {
  const paper = style.model.paper;
  const full = colourDistance(paper, ...style.model.line);
  if (full <= 0) return undefined;
  const spacing = 0.5;
  const reach = MAX_BAND_WIDTHS * style.width + 4;
  const m = Math.ceil(reach / spacing);
  const section = new Float64Array(2 * m + 1);
  sampleInkSection(image, paper, full, p[0], p[1], normal[0], normal[1], m, spacing, section, counter);
  const runs: Run[] = [];
  let best: Run | undefined;
  for (const r of findRuns(section, m, spacing, style.threshold, runs)) {
    const d = r.lowEdge <= 0 && r.highEdge >= 0 ? 0 : Math.min(Math.abs(r.lowEdge), Math.abs(r.highEdge));
    if (d <= style.width && (!best || d < (best.lowEdge <= 0 && best.highEdge >= 0 ? 0 : Math.min(Math.abs(best.lowEdge), Math.abs(best.highEdge))))) best = r;
  }
  if (!best || best.highEdge - best.lowEdge > MAX_BAND_WIDTHS * style.width) return undefined;
  const low = best.lowEdge + style.width / 2;
  const high = best.highEdge - style.width / 2;
  return high >= low ? { low, high } : { low: (low + high) / 2, high: (low + high) / 2 };
}
