/**
 * Panels found on a scan: the page turned level (ink.ts), plot frames from long rules and
 * grid lines inside them (rasterFrames.ts), tick labels beside each frame read by the
 * character reader (rasterText.ts) and put on their grid lines, and each axis calibrated from
 * the labels that make one evenly spaced axis (robustAxis.ts; log when the labels' logarithms
 * space evenly). Axis titles are read too, to say what each panel plots.
 *
 * The anchors are grid crossings (both values), turned back into the image's own pixels, so
 * the calibration carries the page's turn. What is doubtful becomes a question, never a guess:
 * a frame whose labels make no axis, a label that does not fit the others, a title not read.
 *
 * Pure: the raster and the reader are handed in.
 */
import type { PanelProposal, TickLabel } from '../autoCalibrate.ts';
import { calibrate, type AnchorInput } from '../calibration.ts';
import type { RasterImage } from '../raster.ts';
import type { AxisScaleType } from '../../model/takeoff.ts';
import { inkMap, levelInk, levelOf, pageAngle, strongInk, type InkMap, type Level } from './ink.ts';
import type { Box, FoundPanel } from './panels.ts';
import { findRasterFrames, frameSkew, framesTurn, gridLines, horizontalRules, verticalRules } from './rasterFrames.ts';
import { squarePage } from './keystone.ts';
import { inkBlots, readCrops, wordsOf, type Blot, type Crop, type TextReader } from './rasterText.ts';
import { readAxis } from './robustAxis.ts';
import { quantityOfTitle, SHEET_NUMBER, sheetNumber, unitOfTitle } from './words.ts';
import { parseUnit } from '../../units/index.ts';

export interface RasterPanelsFound {
  panels: FoundPanel[];
  /** Frames found, level pixels. */
  frames: Box[];
  /** The page's turn on the glass, degrees. */
  turnDeg: number;
  questions: string[];
  /** The level page the panels were found on, for finding their curves (rasterCurves.ts), with the grid lines of each frame calibrated (rasterFrames.gridLines), so they are not found twice. */
  page?: { map: InkMap; level: Level; strong: number; words: Blot[]; h: number; grids?: Map<Box, { x: number[]; y: number[] }> };
  /** Each found panel's frame in level pixels. */
  levelFrames?: Map<FoundPanel, Box>;
}

/** Progress of the detection, a fraction 0–1 with what is being done. */
export type DetectProgress = (fraction: number, what: string) => void;

interface Word extends Blot {
  cx: number;
  cy: number;
}

interface Side {
  frame: Box;
  side: 'left' | 'right';
  labels: Word[];
  /** Title crop: upright beyond the labels, or level above the frame's corner on that side; null when there is no ink there. */
  title: Blot | null;
  /** True when the title is written upwards beside the labels, false when it stands level above the frame. */
  upright: boolean;
}

/** Largest difference, pixels, between a frame side's position near its two ends on a level scan (turned scans measure under 0.6). */
export const MAX_FRAME_SKEW = 1;

/**
 * The placement error that the anchors of a panel found on a scan share, pixels (one standard
 * error). Every anchor stands on the frame's rules and grid lines read the same way, so a rule's
 * centre read off by a fraction of a pixel (blur, JPEG, a rule thicker on one side) moves them
 * all alike and more anchors do not average it away. Set on the scan detection bed
 * (scripts/detectSheets/scanBed.ts, seeds 1–40, 117 panels): with a quarter pixel the residual
 * shown comes within 3× of the real error on 113 panels and under it on none (without it, the
 * real error was more than 3× the shown on 70); checked on seeds 41–80 and on photos.
 */
export const RASTER_ANCHOR_BIAS = 0.25;

/** Darkness, as a share of the page's strong ink, from which a pixel counts for the keystone's lines: low enough to take a faint grid's lines too, which carry most of a photo's perspective. */
const KEYSTONE_INK = 0.35;

