/**
 * Iso-efficiency lines on a scan: which words of the head frame are their "%" labels, the
 * level each line carries, and what stays unknown.
 *
 * A line of the head frame that starts neither at the flow axis nor at the bottom is taken for
 * an iso-line (rasterCurves.ts); a steep branch, which the column-by-column line finder cannot
 * follow, is found on the ink turned over its diagonal (steepLines), and the pieces of one line
 * found both ways are joined (isoPiecesAcross). A line's level comes from the label printed on
 * it ("64%", read as words and as digits, the two readings agreeing, the label's middle on the
 * line). An unlabelled line takes its level from the labelled ones by their order along the flow
 * axis (isoLevels.ts, as on a vector sheet), but on a scan a line the finder missed would shift
 * that order, so such a level is unsure, and so is a level found on one line only (its other
 * branch not found): the engineer is asked to look at them. A line left without a level is left
 * out, said in one sentence, and the levels of the others are then all unsure: the efficiency
 * they give rests on part of the crossings.
 *
 * Pure: the reader is handed in.
 */
import { sheetPoint, type SheetPoint } from '../points.ts';
import { distanceToPolyline, nearestOnPolyline } from '../polyline.ts';
import type { InkMap } from './ink.ts';
import { inferIsoLevels, levelsFromList } from './isoLevels.ts';
import type { Box } from './panels.ts';
import { frameLines, type LinesOptions, type Track } from './rasterLines.ts';
import { readCrops, type Blot, type TextReader } from './rasterText.ts';
import { isoLabel, sheetNumber, trimSpecks } from './words.ts';

/** A word found in a frame: its box in the frame's cleaned ink (`clean`, offset `at` on the level page). */
export interface FrameWord {
  word: Blot;
  clean: InkMap;
  at: [number, number];
  /**
   * Weaker evidence of a label: a word found only as glyphs run together, or a part of a word cut
   * between iso-lines. Its level counts only when a second reading, alone and larger, agrees.
   */
  confirm?: boolean;
}

/**
 * An iso-line as this file needs it: the line found (level pixels; with `transposed`, found on
 * the page turned over its diagonal, so its `u` are rows and its `v` columns) and the tracer's
 * line (sheet units).
 */
export interface IsoLine {
  track: Track;
  traced: readonly SheetPoint[];
  transposed?: boolean;
}

/**
 * The ink of a box (level pixels) turned over its diagonal, rows becoming columns, and shrunk by
 * `factor` (each pixel the darkest of its factor × factor block, so a thin line stays): a steep
 * line becomes a shallow one, which the column-by-column line finder follows. Pixel (i, j) of
 * the result covers turned coordinates (top + i·factor, left + j·factor).
 */
export function turnedInk(map: InkMap, box: Box, factor: number): InkMap {
  const [l, t, r, b] = box.map(Math.round) as [number, number, number, number];
  const width = Math.max(1, Math.ceil((b - t) / factor));
  const height = Math.max(1, Math.ceil((r - l) / factor));
  const out = new Uint8Array(width * height);
  for (let y = Math.max(0, t); y < Math.min(map.height, b); y++) {
    const i = Math.floor((y - t) / factor);
    const row = y * map.width;
    for (let x = Math.max(0, l); x < Math.min(map.width, r); x++) {
      const k = Math.floor((x - l) / factor) * width + i;
      const d = map.ink[row + x] as number;
      if (d > (out[k] as number)) out[k] = d;
    }
  }
  return { width, height, ink: out };
}

/** A box (left, top, right, bottom) turned over the diagonal. */
export const transposeBox = (b: Box | readonly [number, number, number, number]): Box => [b[1], b[0], b[3], b[2]];

/** Shrinking of the turned ink for the steep-line pass: frames wider than this (level pixels) are looked at in 2 × 2 blocks. */
const SHRINK_ABOVE = 1200;

/**
 * The steep lines of a frame, in turned coordinates (see IsoLine): lines found on the turned ink
 * of the frame (turnedInk, shrunk by 2 on large frames), except those that run along a line the
 * normal pass found (`normal`, level coordinates): a line at about 45° is found both ways.
 */
