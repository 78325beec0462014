/**
 * The lines drawn inside one frame of a scan, on the level page (ink.ts): the grid is left out
 * (the rows and columns of its lines, found by rasterFrames.gridLines, are looked through),
 * each column's ink is cut into runs, and the runs are joined column to column into tracks by
 * continuity (each track predicts its next row from its own slope). Where two lines cross or
 * run together, the tracks sharing one run stop being told apart: the younger one is dropped,
 * and the pieces on either side of the bunch are joined afterwards when one continues the
 * other's course. A dash pattern's gaps are bridged; text is too short to make a line.
 *
 * Each track keeps, column by column, whether its run stood alone (no other ink within a few
 * line widths across): the places where guides for the tracer can go without doubt.
 *
 * Pure: works on the level ink map only.
 */
import { solveLeastSquares } from '../../fit/leastSquares.ts';
import type { InkMap } from './ink.ts';
import type { Box } from './panels.ts';

/** One column's piece of ink: its middle row, its length across, its darkness. */
interface Run {
  v: number;
  len: number;
  /** Rows to the nearest other run of the column (Infinity when alone). */
  room: number;
}

export interface Track {
  /** Columns (level pixels, centres) and the line's middle row at each; bridged columns are not listed. */
  u: number[];
  v: number[];
  /** Rows to the nearest other ink across, at each listed column. */
  room: number[];
  /** Run length across at each listed column (the line's width where it is level). */
  len: number[];
  /** Indices where a piece joined after a gap begins (a bunch or crossing lay between): guides never spread across one. */
  joins?: number[];
}

export interface LinesOptions {
  /** Darkness at or above which a pixel is ink; by default half the darkness of the frame's darkest half-percent off the grid, between `floor` and `ceiling`. */
  threshold?: number;
  floor?: number;
  ceiling?: number;
  /** Grid line positions (level pixels): columns of the vertical lines, rows of the horizontal ones. */
  grid: { x: readonly number[]; y: readonly number[] };
  /** Boxes (level pixels: left, top, right, bottom) whose ink is not line: the words printed in the frame. */
  holes?: readonly (readonly [number, number, number, number])[];
  /**
   * Keep a line's stretch past a hole (a label printed over the line, and over its neighbours where
   * they bunch) though it is shorter than a line: it starts within the followed gap of the hole's
   * box and spans `AFTER_LABEL_SPAN` of the frame. Off by default: in a head frame such stretches
   * of iso-lines past their "%" labels would count as lines of their own.
   */
  pastLabels?: boolean;
}

const INSET = 5;

/** Slope and intercept of the last points of a track, least squares (v = a + b·u). */
export function course(t: Pick<Track, 'u' | 'v'>, last = 12): { a: number; b: number } {
  const n = t.u.length;
  const k0 = Math.max(0, n - last);
  if (n - k0 < 3) return { a: t.v[n - 1] as number, b: 0 };
  let su = 0;
  let sv = 0;
  let suu = 0;
  let suv = 0;
  const m = n - k0;
  for (let k = k0; k < n; k++) {
    const u = t.u[k] as number;
    const v = t.v[k] as number;
    su += u;
    sv += v;
    suu += u * u;
    suv += u * v;
  }
  const d = m * suu - su * su;
  const b = d === 0 ? 0 : (m * suv - su * sv) / d;
  return { a: (sv - b * su) / m, b };
}

/**
 * The grid's own darkness at a pixel on grid row darkness `row` and grid column darkness `col`
 * (0 off the grid): where a row and a column cross, the two lines lie one over the other and
 * each lets through its share of the light, so the crossing is darker than either line,
 * 1 − (1 − r)(1 − c) in shares of full black. Taking off only the darker of the two left every
 * crossing of a faint-lined sheet's grid as a dot of ink, and the dots, a grid cell apart,
 * chained into false lines along the grid rows and across the cells.
 */
export function gridDarkness(row: number, col: number): number {
  return row + col - (row * col) / 255;
}

function inHole(here: readonly (readonly [number, number, number, number])[], v: number): boolean {
  for (const h of here) if (v >= h[1] && v < h[3]) return true;
  return false;
}