const NUMBER = new RegExp(`^[-−]?${SHEET_NUMBER}%?$`);

const grow = (b: Blot, by: number): Blot => ({ l: b.l - by, t: b.t - by, r: b.r + by, b: b.b + by });

function union(list: readonly Blot[]): Blot | null {
  if (list.length === 0) return null;
  return { l: Math.min(...list.map((k) => k.l)), t: Math.min(...list.map((k) => k.t)), r: Math.max(...list.map((k) => k.r)), b: Math.max(...list.map((k) => k.b)) };
}

function median(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s.length ? (s[Math.floor(s.length / 2)] as number) : NaN;
}

/** The label's line: the nearest grid line within a third of the text height, else the label's own middle. */
function snap(at: number, lines: readonly number[], h: number): number {
  let best = at;
  let off = 0.35 * h;
  for (const g of lines) {
    const d = Math.abs(g - at);
    if (d < off) [best, off] = [g, d];
  }
  return best;
}

/** Value labels beside one side of a frame: a column aligned on the edge toward the frame. */
function valueColumn(words: readonly Word[], frame: Box, side: 'left' | 'right', h: number): Word[] {
  const [l, t, r, b] = frame;
  const near = words.filter((w) => w.cy >= t - h && w.cy <= b + h && w.b - w.t <= 1.8 * h && w.b - w.t >= 0.5 * h && (side === 'left' ? w.r <= l - 0.05 * h && w.r >= l - 2.5 * h : w.l >= r + 0.05 * h && w.l <= r + 2.5 * h));
  if (near.length === 0) return [];
  const edge = side === 'left' ? Math.max(...near.map((w) => w.r)) : Math.min(...near.map((w) => w.l));
  return near.filter((w) => Math.abs((side === 'left' ? w.r : w.l) - edge) <= 0.8 * h);
}

/**
 * A value axis's title written level above the frame, at the corner of its side ("Head (m)" over
 * the top left corner, as many sheets print it): the line of words nearest above the frame's top
 * edge, starting within a few text heights of the corner and reaching no further than the
 * frame's middle (a centred sheet title or the flow title of a panel above is no axis title).
 * Tick labels are left out. Null when no such line is there.
 */
function titleAbove(words: readonly Word[], frame: Box, side: 'left' | 'right', h: number, ticks: ReadonlySet<Word>): Blot | null {
  const [l, t, r] = frame;
  const mid = (l + r) / 2;
  const near = words.filter(
    (w) => !ticks.has(w) && w.b <= t + 0.3 * h && w.b >= t - 2.5 * h && w.b - w.t <= 2.5 * h && (side === 'left' ? w.l >= l - 6 * h && w.r <= mid : w.r <= r + 6 * h && w.l >= mid),
  );
  if (near.length === 0) return null;
  // The line nearest the frame, its words joined from the corner outwards with gaps under two text heights.
  const bottom = Math.max(...near.map((w) => w.b));
  const line = near.filter((w) => w.b >= bottom - 0.6 * h).sort((a, b) => (side === 'left' ? a.l - b.l : b.r - a.r));
  const first = line[0] as Word;
  if (side === 'left' ? first.l > l + 3 * h : first.r < r - 3 * h) return null;
  const kept = [first];
  for (const w of line.slice(1)) {
    const last = kept[kept.length - 1] as Word;
    if (side === 'left' ? w.l - last.r > 2 * h : last.l - w.r > 2 * h) break;
    kept.push(w);
  }
  return union(kept);
}

/** Flow labels under a frame: the first row of words below its bottom edge. */
function flowRow(words: readonly Word[], frame: Box, h: number): Word[] {
  const [l, , r, b] = frame;
  const near = words.filter((w) => w.t >= b + 0.1 * h && w.t <= b + 2.5 * h && w.cx >= l - 1.5 * h && w.cx <= r + 1.5 * h && w.b - w.t <= 1.8 * h && w.b - w.t >= 0.5 * h);
  if (near.length === 0) return [];
  const top = Math.min(...near.map((w) => w.t));
  return near.filter((w) => w.t <= top + 0.6 * h);
}