export function steepLines(map: InkMap, frame: Box, options: LinesOptions, normal: readonly Track[]): Track[] {
  const [l, t, r, b] = frame;
  const f = r - l > SHRINK_ABOVE ? 2 : 1;
  const small = turnedInk(map, frame, f);
  // Level (x, y) → small turned pixel: column (y − top)/f, row (x − left)/f.
  const turnedGrid = { x: options.grid.y.map((y) => (y - t) / f), y: options.grid.x.map((x) => (x - l) / f) };
  const holes = options.holes?.map((h) => [(h[1] - t) / f, (h[0] - l) / f, (h[3] - t) / f, (h[2] - l) / f] as const);
  const found = frameLines(small, [0, 0, small.width, small.height], { ...options, grid: turnedGrid, ...(holes ? { holes } : {}) });
  // Back to full-size turned coordinates: u a row, v a column of the level page.
  const tracks = found.map((k) => ({
    ...k,
    u: k.u.map((u) => t + u * f),
    v: k.v.map((v) => l + v * f),
    room: k.room.map((x) => x * f),
    len: k.len.map((x) => x * f),
  }));
  return tracks.filter((k) => {
    let near = 0;
    let n = 0;
    for (let i = 0; i < k.u.length; i += 4, n++) if (normal.some((o) => distanceToTrack(o, k.v[i] as number, k.u[i] as number) <= 3)) near++;
    return near < 0.5 * n;
  });
}

/**
 * The level of an iso-line's label as read on a scan (isoLabel, the one rule for "64%", "64 %",
 * "η 64%"), without the specks at its ends; null for anything else or outside 0–100 %.
 */
export function isoLevelOf(text: string): number | null {
  // Specks the reader takes for marks at either end (the stub of the line the label sits on) are no part of it.
  const v = isoLabel(trimSpecks(text));
  return v !== null && v > 0 && v < 100 ? v : null;
}

/**
 * The level of a label read two ways: as words (with its "%") and as digits. The digits reading
 * must give the same number, or that number with one more digit (the "%" read as a digit);
 * otherwise the label is not trusted.
 */
export function isoLevelRead(text: string, digits: string): number | null {
  const level = isoLevelOf(text);
  if (level === null) return null;
  const number = /\d+(?:[.,]\d+)?/.exec(digits.replace(/\s+/g, ''))?.[0];
  if (number === undefined) return level;
  return sheetNumber(number) === level || sheetNumber(number.slice(0, -1)) === level ? level : null;
}

/** A track's points as a polyline, made once per track. */
const trackPoints = new WeakMap<Track, [number, number][]>();
function pointsOf(t: Track): [number, number][] {
  let p = trackPoints.get(t);
  if (!p) trackPoints.set(t, (p = t.u.map((u, i) => [u, t.v[i] as number])));
  return p;
}

/** Distance (level pixels) from a point to the polyline of a track (the one polyline rule, polyline.ts). */
export function distanceToTrack(t: Track, x: number, y: number): number {
  return t.u.length === 0 ? Infinity : distanceToPolyline(pointsOf(t), [x, y]);
}

/** Text height (pixels of the reader's picture) at which an iso label that gave no level is read again: twice the usual 40. */
export const AGAIN_ACROSS = 80;
/** The second, larger text height (pixels of the reader's picture) at which a word of weaker evidence that gave no level is read alone, after AGAIN_ACROSS. */
export const AGAIN_LARGEST = 120;
/** Least width of a word read again, in its heights: two glyphs and a "%" are about two. */
const AGAIN_WIDTH = 1.5;

/** How far a label's middle may lie from its line, in text heights (the line runs through the label's box). */
export const ON_LINE = 0.6;

/** A word's box on the level page. */
const onPage = (w: FrameWord): Blot => ({ l: w.word.l + w.at[0], t: w.word.t + w.at[1], r: w.word.r + w.at[0], b: w.word.b + w.at[1] });

/** How near an iso-line must pass to a point of a word's middle row to cross the word there, in text heights. */
export const CROSSES = 0.25;

