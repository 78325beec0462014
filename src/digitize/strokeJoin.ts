/**
 * Joining the pieces of one drawn stroke. Renderers often break a curve into several paths;
 * pieces of the same style whose ends coincide within a small tolerance are chained, and where
 * more than two ends meet (a grid crossing, say) the straightest continuation is taken first.
 */
import { sheetPoint, type SheetPoint } from './points.ts';

export interface Piece {
  readonly points: readonly SheetPoint[];
  readonly closed: boolean;
  /** Same style key = may be one stroke (colour, width, dash). */
  readonly style: string;
  readonly stroke: string | null;
  readonly lineWidth: number;
  /**
   * The outline a filled piece was read from. For a dot (a one-point piece standing for a sliver
   * of a dash) a line it ends runs to the sliver's far edge, not to its middle.
   */
  readonly extent?: readonly SheetPoint[];
  /**
   * Index of the drawn path the piece came from. The dashes one path holds are one stroke: they
   * join one another before any dash of another path (bunched dashed curves, each drawn as one
   * path of many dashes, would otherwise swap dashes where they run close).
   */
  readonly path?: number;
}

export interface StrokeLine {
  readonly points: SheetPoint[];
  readonly closed: boolean;
  readonly style: string;
  readonly stroke: string | null;
  readonly lineWidth: number;
  /** Number of pieces joined. */
  readonly pieces: number;
  /** Every segment level or upright: a grid line, a frame, a tick. */
  readonly gridLike: boolean;
  /** [minX, minY, maxX, maxY]. */
  readonly box: readonly [number, number, number, number];
}

/** Largest turn accepted at a join, radians: a curve's pieces continue smoothly, a grid corner turns 90°. */
const MAX_TURN = (60 * Math.PI) / 180;
/**
 * Some programs write a dashed line as its dashes. Ends of the same style up to this far apart
 * (sheet units) are bridged when the gap runs along both ends' directions, as a dash gap does.
 */
export const DEFAULT_BRIDGE = 8;
/** Added to the cost of joining pieces of two drawn paths that each hold several: every join within a path comes first. */
const CROSS_PATH = 1e6;
const BRIDGE_ALIGN = Math.cos((20 * Math.PI) / 180);

export function joinPieces(pieces: readonly Piece[], tolerance: number, bridge = DEFAULT_BRIDGE): StrokeLine[] {
  const byStyle = new Map<string, Piece[]>();
  for (const p of pieces) {
    const list = byStyle.get(p.style);
    if (list) list.push(p);
    else byStyle.set(p.style, [p]);
  }
  const out: StrokeLine[] = [];
  for (const group of byStyle.values()) out.push(...joinGroup(group, tolerance, Math.max(bridge, tolerance)));
  return out;
}

interface End {
  piece: number;
  /** 0 = start of the piece, 1 = end. */
  side: 0 | 1;
  at: SheetPoint;
  /** Unit direction pointing out of the piece at this end. */
  out: [number, number];
}