function parseLabel(text: string): number | null {
  const t = text.replace(/\s+/g, '').replace('−', '-');
  if (!NUMBER.test(t)) return null;
  const v = (t.startsWith('-') ? -1 : 1) * sheetNumber(t.replace(/^-/, '').replace(/%$/, ''));
  return Number.isFinite(v) ? v : null;
}

/** An axis from its labels: linear when the values space evenly, log when their logarithms do. */
function axisOf(labels: readonly TickLabel[]): { scale: AxisScaleType; inliers: TickLabel[]; outliers: TickLabel[]; fragments?: TickLabel[] } | null {
  const lin = readAxis(labels);
  if (lin) return { scale: 'linear', inliers: lin.inliers, outliers: lin.outliers, ...(lin.fragments ? { fragments: lin.fragments } : {}) };
  if (labels.length >= 3 && labels.every((k) => k.value > 0)) {
    const log = readAxis(labels.map((k) => ({ ...k, value: Math.log10(k.value) })));
    if (log) {
      const back = (list: TickLabel[]) => list.map((k) => labels.find((o) => o.at === k.at && o.text === k.text) as TickLabel);
      return { scale: 'log', inliers: back(log.inliers), outliers: back(log.outliers) };
    }
  }
  return null;
}

/** A turn left on the level page smaller than this is left (radians: 0.01°, a tenth of a pixel over 600 px). */
const MIN_TURN_LEFT = (0.01 * Math.PI) / 180;

/** Everything `findRasterPanels` works from: the level ink, the frames, the words. */
interface Page {
  map: InkMap;
  level: Level;
  strong: number;
  frames: Box[];
  words: Word[];
  h: number;
}

function readPage(image: RasterImage): Page {
  const raw = inkMap(image);
  const strong = strongInk(raw);
  const angle = pageAngle(raw, 0.6 * strong);
  let level = levelOf(angle, raw.width, raw.height);
  let map = levelInk(raw, level);
  const minSide = 0.15 * Math.min(map.width, map.height);
  // A panel may be wide and low (an NPSHr strip under the others: a tenth of the page high), so
  // its sides need only half the length its top and bottom need; but only a low frame stacked
  // with a full-sized one (the same left and right edges) is taken for a panel: alone, a low
  // box is a title block or a table as often.
  const minHeight = 0.5 * minSide;
  const framesOn = (m: InkMap) => {
    const all = findRasterFrames(horizontalRules(m, 0.6 * strong, minSide), verticalRules(m, 0.6 * strong, minHeight), minSide, 6, minHeight);
    const full = all.filter((f) => f[3] - f[1] >= minSide);
    return all.filter((f) => f[3] - f[1] >= minSide || full.some((g) => Math.abs(g[0] - f[0]) <= 6 && Math.abs(g[2] - f[2]) <= 6));
  };
  const squareFrames = (m: InkMap, list: readonly Box[]) => list.filter((f) => frameSkew(m, f) <= MAX_FRAME_SKEW).length;
  let frames = framesOn(map);
  // The turn read again on the frames' own rules, to a hundredth of a degree (framesTurn), and
  // the page turned level once more where it is off by more than that.
  const left = framesTurn(map, frames);
  if (left !== undefined && Math.abs(left) > MIN_TURN_LEFT) {
    const again = levelOf(level.angle + left, raw.width, raw.height);
    const againMap = levelInk(raw, again);
    const againFrames = framesOn(againMap);
    if (againFrames.length >= frames.length) [level, map, frames] = [again, againMap, againFrames];
  }
  // A photo taken at an angle: no frame found, or frames that are no rectangles on the turned
  // page. The page is squared from its own lines (keystone.ts) and kept so when more frames
  // come out square.
  if (frames.length === 0 || squareFrames(map, frames) < frames.length) {
    const squared = squarePage(raw, map, angle, KEYSTONE_INK * strong, minSide);
    if (squared) {
      const again = framesOn(squared.map);
      if (squareFrames(squared.map, again) > squareFrames(map, frames)) {
        level = squared.level;
        map = squared.map;
        frames = again;
      }
    }
  }
  const words = wordsOf(inkBlots(map, 0.6 * strong, frames, Math.round(0.06 * Math.max(map.width, map.height)))).map((w) => ({ ...w, cx: (w.l + w.r) / 2, cy: (w.t + w.b) / 2 }));
  // Text height: the middle height of the words standing beside the frames.
  const beside = words.filter((w) => frames.some(([l, t, r, b]) => w.cy >= t - 50 && w.cy <= b + 100 && w.cx >= l - 200 && w.cx <= r + 200 && !(w.cx > l && w.cx < r && w.cy > t && w.cy < b)));
  const h = median(beside.map((w) => w.b - w.t));
  return { map, level, strong, frames, words, h };
}