/**
 * Runs of ink in column `u` between rows t and b (`column`: its pixels from row t). On a grid row (or column) the grid's own
 * darkness there (`base`, its median along the frame; both where they cross, gridDarkness) is
 * taken off first: a line crossing the grid, or running along a grid line, still shows; the
 * grid alone does not.
 */
function columnRuns(column: Uint8Array, u: number, t: number, b: number, base: Float32Array, colBase: number, threshold: number, maxLen: number, holes: readonly (readonly [number, number, number, number])[]): Run[] {
  const here = holes.filter((h) => u >= h[0] && u < h[2]);
  const runs: Run[] = [];
  let start = -1;
  let last = -1;
  let sw = 0;
  let sv = 0;
  // The grid's darkness is never negative: a pixel lighter than a threshold above zero is no ink
  // whatever is taken off (most pixels are paper). No closure in this loop: it runs for every
  // pixel of the frame.
  const paperBelow = threshold > 0 ? threshold : -Infinity;
  for (let v = t; v <= b; v++) {
    // Past the last row, the run still open ends.
    const pixel = v < b ? (column[v - t] as number) : -1;
    const d = v === b || pixel < paperBelow || (here.length > 0 && inHole(here, v)) ? 0 : pixel - gridDarkness(base[v] as number, colBase);
    if (v < b && d >= threshold) {
      if (start < 0) start = v;
      last = v;
      const w = d - threshold + 1;
      sw += w;
      sv += w * (v + 0.5);
    } else if (start >= 0) {
      // A run ends: kept unless it is too long across for a line.
      const len = last - start + 1;
      if (len <= maxLen && sw > 0) runs.push({ v: sv / sw, len, room: Infinity });
      start = -1;
      sw = 0;
      sv = 0;
    }
  }
  for (let i = 0; i < runs.length; i++) {
    const r = runs[i] as Run;
    const prev = runs[i - 1];
    const next = runs[i + 1];
    r.room = Math.min(prev ? r.v - prev.v : Infinity, next ? next.v - r.v : Infinity);
  }
  return runs;
}

/**
 * The lines of a frame (level pixels), each at least `minSpan` columns wide, left to right.
 * `maxGap` columns without ink are bridged on the track's course (dashes, labels on the line,
 * grid columns, crossings).
 */