function joinGroup(group: readonly Piece[], tolerance: number, bridge: number): StrokeLine[] {
  const lines: StrokeLine[] = [];
  const open: Piece[] = [];
  for (const p of group) (p.closed ? lines.push(makeLine([p.points], true, p, 1)) : open.push(p));
  if (open.length === 0) return lines;

  const ends: End[] = [];
  open.forEach((p, k) => {
    ends.push({ piece: k, side: 0, at: p.points[0] as SheetPoint, out: outward(p.points, 0) });
    ends.push({ piece: k, side: 1, at: p.points[p.points.length - 1] as SheetPoint, out: outward(p.points, 1) });
  });

  // Candidate joins through a grid of cells as wide as the largest gap bridged.
  const cell = Math.max(bridge, 1e-9);
  const grid = new Map<string, number[]>();
  const key = (x: number, y: number) => `${Math.floor(x / cell)},${Math.floor(y / cell)}`;
  ends.forEach((e, i) => {
    const k = key(e.at[0], e.at[1]);
    const list = grid.get(k);
    if (list) list.push(i);
    else grid.set(k, [i]);
  });
  // Pieces per drawn path: a path of two or more pieces is one stroke written in parts.
  const perPath = new Map<number, number>();
  for (const p of open) if (p.path !== undefined) perPath.set(p.path, (perPath.get(p.path) ?? 0) + 1);
  const apart = (a: Piece, b: Piece) => a.path !== undefined && b.path !== undefined && a.path !== b.path && (perPath.get(a.path) ?? 0) > 1 && (perPath.get(b.path) ?? 0) > 1;
  const candidates: { i: number; j: number; cost: number }[] = [];
  ends.forEach((e, i) => {
    const cx = Math.floor(e.at[0] / cell);
    const cy = Math.floor(e.at[1] / cell);
    for (let dx = -1; dx <= 1; dx++) {
      for (let dy = -1; dy <= 1; dy++) {
        for (const j of grid.get(`${cx + dx},${cy + dy}`) ?? []) {
          if (j <= i) continue;
          const f = ends[j] as End;
          if (e.piece === (ends[j] as End).piece) continue;
          const gap = Math.hypot(e.at[0] - f.at[0], e.at[1] - f.at[1]);
          if (gap > bridge) continue;
          // A dot (a one-point piece: the last sliver of a dashed line) has no direction; it joins
          // only on the tangent of a piece that has one, which then decides alone.
          const eDot = e.out[0] === 0 && e.out[1] === 0;
          const fDot = f.out[0] === 0 && f.out[1] === 0;
          if (eDot && fDot) continue;
          // Smooth continuation: the two outward directions point against each other.
          const cos = -(e.out[0] * f.out[0] + e.out[1] * f.out[1]);
          const turn = eDot || fDot ? 0 : Math.acos(Math.max(-1, Math.min(1, cos)));
          if (turn > MAX_TURN) continue;
          const bridged = gap > tolerance;
          const gx = f.at[0] - e.at[0];
          const gy = f.at[1] - e.at[1];
          // How far the far end lies off the near end's tangent (and the other way round).
          const lateral = Math.max(Math.abs(e.out[0] * gy - e.out[1] * gx), Math.abs(f.out[0] * gy - f.out[1] * gx));
          if (bridged) {
            // A dash gap runs straight on from both ends.
            if ((!eDot && (e.out[0] * gx + e.out[1] * gy) / gap < BRIDGE_ALIGN) || (!fDot && -(f.out[0] * gx + f.out[1] * gy) / gap < BRIDGE_ALIGN)) continue;
            if (lateral > Math.max(0.2, 0.15 * gap)) continue;
          }
          // Truest continuation first: on the tangent and heading the same way. Where two curves
          // cross, the other curve's piece may lie on the tangent too, but heads off at the crossing
          // angle; where ends coincide (a grid crossing), the straightest way on wins.
          // Ends of two strokes each written in parts join only after every join within a stroke.
          candidates.push({ i, j, cost: lateral + Math.max(gap, 1) * turn + (bridged ? 0.01 : 0) + (apart(open[e.piece] as Piece, open[f.piece] as Piece) ? CROSS_PATH : 0) });
        }
      }
    }
  });
  candidates.sort((a, b) => a.cost - b.cost);
  const partner = new Int32Array(ends.length).fill(-1);
  for (const c of candidates) {
    if (partner[c.i] !== -1 || partner[c.j] !== -1) continue;
    partner[c.i] = c.j;
    partner[c.j] = c.i;
  }

  const visited = new Uint8Array(open.length);
  const walk = (startEnd: number): { parts: SheetPoint[][]; pieces: Piece[]; closed: boolean; count: number } => {
    const parts: SheetPoint[][] = [];
    const pieces: Piece[] = [];
    let enter = startEnd;
    let count = 0;
    for (;;) {
      const e = ends[enter] as End;
      if (visited[e.piece]) return { parts, pieces, closed: true, count };
      visited[e.piece] = 1;
      count++;
      const piece = open[e.piece] as Piece;
      parts.push(e.side === 0 ? [...piece.points] : [...piece.points].reverse());
      pieces.push(piece);
      const exit = e.piece * 2 + (1 - e.side);
      const next = partner[exit] as number;
      if (next === -1) return { parts, pieces, closed: false, count };
      enter = next;
    }
  };
  // Chains with a free end first, then the remaining cycles; a dot left alone is no line.
  ends.forEach((e, i) => {
    if (!visited[e.piece] && partner[i] === -1) {
      const { parts, pieces, count } = walk(i);
      endAtFarEdge(parts, pieces, 'first');
      endAtFarEdge(parts, pieces, 'last');
      const line = makeLine(parts, false, open[e.piece] as Piece, count);
      if (line.points.length >= 2) lines.push(line);
    }
  });
  ends.forEach((e, i) => {
    if (!visited[e.piece] && e.side === 0) {
      const { parts, count } = walk(i);
      lines.push(makeLine(parts, true, open[e.piece] as Piece, count));
    }
  });
  return lines;
}