/**
 * Panels of a scanned sheet. `image.scale` (pixels per sheet unit) converts the anchors back
 * to sheet units.
 */
export async function findRasterPanels(image: RasterImage, reader: TextReader, progress: DetectProgress = () => undefined): Promise<RasterPanelsFound> {
  progress(0.05, 'finding the ink and the frames');
  const page = readPage(image);
  const { map, level, frames, words, h } = page;
  const turnDeg = (level.angle * 180) / Math.PI;
  const questions: string[] = [];
  if (frames.length === 0 || !(h > 0)) {
    return { panels: [], frames, turnDeg, questions: ['No plot frame (four straight rules meeting at the corners) was found on this scan; draw each panel\'s frame and place its anchors by hand.'] };
  }
  // A frame that is no rectangle on the level page (a photo at an angle, a bent page) would put
  // its grid crossings where they are not: its panel is not calibrated here, and the sheet asks once.
  const skewed = frames.map((f) => ({ f, off: frameSkew(map, f) })).filter((k) => k.off > MAX_FRAME_SKEW);
  if (skewed.length > 0) {
    questions.push(`The frame${skewed.length === 1 ? '' : 's'} at ${skewed.map((k) => `[${k.f.map((v) => Math.round(v)).join(', ')}]`).join(', ')} (level pixels) ${skewed.length === 1 ? 'is' : 'are'} not square on the image (sides off by up to ${Math.max(...skewed.map((k) => k.off)).toFixed(1)} px: a photo taken at an angle, or a bent page); ${skewed.length === 1 ? 'its panel is' : 'their panels are'} not calibrated from the tick labels, so place four anchors on each by hand (the projective calibration takes them).`);
  }
  const square = frames.filter((f) => !skewed.some((k) => k.f === f));
  progress(0.35, 'reading the tick labels');
  const sides: Side[] = [];
  const flowLabels = new Map<Box, Word[]>();
  for (const f of square) flowLabels.set(f, flowRow(words, f, h));
  const tickWords = new Set([...flowLabels.values()].flat());
  for (const f of square) {
    for (const side of ['left', 'right'] as const) {
      const labels = valueColumn(words, f, side, h);
      if (labels.length < 2) continue;
      // The title stands beyond the labels, written upwards, within the frame's height.
      const edge = side === 'left' ? Math.min(...labels.map((w) => w.l)) : Math.max(...labels.map((w) => w.r));
      const beyond = words.filter((w) => w.cy > f[1] && w.cy < f[3] && (side === 'left' ? w.r <= edge - 0.2 * h && w.l >= edge - 5 * h : w.l >= edge + 0.2 * h && w.r <= edge + 5 * h));
      const upright = union(beyond);
      sides.push({ frame: f, side, labels, ...(upright ? { title: upright, upright: true } : { title: titleAbove(words, f, side, h, new Set([...tickWords, ...labels])), upright: false }) });
    }
  }
  const digitCrops: Crop[] = [];
  const owners: Word[] = [];
  for (const s of sides) for (const w of s.labels) (digitCrops.push({ box: grow(w, 2), upright: false }), owners.push(w));
  for (const list of flowLabels.values()) for (const w of list) (digitCrops.push({ box: grow(w, 2), upright: false }), owners.push(w));
  const inkFull = 2 * page.strong;
  const digitReadings = await readCrops(map, digitCrops, reader, 'digits', inkFull);
  const valueOf = new Map<Word, { value: number | null; text: string; confidence: number }>();
  owners.forEach((w, i) => {
    const r = digitReadings[i] as { text: string; confidence: number };
    valueOf.set(w, { value: parseLabel(r.text), text: r.text, confidence: r.confidence });
  });

  progress(0.65, 'reading the axis titles');
  const titleCrops: Crop[] = [];
  const flowTitleOf = new Map<Box, number>();
  const sideTitleOf = new Map<Side, number>();
  for (const s of sides) if (s.title) (sideTitleOf.set(s, titleCrops.length), titleCrops.push({ box: grow(s.title, 3), upright: s.upright }));
  const titlesAbove = frames.flatMap((f) => (['left', 'right'] as const).map((side) => titleAbove(words, f, side, h, tickWords))).filter((k): k is Blot => k !== null);
  for (const f of square) {
    const row = flowLabels.get(f) ?? [];
    const below = row.length ? Math.max(...row.map((w) => w.b)) : f[3];
    // A title written above the frame of a panel below is that panel's, not this flow axis's.
    const line = words.filter((w) => w.t >= below + 0.1 * h && w.t <= below + 2.5 * h && w.cx >= f[0] && w.cx <= f[2] && !titlesAbove.some((k) => w.cx >= k.l && w.cx <= k.r && w.cy >= k.t && w.cy <= k.b));
    const top = line.length ? Math.min(...line.map((w) => w.t)) : 0;
    const title = union(line.filter((w) => w.t <= top + 0.6 * h));
    if (title) (flowTitleOf.set(f, titleCrops.length), titleCrops.push({ box: grow(title, 3), upright: false }));
  }
  const titleReadings = await readCrops(map, titleCrops, reader, 'words', inkFull);
  // A flow title whose unit was not read as one this tool knows ("(m3)" for "(m³/h)": the small
  // superscript and the slash are lost at the usual size) is read again larger; the second
  // reading counts only when it names a known flow unit.
  const unread = [...flowTitleOf.values()].filter((i) => !knownFlowUnit(titleReadings[i]?.text ?? ''));
  if (unread.length > 0) {
    const again = await readCrops(map, unread.map((i) => titleCrops[i] as Crop), reader, 'words', inkFull, 64);
    unread.forEach((i, k) => {
      const second = again[k];
      if (second && knownFlowUnit(second.text)) titleReadings[i] = second;
    });
  }

  const grids = new Map<Box, { x: number[]; y: number[] }>();
  for (const f of square) grids.set(f, { x: gridLines(map, f, 'x'), y: gridLines(map, f, 'y') });
  // Each axis's labels as a list of words: the flow row of a frame (shared by its two sides), each value column.
  const axes: { words: Word[]; along: 'x' | 'y'; frame: Box }[] = [];
  for (const f of square) axes.push({ words: flowLabels.get(f) ?? [], along: 'x', frame: f });
  for (const s of sides) axes.push({ words: s.labels, along: 'y', frame: s.frame });
  const ticksOf = (a: (typeof axes)[number]): { ticks: TickLabel[]; from: Map<TickLabel, Word> } => {
    const grid = grids.get(a.frame) as { x: number[]; y: number[] };
    const from = new Map<TickLabel, Word>();
    const ticks: TickLabel[] = [];
    for (const w of a.words) {
      const v = valueOf.get(w);
      if (!v || v.value === null) continue; // an unreadable label is left out, never guessed
      const t = { value: v.value, at: a.along === 'x' ? snap(w.cx, grid.x, h) : snap(w.cy, grid.y, h), text: v.text };
      ticks.push(t);
      from.set(t, w);
    }
    return { ticks, from };
  };
  // A second reading, larger, of every label that made an axis doubtful: unread, odd, or on an axis not read.
  const doubtful = new Set<Word>();
  for (const a of axes) {
    const { ticks, from } = ticksOf(a);
    const read = axisOf(ticks);
    for (const w of a.words) if (valueOf.get(w)?.value === null) doubtful.add(w);
    if (!read) for (const w of a.words) doubtful.add(w);
    else for (const t of read.outliers) doubtful.add(from.get(t) as Word);
  }
  const twoWays = new Map<Word, string>();
  if (doubtful.size > 0) {
    progress(0.85, 'reading doubtful tick labels again');
    const list = [...doubtful];
    const again = await readCrops(map, list.map((w) => ({ box: grow(w, 2), upright: false })), reader, 'digits', inkFull, 64);
    list.forEach((w, i) => {
      const second = again[i] as { text: string; confidence: number };
      const first = valueOf.get(w) as { value: number | null; text: string; confidence: number };
      const value = parseLabel(second.text);
      if (value === null || second.text === first.text) return;
      // The two readings disagree: the second is tried; the panel then asks, whatever it decides.
      // A label the first reading left blank and the larger one reads is read once, not two ways:
      // it still has to fit the evenly spaced axis of the others (an outlier asks below).
      if (first.text.trim() !== '') twoWays.set(w, first.text);
      valueOf.set(w, { value, text: second.text, confidence: second.confidence });
    });
  }
  progress(0.9, 'calibrating the panels');
  const panels: FoundPanel[] = [];
  const levelFrames = new Map<FoundPanel, Box>();
  const used = new Map<string, number>();
  for (const s of sides) {
    const f = s.frame;
    const xa = ticksOf(axes.find((a) => a.along === 'x' && a.frame === f) as (typeof axes)[number]);
    const ya = ticksOf(axes.find((a) => a.words === s.labels) as (typeof axes)[number]);
    const xs = xa.ticks;
    const ys = ya.ticks;
    const x = axisOf(xs);
    const y = axisOf(ys);
    const where = `[${f.map((v) => Math.round(v)).join(', ')}]`;
    const readTwice = (list: TickLabel[], from: Map<TickLabel, Word>) => list.flatMap((t) => {
      const first = twoWays.get(from.get(t) as Word);
      return first === undefined ? [] : [`"${first}" then "${t.text}"`];
    });
    if (!x || !y) {
      questions.push(`The ${s.side} axis of the frame at ${where} (level pixels) has tick labels that were not read as an evenly spaced axis (${!x ? `flow labels read: ${xs.map((k) => k.text).join(' ') || 'none'}` : ''}${!x && !y ? '; ' : ''}${!y ? `value labels read: ${ys.map((k) => k.text).join(' ') || 'none'}` : ''}); place its anchors by hand.`);
      continue;
    }
    const disagreed = [...readTwice(x.inliers, xa.from), ...readTwice(y.inliers, ya.from)];
    const anchors = crossings(x.inliers, y.inliers, level, image.scale);
    const anchorBias = RASTER_ANCHOR_BIAS / image.scale;
    let calibration;
    try {
      calibration = calibrate(anchors, { xScale: x.scale, yScale: y.scale, anchorBias });
    } catch {
      questions.push(`The frame at ${where} could not be calibrated from its tick labels; place its anchors by hand.`);
      continue;
    }
    const titleIndex = sideTitleOf.get(s);
    const title = titleIndex !== undefined ? (titleReadings[titleIndex]?.text ?? '') : '';
    const flowIndex = flowTitleOf.get(f);
    const flowRead = flowIndex !== undefined ? (titleReadings[flowIndex]?.text ?? '') : '';
    // A line under the flow labels that titles a value axis ("NPSHr (m)" above the panel below) is no flow title.
    const flowTitle = valueAxisTitle(flowRead) ? '' : flowRead;
    const quantity = title ? quantityOfTitle(title) : null;
    const base = quantity ?? 'panel';
    const n = (used.get(base) ?? 0) + 1;
    used.set(base, n);
    const id = n === 1 ? base : `${base}${n}`;
    const proposal: PanelProposal = {
      frame: [Math.min(...x.inliers.map((k) => k.at)), Math.min(...y.inliers.map((k) => k.at)), Math.max(...x.inliers.map((k) => k.at)), Math.max(...y.inliers.map((k) => k.at))],
      x: { scale: x.scale, labels: x.inliers },
      y: { scale: y.scale, labels: y.inliers },
      anchors,
      xScale: x.scale,
      yScale: y.scale,
      calibration,
      anchorBias,
    };
    const residual = calibration.maxPercentOfSpan;
    let confidence = Math.min(1, 0.4 + 0.08 * Math.min(x.inliers.length, y.inliers.length)) * (residual <= 0.1 ? 1 : residual <= 0.3 ? 0.8 : 0.5);
    // Pieces of a label on the axis read apart from it (fragments) are no odd labels to ask about.
    const odd = [...x.outliers, ...y.outliers].filter((k) => !(x.fragments ?? []).includes(k) && !(y.fragments ?? []).includes(k));
    if (odd.length > 0) {
      confidence *= 0.6;
      questions.push(`Panel "${id}": the tick label${odd.length === 1 ? '' : 's'} ${odd.map((k) => `"${k.text}"`).join(', ')} read from the scan do${odd.length === 1 ? 'es' : ''} not fit the evenly spaced axis the other labels make; the panel is calibrated from the others. Is the axis read right?`);
    }
    if (disagreed.length > 0) {
      confidence *= 0.7;
      questions.push(`Panel "${id}": the tick label${disagreed.length === 1 ? ' was' : 's were'} read two ways (${disagreed.join(', ')}); the panel takes the second reading${disagreed.length === 1 ? '' : 's'}, which fit${disagreed.length === 1 ? 's' : ''} the evenly spaced axis of the other labels. Is that what the sheet prints?`);
    }
    if (!quantity) {
      confidence *= 0.5;
      questions.push(`What does the panel at ${where} plot (its ${s.side} axis title was ${title ? `read as "${title}"` : 'not read'})? Set its quantity (head, efficiency, power or NPSHr) on the panel.`);
    }
    const panel: FoundPanel = {
      id,
      quantity,
      frame: sheetBox(f, level, image.scale),
      side: s.side,
      proposal,
      title: title || null,
      flowTitle: flowTitle || null,
      yUnit: title ? unitOfTitle(title) : null,
      xUnit: flowTitle ? flowUnitOfTitle(flowTitle) : null,
      confidence: Math.round(confidence * 100) / 100,
    };
    panels.push(panel);
    levelFrames.set(panel, f);
  }
  sharedFlowTitles(panels, levelFrames, h);
  progress(1, 'panels found');
  return { panels, frames, turnDeg, questions, page: { map, level, strong: page.strong, words, h, grids }, levelFrames };
}