export function frameLines(map: InkMap, frame: Box, options: LinesOptions): Track[] {
  const [l, t, r, b] = frame.map(Math.round) as [number, number, number, number];
  const fw = r - l;
  const fh = b - t;
  const maxGap = Math.max(8, Math.round(0.03 * fw));
  const minSpan = 0.12 * fw;
  const maskRows = new Uint8Array(map.height);
  const maskCols = new Uint8Array(map.width);
  for (const y of options.grid.y) for (let v = Math.floor(y - 2.5); v <= Math.ceil(y + 1.5); v++) if (v >= 0 && v < map.height) maskRows[v] = 1;
  for (const x of options.grid.x) for (let u = Math.floor(x - 2.5); u <= Math.ceil(x + 1.5); u++) if (u >= 0 && u < map.width) maskCols[u] = 1;
  const top = t + INSET;
  const bottom = b - INSET;
  const threshold = options.threshold ?? lineThreshold(map, [l + INSET, top, r - INSET, bottom], maskRows, maskCols, options.floor ?? 10, options.ceiling ?? 255);
  // The grid's darkness along each grid row and column (median over the frame).
  const rowBase = new Float32Array(map.height);
  const colBase = new Float32Array(map.width);
  for (let v = top; v < bottom; v++) if (maskRows[v]) rowBase[v] = medianAlong(map, v, l + INSET, r - INSET, 'row');
  for (let u = l + INSET; u < r - INSET; u++) if (maskCols[u]) colBase[u] = medianAlong(map, u, top, bottom, 'column');
  const active: { track: Track; lastU: number }[] = [];
  const done: Track[] = [];
  const retire = (k: number) => {
    const [a] = active.splice(k, 1);
    if (a) done.push(a.track);
  };
  // The frame's columns, each one's pixels in a row (read column after column below).
  const columns = frameColumns(map, l + INSET, r - INSET, top, bottom);
  const rows = bottom - top;
  for (let u = l + INSET; u < r - INSET; u++) {
    for (let k = active.length - 1; k >= 0; k--) if (u - (active[k]!.lastU) > maxGap) retire(k);
    const k0 = (u - l - INSET) * rows;
    const runs = columnRuns(columns.subarray(k0, k0 + rows), u, top, bottom, rowBase, colBase[u] as number, threshold, Math.max(12, 0.25 * fh), options.holes ?? []);
    const taken = new Set<number>();
    const claims: { k: number; i: number; d: number }[] = [];
    active.forEach((a, k) => {
      const gap = u - a.lastU;
      const c = course(a.track);
      const p = c.a + c.b * (u + 0.5);
      const tol = 2.5 + 0.5 * (a.track.len[a.track.len.length - 1] ?? 2) + Math.min(6, Math.abs(c.b)) * 1.5 + 0.15 * gap;
      let best = -1;
      let bestD = Infinity;
      runs.forEach((run, i) => {
        const d = Math.abs(run.v - p);
        if (d <= tol + 0.5 * run.len && d < bestD) [best, bestD] = [i, d];
      });
      if (best >= 0) claims.push({ k, i: best, d: bestD });
    });
    for (const c of claims) {
      const a = active[c.k]!;
      const run = runs[c.i] as Run;
      a.track.u.push(u + 0.5);
      a.track.v.push(run.v);
      a.track.len.push(run.len);
      a.track.room.push(run.room);
      a.lastU = u;
      taken.add(c.i);
    }
    // Two tracks on one run for a while are one line now: the younger (shorter) is let go.
    const byRun = new Map<number, number[]>();
    for (const c of claims) byRun.set(c.i, [...(byRun.get(c.i) ?? []), c.k]);
    const drop = new Set<number>();
    for (const ks of byRun.values()) {
      if (ks.length < 2) continue;
      for (let x = 0; x < ks.length; x++) {
        for (let y = x + 1; y < ks.length; y++) {
          const A = active[ks[x] as number]!.track;
          const B = active[ks[y] as number]!.track;
          if (sharedTail(A, B) >= 6) drop.add(A.u.length >= B.u.length ? (ks[y] as number) : (ks[x] as number));
        }
      }
    }
    for (const k of [...drop].sort((x, y) => y - x)) {
      const a = active[k]!;
      // The shared tail belongs to the line that goes on; what came before stays a piece.
      const n = sharedTailOf(a, active.filter((_, j) => j !== k).map((o) => o.track));
      a.track.u.splice(a.track.u.length - n);
      a.track.v.splice(a.track.v.length - n);
      a.track.len.splice(a.track.len.length - n);
      a.track.room.splice(a.track.room.length - n);
      retire(k);
    }
    runs.forEach((run, i) => {
      if (!taken.has(i)) active.push({ track: { u: [u + 0.5], v: [run.v], len: [run.len], room: [run.room] }, lastU: u });
    });
  }
  while (active.length) retire(0);
  // A line's last stretch past a label printed over it (and over its neighbours: a bunch the label
  // cuts all at once) is shorter than a line, but no speck: it starts by the label's box, within
  // the gap a line is followed across.
  const afterLabel = (tr: Track) => {
    const u0 = tr.u[0] as number;
    const v0 = tr.v[0] as number;
    return (options.holes ?? []).some((h) => Math.hypot(Math.max(h[0] - u0, 0, u0 - h[2]), Math.max(h[1] - v0, 0, v0 - h[3])) <= maxGap);
  };
  return joinPieces(done.filter((tr) => tr.u.length >= 3), maxGap * 4, fh).filter((tr) => {
    const span = (tr.u[tr.u.length - 1] as number) - (tr.u[0] as number);
    return (span >= minSpan || (options.pastLabels === true && span >= AFTER_LABEL_SPAN * fw && afterLabel(tr))) && !isRule(tr);
  });
}