/**
 * Where iso-lines cross a word along its middle row (page columns, left to right): a line
 * passing within `CROSSES` of the text height of a point of that row, nearer there than any head
 * curve. Labels printed side by side that the scan ran together make one word crossed by each
 * of their lines, each label centred on its own line.
 */
export function crossingsOfWord<L extends IsoLine>(b: Blot, isos: readonly L[], heads: readonly { track: Track }[]): { line: L; x: number }[] {
  const cy = (b.t + b.b) / 2;
  const tol = Math.max(2, CROSSES * (b.b - b.t));
  const out: { line: L; x: number }[] = [];
  for (const c of isos) {
    let best = { d: Infinity, x: NaN };
    for (let x = b.l; x <= b.r; x++) {
      const d = c.transposed ? distanceToTrack(c.track, cy, x) : distanceToTrack(c.track, x, cy);
      if (d < best.d) best = { d, x };
    }
    if (best.d > tol) continue;
    if (heads.some((h) => distanceToTrack(h.track, best.x, cy) <= best.d)) continue;
    out.push({ line: c, x: best.x });
  }
  return out.sort((a, k) => a.x - k.x);
}

/**
 * A word crossed by several iso-lines (crossingsOfWord), cut between them: each part, from
 * halfway to the previous crossing to halfway to the next (the word's own ends outside), is the
 * label of the line crossing it. Null when fewer than two lines cross it or a part is narrower
 * than the text is high (no label of a level fits there).
 */
export function splitAcross<L extends IsoLine>(w: FrameWord, isos: readonly L[], heads: readonly { track: Track }[]): { part: FrameWord; line: L }[] | null {
  const b = onPage(w);
  const hgt = b.b - b.t;
  const cross = crossingsOfWord(b, isos, heads);
  if (cross.length < 2) return null;
  const cuts = [b.l, ...cross.slice(1).map((c, i) => Math.round((c.x + (cross[i] as { x: number }).x) / 2)), b.r];
  // A cut inside the word is kept clear of by the reading's margin (2 px, isoLevelsOnScan): no part shows its neighbour's last stroke.
  const last = cross.length - 1;
  const parts = cross.map((c, i) => ({ line: c.line, l: (cuts[i] as number) + (i > 0 ? 2 : 0), r: (cuts[i + 1] as number) - (i < last ? 2 : 0) }));
  if (parts.some((p) => p.r - p.l < hgt)) return null;
  return parts.map((p) => ({ line: p.line, part: { ...w, word: { l: p.l - w.at[0], t: w.word.t, r: p.r - w.at[0], b: w.word.b }, confirm: true } }));
}

/**
 * The words of the head frame that sit on an iso-line: a label printed on a line interrupts it,
 * so the word's middle lies on the line (within `ON_LINE` of the text height), nearer to it than
 * to any head curve, and far nearer to it than to any other iso-line. A word that is none of
 * these but is crossed by several iso-lines is cut between them (splitAcross), a part per line.
 *
 * The line is the line found and, with `bridged` (the tracer's line of each, level page points),
 * the tracer's line too: where the label cut the line found in two, the tracer's line runs on
 * across the gap, through the label's middle (scan bed seed 69: "45%", "50%" and "55%" each
 * lay 17 px from the pieces of their lines, and no level was read).
 */