/** Anchors at grid crossings: every flow label with the lowest and highest value label, and every value label with the lowest and highest flow label; in sheet units. */
function crossings(xs: readonly TickLabel[], ys: readonly TickLabel[], level: Level, scale: number): AnchorInput[] {
  const ends = <T extends TickLabel>(list: readonly T[]) => [...list].sort((a, b) => a.at - b.at).filter((_, i, all) => i === 0 || i === all.length - 1);
  const pairs = new Map<string, [TickLabel, TickLabel]>();
  for (const x of xs) for (const y of ends(ys)) pairs.set(`${x.at}|${y.at}`, [x, y]);
  for (const y of ys) for (const x of ends(xs)) pairs.set(`${x.at}|${y.at}`, [x, y]);
  return [...pairs.values()].map(([x, y]) => {
    const [px, py] = level.toImage(x.at, y.at);
    return { at: [px / scale, py / scale] as [number, number], x: x.value, y: y.value };
  });
}

/** The sheet-unit box around a level frame's corners. */
function sheetBox(f: Box, level: Level, scale: number): Box {
  const corners = [level.toImage(f[0], f[1]), level.toImage(f[2], f[1]), level.toImage(f[2], f[3]), level.toImage(f[0], f[3])];
  const xs = corners.map((c) => c[0] / scale);
  const ys = corners.map((c) => c[1] / scale);
  return [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)];
}