/** The shortest stretch past a label kept as a line, in frame widths (a line is otherwise 12 %). */
const AFTER_LABEL_SPAN = 0.05;

/** The ink of columns [c0, c1) between rows [r0, r1), column after column (read in tiles, so that both sides stay in the cache). */
function frameColumns(map: InkMap, c0: number, c1: number, r0: number, r1: number): Uint8Array {
  const { width, ink } = map;
  const rows = Math.max(0, r1 - r0);
  const out = new Uint8Array(Math.max(0, c1 - c0) * rows);
  const TILE = 64;
  for (let y0 = r0; y0 < r1; y0 += TILE) {
    const y1 = Math.min(r1, y0 + TILE);
    for (let x0 = c0; x0 < c1; x0 += TILE) {
      const x1 = Math.min(c1, x0 + TILE);
      for (let y = y0; y < y1; y++) {
        const from = y * width;
        const to = y - r0;
        for (let x = x0; x < x1; x++) out[(x - c0) * rows + to] = ink[from + x] as number;
      }
    }
  }
  return out;
}

function medianAlong(map: InkMap, at: number, from: number, to: number, along: 'row' | 'column'): number {
  // The median of every other pixel, counted by darkness (the upper middle of an even count).
  const hist = new Uint32Array(256);
  let n = 0;
  for (let k = from; k < to; k += 2, n++) hist[map.ink[along === 'row' ? at * map.width + k : k * map.width + at] as number]!++;
  if (n === 0) return 0;
  const middle = n >> 1;
  let seen = 0;
  for (let v = 0; v < 256; v++) if ((seen += hist[v] as number) > middle) return v;
  return 0;
}

/** A straight level line (a grid line the grid finder missed), not a curve: within 1.5 px of one row all along. */
function isRule(t: Track): boolean {
  const mean = t.v.reduce((a, v) => a + v, 0) / t.v.length;
  return t.v.every((v) => Math.abs(v - mean) <= 1.5);
}

/**
 * The ink threshold of a frame: half the darkness reached by its darkest half-percent of pixels
 * off the grid (the lines drawn cover a few percent of a frame), kept between floor and ceiling.
 */
function lineThreshold(map: InkMap, box: [number, number, number, number], maskRows: Uint8Array, maskCols: Uint8Array, floor: number, ceiling: number): number {
  const hist = new Uint32Array(256);
  let n = 0;
  for (let v = box[1]; v < box[3]; v += 2) {
    if (maskRows[v]) continue;
    for (let u = box[0]; u < box[2]; u += 2) {
      if (maskCols[u]) continue;
      hist[map.ink[v * map.width + u] as number]!++;
      n++;
    }
  }
  let seen = 0;
  for (let d = 255; d >= 0; d--) {
    seen += hist[d] as number;
    if (seen >= 0.005 * n) return Math.max(floor, Math.min(ceiling, d / 2));
  }
  return floor;
}

/** How many last points two tracks share (same column, same row). */
function sharedTail(a: Track, b: Track): number {
  let n = 0;
  for (let i = a.u.length - 1, j = b.u.length - 1; i >= 0 && j >= 0; i--, j--) {
    if (a.u[i] !== b.u[j] || Math.abs((a.v[i] as number) - (b.v[j] as number)) > 0.01) break;
    n++;
  }
  return n;
}

function sharedTailOf(a: { track: Track }, others: readonly Track[]): number {
  return Math.max(0, ...others.map((o) => sharedTail(a.track, o)));
}

/**
 * Pieces joined where one continues another: the next piece starts after the first ends
 * (within `maxGap` columns), and each one's course, carried to the other's end, meets it
 * within a few pixels. Each piece joins at most one on either side, the closest first.
 */