export function wordsOnIsoLines<L extends IsoLine>(words: readonly FrameWord[], isos: readonly L[], heads: readonly { track: Track }[], note: (line: string) => void = () => undefined, bridged?: (line: L) => readonly (readonly [number, number])[]): Map<FrameWord, L> {
  const out = new Map<FrameWord, L>();
  if (isos.length === 0) return out;
  for (const w of words) {
    const b = onPage(w);
    const cx = (b.l + b.r) / 2;
    const cy = (b.t + b.b) / 2;
    const hgt = b.b - b.t;
    let best: L | null = null;
    let bestD = Infinity;
    let second = Infinity;
    for (const c of isos) {
      const found = c.transposed ? distanceToTrack(c.track, cy, cx) : distanceToTrack(c.track, cx, cy);
      const across = bridged?.(c) ?? [];
      const d = across.length > 1 ? Math.min(found, distanceToPolyline(across as [number, number][], [cx, cy])) : found;
      if (d < bestD) [second, bestD, best] = [bestD, d, c];
      else if (d < second) second = d;
    }
    const head = Math.min(Infinity, ...heads.map((h) => distanceToTrack(h.track, cx, cy)));
    // On an iso-line, nearer it than any head curve, and not halfway between two iso-lines.
    const on = best !== null && bestD <= ON_LINE * hgt && bestD < head && second > 3 * bestD + 2;
    const split = on ? null : splitAcross(w, isos, heads);
    note(`word at [${b.l}, ${b.t}, ${b.r}, ${b.b}]: nearest iso-line ${bestD.toFixed(1)} px, next ${second.toFixed(1)} px, head curve ${head.toFixed(1)} px (text height ${hgt}) → ${on ? 'on an iso-line' : split ? `crossed by ${split.length} iso-lines, cut at ${split.slice(1).map((p) => p.part.word.l + w.at[0]).join(', ')}` : 'not an iso label'}`);
    if (on && best) out.set(w, best);
    for (const p of split ?? []) out.set(p.part, p.line);
  }
  return out;
}

export interface IsoLevels<L> {
  /** The level of every iso-line that has one (when some line has none, `missing` says so). */
  levels: Map<L, number>;
  /** Levels inferred by order, or found on one line only (the other branch not found): kept, but unsure. */
  unsure: Set<L>;
  /** One sentence for the engineer when the levels are incomplete or disagree; null when all are known. */
  missing: string | null;
}