/**
 * Panels stacked over one flow axis often print its title once, under the lowest: a panel
 * without a flow title takes the one title read under a panel whose flow labels are the same
 * values at the same places (within a text height `h`, level pixels), when no other flow unit
 * was read on the sheet. Changes `panels` in place.
 */
export function sharedFlowTitles(panels: FoundPanel[], frames: ReadonlyMap<FoundPanel, Box>, h: number): void {
  const titled = panels.filter((p) => p.flowTitle !== null && knownFlowUnit(p.flowTitle));
  if (new Set(titled.map((p) => p.xUnit)).size !== 1) return;
  const byPlace = (list: readonly TickLabel[]) => [...list].sort((m, n) => m.at - n.at);
  for (const p of panels) {
    const pf = frames.get(p);
    if (p.flowTitle !== null || !pf) continue;
    const same = titled.find((q) => {
      const qf = frames.get(q);
      if (!qf) return false;
      const a = byPlace(p.proposal.x.labels);
      const b = byPlace(q.proposal.x.labels);
      return Math.abs(pf[0] - qf[0]) <= h && Math.abs(pf[2] - qf[2]) <= h && a.length === b.length && a.every((k, i) => k.value === b[i]?.value && Math.abs(k.at - (b[i] as TickLabel).at) <= h);
    });
    if (same) Object.assign(p, { flowTitle: same.flowTitle, xUnit: same.xUnit });
  }
}

