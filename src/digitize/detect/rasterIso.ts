/**
 * Iso-efficiency lines on a scan: which words of the head frame are their "%" labels, the
 * level each line carries, and what stays unknown.
 *
 * A line of the head frame that starts neither at the flow axis nor at the bottom is taken for
 * an iso-line (rasterCurves.ts). Its level comes only from the label printed on it ("64%", read
 * as words and as digits, the two readings agreeing, the label's middle on the line). On a scan
 * the line finder may miss an iso-line (a steep branch, a line lost in the grid), so the order of
 * the lines found along the flow axis names nothing: a level inferred by order, as on a vector
 * sheet (isoLevels.ts), would take the level of a line that was not found. Efficiency from
 * iso-lines rests on every line found in the panel: when one has no level, none is used and the
 * engineer is told once. A level found on one line only (its other branch not found) is kept
 * but unsure, so that the engineer looks at it.
 *
 * Pure: the reader is handed in.
 */
import type { SheetPoint } from '../points.ts';
import type { InkMap } from './ink.ts';
import type { Track } from './rasterLines.ts';
import { readCrops, type Blot, type TextReader } from './rasterText.ts';

/** A word found in a frame: its box in the frame's cleaned ink (`clean`, offset `at` on the level page). */
export interface FrameWord {
  word: Blot;
  clean: InkMap;
  at: [number, number];
}

/** An iso-line as this file needs it: the line found (level pixels) and the tracer's line (sheet units). */
export interface IsoLine {
  track: Track;
  traced: readonly SheetPoint[];
}

/**
 * The level of an iso-line's label as read: "64%", "64 %", "η 64%", "64.5%"; null for anything
 * else. Levels lie between 0 and 100 % (exclusive).
 */
export function isoLevelOf(text: string): number | null {
  const t = text.replace(/\s+/g, '').replace(/^[,.;:_\-–—'`~|]+|[,.;:_\-–—'`~|]+$/g, '');
  const m = /^(?:η=?)?(\d{1,2}(?:[.,]\d)?)%$/.exec(t);
  if (!m) return null;
  const v = Number((m[1] as string).replace(',', '.'));
  return v > 0 && v < 100 ? v : null;
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
  const asDigits = (s: string) => Number(s.replace(',', '.'));
  return asDigits(number) === level || asDigits(number.slice(0, -1)) === level ? level : null;
}

/** Distance (level pixels) from a point to the polyline of a track. */
export function distanceToTrack(t: Track, x: number, y: number): number {
  let best = Infinity;
  const n = t.u.length;
  if (n === 1) return Math.hypot((t.u[0] as number) - x, (t.v[0] as number) - y);
  for (let i = 1; i < n; i++) {
    const ax = t.u[i - 1] as number;
    const ay = t.v[i - 1] as number;
    const dx = (t.u[i] as number) - ax;
    const dy = (t.v[i] as number) - ay;
    const len2 = dx * dx + dy * dy;
    const s = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((x - ax) * dx + (y - ay) * dy) / len2));
    const d = Math.hypot(ax + s * dx - x, ay + s * dy - y);
    if (d < best) best = d;
  }
  return best;
}

/** How far a label's middle may lie from its line, in text heights (the line runs through the label's box). */
export const ON_LINE = 0.6;

/** A word's box on the level page. */
const onPage = (w: FrameWord): Blot => ({ l: w.word.l + w.at[0], t: w.word.t + w.at[1], r: w.word.r + w.at[0], b: w.word.b + w.at[1] });

/**
 * The words of the head frame that sit on an iso-line: a label printed on a line interrupts it,
 * so the word's middle lies on the line (within `ON_LINE` of the text height), nearer to it than
 * to any head curve, and far nearer to it than to any other iso-line.
 */
export function wordsOnIsoLines<L extends IsoLine>(words: readonly FrameWord[], isos: readonly L[], heads: readonly { track: Track }[]): Map<FrameWord, L> {
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
      const d = distanceToTrack(c.track, cx, cy);
      if (d < bestD) [second, bestD, best] = [bestD, d, c];
      else if (d < second) second = d;
    }
    const head = Math.min(Infinity, ...heads.map((h) => distanceToTrack(h.track, cx, cy)));
    // On an iso-line, nearer it than any head curve, and not halfway between two iso-lines.
    if (best && bestD <= ON_LINE * hgt && bestD < head && second > 3 * bestD + 2) out.set(w, best);
  }
  return out;
}

export interface IsoLevels<L> {
  /** Every iso-line's level, or empty when some line has none (then `missing` says so). */
  levels: Map<L, number>;
  /** Levels found on one line only (the other branch not found): kept, but unsure. */
  single: Set<L>;
  /** One sentence for the engineer when the levels are incomplete or disagree; null when all are known. */
  missing: string | null;
}

/**
 * Levels of the iso-lines of one head panel, read from their labels (`onLines`, each word's
 * line). Every line has a level, or none is returned.
 */
export async function isoLevelsOnScan<L extends IsoLine>(
  isos: readonly L[],
  onLines: ReadonlyMap<FrameWord, L>,
  reader: TextReader,
  inkFull: number,
  panelId: string,
  note: (line: string) => void = () => undefined,
): Promise<IsoLevels<L>> {
  const levels = new Map<L, number>();
  const single = new Set<L>();
  if (isos.length === 0) return { levels, single, missing: null };
  // Read the words on the lines, one call per cleaned frame, as words and as digits.
  const read = new Map<L, Set<number>>();
  const byClean = new Map<InkMap, FrameWord[]>();
  for (const w of onLines.keys()) byClean.set(w.clean, [...(byClean.get(w.clean) ?? []), w]);
  for (const [clean, list] of byClean) {
    const crops = list.map((w) => ({ box: { l: w.word.l - 2, t: w.word.t - 2, r: w.word.r + 2, b: w.word.b + 2 }, upright: false }));
    const asWords = await readCrops(clean, crops, reader, 'words', inkFull);
    const asDigits = await readCrops(clean, crops, reader, 'digits', inkFull);
    list.forEach((w, i) => {
      const text = asWords[i]?.text ?? '';
      const digits = asDigits[i]?.text ?? '';
      const level = isoLevelRead(text, digits);
      const b = onPage(w);
      note(`iso label at [${b.l}, ${b.t}, ${b.r}, ${b.b}] read "${text}" / "${digits}" → ${level ?? 'no level'}`);
      if (level === null) return;
      const line = onLines.get(w) as L;
      read.set(line, (read.get(line) ?? new Set()).add(level));
    });
  }
  // A line whose labels disagree has no level read.
  const known = new Map<L, number>();
  for (const [line, set] of read) if (set.size === 1) known.set(line, [...set][0] as number);
  for (const [c, v] of known) levels.set(c, v);
  for (const [c, v] of known) if ([...known.values()].filter((k) => k === v).length === 1) single.add(c);
  if (levels.size === isos.length) return { levels, single, missing: null };
  const readList = [...new Set(known.values())].sort((a, b) => a - b);
  const missing = `${isos.length - levels.size} of the ${isos.length} iso-lines found on panel "${panelId}" ${isos.length - levels.size === 1 ? 'has' : 'have'} no "%" label read on ${isos.length - levels.size === 1 ? 'it' : 'them'}${readList.length > 0 ? ` (levels read: ${readList.map((v) => `${v} %`).join(', ')})` : ''}; efficiency from the iso-lines is left out: trace them by hand with their levels.`;
  return { levels: new Map(), single: new Set(), missing };
}