/** Levels of the iso-lines of one head panel, from their labels (`onLines`, each word's line) and their order. */
export async function isoLevelsOnScan<L extends IsoLine>(
  isos: readonly L[],
  onLines: ReadonlyMap<FrameWord, L>,
  reader: TextReader,
  inkFull: number,
  panelId: string,
  note: (line: string) => void = () => undefined,
  textHeight = 0,
  lost: { lines: readonly L[]; onSheet: (line: L) => SheetPoint[] } = { lines: [], onSheet: () => [] },
  given: readonly number[] = [],
): Promise<IsoLevels<L>> {
  const levels = new Map<L, number>();
  // Lines the tracer could not follow (`lost`) get no level, but they stand in the order, and
  // their labels mark it: leaving them out would shift the order of the others.
  const all = [...isos, ...lost.lines];
  const unsure = new Set<L>();
  if (isos.length === 0) return { levels, unsure, missing: null };
  // Read the words on the lines, one call per cleaned frame, as words and as digits (the two must
  // agree each time). A word that gives no level is read once more alone and larger
  // (`AGAIN_ACROSS` pixels of text height): a small, blurred label the reader passes over at the
  // usual size among the others. A word of weaker evidence (`confirm`) is read so too, and its
  // level counts only when both readings give it.
  const read = new Map<L, Set<number>>();
  const byClean = new Map<InkMap, FrameWord[]>();
  for (const w of onLines.keys()) byClean.set(w.clean, [...(byClean.get(w.clean) ?? []), w]);
  const readWords = async (clean: InkMap, list: readonly FrameWord[], across?: number): Promise<(number | null)[]> => {
    const crops = list.map((w) => ({ box: { l: w.word.l - 2, t: w.word.t - 2, r: w.word.r + 2, b: w.word.b + 2 }, upright: false }));
    const asWords = await readCrops(clean, crops, reader, 'words', inkFull, across);
    const asDigits = await readCrops(clean, crops, reader, 'digits', inkFull, across);
    return list.map((w, i) => {
      const text = asWords[i]?.text ?? '';
      const digits = asDigits[i]?.text ?? '';
      const level = isoLevelRead(text, digits);
      const b = onPage(w);
      note(`${across ? 'read again alone, larger: ' : ''}iso label at [${b.l}, ${b.t}, ${b.r}, ${b.b}]${w.confirm ? ' (glyphs run together or cut between lines)' : ''} read "${text}" / "${digits}" → ${level ?? 'no level'}`);
      return level;
    });
  };
  const take = (w: FrameWord, level: number) => {
    const line = onLines.get(w) as L;
    read.set(line, (read.get(line) ?? new Set()).add(level));
  };
  for (const [clean, list] of byClean) {
    const first = await readWords(clean, list);
    for (const [i, w] of list.entries()) {
      const level = first[i] as number | null;
      // Only a word wide enough for a level and its "%" is read again (specks and stubs are not).
      const wide = w.word.r - w.word.l >= AGAIN_WIDTH * (w.word.b - w.word.t);
      if (level === null && w.confirm === true && wide) {
        // A word of weaker evidence that the reading among the others passed over (a clear
        // "60%" on bed scan 35 reads as nothing at the usual size, nor alone up to 70 px of text
        // height, and as "60%" from 80 px): read alone twice, at two larger sizes, its level
        // counts when both give it.
        const [alone] = await readWords(clean, [w], AGAIN_ACROSS);
        const [larger] = await readWords(clean, [w], AGAIN_LARGEST);
        if (alone !== null && alone !== undefined && alone === larger) take(w, alone);
        continue;
      }
      const again = level !== null ? w.confirm === true : w.confirm !== true && wide;
      if (!again) {
        if (level !== null) take(w, level);
        continue;
      }
      const [second] = await readWords(clean, [w], AGAIN_ACROSS);
      if (level === null && second !== null && second !== undefined) take(w, second);
      else if (level !== null && second === level) take(w, level);
      else if (level !== null) note(`the level ${level} % of a word of glyphs run together or cut between lines is not confirmed read alone and larger; not taken`);
    }
  }
  // A line whose labels disagree has no level read.
  const known = new Map<L, number>();
  for (const [line, set] of read) if (set.size === 1) known.set(line, [...set][0] as number);
  for (const [c, v] of known) if (isos.includes(c)) levels.set(c, v);
  // The rest by order along the flow axis, taken twice: from the tracer's lines and from the lines
  // found (level pixels, y down as on the sheet); a level is kept only where both orders give it
  // (a tracer's line that stopped short or ran on moves its end and shifts its order). Not when
  // one line runs on into another (pieces of one line, linesMeeting, with the page's text
  // height): the order would count a line twice.
  const meeting = levels.size < isos.length && (known.size > 0 || given.length > 0) ? linesMeeting(all, textHeight) : null;
  // The lines as the order reads them (the tracer's or the found ones), and the labelled among them;
  // null when a line has too few points to stand in the order.
  const shapesOf = (points: (line: L) => readonly SheetPoint[]) => {
    const shapes = all.map((line) => ({ line, points: points(line) }));
    if (shapes.some((k) => k.points.length < 2)) return null;
    return { shapes, known: new Map(shapes.filter((k) => known.has(k.line)).map((k) => [k, known.get(k.line) as number])) };
  };
  if (meeting) note(`an iso-line runs on into another at [${meeting.map((v) => v.toFixed(0)).join(', ')}] (pieces of one line?): no level is taken by order`);
  if (levels.size < isos.length && known.size > 0 && !meeting) {
    const byOrder = (points: (line: L) => readonly SheetPoint[]): Map<L, number> => {
      const o = shapesOf(points);
      return o ? new Map([...inferIsoLevels(o.shapes, o.known, { adjacent: true })].map(([k, v]) => [k.line, v])) : new Map();
    };
    // A lost line has no tracer's line: it stands in the tracer's order by the line found.
    const traced = byOrder((line) => (isos.includes(line) ? line.traced : lost.onSheet(line)));
    const found = byOrder((line) => levelPoints(line).map(([x, y]) => sheetPoint(x, y)));
    for (const [line, v] of traced) {
      if (!isos.includes(line)) continue;
      if (found.get(line) !== v) {
        note(`iso-line without a label: ${v} % by the order of the tracer's lines, ${found.get(line) ?? 'none'} by the lines found; no level by order`);
        continue;
      }
      levels.set(line, v);
      unsure.add(line);
      note(`iso-line without a label takes ${v} % by order`);
    }
  }
  // Every level drawn, given by the engineer (the take-off's iso_levels): the lines still without
  // a level take theirs from the list by order, from the tracer's lines and from the lines found
  // alike; such a level is sure only when both branches of every level were found (levelsFromList).
  let listNote = '';
  if (given.length > 0 && levels.size < isos.length && !meeting) {
    const fromList = (points: (line: L) => readonly SheetPoint[]) => {
      const o = shapesOf(points);
      const got = o ? levelsFromList(o.shapes, given, o.known) : null;
      return got ? { levels: new Map([...got.levels].map(([k, v]) => [k.line, v])), full: got.full } : null;
    };
    const traced = fromList((line) => (isos.includes(line) ? line.traced : lost.onSheet(line)));
    const found = fromList((line) => levelPoints(line).map(([x, y]) => sheetPoint(x, y)));
    if (!traced || !found) listNote = ` (the ${given.length} levels given, ${given.join(', ')} %, do not fit the ${all.length} lines found in their order${known.size > 0 ? ' and the labels read' : ''}: a line may be missing)`;
    else {
      for (const line of isos) {
        const v = traced.levels.get(line);
        if (levels.has(line) || v === undefined || found.levels.get(line) !== v) continue;
        levels.set(line, v);
        if (!traced.full) unsure.add(line);
        note(`iso-line without a label takes ${v} % from the levels given, by order${unsure.has(line) ? ' (unsure: fewer lines found than both branches of every level, so one may be missing)' : ''}`);
      }
    }
  }
  for (const [c, v] of levels) if ([...levels.values()].filter((k) => k === v).length === 1) unsure.add(c);
  if (levels.size === isos.length) return { levels, unsure, missing: null };
  const readList = [...new Set(known.values())].sort((a, b) => a - b);
  const missing = `${isos.length - levels.size} of the ${isos.length} lines on panel "${panelId}" that start neither at the flow axis nor at the bottom (iso-lines, or pieces of a curve the finder broke) ${isos.length - levels.size === 1 ? 'has' : 'have'} no level (no "%" label read on ${isos.length - levels.size === 1 ? 'it' : 'them'}, and the order of the lines does not tell it)${readList.length > 0 ? ` (levels read: ${readList.map((v) => `${v} %`).join(', ')})` : ''}${listNote}; ${isos.length - levels.size === 1 ? 'it is' : 'they are'} left out${levels.size > 0 ? ', and the levels of the others are unsure (their efficiency rests on part of the crossings): look at them' : ''}; ${given.length > 0 ? 'check the levels given, or trace what is missing by hand with its level' : 'give every efficiency level drawn as iso-lines ("iso_levels" in the take-off file), or trace what is missing by hand with its level'}.`;
  for (const c of levels.keys()) unsure.add(c);
  return { levels, unsure, missing };
}