/** True when a title is a value axis's rather than a flow axis's: it names no flow unit, and names a value quantity or a unit of head, power or efficiency ("NPSHr (m)", "(kW)"). */
export function valueAxisTitle(title: string): boolean {
  if (title === '' || knownFlowUnit(title)) return false;
  if (quantityOfTitle(title) !== null) return true;
  const token = unitOfTitle(title);
  if (token === null) return false;
  if (token.trim() === '%') return true;
  for (const kind of ['head', 'power'] as const) {
    try {
      parseUnit(kind, token);
      return true;
    } catch {
      // not a unit of this kind
    }
  }
  return false;
}

/**
 * The flow unit a scan's flow title names in brackets; "m3/h" where the reader lost the small
 * superscript 3 or the slash of "m³/h", or read the 3 as a mark or a letter ("(mh)", "(m3h)",
 * "(m/h)", "(mah)"): under a flow axis no other unit reads so (the committed sample scan's
 * "Flow (m³/h)" reads "Flow (mh)"). Null when the title has no bracketed unit.
 */
export function flowUnitOfTitle(title: string): string | null {
  const token = unitOfTitle(title);
  if (token === null) return null;
  return /^m\s*[3³°'"*?a]?\s*[/|l1]?\s*hr?$/i.test(token.trim()) ? 'm3/h' : token;
}

/** True when a title names, in brackets, a flow unit this tool knows ("Flow Q (m3/h)"). */
export function knownFlowUnit(title: string): boolean {
  const token = flowUnitOfTitle(title);
  if (token === null) return false;
  try {
    parseUnit('flow', token);
    return true;
  } catch {
    return false;
  }
}