function joinPieces(pieces: Track[], maxGap: number, fh: number): Track[] {
  const list = [...pieces].sort((a, b) => (a.u[0] as number) - (b.u[0] as number));
  const pairs: { a: Track; b: Track; cost: number }[] = [];
  for (const a of list) {
    const ea = a.u[a.u.length - 1] as number;
    const va = a.v[a.v.length - 1] as number;
    const ca = course(a, 20);
    for (const b of list) {
      if (a === b) continue;
      const sb = b.u[0] as number;
      const gap = sb - ea;
      if (gap < 0 || gap > maxGap) continue;
      const back: Track = { u: b.u.slice(0, 20).reverse(), v: b.v.slice(0, 20).reverse(), len: [], room: [] };
      const cb = course(back, 20);
      const miss = Math.max(Math.abs(ca.a + ca.b * sb - (b.v[0] as number)), Math.abs(cb.a + cb.b * ea - va));
      if (miss > Math.max(3, 0.01 * fh) + 0.05 * gap) continue;
      pairs.push({ a, b, cost: gap + 10 * miss });
    }
  }
  pairs.sort((x, y) => x.cost - y.cost);
  const next = new Map<Track, Track>();
  const prev = new Map<Track, Track>();
  for (const p of pairs) {
    if (next.has(p.a) || prev.has(p.b)) continue;
    next.set(p.a, p.b);
    prev.set(p.b, p.a);
  }
  const out: Track[] = [];
  for (const start of list) {
    if (prev.has(start)) continue;
    const t: Track = { u: [], v: [], len: [], room: [], joins: [] };
    for (let p: Track | undefined = start; p; p = next.get(p)) {
      if (t.u.length > 0) t.joins!.push(t.u.length);
      t.u.push(...p.u);
      t.v.push(...p.v);
      t.len.push(...p.len);
      t.room.push(...p.room);
    }
    out.push(t);
  }
  return out;
}

/** The track's row at column u (between its listed columns), or null outside its columns. */
export function trackAt(t: Track, u: number): number | null {
  const n = t.u.length;
  if (n === 0 || u < (t.u[0] as number) || u > (t.u[n - 1] as number)) return null;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if ((t.u[mid] as number) <= u) lo = mid;
    else hi = mid;
  }
  const u0 = t.u[lo] as number;
  const u1 = t.u[hi] as number;
  const f = u1 === u0 ? 0 : (u - u0) / (u1 - u0);
  return (t.v[lo] as number) + f * ((t.v[hi] as number) - (t.v[lo] as number));
}

/**
 * Places for guides where the track's ink stood alone (at least `room` rows from any other ink,
 * columns no more than 8 apart, no step off the line's course between them), on stretches of at least `stretch` columns. On the longest
 * stretch: one place in its middle, or two at a quarter and three quarters of it when it is
 * longer than `long` columns. With `spread` (lines that never cross one another), also the
 * middle of every other stretch of the same piece (never across a join), up to `most` places
 * in all; without it the places lie on one stretch, with no crossing between them, so they
 * cannot sit on two different lines.
 */
export function alonePlaces(t: Track, room: number, stretch: number, long: number, spread = false, most = 5): { u: number; v: number }[] {
  const spans: [number, number][] = [];
  let s = -1;
  // A step off the course of the columns before (the finder passed onto another line across a
  // short gap) ends a stretch as a gap does: guides on either side could sit on two lines.
  const stepOff = (i: number): boolean => {
    if (i < 5) return false;
    const du = (t.u[i] as number) - (t.u[i - 1] as number);
    const slope = ((t.v[i - 1] as number) - (t.v[i - 5] as number)) / ((t.u[i - 1] as number) - (t.u[i - 5] as number));
    return Math.abs((t.v[i] as number) - (t.v[i - 1] as number) - slope * du) > 2.5 + 0.2 * du;
  };
  for (let i = 0; i <= t.u.length; i++) {
    const ok = i < t.u.length && (t.room[i] as number) >= room && (s < 0 || ((t.u[i] as number) - (t.u[i - 1] as number) <= 8 && !stepOff(i)));
    if (ok && s < 0) s = i;
    if (!ok && s >= 0) {
      if ((t.u[i - 1] as number) - (t.u[s] as number) >= stretch) spans.push([s, i - 1]);
      s = i < t.u.length && (t.room[i] as number) >= room ? i : -1;
    }
  }
  if (spans.length === 0) return [];
  const width = (k: [number, number]) => (t.u[k[1]] as number) - (t.u[k[0]] as number);
  const longest = spans.reduce((a, b) => (width(b) > width(a) ? b : a));
  const at = ([i, j]: [number, number], f: number) => {
    const k = Math.round(i + f * (j - i));
    return { u: t.u[k] as number, v: t.v[k] as number };
  };
  const places = width(longest) > long ? [at(longest, 0.25), at(longest, 0.75)] : [at(longest, 0.5)];
  if (spread) {
    const piece = (i: number) => (t.joins ?? []).filter((j) => j <= i).length;
    const others = spans.filter((k) => k !== longest && piece(k[0]) === piece(longest[0]) && piece(k[1]) === piece(longest[0])).sort((a, b) => width(b) - width(a)).slice(0, Math.max(0, most - places.length));
    places.push(...others.map((k) => at(k, 0.5)));
  }
  return places.sort((a, b) => a.u - b.u);
}