/** A found line's points in level pixels, whichever way it was found. */
const levelPoints = (c: IsoLine): [number, number][] => c.track.u.map((u, i) => (c.transposed ? [c.track.v[i] as number, u] : [u, c.track.v[i] as number]));

/** How near the lower end of one found line and the upper end of another lie when they are one line's pieces, in text heights (a label's gap is about one and a quarter). */
export const MEET_HEIGHTS = 1.5;

/**
 * Where one found iso-line runs on into another: the lower end of one (on the level page) lies
 * within `MEET_HEIGHTS` text heights of the upper end of the other, as the pieces of a line the
 * finder broke (at its label, or where its steep and shallow passes met) or of a head curve
 * broken at a crossing. Two iso-lines of different levels never do: those lying side by side
 * end side by side (both lower ends on the smallest impeller's curve). Null when none does.
 */
export function linesMeeting(isos: readonly IsoLine[], textHeight: number): [number, number] | null {
  const ends = isos.map((c) => {
    const p = levelPoints(c);
    const a = p[0];
    const b = p[p.length - 1];
    if (!a || !b || p.length < 2) return null;
    return a[1] <= b[1] ? { upper: a, lower: b } : { upper: b, lower: a };
  });
  const reach = MEET_HEIGHTS * textHeight;
  for (const [i, a] of ends.entries()) {
    for (const [j, b] of ends.entries()) {
      if (!a || !b || i === j) continue;
      if (Math.hypot(a.lower[0] - b.upper[0], a.lower[1] - b.upper[1]) <= reach) return a.lower;
    }
  }
  return null;
}