/**
 * A dot that ends a chain stands for the last sliver of a dash, and the line's own end is the
 * sliver's far edge, half a sliver beyond its middle (up to 0.75 line widths): the end is moved
 * along the way the line arrives at it to the farthest point of the sliver.
 */
function endAtFarEdge(parts: SheetPoint[][], pieces: readonly Piece[], which: 'first' | 'last'): void {
  if (parts.length < 2) return;
  const k = which === 'last' ? parts.length - 1 : 0;
  const extent = (pieces[k] as Piece).extent;
  const dot = (parts[k] as SheetPoint[])[0];
  if (!extent || extent.length === 0 || (parts[k] as SheetPoint[]).length !== 1 || !dot) return;
  // The way the line arrives at the dot: out of the neighbouring part at the end facing it.
  const neighbour = parts[which === 'last' ? k - 1 : 1] as SheetPoint[];
  const [dx, dy] = outward(neighbour, which === 'last' ? 1 : 0);
  if (dx === 0 && dy === 0) return;
  let far = 0;
  for (const p of extent) far = Math.max(far, (p[0] - dot[0]) * dx + (p[1] - dot[1]) * dy);
  parts[k] = [sheetPoint(dot[0] + far * dx, dot[1] + far * dy)];
}

/** Direction out of the piece at one end, taken over about 2 sheet units so that tiny last segments do not mislead. */
function outward(points: readonly SheetPoint[], side: 0 | 1): [number, number] {
  const n = points.length;
  const at = side === 0 ? (points[0] as SheetPoint) : (points[n - 1] as SheetPoint);
  let ref = at;
  for (let k = 1; k < n; k++) {
    ref = side === 0 ? (points[k] as SheetPoint) : (points[n - 1 - k] as SheetPoint);
    if (Math.hypot(ref[0] - at[0], ref[1] - at[1]) >= 2) break;
  }
  const dx = at[0] - ref[0];
  const dy = at[1] - ref[1];
  const len = Math.hypot(dx, dy);
  return len > 0 ? [dx / len, dy / len] : [0, 0];
}

function makeLine(parts: readonly (readonly SheetPoint[])[], closed: boolean, style: Piece, count: number): StrokeLine {
  const points: SheetPoint[] = [];
  for (const part of parts) {
    for (const p of part) {
      const last = points.at(-1);
      if (!last || last[0] !== p[0] || last[1] !== p[1]) points.push(p);
    }
  }
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  let level = true;
  for (let i = 0; i < points.length; i++) {
    const p = points[i] as SheetPoint;
    minX = Math.min(minX, p[0]);
    minY = Math.min(minY, p[1]);
    maxX = Math.max(maxX, p[0]);
    maxY = Math.max(maxY, p[1]);
    if (i > 0) {
      const q = points[i - 1] as SheetPoint;
      const dx = Math.abs(p[0] - q[0]);
      const dy = Math.abs(p[1] - q[1]);
      // Level or upright within about 0.5°.
      if (dx > 0.009 * dy && dy > 0.009 * dx) level = false;
    }
  }
  return { points, closed, style: style.style, stroke: style.stroke, lineWidth: style.lineWidth, pieces: count, gridLike: level, box: [minX, minY, maxX, maxY] };
}