/**
 * True when `points` (level pixels: column, row), all past one end of the track (`side`), carry
 * on its course step by step, however far they reach: those within half of `reach` past the end
 * must lie on the course fitted there (`offCourse`, as `continuesCourse` judges); they then join
 * the track, one row per column between them, and the next step is judged by the course fitted
 * again over the line so extended. A line
 * that bends as it goes on (a head curve the finder cut short at a label or at a crossing, which
 * the tracer follows to its drawn end) passes; a tracer that turns off onto another line at a
 * crossing, or jumps across a gap to another, does not. False when there is no point to judge.
 */
export function carriesOnAsItBends(t: Pick<Track, 'u' | 'v'>, points: readonly (readonly [number, number])[], side: 'start' | 'end', tol: number, reach: number): boolean {
  if (points.length === 0 || t.u.length === 0) return false;
  const sign = side === 'end' ? 1 : -1;
  const rest = [...points].sort((a, b) => sign * (a[0] - b[0]));
  // The track in order of distance from the judged end, outward last.
  const u = side === 'end' ? [...t.u] : [...t.u].reverse();
  const v = side === 'end' ? [...t.v] : [...t.v].reverse();
  const asTrack = (): Track => (side === 'end' ? { u, v, room: [], len: [] } : { u: [...u].reverse(), v: [...v].reverse(), room: [], len: [] });
  let i = 0;
  while (i < rest.length) {
    const off = offCourse(asTrack(), side, reach);
    if (!off) return false;
    const endU = u[u.length - 1] as number;
    const step: (readonly [number, number])[] = [];
    while (i < rest.length && sign * ((rest[i] as readonly [number, number])[0] - endU) <= reach / 2) step.push(rest[i++] as readonly [number, number]);
    // Past a gap wider than the step: the next point alone, judged on the course (never beyond twice `reach`).
    if (step.length === 0) step.push(rest[i++] as readonly [number, number]);
    if (!step.every(([pu, pv]) => off(pu, pv) <= tol)) return false;
    for (const [pu, pv] of step) {
      const u0 = u[u.length - 1] as number;
      const v0 = v[v.length - 1] as number;
      const n = Math.floor(sign * (pu - u0));
      for (let k = 1; k <= n; k++) {
        u.push(u0 + sign * k);
        v.push(v0 + ((pv - v0) * k) / (sign * (pu - u0)));
      }
    }
  }
  return true;
}

/**
 * True when `points` (level pixels: column, row), all past one end of the track (`side`), carry
 * on its course: each within `tol` pixels, plus 2 % of its distance from the end, of the parabola
 * fitted to the track's last (or first) `reach` columns, and none farther than twice `reach`
 * past the end. A line the finder lost in a bunch or at a crossing, which the tracer follows on to
 * its drawn end, passes; a tracer that turns off into a label or onto another line does not.
 * False when the track's stretch holds fewer than 8 columns or there is no point to judge.
 */
export function continuesCourse(t: Track, points: readonly (readonly [number, number])[], side: 'start' | 'end', tol: number, reach: number): boolean {
  if (points.length === 0) return false;
  const off = offCourse(t, side, reach);
  return off !== null && points.every(([u, v]) => off(u, v) <= tol);
}