/** Share of `points` within `tol` of the polyline `line`, looked at every 3rd point. */
function shareAlong(points: readonly (readonly [number, number])[], line: readonly (readonly [number, number])[], tol: number, beside = false): number {
  let near = 0;
  let n = 0;
  const last = line.length - 2;
  for (let i = 0; i < points.length; i += 3) {
    const [x, y] = points[i] as [number, number];
    const at = nearestOnPolyline(line, [x, y]);
    // `beside`: a point whose nearest place on the line is one of its ends lies past it, and is not judged.
    if (beside && ((at.segment === 0 && at.t <= 0) || (at.segment >= last && at.t >= 1)) && at.distance > tol) continue;
    n++;
    if (at.distance <= tol) near++;
  }
  return n === 0 || (beside && n < BESIDE_LEAST * Math.ceil(points.length / 3)) ? 0 : near / n;
}

/** Share of a line's points that must lie beside the other line for the share along it to be judged. */
const BESIDE_LEAST = 0.5;

/**
 * Lines sorted as iso-lines that are pieces of a head curve: 80 % of the line found lies within
 * 3 px of a head curve's tracer's line (level pixels). An iso-line crosses the head curves and
 * shares only a few points with any of them; a head curve the finder broke (at a label, or where
 * an iso-line crosses it at a shallow angle) leaves a piece starting off the flow axis, which the
 * head curve's own tracer's line runs along.
 */
export function headPieces<L extends IsoLine>(isos: readonly L[], heads: readonly { traced: readonly SheetPoint[] }[], toLevel: (p: SheetPoint) => [number, number]): Set<L> {
  const lines = heads.filter((h) => h.traced.length >= 2).map((h) => h.traced.map(toLevel));
  return new Set(isos.filter((c) => lines.some((line) => shareAlong(levelPoints(c), line, 3) >= 0.8)));
}

/**
 * Iso-lines found in pieces across the two passes (a steep branch on the turned ink, its shallow
 * rest on the page): a line whose points lie (80 %, within 3 px) along the tracer's line of a
 * surer one, or of an equally sure one whose tracer's line is longer, is a piece of it (of a
 * line under 0.5 sure only when it has a tracer's line too, judged as follows); when it
 * has a tracer's line of its own, the other line lies along that one too, where it lies beside it
 * (a tracer that ran on from one line onto another does not make the other a piece of it; a
 * tracer that stopped short of the other line's end does not make them two: scan bed seed 69,
 * an iso-line cut in two by its label).
 */
export function isoPiecesAcross<L extends IsoLine & { confidence: number }>(isos: readonly L[], toLevel: (p: SheetPoint) => [number, number]): Set<L> {
  const traced = new Map(isos.map((c) => [c, c.traced.map(toLevel)]));
  const length = (c: L) => {
    const p = traced.get(c) as [number, number][];
    let s = 0;
    for (let i = 1; i < p.length; i++) s += Math.hypot((p[i] as [number, number])[0] - (p[i - 1] as [number, number])[0], (p[i] as [number, number])[1] - (p[i - 1] as [number, number])[1]);
    return s;
  };
  const out = new Set<L>();
  for (const c of isos) {
    for (const k of isos) {
      if (k === c || out.has(k) || (traced.get(k) as []).length < 2) continue;
      if (!(k.confidence > c.confidence || (k.confidence === c.confidence && length(k) > length(c)))) continue;
      if (shareAlong(levelPoints(c), traced.get(k) as [number, number][], 3) < 0.8) continue;
      const own = traced.get(c) as [number, number][];
      // Of two unsure lines, one is a piece of the other only where each lies along the other's tracer's line.
      if (!(k.confidence >= 0.5) && own.length < 2) continue;
      if (own.length >= 2 && shareAlong(levelPoints(k), own, 3, true) < 0.8) continue;
      out.add(c);
      break;
    }
  }
  return out;
}