/**
 * The course of the track's last (or first) `reach` columns, a parabola, carried on past that end:
 * for a point (column, row) past the end, how far it lies from the course less 2 % of its distance
 * from the end (Infinity before the end or farther than twice `reach` past it). Null when the
 * stretch holds fewer than 8 columns.
 *
 * With `near` (the distance the caller compares with), the parabola is first fitted by the normal
 * equations, which is many times quicker than the QR fit (solveLeastSquares) and agrees with it to
 * far under `DECIDE_MARGIN`; wherever a decision lies within that margin of its threshold (a
 * column kept by the robust fit, a distance against `near`), the QR fit is made and used, so every
 * decision is the QR fit's. Distances far from `near` may then differ from the QR fit's in their
 * last digits.
 */
export function offCourse(t: Track, side: 'start' | 'end', reach: number, robust = false, near?: number): ((u: number, v: number) => number) | null {
  const n = t.u.length;
  if (n === 0) return null;
  const endU = (side === 'end' ? t.u[n - 1] : t.u[0]) as number;
  const sign = side === 'end' ? 1 : -1;
  // v = a + b·x + c·x² over the stretch, x = (u − endU)·sign in units of `reach` (−1 … 0 on the track).
  const xs: number[] = [];
  const vs: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = (((t.u[i] as number) - endU) * sign) / reach;
    if (x < -1) continue;
    xs.push(x);
    vs.push(t.v[i] as number);
  }
  if (xs.length < 8) return null;
  let sure = near === undefined;
  let coef = sure ? null : quickCourse(xs, vs, robust);
  if (!coef) {
    coef = exactCourse(xs, vs, robust);
    sure = true;
  }
  if (!coef) return null;
  let [a, b, c] = coef;
  return (u, v) => {
    const d = (u - endU) * sign;
    const x = d / reach;
    if (d < 0 || x > 2) return Infinity;
    const off = Math.abs(a + b * x + c * x * x - v) - 0.02 * d;
    if (sure || Math.abs(off - (near as number)) > DECIDE_MARGIN) return off;
    // Near the threshold: the QR fit decides (it exists: the quick fit was well conditioned).
    sure = true;
    const exact = exactCourse(xs, vs, robust);
    if (exact) [a, b, c] = exact;
    return Math.abs(a + b * x + c * x * x - v) - 0.02 * d;
  };
}

/** Pixels within which a decision on the quick fit of a course is left to the QR fit (offCourse). */
const DECIDE_MARGIN = 1e-4;

/** The parabola's coefficients by QR (solveLeastSquares), fitted again without the columns more than 2 px off when `robust`; null when the columns define none. */
function exactCourse(xs: readonly number[], vs: readonly number[], robust: boolean): [number, number, number] | null {
  const rows = xs.map((x) => [1, x, x * x]);
  let coef: number[];
  try {
    coef = solveLeastSquares(rows, vs).solution;
  } catch {
    return null;
  }
  // Robust: fitted again without the columns more than 2 px off the first fit (a label or a
  // crossing on the stretch pulls a least-squares course off where it is short).
  if (robust) {
    const [a0, b0, c0] = coef as [number, number, number];
    const keep = rows.map((r, k) => Math.abs(a0 + b0 * (r[1] as number) + c0 * (r[1] as number) ** 2 - (vs[k] as number)) <= 2);
    if (keep.filter(Boolean).length >= 8 && keep.some((k) => !k)) {
      try {
        coef = solveLeastSquares(rows.filter((_, k) => keep[k]), vs.filter((_, k) => keep[k])).solution;
      } catch {
        return null;
      }
    }
  }
  return coef as [number, number, number];
}

/**
 * The same parabola by the normal equations (3 × 3, by the adjugate), or null when the QR fit must
 * decide: the equations are not well conditioned (1-norm condition over 1e6, where their answer
 * could stray from the QR fit's by more than a millionth of a pixel), or a column lies within
 * `DECIDE_MARGIN` of the robust fit's 2 px.
 */
function quickCourse(xs: readonly number[], vs: readonly number[], robust: boolean): [number, number, number] | null {
  const first = normalFit(xs, vs, null);
  if (!first || !robust) return first;
  const [a0, b0, c0] = first;
  const keep: boolean[] = [];
  let kept = 0;
  for (let k = 0; k < xs.length; k++) {
    const x = xs[k] as number;
    const r = Math.abs(a0 + b0 * x + c0 * x * x - (vs[k] as number));
    if (Math.abs(r - 2) <= DECIDE_MARGIN) return null;
    keep.push(r <= 2);
    if (r <= 2) kept++;
  }
  return kept >= 8 && kept < xs.length ? normalFit(xs, vs, keep) : first;
}

function normalFit(xs: readonly number[], vs: readonly number[], keep: readonly boolean[] | null): [number, number, number] | null {
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let s4 = 0;
  let t0 = 0;
  let t1 = 0;
  let t2 = 0;
  for (let k = 0; k < xs.length; k++) {
    if (keep && !keep[k]) continue;
    const x = xs[k] as number;
    const v = vs[k] as number;
    const x2 = x * x;
    s0 += 1;
    s1 += x;
    s2 += x2;
    s3 += x2 * x;
    s4 += x2 * x2;
    t0 += v;
    t1 += v * x;
    t2 += v * x2;
  }
  // M = [[s0 s1 s2] [s1 s2 s3] [s2 s3 s4]], symmetric: its inverse is the adjugate over the determinant.
  const i00 = s2 * s4 - s3 * s3;
  const i01 = s2 * s3 - s1 * s4;
  const i02 = s1 * s3 - s2 * s2;
  const i11 = s0 * s4 - s2 * s2;
  const i12 = s1 * s2 - s0 * s3;
  const i22 = s0 * s2 - s1 * s1;
  const det = s0 * i00 + s1 * i01 + s2 * i02;
  if (!(Math.abs(det) > 0)) return null;
  const normM = Math.max(Math.abs(s0) + Math.abs(s1) + Math.abs(s2), Math.abs(s1) + Math.abs(s2) + Math.abs(s3), Math.abs(s2) + Math.abs(s3) + Math.abs(s4));
  const normInv = Math.max(Math.abs(i00) + Math.abs(i01) + Math.abs(i02), Math.abs(i01) + Math.abs(i11) + Math.abs(i12), Math.abs(i02) + Math.abs(i12) + Math.abs(i22)) / Math.abs(det);
  if (!(normM * normInv <= 1e6)) return null;
  return [(i00 * t0 + i01 * t1 + i02 * t2) / det, (i01 * t0 + i11 * t1 + i12 * t2) / det, (i02 * t0 + i12 * t1 + i22 * t2) / det];
}

/**
 * A line as a track from its points (level pixels) in any order along it: sorted by column, one
 * row per whole column (the mean of the points in it). For testing what lies along a traced line.
 */
export function trackOf(points: readonly (readonly [number, number])[]): Track {
  const byColumn = new Map<number, { sum: number; n: number }>();
  for (const [u, v] of points) {
    const k = Math.floor(u);
    const c = byColumn.get(k) ?? { sum: 0, n: 0 };
    c.sum += v;
    c.n++;
    byColumn.set(k, c);
  }
  const t: Track = { u: [], v: [], len: [], room: [] };
  for (const k of [...byColumn.keys()].sort((a, b) => a - b)) {
    const c = byColumn.get(k) as { sum: number; n: number };
    t.u.push(k + 0.5);
    t.v.push(c.sum / c.n);
  }
  return t;
}

/**
 * True when the track is a piece of the line `along`: at least `share` of its columns (every
 * third one) lie within the line's columns and within `tol` rows of it.
 */
export function liesAlong(t: Track, along: Track, tol: number, share = 0.8): boolean {
  let n = 0;
  let near = 0;
  for (let i = 0; i < t.u.length; i += 3) {
    n++;
    const v = trackAt(along, t.u[i] as number);
    if (v !== null && Math.abs(v - (t.v[i] as number)) <= tol) near++;
  }
  return n > 0 && near >= share * n;
}
