/**
 * Curves found on a scan, panel by panel: the lines of each frame (rasterLines.ts), sorted
 * into curves (a head curve starts at the flow axis; a curve against a second axis in the head
 * frame starts at the bottom; what else crosses the head curves is an iso-line), with guides
 * placed where each line stands alone. The guides go to the raster tracer (rasterTrace.ts),
 * the one follower the manual take-off uses too, and its line is checked against the line
 * found here: two followers that disagree make a question, never a silent curve.
 *
 * Names: the head curves by the labels read beside or on them ("330 mm", 13"), else by the
 * diameters the engineer gave, in order (the larger impeller gives more head at every flow).
 * The curves of the other panels take the diameter of the head curve that ends at the same
 * flow (each impeller's curves are drawn over the same flows on every panel; where each
 * impeller's curves end, also for head curves the tracer did not confirm, is endFlows.ts). Each
 * curve carries a confidence; where a name is doubtful the curve is left out, or proposed unsure,
 * with one question.
 *
 * Pure: the raster, the found panels and the character reader are handed in.
 */
import { QUANTITY_WORDS, type Quantity } from '../../model/curveset.ts';
import { captureRasterTrace } from '../rasterTrace.ts';
import { inkModel, type InkModel } from '../colour.ts';
import { membershipAt } from '../lineProfile.ts';
import { sheetPoint, type SheetPoint } from '../points.ts';
import type { RasterImage } from '../raster.ts';
import type { InkMap, Level } from './ink.ts';
import type { Box, FoundPanel } from './panels.ts';
import { END_MATCH_SHARE, endMatch, endReferences, nameByEnds, panelEndRule, withPanelRule } from './endFlows.ts';
import { gridLines } from './rasterFrames.ts';
import { alonePlaces, carriesOnAsItBends, continuesCourse, course, frameLines, liesAlong, offCourse, trackAt, trackOf, type Track } from './rasterLines.ts';
import { distanceToTrack, headPieces, isoLevelsOnScan, isoPiecesAcross, steepLines, transposeBox, wordsOnIsoLines, type FrameWord } from './rasterIso.ts';
import type { RasterPanelsFound } from './rasterPanels.ts';
import { inkBlots, labelPicture, readCrops, wordsOf, type Blot, type TextReader } from './rasterText.ts';
import { curveLabel, isoLabel, SHEET_NUMBER, sheetNumber, speedShareLabel, trimSpecks } from './words.ts';


export interface RasterCurve {
  panel: FoundPanel;
  quantity: Quantity;
  kind: 'curve' | 'iso';
  /** The line found, and the frame it was found in, level pixels (with `transposed`, both turned over the diagonal: see rasterIso.ts). */
  track: Track;
  levelFrame: Box;
  /** A steep iso-line found on the transposed ink: its track's `u` are rows, its `v` columns. */
  transposed?: boolean;
  /** Where the tracer is started, sheet units, in order along the line. */
  guides: SheetPoint[];
  /** The tracer's line, sheet units. */
  traced: SheetPoint[];
  /** Flow at the line's two ends (the panel's calibration). */
  flows: [number, number];
  /** The diameter or speed, or the iso level; undefined until named. */
  value?: number;
  /** How the value was found. */
  named?: 'label' | 'given' | 'end flow' | 'traced end' | 'elimination';
  /** The flow where the tracer's line ends, where the line found runs on past it in ink of another colour (`notOwnInkFrom`). */
  ownEnd?: number;
  confidence: number;
  /**
   * True when the curve is unsure only for a reason a question or sentence of its own says: the
   * label of its value was read with little certainty, or its name came by elimination.
   */
  ownQuestion?: boolean;
}

/** Within this share of the flow span of its value's reference end, a curve may be named by elimination (`byElimination`). */
export const ELIMINATION_SHARE = 0.06;

export interface RasterCurvesFound {
  curves: RasterCurve[];
  /**
   * Unit of the labels read ('mm', 'in', 'rpm'), null when none was read surely: the unit of the
   * labels that named the curves, or one read on at least two labels and no other unit read.
   */
  labelUnit: string | null;
  /** Unit of the curves' values: the labels' where labels named them, null where the values given did (already in the take-off's unit). */
  valueUnit: string | null;
  family: 'diameter' | 'speed';
  /** What the engineer must answer (the names of the curves). */
  questions: string[];
  /** Parts left out, each one sentence (the caller asks about them together, once). */
  leftOut: string[];
  /** Every line sorted into a curve or an iso-line, named or not (for the dump scripts). */
  lines?: RasterCurve[];
}

export interface RasterCurveOptions {
  /** Values the engineer gave (the take-off's diameters or speeds), used when no label is read. */
  given?: { family: 'diameter' | 'speed'; values: readonly number[] };
  /** The rated speed of the take-off (pump.speed_rpm), rpm: a speed family labelled "100 %", "90 %" … is named from it. */
  ratedRpm?: number;
  /** Every efficiency level drawn as iso-lines, as the engineer gave them (the take-off's iso_levels): unlabelled iso-lines take theirs by order. */
  isoLevels?: readonly number[];
  /** Receives lines about what was read (the dump scripts print them). */
  note?: (line: string) => void;
  /** Progress within this step, 0–1 with what is being done (lines found per frame, lines followed, labels read). */
  progress?: (fraction: number, what: string) => void;
}

/** Most lines one frame holds: ten diameters, their iso-lines and a second axis's curves (common practice: sheets draw far fewer). */
const MAX_LINES = 30;

/**
 * A line whose start lies this share of the frame's width or less from the flow axis, but farther
 * than the 3 % a line at the axis starts within, may still be a head curve whose first stretch the
 * finder missed (drawn pale, or faded by the scan).
 */
const FAINT_START_SHARE = 0.1;
/** Least share of the frame's width such a line spans, and least share of the frame's height it falls over that span. */
const FAINT_START_SPAN = 0.5;
const FAINT_START_FALL = 0.03;

/**
 * Whether a line that starts off the flow axis is a head curve with a faint start: it starts
 * within `FAINT_START_SHARE` of the frame's width of the axis, spans at least `FAINT_START_SPAN`
 * of it and falls (head falls with flow) by at least `FAINT_START_FALL` of the frame's height
 * from its start to its end. An iso-line's branches rise with flow (a larger impeller reaches a
 * level at more flow and more head) and span a small part of the frame, and a piece of a head curve
 * cut at a label starts well inside the frame. Rows grow downwards, so a fall is a growing row.
 */
export function startsFaint(t: Track, left: number, width: number, height: number): boolean {
  const u0 = t.u[0] as number;
  const u1 = t.u[t.u.length - 1] as number;
  return u0 - left <= FAINT_START_SHARE * width && u1 - u0 >= FAINT_START_SPAN * width && (t.v[t.v.length - 1] as number) - (t.v[0] as number) >= FAINT_START_FALL * height;
}

const NUMBER_ONLY = new RegExp(`^${SHEET_NUMBER}$`);

/** The level page's frame of a panel, and the panels sharing it. */
function framesOf(found: RasterPanelsFound): { frame: Box; panels: FoundPanel[] }[] {
  const out: { frame: Box; panels: FoundPanel[] }[] = [];
  for (const p of found.panels) {
    const f = found.levelFrames?.get(p);
    if (!f || p.quantity === null) continue;
    const k = out.find((o) => o.frame === f);
    if (k) k.panels.push(p);
    else out.push({ frame: f, panels: [p] });
  }
  return out;
}

/** Two tracks that run together over most of their common columns are one line: the longer stays. */
function dropDoubles(tracks: Track[]): Track[] {
  const keep = [...tracks].sort((a, b) => b.u.length - a.u.length);
  const out: Track[] = [];
  for (const t of keep) {
    const double = out.some((o) => {
      let near = 0;
      let n = 0;
      for (let i = 0; i < t.u.length; i += 4) {
        const v = trackAt(o, t.u[i] as number);
        if (v === null) continue;
        n++;
        if (Math.abs(v - (t.v[i] as number)) <= 3) near++;
      }
      return n > 0.5 * (t.u.length / 4) && near >= 0.8 * n;
    });
    if (!double) out.push(t);
  }
  return out;
}

/**
 * Curves of every found panel. `found` must come from findRasterPanels on the same image
 * (it carries the level page). Questions say what was left out and why.
 */
export async function findRasterCurves(image: RasterImage, found: RasterPanelsFound, reader: TextReader, options: RasterCurveOptions = {}): Promise<RasterCurvesFound> {
  const questions: string[] = [];
  /** Parts left out for the engineer to trace: said together, as one question, by the caller. */
  const leftOut: string[] = [];
  const page = found.page;
  if (!page) return { curves: [], labelUnit: null, valueUnit: null, family: 'diameter', questions, leftOut };
  const { map, level } = page;
  const toSheet = (u: number, v: number): SheetPoint => {
    const [x, y] = level.toImage(u, v);
    return sheetPoint(x / image.scale, y / image.scale);
  };
  const toLevel = (p: SheetPoint): [number, number] => level.toLevel(p[0] * image.scale, p[1] * image.scale);
  const curves: RasterCurve[] = [];
  const isoWordsAt: FrameWord[] = [];
  const labelsAt: { word: Blot; frame: Box; clean: InkMap; plain: InkMap; at: [number, number] }[] = [];
  const frames = framesOf(found);
  for (const [k, { frame, panels }] of frames.entries()) {
    options.progress?.((0.4 * k) / frames.length, `finding the lines in frame ${k + 1} of ${frames.length}`);
    const grid = page.grids?.get(frame) ?? { x: gridLines(map, frame, 'x'), y: gridLines(map, frame, 'y') };
    // The words printed in the frame (curve labels) are no line: the lines are followed around them.
    const printed = frameWords(map, frame, page.strong, page.h);
    const holes = printed.words.map((w) => [w.l + printed.at[0] - 2, w.t + printed.at[1] - 2, w.r + printed.at[0] + 2, w.b + printed.at[1] + 2] as const);
    // In a head frame (where the labels name the curves) the labels are looked for once more with
    // the lines' ink taken out (found without holes), so that a label touching its line stands
    // free; only words on a line or beside a line's end are read.
    const bare = panels.some((p) => p.quantity === 'head') ? frameLines(map, frame, { ceiling: 0.3 * page.strong, grid }) : [];
    const labels = bare.length > 0 ? frameWords(map, frame, page.strong, page.h, bare, printed) : printed;
    const everyWord = labels.words;
    labels.words = labels.words.filter((w) => nearLine({ l: w.l + labels.at[0], t: w.t + labels.at[1], r: w.r + labels.at[0], b: w.b + labels.at[1] }, bare.length > 0 ? bare : []));
    const head = panels.find((p) => p.quantity === 'head');
    // Past a label: a power or NPSHr line's stretch to its end, kept though short (its end names it).
    const tracks = dropDoubles(frameLines(map, frame, { ceiling: 0.3 * page.strong, grid, holes, pastLabels: !head }));
    // More lines than any sheet draws in one frame: the ink was not told from the grid or the noise.
    if (tracks.length > MAX_LINES) {
      leftOut.push(`The frame of panel${panels.length === 1 ? '' : 's'} ${panels.map((p) => `"${p.id}"`).join(' and ')} gave ${tracks.length} lines, more than a sheet draws: its curves could not be told from the grid; trace them by hand.`);
      continue;
    }
    const [l, , r, b] = frame;
    const fw = r - l;
    const second = panels.find((p) => p !== head);
    for (const t of tracks) {
      const u0 = t.u[0] as number;
      const v0 = t.v[0] as number;
      const atAxis = u0 - l <= 0.03 * fw;
      let panel: FoundPanel | undefined;
      let kind: 'curve' | 'iso' = 'curve';
      if (!head) panel = panels[0];
      else if (atAxis && second && b - v0 <= 0.05 * (b - frame[1])) panel = second;
      else if (atAxis || startsFaint(t, l, fw, b - frame[1])) panel = head;
      else [panel, kind] = [head, 'iso'];
      if (!panel) continue;
      curves.push({ panel, quantity: kind === 'iso' ? 'efficiency' : (panel.quantity as Quantity), kind, track: t, levelFrame: frame, guides: [], traced: [], flows: [NaN, NaN], confidence: 1 });
    }
    // Iso-lines cross the head curves steeply: the branch of one that the column-by-column finder
    // cannot follow is looked for on the ink turned over its diagonal.
    let joinedLabels: Blot[] = [];
    if (head) {
      const steep = steepLines(map, frame, { ceiling: 0.3 * page.strong, grid, holes }, tracks);
      const frameT = transposeBox(frame);
      if (steep.length <= MAX_LINES) {
        for (const t of steep) curves.push({ panel: head, quantity: 'efficiency', kind: 'iso', track: t, levelFrame: frameT, transposed: true, guides: [], traced: [], flows: [NaN, NaN], confidence: 1 });
        // The words on those lines, for their levels only (the head curves' names never rest on them).
        const kept = new Set(labels.words);
        for (const word of everyWord) {
          if (kept.has(word)) continue;
          const cx = (word.l + word.r) / 2 + labels.at[0];
          const cy = (word.t + word.b) / 2 + labels.at[1];
          if (steep.some((t) => distanceToTrack(t, cy, cx) <= 1.5 * (word.b - word.t))) isoWordsAt.push({ word, clean: labels.clean, at: labels.at });
        }
      }
      // Labels whose glyphs the scan ran together, which frameWords drops: for the iso levels only.
      const overlaps = (a: Blot, c: Blot) => a.l < c.r && c.l < a.r && a.t < c.b && c.t < a.b;
      const joined = runTogetherWords(labels.clean, page.strong, page.h).filter((w) => !everyWord.some((k) => overlaps(k, w) && k.r - k.l >= w.r - w.l));
      for (const word of joined) isoWordsAt.push({ word, clean: labels.clean, at: labels.at, confirm: true });
      // Such a word by a head line is read for the curves' names too: a label's digits blurred
      // into one blot ("330" on the committed sample scan, 30 px wide for 14 px of text) are
      // dropped by frameWords, and its unit word beside it alone names nothing.
      joinedLabels = joined.filter((w) => nearLine({ l: w.l + labels.at[0], t: w.t + labels.at[1], r: w.r + labels.at[0], b: w.b + labels.at[1] }, bare));
      options.note?.(`${steep.length} steep line${steep.length === 1 ? '' : 's'} found on the turned ink of the head frame${joined.length > 0 ? `; ${joined.length} word${joined.length === 1 ? '' : 's'} of glyphs run together looked at for iso labels` : ''}`);
    }
    if (head) labelsAt.push(...[...labels.words, ...joinedLabels].map((word) => ({ word, frame, clean: labels.clean, plain: printed.clean, at: labels.at })));
  }

  // A head line broken by a label printed on it (or cut where the finder ran on along an iso-line
  // from the label) goes on beyond the label as a line that starts off the flow axis, which would
  // be sorted as an iso-line: joined back where that line carries on the head line's course.
  const headLines = () => curves.filter((c) => c.kind === 'curve' && c.quantity === 'head' && !c.transposed);
  // What lies past a turn is a piece of the line the track turned onto: kept where it carries on
  // another head line found short (two head lines that swapped at a label), dropped below if not.
  const rests = new Set<RasterCurve>();
  for (const c of headLines()) {
    const cut = courseBreak(c.track, Math.max(3, 1.5 * Math.max(2, median(c.track.len))), 0.15 * (c.levelFrame[2] - c.levelFrame[0]));
    if (cut === null) continue;
    const rest = trackFrom(c.track, cut);
    if (rest.u.length >= 8) {
      const piece: RasterCurve = { ...c, kind: 'iso', quantity: 'efficiency', track: rest };
      curves.push(piece);
      rests.add(piece);
    }
    c.track = cutTrack(c.track, cut);
  }
  for (const c of headLines()) {
    const width = Math.max(2, median(c.track.len));
    const fw = c.levelFrame[2] - c.levelFrame[0];
    // An iso-line's branch that starts just past the head line's end and runs along its course
    // crosses the other head lines, and a piece of another head line lies along it: the head
    // line's own rest does neither.
    const others = headLines().filter((k) => k !== c && k.levelFrame === c.levelFrame).map((k) => k.track);
    for (;;) {
      const rest = continuationOf(c.track, curves.filter((k) => k.kind === 'iso' && !k.transposed && k.levelFrame === c.levelFrame && !others.some((o) => tracksCross(o, k.track) || liesAlong(k.track, o, Math.max(3, 1.5 * width), ALONG_OTHER_SHARE))), width, fw);
      if (!rest) break;
      c.track = joinTracks(c.track, rest.track);
      curves.splice(curves.indexOf(rest), 1);
    }
  }
  for (const piece of rests) if (curves.includes(piece)) curves.splice(curves.indexOf(piece), 1);

  // Efficiency curves drawn against a right-hand axis rise from the origin together: the finder
  // follows the bunch as one line, and each curve that leaves it starts mid-frame, as an iso-line
  // would. Such a line, starting on an efficiency curve and carrying on its course, is a curve of
  // its own: it takes that curve's line up to where it leaves it.
  for (const { frame, panels } of frames) {
    const efficiency = panels.find((p) => p.quantity === 'efficiency');
    if (!efficiency || !panels.some((p) => p.quantity === 'head')) continue;
    const fw = frame[2] - frame[0];
    const loose = curves.filter((c) => c.kind === 'iso' && !c.transposed && c.levelFrame === frame).sort((a, b) => (a.track.u[0] as number) - (b.track.u[0] as number));
    for (const c of loose) {
      // An efficiency curve cut by a label printed on it goes on beyond it, as a head line does.
      const cut = curves.find((k) => k.kind === 'curve' && k.panel === efficiency && k.levelFrame === frame && continuationOf(k.track, [c], Math.max(2, median(k.track.len)), fw, false) === c);
      if (cut) {
        options.note?.(`a line starting at column ${Math.round(c.track.u[0] as number)} carries on an efficiency curve past a label: joined to it`);
        cut.track = joinTracks(cut.track, c.track);
        curves.splice(curves.indexOf(c), 1);
        continue;
      }
      const trunks = curves.filter((k) => k.kind === 'curve' && k.panel === efficiency && k.levelFrame === frame).map((k) => k.track);
      const joined = branchOf(c.track, trunks, Math.max(2, median(c.track.len)), fw);
      if (!joined) continue;
      options.note?.(`a line starting at column ${Math.round(c.track.u[0] as number)} leaves the bunch of efficiency curves: taken for one of them`);
      Object.assign(c, { panel: efficiency, quantity: 'efficiency', kind: 'curve', track: joined });
    }
  }

  bandsHaveNoRoom(curves);
  // Guides where each line stands alone, and the tracer's line from them.
  for (const [i, c] of curves.entries()) {
    options.progress?.(0.4 + (0.45 * i) / curves.length, `following line ${i + 1} of ${curves.length}`);
    const width = Math.max(2, median(c.track.len));
    // Head and power curves of one family do not cross (the larger impeller gives more of both at
    // every flow): their guides may spread over the whole line. Efficiency and NPSHr curves cross.
    const spread = c.kind === 'curve' && (c.quantity === 'head' || c.quantity === 'power');
    const { places, trust } = guidePlaces(c.track, width, c.levelFrame[2] - c.levelFrame[0], spread);
    c.confidence *= trust;
    if (places.length === 0) {
      c.confidence = 0;
      continue;
    }
    // A turned line's track speaks in turned coordinates: (u, v) are (row, column).
    const toLine = c.transposed ? (p: SheetPoint): [number, number] => {
      const [u, v] = toLevel(p);
      return [v, u];
    } : toLevel;
    const fromLine = (u: number, v: number) => (c.transposed ? toSheet(v, u) : toSheet(u, v));
    c.guides = places.map((p) => fromLine(p.u, p.v));
    const frame = c.panel.frame;
    let tracedInk: InkModel | undefined;
    // The tracer took the line up again past a break beside another line of its colour.
    let afterGap = false;
    try {
      const traced = captureRasterTrace(image, { guides: c.guides }, { frame: [frame[0], frame[1], frame[2], frame[3]] });
      c.traced = traced.points;
      tracedInk = traced.line.widthPx > 0 ? inkModel(traced.line.colour, traced.line.paper) : undefined;
      if (traced.lost.length > 0) c.confidence *= 0.7;
      afterGap = traced.doubts.some((d) => d.code === 'takeoff.end-after-gap');
    } catch {
      c.confidence = 0;
      continue;
    }
    // The tracer's line against the line found here, over their common columns; and the tracer
    // must not run on far past either end of the line found (into another line, or a label),
    // unless what it adds there carries on the line's own course: the rest of a line the finder
    // lost in a bunch or at a crossing, which is then the line's true end.
    let off = 0;
    let n = 0;
    const fw = c.levelFrame[2] - c.levelFrame[0];
    const first = c.track.u[0] as number;
    const last = c.track.u[c.track.u.length - 1] as number;
    const past = { start: [] as [number, number][], end: [] as [number, number][] };
    const tol = Math.max(3, 1.5 * width);
    for (const p of c.traced) {
      const [u, v] = toLine(p);
      if (u < first) past.start.push([u, v]);
      if (u > last) past.end.push([u, v]);
      const at = trackAt(c.track, u);
      if (at === null) continue;
      n++;
      if (Math.abs(at - v) > tol) off++;
    }
    if (n < 3 || off > 0.02 * n) c.confidence *= 0.3;
    const far = (side: 'start' | 'end') => past[side].filter(([u]) => (side === 'end' ? u > last + 0.03 * fw : u < first - 0.03 * fw)).length;
    // Head and power curves, which never cross, may be carried on step by step as they bend (the
    // rest of a line the finder cut at a label or lost at a crossing), unless the tracer took its
    // line up again past a break; efficiency and NPSHr curves cross and bunch, and only a short
    // stretch on the course fitted at the end counts.
    const carriesOn = (side: 'start' | 'end') => (spread && !afterGap ? carriesOnAsItBends(c.track, past[side], side, tol, 0.15 * fw) : continuesCourse(c.track, past[side], side, tol, 0.15 * fw));
    const runOn = { start: far('start') > 0 && carriesOn('start'), end: far('end') > 0 && carriesOn('end') };
    const beyond = (runOn.start ? 0 : far('start')) + (runOn.end ? 0 : far('end'));
    if (beyond > 0.05 * c.traced.length) c.confidence *= 0.5;
    // Lines that may cross (efficiency, NPSHr): where the tracer carried the line on past its end
    // along another line found in the frame, the course cannot tell which of the two it kept.
    if (!spread && ((runOn.start && bunchedRun(past.start, c, curves, tol)) || (runOn.end && bunchedRun(past.end, c, curves, tol)))) c.confidence = Math.min(c.confidence, 0.45);
    // The line's ends, as found here (around the words: the tracer may run on into a label beside
    // the end), or the tracer's where it carried the line on.
    const n0 = c.track.u.length - 1;
    const endAt = (side: 'start' | 'end'): SheetPoint => {
      const run = past[side];
      if (runOn[side] && run.length > 0) {
        const [u, v] = run.reduce((a, b) => ((side === 'end' ? b[0] > a[0] : b[0] < a[0]) ? b : a));
        return fromLine(u, v);
      }
      const k = side === 'end' ? n0 : 0;
      return fromLine(c.track.u[k] as number, c.track.v[k] as number);
    };
    const ends = [endAt('start'), endAt('end')];
    const xs = ends.map((p) => c.panel.proposal.calibration.toData(p)[0]);
    c.flows = [Math.min(...xs), Math.max(...xs)];
    // Where the tracer stopped short of the line found and the line found runs on there in ink of
    // another colour than the tracer's line (a coloured curve running into a black label beside
    // its end, which the finder, reading darkness, joined to it), the tracer's end is the other
    // candidate for the line's end (used only where the found end names nothing).
    const stop = tracedInk && !runOn.end ? notOwnInkFrom(image, c.track, c.traced.map(toLine), tracedInk, 0.03 * fw, (u, v) => fromLine(u, v)) : undefined;
    if (stop !== undefined) c.ownEnd = c.panel.proposal.calibration.toData(fromLine(stop, trackAt(c.track, stop) as number))[0];
  }
  // A line found in pieces (the finder lost it in a bunch, at a crossing or at a label) is one
  // curve: a piece lying along the tracer's line of a surer (or longer) line of its frame is that
  // line, already taken, and neither a curve nor a question of its own.
  const turnedLevel = (p: SheetPoint): [number, number] => {
    const [u, v] = toLevel(p);
    return [v, u];
  };
  const pieces = new Set([...piecesOf(curves.filter((c) => !c.transposed), toLevel), ...piecesOf(curves.filter((c) => c.transposed), turnedLevel)]);
  // A steep branch and a shallow one found apart may be one iso-line: the tracer's line of one runs along the other.
  for (const c of isoPiecesAcross(curves.filter((k) => k.kind === 'iso' && !pieces.has(k)), toLevel)) pieces.add(c);
  const kept = curves.filter((c) => !pieces.has(c));
  if (pieces.size > 0) options.note?.(`${pieces.size} line${pieces.size === 1 ? '' : 's'} found lying along the tracer's line of another: pieces of it, dropped`);
  const usable = kept.filter((c) => c.confidence > 0 && c.kind === 'curve');
  const sortedIso = kept.filter((c) => c.kind === 'iso');
  const lostCount = kept.filter((c) => c.confidence === 0 && c.kind === 'curve').length;
  if (lostCount > 0) leftOut.push(`${lostCount} line${lostCount === 1 ? '' : 's'} found on the panels never stand${lostCount === 1 ? 's' : ''} alone (bunched or crossed all along), so no guide could be placed on ${lostCount === 1 ? 'it' : 'them'}; trace ${lostCount === 1 ? 'it' : 'them'} by hand.`);

  // Names of the head curves: labels read beside them, else the values given, by order.
  const heads = usable.filter((c) => c.panel.quantity === 'head' && c.kind === 'curve');
  // A line sorted as an iso-line that the tracer's line of a head curve runs along is a piece of that head curve, already traced.
  const onHeads = headPieces(sortedIso, heads, toLevel);
  if (onHeads.size > 0) options.note?.(`${onHeads.size} line${onHeads.size === 1 ? '' : 's'} sorted as iso-line${onHeads.size === 1 ? '' : 's'} lying along a head curve's tracer's line: piece${onHeads.size === 1 ? '' : 's'} of it, dropped`);
  // On a head panel drawn with a right-hand efficiency axis, efficiency is drawn as curves, not as
  // iso-lines: a line left starting mid-frame there is a piece of a curve the finder broke, and no
  // level is asked for it (unless the engineer gave iso levels).
  const withCurves = (c: RasterCurve) => (options.isoLevels ?? []).length === 0 && frames.some((f) => f.panels.includes(c.panel) && f.panels.some((p) => p.quantity === 'efficiency'));
  const curvePieces = sortedIso.filter((c) => !onHeads.has(c) && withCurves(c));
  if (curvePieces.length > 0) {
    const id = (curvePieces[0] as RasterCurve).panel.id;
    leftOut.push(`${curvePieces.length} line${curvePieces.length === 1 ? '' : 's'} on panel "${id}", which draws efficiency as curves against its right-hand axis, start${curvePieces.length === 1 ? 's' : ''} mid-frame and join${curvePieces.length === 1 ? 's' : ''} no curve found (${curvePieces.length === 1 ? 'a piece of a curve' : 'pieces of curves'} the finder lost where lines cross or run together); ${curvePieces.length === 1 ? 'it is' : 'they are'} left out: trace what is missing by hand.`);
  }
  const isos = sortedIso.filter((c) => !onHeads.has(c) && !curvePieces.includes(c));
  options.progress?.(0.85, 'reading the curve labels');
  const named = await nameHeads(heads, labelsAt, page.strong, reader, image, map, level, image.scale, options.given, options.ratedRpm, questions, leftOut, options.note);
  // The iso-lines' levels, from the "%" labels on them (rasterIso.ts).
  const isoNamed: RasterCurve[] = [];
  // A line the tracer could not follow is left out, said once; the levels of the others are then unsure.
  const unfollowed = isos.filter((c) => c.confidence === 0 || c.guides.length === 0 || c.traced.length < 2);
  const followed = isos.filter((c) => !unfollowed.includes(c));
  if (unfollowed.length > 0) {
    const id = (isos[0] as RasterCurve).panel.id;
    leftOut.push(`${unfollowed.length} of the ${isos.length} lines on panel "${id}" that start neither at the flow axis nor at the bottom (iso-lines, or pieces of a curve the finder broke) could not be followed (nowhere ${unfollowed.length === 1 ? 'does it' : 'do they'} stand alone); ${unfollowed.length === 1 ? 'it is' : 'they are'} left out${followed.length > 0 ? ', and the levels of the others are unsure' : ''}: trace ${unfollowed.length === 1 ? 'it' : 'them'} by hand with ${unfollowed.length === 1 ? 'its level' : 'their levels'}.`);
  }
  if (followed.length > 0) {
    // Words are placed among all the lines found; a label on a line left out names nothing else,
    // but marks the order the unlabelled lines' levels are taken from.
    const bridged = new Map(followed.map((c) => [c, c.traced.map(toLevel)] as const));
    const onLines = wordsOnIsoLines([...labelsAt, ...isoWordsAt], isos, heads, options.note, (c) => bridged.get(c) ?? []);
    const onSheet = (c: RasterCurve) => c.track.u.map((u, i) => (c.transposed ? toSheet(c.track.v[i] as number, u) : toSheet(u, c.track.v[i] as number)));
    const iso = await isoLevelsOnScan(followed, onLines, reader, 2 * page.strong, (followed[0] as RasterCurve).panel.id, options.note, page.h, { lines: unfollowed, onSheet }, options.isoLevels);
    if (iso.missing) leftOut.push(iso.missing);
    for (const [c, v] of iso.levels) {
      c.value = v;
      c.named = 'label';
      c.confidence = iso.unsure.has(c) || unfollowed.length > 0 ? Math.min(0.45, c.confidence) : 0.95 * c.confidence;
      isoNamed.push(c);
    }
  }
  // The other panels' curves: the head curve ending at the same flow.
  const others = usable.filter((c) => !heads.includes(c));
  const flowSpan = (c: RasterCurve) => {
    const xs = c.panel.proposal.x.labels.map((k) => k.value);
    return Math.max(...xs) - Math.min(...xs);
  };
  // Where each impeller's curves end: a head curve the tracer confirmed gives its own end; an
  // unsure one (it may end on another line) only where the affinity rule vouches for it, and a
  // value with no head end of its own is put at k·D when the sheet's head ends keep that rule.
  const headPanel = [...named.values.keys()][0];
  const givenValues = options.given && options.given.family === named.family ? options.given.values : [];
  // Every value named on the head panel or given, largest first.
  const known = [...new Set([...named.values.values(), ...givenValues])].sort((a, b) => b - a);
  const headEnds = [...named.values].map(([h, value]) => ({ value, end: h.flows[1], sure: h.confidence >= 0.5 }));
  let references = headPanel ? endReferences(headEnds, givenValues, flowSpan(headPanel)) : [];
  // The rule Q ∝ D read from the other panels' ends, where they keep it twice over
  // (`panelEndRule`): head curves found short, run on along an iso-line or left unsure no longer
  // leave their impellers' power and NPSHr curves without a reference.
  const endSpan = headPanel ? flowSpan(headPanel) : others[0] ? flowSpan(others[0]) : NaN;
  const endsByPanel = new Map<FoundPanel, number[]>();
  for (const c of others) if (c.kind === 'curve') endsByPanel.set(c.panel, [...(endsByPanel.get(c.panel) ?? []), c.flows[1]]);
  const panelK = panelEndRule([...endsByPanel.values()], headEnds, known, endSpan);
  if (panelK !== null) {
    references = withPanelRule(references, panelK, known, endSpan);
    options.note?.(`the other panels' curve ends keep Q ∝ D with k = ${panelK.toPrecision(4)}: ${known.length} values referenced there`);
  }
  // Power panels: when every head curve is named and confirmed and the panel holds as many power
  // curves, which never cross, they take the names in order (the larger impeller higher), each
  // checked against the end flow of its head curve. Else, when the panel holds as many power
  // curves as there are values with an end reference (above), the same by those references.
  const confirmed = [...named.values.keys()].filter((h) => h.confidence >= 0.5);
  const heads0 = usable.filter((c) => c.panel.quantity === 'head' && c.kind === 'curve');
  const byHeads = confirmed.map((h) => ({ v: named.values.get(h) as number, ends: [h.flows[1]], sure: true })).sort((a, b) => b.v - a.v);
  const byReferences = [...new Set(references.map((r) => r.value))]
    .sort((a, b) => b - a)
    .map((v) => ({ v, ends: references.filter((r) => r.value === v).map((r) => r.end), sure: references.every((r) => r.value !== v || r.how === 'sure') }));
  for (const panel of new Set(others.filter((c) => c.quantity === 'power').map((c) => c.panel))) {
    const list = others.filter((c) => c.panel === panel && c.quantity === 'power');
    const values = confirmed.length === heads0.length && list.length === confirmed.length ? byHeads : list.length === byReferences.length && list.length >= 2 ? byReferences : null;
    if (!values) continue;
    const above = (a: RasterCurve, b: RasterCurve): number | null => {
      let sum = 0;
      let n = 0;
      for (let k = 0; k < a.track.u.length; k += 5) {
        const vb = trackAt(b.track, a.track.u[k] as number);
        if (vb === null) continue;
        const d = (a.track.v[k] as number) - vb;
        if (Math.abs(d) > 2) (sum += Math.sign(d), n++);
      }
      return n === 0 ? null : Math.abs(sum) === n ? Math.sign(sum) : NaN;
    };
    const pairs = list.flatMap((a) => list.filter((b) => b !== a).map((b) => above(a, b)));
    if (pairs.some((k) => k === null || Number.isNaN(k))) continue;
    const order = [...list].sort((a, b) => above(a, b) as number);
    const span = flowSpan(list[0] as RasterCurve);
    if (!order.every((c, i) => Math.min(...(values[i] as { ends: number[] }).ends.map((e) => Math.abs(c.flows[1] - e))) / span <= 0.03)) continue;
    order.forEach((c, i) => {
      const k = values[i] as { v: number; sure: boolean };
      c.value = k.v;
      c.named = 'end flow';
      c.confidence *= k.sure ? 0.95 : 0.8;
    });
  }
  // Names by where each curve ends (the line found's end, else, as an unsure proposal, the tracer's).
  const waiting = named.values.size === 0 && references.length === 0 ? [] : others.filter((c) => c.value === undefined);
  const names = nameByEnds(
    others.map((c) => ({ group: c.panel, end: c.flows[1], tracedEnd: Math.max(...c.traced.map((p) => c.panel.proposal.calibration.toData(p)[0])), span: flowSpan(c), ...(c.value !== undefined ? { value: c.value } : {}) })),
    references,
  );
  // Curves no end names yet: looked at once more when every other is named.
  const unnamed: RasterCurve[] = [];
  for (const c of waiting) {
    const name = names[others.indexOf(c)];
    if (name) {
      c.value = name.value;
      c.named = name.by;
      // A proposal from the tracer's end alone stays unsure: the engineer is asked to look at it.
      if (name.by === 'traced end') c.confidence = Math.min(0.45, 0.8 * c.confidence);
      else c.confidence *= name.reference.how === 'sure' ? (name.share <= 0.008 ? 0.95 : 0.8) : name.share <= 0.008 ? 0.8 : 0.7;
      continue;
    }
    unnamed.push(c);
  }
  for (const c of unnamed) {
    // The line found ran on into ink of another colour past the tracer's end: the tracer's end
    // names it where it ends where exactly one head curve ends and no other curve of its panel has
    // that name (the committed colour scan's 330 mm efficiency curve, run on into its label).
    if (c.ownEnd !== undefined) {
      const own = endMatch(references, c.ownEnd, flowSpan(c), END_MATCH_SHARE);
      if (own.sole && own.best && !others.some((o) => o !== c && o.panel === c.panel && o.value === own.best?.r.value)) {
        c.value = own.best.r.value;
        c.named = 'end flow';
        c.flows = [c.flows[0], c.ownEnd];
        c.confidence *= own.best.r.how === 'sure' ? 0.8 : 0.7;
        continue;
      }
    }
    const flow = (q: number) => `${q.toPrecision(4)}${c.panel.xUnit ? ` ${c.panel.xUnit}` : ' on the flow axis'}`;
    // The only curve of its panel left, for the only value left there: proposed, unsure.
    const last = byElimination(c, others, unnamed, known, references, flowSpan(c));
    if (last) {
      const { value, how, end } = last.reference;
      c.value = value;
      c.named = 'elimination';
      c.ownQuestion = true;
      c.confidence = Math.min(0.45, 0.8 * c.confidence);
      const ending = last.traced ? `whose line the tracer follows to ${flow(last.end)} (the line found stops at ${flow(c.flows[1])})` : `ending at ${flow(c.flows[1])}`;
      leftOut.push(`${c.quantity === 'efficiency' || c.quantity === 'npshr' ? 'An' : 'A'} ${QUANTITY_WORDS[c.quantity]} curve on panel "${c.panel.id}" ${ending} is the only one of its panel left without a name, and ${value} the only value without one there: it is proposed as ${value} (the ${value} head curve ${how === 'predicted' ? 'is expected to end' : 'ends'} at ${flow(end)}); look at it on the sheet before using the curve set.`);
      continue;
    }
    const best = endMatch(references, c.flows[1], flowSpan(c), END_MATCH_SHARE).best;
    leftOut.push(`${c.quantity === 'efficiency' || c.quantity === 'npshr' ? 'An' : 'A'} ${QUANTITY_WORDS[c.quantity]} curve on panel "${c.panel.id}" ending at ${flow(c.flows[1])} does not end where exactly one head curve ends${best ? ` (nearest: the ${best.r.value} head curve, ${best.r.how === 'predicted' ? 'expected to end' : 'ending'} at ${flow(best.r.end)})` : ''}; it is left out: trace it by hand with its diameter.`);
  }
  // Power curves of one family do not cross either (common practice: trims at one speed, the
  // larger impeller takes more power at every flow): names by end flow that break that order go.
  const powers = others.filter((c) => c.quantity === 'power' && c.value !== undefined);
  const broken = new Set<RasterCurve>();
  for (const a of powers) {
    for (const b of powers) {
      if (a === b || (a.value as number) <= (b.value as number)) continue;
      // a has the larger value: it must lie higher (a smaller row) wherever both are drawn.
      for (let k = 0; k < b.track.u.length; k += 5) {
        const va = trackAt(a.track, b.track.u[k] as number);
        if (va !== null && va > (b.track.v[k] as number) + 2) {
          broken.add(a);
          broken.add(b);
          break;
        }
      }
    }
  }
  if (broken.size > 0) {
    const list = [...broken];
    leftOut.push(`The power curves named ${list.map((c) => c.value).join(', ')} by where they end do not keep the larger impeller's curve above the smaller one's; they are left out: trace them by hand with their diameters.`);
    for (const c of list) delete c.value;
  }
  // Two curves of one panel with one name: neither is kept.
  const out = usable.filter((c) => c.value !== undefined);
  const twice = out.filter((c) => out.some((o) => o !== c && o.panel === c.panel && o.value === c.value));
  if (twice.length > 0) leftOut.push(`On panel "${twice[0]!.panel.id}" two curves came out as ${twice[0]!.value}; both are left out: trace them by hand.`);
  const curvesOut = out.filter((c) => !twice.includes(c));
  // A value read from a label the reader was unsure of: every curve named after it is unsure too.
  if (named.doubtful) {
    for (const c of curvesOut) {
      if (!named.doubtful.has(c.value as number)) continue;
      if (c.confidence >= 0.5) c.ownQuestion = true;
      c.confidence = Math.min(0.45, c.confidence);
    }
  }
  // Every value named on the head panel (or given) should have its curve on each other panel
  // found: what has none is said, so that a curve missing is never missing in silence.
  if (known.length > 0) leftOut.push(...missingCurves(framesOf(found).flatMap((f) => f.panels), curvesOut, known));
  curvesOut.push(...isoNamed);
  return { curves: curvesOut, labelUnit: named.unit, valueUnit: named.byLabels ? named.unit : null, family: named.family, questions, leftOut, lines: curves };
}

/**
 * The name of a curve no end named, by elimination: it is the only curve of its quantity left
 * unnamed on its panel, exactly one value (named on the head panel or given) has no curve of that
 * quantity there, and the curve's end, the line found's or the tracer's, lies within
 * `ELIMINATION_SHARE` of the span of that value's reference end (a head curve cut short where the
 * curve runs to the drawn end, or the other way round). Null otherwise: a piece of a line ending
 * far from the value's end is not named. The caller proposes it unsure, with a sentence of its own.
 */
export function byElimination(
  c: Pick<RasterCurve, 'panel' | 'quantity' | 'flows' | 'traced'>,
  others: readonly Pick<RasterCurve, 'panel' | 'quantity' | 'value'>[],
  unnamed: readonly Pick<RasterCurve, 'panel' | 'quantity'>[],
  known: readonly number[],
  references: readonly { value: number; end: number; how: string }[],
  span: number,
): { reference: { value: number; end: number; how: string }; end: number; traced: boolean } | null {
  const here = (o: Pick<RasterCurve, 'panel' | 'quantity'>) => o.panel === c.panel && o.quantity === c.quantity;
  if (unnamed.filter(here).length !== 1) return null;
  const taken = new Set(others.filter(here).map((o) => o.value).filter((v): v is number => v !== undefined));
  const free = known.filter((v) => !taken.has(v));
  if (free.length !== 1 || !(span > 0)) return null;
  const value = free[0] as number;
  const tracedEnd = c.traced.length > 0 ? Math.max(...c.traced.map((p) => c.panel.proposal.calibration.toData(p)[0])) : NaN;
  // Each reference of the value against the line found's end and the tracer's: the nearest pair.
  const near = references
    .filter((r) => r.value === value)
    .flatMap((r) => [
      { reference: r, end: c.flows[1], traced: false },
      ...(Number.isFinite(tracedEnd) ? [{ reference: r, end: tracedEnd, traced: true }] : []),
    ])
    .sort((a, b) => Math.abs(a.end - a.reference.end) - Math.abs(b.end - b.reference.end))[0];
  return near && Math.abs(near.end - near.reference.end) <= ELIMINATION_SHARE * span ? near : null;
}

/**
 * The first index of the track (looked at every 4 columns, once `reach` columns lie behind) from
 * which the line leaves the course of the `reach` columns before it (offCourse, robust) for good:
 * over the next half of `reach` columns, two points in five or more lie farther than `tol` from
 * the course, and so do all of the last quarter (a label or a crossing on the line, a few columns
 * long, is no turn), and the line is not back on the course from `reach` to 1.5 `reach` past
 * there (a longer label passed: `BACK_ON_COURSE`). Where
 * the line turned off onto another; null when it never does.
 */
export function courseBreak(t: Track, tol: number, reach: number): number | null {
  const n = t.u.length;
  if (n < 16) return null;
  const u0 = t.u[0] as number;
  /** Columns of labels left behind: the course is never fitted over them, nor looked at before half `reach` lies past them. */
  const labels: [number, number][] = [];
  const clear = (k: Track): Track => {
    if (labels.length === 0) return k;
    const keep = k.u.map((u) => !labels.some(([a, b]) => u >= a && u <= b));
    const pick = <T,>(xs: T[]) => xs.filter((_, q) => keep[q]);
    return { u: pick(k.u), v: pick(k.v), room: pick(k.room), len: pick(k.len) };
  };
  for (let i = 0; i < n; i++) {
    const u = t.u[i] as number;
    if (u - u0 < reach || labels.some(([a, b]) => u >= a && u <= b + reach / 2) || (i > 0 && Math.floor(u / 4) === Math.floor((t.u[i - 1] as number) / 4))) continue;
    const ahead: [number, number][] = [];
    for (let k = i + 1; k < n && (t.u[k] as number) - u <= reach / 2; k++) ahead.push([t.u[k] as number, t.v[k] as number]);
    if (ahead.length < 8) break;
    const off = offCourse(clear(cutTrack(t, i + 1)), 'end', reach, true, tol);
    if (!off) continue;
    const far = ahead.map(([au, av]) => off(au, av) > tol);
    const tail = far.slice(Math.floor(0.75 * far.length));
    if (far.filter(Boolean).length < 0.4 * far.length || !tail.every(Boolean)) continue;
    // A label longer than half `reach` printed on the line (the line found runs over its glyphs)
    // is left behind: the line found is back on the course beyond it. A line that turned off never
    // is. The course is taken from before the label's first columns, which the line found may run
    // over, and the label's columns are kept out of every course fitted after.
    let j = i;
    while (j > 0 && (t.u[j] as number) > u - reach / 4) j--;
    const before = offCourse(clear(cutTrack(t, j + 1)), 'end', reach, true);
    const back: [number, number][] = [];
    for (let k = i + 1; k < n && (t.u[k] as number) - u <= 1.5 * reach; k++) if ((t.u[k] as number) - u > reach) back.push([t.u[k] as number, t.v[k] as number]);
    if (before && back.length >= 8 && back.filter(([au, av]) => before(au, av) <= tol).length >= BACK_ON_COURSE * back.length) {
      labels.push([u - reach / 4, u + reach]);
      continue;
    }
    return i + 1;
  }
  return null;
}

/** Share of the columns one to 1.5 reaches past a turn that must lie back on the course for the turn to be a label passed. */
const BACK_ON_COURSE = 0.6;

/**
 * The one line of `others` that carries a head line's track on past its end: it starts past the
 * end within `JOIN_GAP_SHARE` of the frame's width (a label's length), and its first columns, up
 * to a tenth of the frame's width and at least `JOIN_LENGTH_SHARE` of it, lie on the course of
 * the track's last columns (continuesCourse), and it falls by `JOIN_FALL` rows a column (unless
 * `falls` is false: an efficiency curve past its peak). Undefined when none does, or more than one.
 */
export function continuationOf<T extends { track: Track }>(t: Track, others: readonly T[], width: number, fw: number, falls = true): T | undefined {
  const end = t.u[t.u.length - 1] as number;
  const tol = Math.max(3, 1.5 * width);
  const found = others.filter((k) => {
    const u0 = k.track.u[0] as number;
    const u1 = k.track.u[k.track.u.length - 1] as number;
    if (u0 <= end || u0 - end > JOIN_GAP_SHARE * fw || u1 - u0 < JOIN_LENGTH_SHARE * fw) return false;
    // A head line falls with flow past a label; a level line there is a grid line's remnant.
    if (falls && ((k.track.v[k.track.v.length - 1] as number) - (k.track.v[0] as number)) / (u1 - u0) < JOIN_FALL) return false;
    const first: [number, number][] = [];
    for (let i = 0; i < k.track.u.length && (k.track.u[i] as number) - u0 <= 0.1 * fw; i++) first.push([k.track.u[i] as number, k.track.v[i] as number]);
    return continuesCourse(t, first, 'end', tol, 0.15 * fw);
  });
  return found.length === 1 ? found[0] : undefined;
}

/**
 * A line that leaves a bunch of efficiency curves, as one line, or null when it does not.
 * - It carries on the course of a line of `trunks` (continuesCourse over its first
 *   `BRANCH_COURSE_SHARE` of the frame's width, within 1.5 line widths and at least 3 pixels),
 *   starting within that line's columns, past its first `BRANCH_START_SHARE` of the frame's width:
 *   the trunk's line up to the start, then this line, with a join there (guides are not spread
 *   across it). Trunks that fit run together there; the longest is taken.
 * - Or it starts beside a trunk, within `BRANCH_NEAR_WIDTHS` line widths (and 4 pixels) across,
 *   rising as the trunk does there (directions within `BRANCH_TURN` degrees): a line the bunch hid
 *   from the origin, where the lines of a steep bunch lie apart in rows but not across. The line
 *   is kept as found; the tracer follows it on into the bunch.
 */
export function branchOf(t: Track, trunks: readonly Track[], width: number, fw: number): Track | null {
  const u0 = t.u[0] as number;
  const v0 = t.v[0] as number;
  const tol = Math.max(3, 1.5 * width);
  const first: [number, number][] = [];
  for (let i = 0; i < t.u.length && (t.u[i] as number) - u0 <= BRANCH_COURSE_SHARE * fw; i++) first.push([t.u[i] as number, t.v[i] as number]);
  if (first.length < 8) return null;
  const fits: Track[] = [];
  let beside = false;
  const slopeOf = (points: readonly [number, number][]) => course({ u: points.map((p) => p[0]), v: points.map((p) => p[1]) }, points.length).b;
  const slope = slopeOf(first);
  for (const k of trunks) {
    if (k === t) continue;
    const start = k.u[0] as number;
    const end = k.u[k.u.length - 1] as number;
    if (u0 - start < BRANCH_START_SHARE * fw || u0 > end) continue;
    let n = 0;
    while (n < k.u.length && (k.u[n] as number) < u0) n++;
    const before = cutTrack(k, n);
    if (continuesCourse(before, first, 'end', tol, 0.15 * fw)) {
      fits.push(before);
      continue;
    }
    // Across: the distance from the start to the trunk's nearest column within reach.
    const near: [number, number][] = [];
    for (let i = 0; i < k.u.length; i++) if (Math.abs((k.u[i] as number) - u0) <= BRANCH_COURSE_SHARE * fw) near.push([k.u[i] as number, k.v[i] as number]);
    if (near.length < 8) continue;
    const across = Math.min(...near.map(([u, v]) => Math.hypot(u - u0, v - v0)));
    const turn = (Math.abs(Math.atan(slope) - Math.atan(slopeOf(near))) * 180) / Math.PI;
    if (across <= Math.max(4, BRANCH_NEAR_WIDTHS * width) && turn <= BRANCH_TURN && slope < 0) beside = true;
  }
  if (fits.length === 0) return beside ? t : null;
  // Trunks that fit run together where the line leaves them: the longest stretch found is kept.
  const trunk = fits.reduce((a, b) => (a.u.length >= b.u.length ? a : b));
  const line = joinTracks(trunk, t);
  line.joins = [...(line.joins ?? []), trunk.u.length].sort((a, b) => a - b);
  return line;
}

/** How far into a trunk, in frame widths, a line leaving it must start (a line starting at the trunk's own start is no branch). */
const BRANCH_START_SHARE = 0.01;
/** How much of a branch's start, in frame widths, must carry on the trunk's course. */
const BRANCH_COURSE_SHARE = 0.03;
/** How far across, in line widths, a line hidden in the bunch from the origin may start from a trunk. */
const BRANCH_NEAR_WIDTHS = 2.5;
/** Degrees between a hidden line's direction and its trunk's where it starts. */
const BRANCH_TURN = 30;
/** How far past a head line's end, in frame widths, its continuation beyond a label may start. */
const JOIN_GAP_SHARE = 0.06;
/** Share of its columns along another head line that makes a line no head line's continuation (a piece of that other line). */
const ALONG_OTHER_SHARE = 0.1;
/** Rows a continuation must fall per column (on the level frame): a head curve falls past the labels on it, a grid line does not. */
const JOIN_FALL = 0.03;
/** How long, in frame widths, a continuation must be to be joined. */
const JOIN_LENGTH_SHARE = 0.05;

/** True when one track passes from one side of the other to the other side over their common columns. */
export function tracksCross(a: Track, b: Track): boolean {
  let side = 0;
  for (let i = 0; i < b.u.length; i++) {
    const at = trackAt(a, b.u[i] as number);
    if (at === null) continue;
    const s = Math.sign((b.v[i] as number) - at);
    if (s !== 0 && side !== 0 && s !== side) return true;
    if (s !== 0) side = s;
  }
  return false;
}

/**
 * Two tracks one after the other as one line. The place they meet is not marked as a join (the
 * finder's joins across a bunch, which guides are not spread across): the course vouched that
 * they are one line, and guides on both sides of the label keep the tracer on it where a bunch
 * crosses near the label.
 */
export function joinTracks(a: Track, b: Track): Track {
  const joins = [...(a.joins ?? []), ...(b.joins ?? []).map((j) => j + a.u.length)];
  return { u: [...a.u, ...b.u], v: [...a.v, ...b.v], room: [...a.room, ...b.room], len: [...a.len, ...b.len], ...(joins.length > 0 ? { joins } : {}) };
}

/** The track from its column `n` on. */
function trackFrom(t: Track, n: number): Track {
  return { u: t.u.slice(n), v: t.v.slice(n), room: t.room.slice(n), len: t.len.slice(n), ...(t.joins ? { joins: t.joins.filter((j) => j > n).map((j) => j - n) } : {}) };
}

/** The track's first `n` columns. */
function cutTrack(t: Track, n: number): Track {
  return { u: t.u.slice(0, n), v: t.v.slice(0, n), room: t.room.slice(0, n), len: t.len.slice(0, n), ...(t.joins ? { joins: t.joins.filter((j) => j < n) } : {}) };
}

/**
 * The width of one line in each frame is the median of its lines' widths; a column where a line's
 * ink is more than twice that (and a pixel) across is several lines run together (a bunch drawn
 * as one band), never a line standing alone: its room is set to 0, so no guide goes there.
 */
export function bandsHaveNoRoom(curves: Pick<RasterCurve, 'track' | 'levelFrame'>[]): void {
  const frameWidth = new Map<Box, number>();
  for (const f of new Set(curves.map((c) => c.levelFrame))) frameWidth.set(f, median(curves.filter((c) => c.levelFrame === f).map((c) => median(c.track.len))));
  for (const c of curves) {
    const most = 2 * Math.max(2, frameWidth.get(c.levelFrame) as number) + 1;
    if (c.track.len.some((k) => k > most)) c.track = { ...c.track, room: c.track.room.map((r, i) => ((c.track.len[i] as number) > most ? 0 : r)) };
  }
}

/**
 * One sentence per panel other than the head panel (each found panel with a quantity) that has
 * no curve for some of the values `known` (named on the head panel, or given): which ones.
 */
export function missingCurves(panels: readonly FoundPanel[], curves: readonly Pick<RasterCurve, 'panel' | 'value'>[], known: readonly number[]): string[] {
  const out: string[] = [];
  for (const p of panels) {
    if (p.quantity === null || p.quantity === 'head') continue;
    const missing = known.filter((v) => !curves.some((c) => c.panel === p && c.value === v));
    if (missing.length === 0) continue;
    out.push(`On panel "${p.id}" no ${QUANTITY_WORDS[p.quantity]} curve was found for ${missing.join(', ')}: trace ${missing.length === 1 ? 'it' : 'them'} by hand if the sheet draws ${missing.length === 1 ? 'it' : 'them'}.`);
  }
  return out;
}

/**
 * True when a third or more of `points` (level pixels, the tracer's line carried on past an end
 * of `c`'s line) lie within `tol` rows of another line found in the same frame: the tracer went
 * on through a bunch, where keeping to one's course does not tell the lines apart.
 */
export function bunchedRun(points: readonly (readonly [number, number])[], c: Pick<RasterCurve, 'track' | 'levelFrame'>, all: readonly Pick<RasterCurve, 'track' | 'levelFrame'>[], tol: number): boolean {
  if (points.length === 0) return false;
  const others = all.filter((o) => o !== c && o.levelFrame === c.levelFrame && o.track !== c.track);
  const near = points.filter(([u, v]) => others.some((o) => {
    const at = trackAt(o.track, u);
    return at !== null && Math.abs(at - v) <= tol;
  })).length;
  return near >= points.length / 3;
}

/**
 * Where guides go on a line `width` pixels wide in a frame `frameWidth` wide: where it stands alone
 * (4 widths, at least 8 px, from other ink; spread over the line for lines that never cross),
 * trusted fully. A line in a bunch all along (the NPSHr curves of a family run close) gets guides
 * where it has half that room, on one stretch of at least 16 columns only, trusted at 0.8; the
 * tracer's line must still agree with it. No place at all: none.
 */
export function guidePlaces(track: Track, width: number, frameWidth: number, spread: boolean): { places: { u: number; v: number }[]; trust: number } {
  const places = alonePlaces(track, Math.max(8, 4 * width), 8, 0.15 * frameWidth, spread);
  if (places.length > 0) return { places, trust: 1 };
  return { places: alonePlaces(track, Math.max(6, 2.5 * width), 16, 0.15 * frameWidth), trust: 0.8 };
}

/**
 * The lines that are pieces of another: each lies (80 % of its columns, within its own width or
 * 3 px) along the tracer's line of a line of the same frame that is surer (confidence 0.5 or more,
 * and higher) or, as sure, spans more columns; and when it has a tracer's line of its own, the
 * other line lies along that one too.
 */
export function piecesOf(curves: readonly Pick<RasterCurve, 'track' | 'traced' | 'confidence' | 'levelFrame'>[], toLevel: (p: SheetPoint) => [number, number]): Set<Pick<RasterCurve, 'track'>> {
  const span = (c: Pick<RasterCurve, 'track'>) => (c.track.u[c.track.u.length - 1] as number) - (c.track.u[0] as number);
  const lines = curves.filter((k) => k.confidence >= 0.5 && k.traced.length > 0).map((k) => ({ k, line: trackOf(k.traced.map(toLevel)) }));
  const out = new Set<Pick<RasterCurve, 'track'>>();
  for (const c of curves) {
    const tol = Math.max(3, 1.5 * Math.max(2, median(c.track.len)));
    for (const { k, line } of lines) {
      if (k === c || k.levelFrame !== c.levelFrame || !(k.confidence > c.confidence || (k.confidence === c.confidence && span(k) > span(c)))) continue;
      // Both ways when the piece has a tracer's line too: a tracer that ran on from one line onto
      // another does not make the other a piece of it.
      if (liesAlong(c.track, line, tol) && (c.traced.length === 0 || liesAlong(k.track, trackOf(c.traced.map(toLevel)), tol))) {
        out.add(c);
        break;
      }
    }
  }
  return out;
}

function median(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s.length ? (s[s.length >> 1] as number) : NaN;
}

/**
 * Words inside a frame (level pixels): blots of about the text height joined along rows, the grid
 * taken out first. With `lines` (the frame's lines found without holes), their ink is taken out
 * too where it stands alone across (nothing else within half a text height): a label printed on
 * a line, or just past its end, touches the line on a scan and would be one blot with it.
 */
export function frameWords(map: InkMap, frame: Box, strong: number, h: number, lines: readonly Track[] = [], from?: { clean: InkMap; at: [number, number] }): { words: Blot[]; clean: InkMap; at: [number, number] } {
  const [l, t, r, b] = frame.map(Math.round) as [number, number, number, number];
  const w = Math.max(0, r - l - 8);
  const hh = Math.max(0, b - t - 8);
  const at: [number, number] = [l + 4, t + 4];
  if (w < 10 || hh < 10 || !(h > 0)) return { words: [], clean: { width: 0, height: 0, ink: new Uint8Array(0) }, at };
  // The same frame's clean ink from an earlier call (`from`) is taken again, copied, not made twice.
  const clean = from && from.clean.width === w && from.clean.height === hh ? from.clean.ink.slice() : gridFree(map, t, l, w, hh);
  eraseLines(clean, w, hh, at, lines, h);
  const cleanMap: InkMap = { width: w, height: hh, ink: clean };
  const blots = joinCut(inkBlots(cleanMap, 0.3 * strong, [], Math.round(2 * h)));
  // Glyphs and the marks beside them (a dot, an inch mark); a word is about the text's height.
  const words = wordsOf(blots.filter((k) => k.b - k.t >= 0.2 * h || k.r - k.l >= 0.2 * h)).filter((k) => k.b - k.t >= 0.6 * h && k.b - k.t <= 1.6 * h && k.r - k.l >= 0.4 * h && k.r - k.l <= 8 * h);
  return { words, clean: cleanMap, at };
}

/** Least share of its box a run-together label's ink fills (print at 180–300 dpi fills about a fifth; a thin line's stretch across the same box under a tenth). */
const WORD_FILL = 0.15;

/**
 * Words of a clean frame picture (frameWords' `clean`) holding a blot wider than two text heights
 * yet as tall as text and filled like print: labels whose glyphs the scan ran together ("69%" as
 * one blot, or two labels printed side by side touching). frameWords drops such blots; these
 * words are looked at for iso labels only (wordsOnIsoLines splits one that several iso-lines
 * cross), so the curve labels and the line finder's holes stay as they are.
 */
export function runTogetherWords(clean: InkMap, strong: number, h: number): Blot[] {
  if (clean.width === 0 || !(h > 0)) return [];
  const all = inkBlots(clean, 0.3 * strong, [], Math.round(2 * h), { minHeight: 0.6 * h, maxHeight: 1.6 * h, maxWidth: 8 * h, fill: WORD_FILL });
  const wide = all.filter((k) => k.r - k.l > Math.round(2 * h));
  if (wide.length === 0) return [];
  // Glyphs cut by a grid row are joined again, but a wide blot takes no line stub above or below it.
  const blots = [...joinCut(all.filter((k) => !wide.includes(k))), ...wide];
  const words = wordsOf(blots.filter((k) => k.b - k.t >= 0.2 * h || k.r - k.l >= 0.2 * h)).filter((k) => k.b - k.t >= 0.6 * h && k.b - k.t <= 1.6 * h && k.r - k.l <= 8 * h);
  return words.filter((w) => wide.some((k) => k.l >= w.l && k.r <= w.r && k.t >= w.t && k.b <= w.b));
}

/** The frame's ink inside a 4 px inset (w × hh from row t + 4, column l + 4) with each row's and column's median darkness taken off. */
function gridFree(map: InkMap, t: number, l: number, w: number, hh: number): Uint8Array {
  // A grid line darkens its whole row (or column): the row's median darkness is taken off every
  // pixel of it, so a label printed over a grid line stands free and the line itself goes; then
  // each column's median (of the rows' remainders, counted 0–255) likewise. Three passes, row by
  // row: each row's median; the row's remainder kept and counted per column; the columns' taken off.
  const rowHist = new Uint32Array(256);
  const colHist = new Uint32Array(256 * w);
  const ink = new Int16Array(w * hh);
  const medianOf = (hist: Uint32Array, h0: number, n: number): number => {
    let seen = 0;
    for (let v = 0; v < 256; v++) if ((seen += hist[h0 + v] as number) >= n / 2) return v;
    return 0;
  };
  for (let y = 0; y < hh; y++) {
    const from = (t + 4 + y) * map.width + l + 4;
    rowHist.fill(0);
    for (let k = 0; k < w; k++) rowHist[map.ink[from + k] as number]!++;
    const m = medianOf(rowHist, 0, w);
    const row = y * w;
    for (let k = 0; k < w; k++) {
      const v = (map.ink[from + k] as number) - (m > 0 ? m : 0);
      ink[row + k] = v;
      colHist[k * 256 + (v < 0 ? 0 : v)]!++;
    }
  }
  const colMedian = new Int16Array(w);
  for (let x = 0; x < w; x++) colMedian[x] = medianOf(colHist, x * 256, hh);
  const clean = new Uint8Array(w * hh);
  for (let y = 0; y < hh; y++) {
    const row = y * w;
    for (let x = 0; x < w; x++) {
      const v = (ink[row + x] as number) - (colMedian[x] as number);
      clean[row + x] = v > 0 ? v : 0;
    }
  }
  return clean;
}

/** The lines' ink taken out of a clean frame picture (see frameWords). */
function eraseLines(clean: Uint8Array, w: number, hh: number, at: [number, number], lines: readonly Track[], h: number): void {
  // Only whole stretches of a text height or more, column after column: a glyph's stroke the line
  // finder picked up (the arch of an "m") is short and stays.
  for (const line of lines) {
    const width = median(line.len);
    const thin = (i: number) => (line.room[i] as number) >= 0.5 * h && (line.len[i] as number) <= 2 * width + 1;
    for (let i = 0; i < line.u.length; ) {
      if (!thin(i)) {
        i++;
        continue;
      }
      let j = i;
      while (j + 1 < line.u.length && thin(j + 1) && (line.u[j + 1] as number) - (line.u[j] as number) <= 1.5) j++;
      if ((line.u[j] as number) - (line.u[i] as number) >= h) {
        for (let k = i; k <= j; k++) {
          const x = Math.floor(line.u[k] as number) - at[0];
          if (x < 0 || x >= w) continue;
          const v = (line.v[k] as number) - at[1];
          const len = line.len[k] as number;
          for (let y = Math.max(0, Math.floor(v - len / 2 - 1.5)); y <= Math.min(hh - 1, Math.ceil(v + len / 2 + 1.5)); y++) clean[y * w + x] = 0;
        }
      }
      i = j + 1;
    }
  }
}

/**
 * True when a word (level pixels) may be a curve's label: a line passes within a text height of
 * it across its columns, or a line ends within two text heights left of it (up to below it).
 * With no lines, every word may be.
 */
export function nearLine(word: Blot, lines: readonly Track[]): boolean {
  if (lines.length === 0) return true;
  const h = word.b - word.t;
  const cy = (word.t + word.b) / 2;
  return lines.some((t) => {
    for (let u = word.l; u <= word.r; u += 2) {
      const v = trackAt(t, u);
      if (v !== null && Math.abs(v - cy) <= h) return true;
    }
    const n = t.u.length - 1;
    const eu = t.u[n] as number;
    const ev = t.v[n] as number;
    return eu <= word.r && word.l - eu <= 2 * h && ev >= word.t - h && ev <= word.b + 2 * h;
  });
}

/** A glyph cut in two by a grid row taken out: pieces one above the other, a few pixels apart, joined again. */
function joinCut(blots: Blot[]): Blot[] {
  const out = [...blots].sort((a, b) => a.t - b.t);
  for (let again = true; again; ) {
    again = false;
    for (let i = 0; i < out.length && !again; i++) {
      for (let j = i + 1; j < out.length; j++) {
        const a = out[i] as Blot;
        const c = out[j] as Blot;
        const overlap = Math.min(a.r, c.r) - Math.max(a.l, c.l);
        const gap = Math.max(a.t, c.t) - Math.min(a.b, c.b);
        if (overlap >= 0.5 * Math.min(a.r - a.l, c.r - c.l) && gap <= 5) {
          out[i] = { l: Math.min(a.l, c.l), t: Math.min(a.t, c.t), r: Math.max(a.r, c.r), b: Math.max(a.b, c.b) };
          out.splice(j, 1);
          again = true;
          break;
        }
      }
    }
  }
  return out;
}

/** A curve's label: "330 mm", 13", "13 in", "1450 rpm", or a bare number. */
function labelOf(text: string): { value: number; unit: 'mm' | 'in' | 'rpm' | null } | null {
  const t = text.replace(/[”“″]/g, '"').replace(/\s+/g, ' ').trim();
  const k = curveLabel(t);
  if (k) return { value: k.value, unit: k.unit };
  if (NUMBER_ONLY.test(t)) return { value: sheetNumber(t), unit: null };
  return null;
}

/** A label word read twice (as words, with its unit; as digits), with the reader's own confidence in the first reading, 0–100. */
interface LabelReading {
  text: string;
  digits: string;
  confidence: number;
}

/**
 * A head label that names a curve is doubted when the reader's own confidence in it (0–100) is
 * under LABEL_READ_SURE and more than LABEL_READ_GAP under the middle of the other labels of the
 * sheet that name curves (three or more): printed alike, they should read alike. On the bed's
 * seeds 1–40 the labels read right with a millimetre unit came back at 90 or more, while an inch
 * mark or a comma lowers a right label's confidence (29–77) for all the labels of a sheet alike;
 * the digit misread on photo 66 ("328 mm" for 329 mm) came back at 59 against 95–96 for its
 * four siblings, and its digits one by one at 97 or more. Order and affinity cannot tell a 9
 * from an 8; a right label doubted costs a question, a wrong one taken is a wrong curve set.
 */
export const LABEL_READ_SURE = 80;
/** See LABEL_READ_SURE. */
export const LABEL_READ_GAP = 25;

async function nameHeads(
  heads: RasterCurve[],
  found: { word: Blot; frame: Box; clean: InkMap; plain: InkMap; at: [number, number] }[],
  strong: number,
  reader: TextReader,
  image: RasterImage,
  raw: InkMap,
  level: Level,
  scale: number,
  given: RasterCurveOptions['given'],
  ratedRpm: number | undefined,
  questions: string[],
  leftOut: string[],
  note: (line: string) => void = () => undefined,
): Promise<{ values: Map<RasterCurve, number>; unit: string | null; byLabels: boolean; family: 'diameter' | 'speed'; doubtful?: ReadonlySet<number> }> {
  const values = new Map<RasterCurve, number>();
  if (heads.length === 0) return { values, unit: null, byLabels: false, family: given?.family ?? 'diameter' };
  // Order, top to bottom, checked at every column the curves share: the higher curve stays higher.
  const lo = Math.max(...heads.map((c) => c.track.u[0] as number));
  const hi = Math.min(...heads.map((c) => c.track.u[c.track.u.length - 1] as number));
  const rows = (u: number) => heads.map((c) => trackAt(c.track, u) ?? NaN);
  const order = [...heads].sort((a, b) => (trackAt(a.track, lo) ?? 0) - (trackAt(b.track, lo) ?? 0));
  let crossing = false;
  for (let k = 0; k <= 10 && hi > lo; k++) {
    const u = lo + ((hi - lo) * k) / 10;
    const at = rows(u);
    const sorted = [...heads].sort((a, b) => (at[heads.indexOf(a)] as number) - (at[heads.indexOf(b)] as number));
    if (sorted.some((c, i) => c !== order[i])) crossing = true;
  }
  // Labels read inside the head frame, each on or beside its nearest head curve.
  // Read on the frame's ink with the grid taken out, one call per frame; then in level pixels.
  // Each word is read twice (as words, for the unit; as digits, for the number): a small label
  // in colour is often read two ways, and the candidates are sorted out below.
  const readings: LabelReading[] = [];
  const words: { word: Blot; plain: InkMap; at: [number, number] }[] = [];
  for (const clean of new Set(found.map((k) => k.clean))) {
    const here = found.filter((k) => k.clean === clean);
    const crops = here.map((w) => ({ box: { l: w.word.l - 2, t: w.word.t - 2, r: w.word.r + 2, b: w.word.b + 2 }, upright: false }));
    const asWords = await readCrops(clean, crops, reader, 'words', 2 * strong);
    const asDigits = await readCrops(clean, crops, reader, 'digits', 2 * strong);
    asWords.forEach((r, i) => readings.push({ text: r.text, digits: asDigits[i]?.text ?? '', confidence: r.confidence }));
    words.push(...here.map((k) => ({ word: { l: k.word.l + k.at[0], t: k.word.t + k.at[1], r: k.word.r + k.at[0], b: k.word.b + k.at[1] }, plain: k.plain, at: k.at })));
  }
  joinPointWords(words, readings, note);
  joinUnitWords(words, readings, note);
  // Where each head curve ends, level pixels: the line found's end, and the tracer's (a line found
  // may stop short of its end at an iso-line or a label; the tracer follows on to it) where the
  // tracer kept to the line found (confidence 0.5 or more: a tracer that ran off names nothing).
  const sureTrace = (c: RasterCurve) => (c.confidence >= 0.5 ? c.traced : []);
  const ends = new Map(
    heads.map((c) => {
      const n = c.track.u.length;
      const list: [number, number][] = [[c.track.u[n - 1] as number, c.track.v[n - 1] as number]];
      let far: [number, number] | null = null;
      for (const p of sureTrace(c)) {
        const q = level.toLevel(p[0] * scale, p[1] * scale);
        if (!far || q[0] > far[0]) far = q;
      }
      if (far && far[0] > (list[0] as [number, number])[0]) list.push(far);
      return [c, list] as const;
    }),
  );
  // The tracer's line in level pixels, by column: it runs on through a label the line found leaves a gap at.
  const tracedLevel = new Map(heads.map((c) => [c, sureTrace(c).map((p) => level.toLevel(p[0] * scale, p[1] * scale)).sort((a, b) => a[0] - b[0])] as const));
  // The tracer keeps few points where its line runs smooth (one every 30 px or more), so a
  // stretch between two is the line's when it is no longer than six text heights (`reach`).
  const tracedAt = (c: RasterCurve, u: number, reach: number): number | null => {
    const pts = tracedLevel.get(c) ?? [];
    for (let k = 1; k < pts.length; k++) {
      const [u0, v0] = pts[k - 1] as [number, number];
      const [u1, v1] = pts[k] as [number, number];
      if (u0 <= u && u <= u1 && u1 - u0 < reach) return u1 > u0 ? v0 + ((v1 - v0) * (u - u0)) / (u1 - u0) : v0;
    }
    return null;
  };
  // The head curve a word is on (the label interrupts the line) or beside the end of (up and to the right).
  const nearestHead = (word: Blot): { curve: RasterCurve | null; d: number } => {
    const cx = (word.l + word.r) / 2;
    const cy = (word.t + word.b) / 2;
    const hgt = word.b - word.t;
    let best: RasterCurve | null = null;
    let bestD = Infinity;
    for (const c of heads) {
      const on = trackAt(c.track, cx);
      const traced = tracedAt(c, cx, Math.max(20, 6 * hgt));
      const dOn = Math.min(on === null ? Infinity : Math.abs(on - cy), traced === null ? Infinity : Math.abs(traced - cy));
      let dEnd = Infinity;
      // An end left of the word (or up to a text height under its start), or inside the word's
      // box (the line found stops where the letters printed on it cover it): the distance to the
      // box, so an end far above the word is not beside it.
      for (const [endU, endV] of ends.get(c) ?? []) {
        const under = endU >= word.l && endU <= word.r && endV >= word.t && endV <= word.b;
        if (word.l >= endU - hgt || under) dEnd = Math.min(dEnd, Math.hypot(Math.max(0, word.l - endU), Math.max(0, endV - word.b, word.t - endV)));
      }
      const d = Math.min(dOn, dEnd);
      if (d < bestD) [best, bestD] = [c, d];
    }
    return { curve: best, d: bestD };
  };
  const byCurve = new Map<RasterCurve, Set<number>>();
  /** Per curve and value: the surest reading that gave it (the reader's own confidence, 0–100) and its text. */
  const certainty = new Map<RasterCurve, Map<number, { confidence: number; text: string }>>();
  // The units read, per word (a word read again, or its first reading taken again, counts once).
  const unitsOf = new Map<number, Set<string>>();
  // The one unit of the labels read whole (with their unit) in these frames, if they agree.
  // A unit read on one label only, against two or more read on the others, is a misreading (an
  // inch mark seen in a stray speck): the frame's unit is the one read at least twice as often as any other.
  const unitOf = (list: readonly { text: string; digits: string }[]) => {
    const count = new Map<'mm' | 'in' | 'rpm', number>();
    for (const r of list) {
      const u = labelCandidates(r.text, r.digits).length > 0 ? scanLabelOf(r.text)?.unit : null;
      if (u) count.set(u, (count.get(u) ?? 0) + 1);
    }
    const ranked = [...count].sort((a, b) => b[1] - a[1]);
    return ranked[0] && (ranked[1] === undefined || ranked[0][1] >= 2 * ranked[1][1]) ? ranked[0][0] : null;
  };
  let frameUnit = unitOf(readings);
  const near = words.map((w) => nearestHead(w.word));
  // A speed family labelled in shares of the rated speed ("100 %", "90 %" …, labels.ts
  // speedShares): only when a "100 %" stands by a head curve (no pump is 100 % efficient, so it
  // is no iso level) and the rated speed is known. The shares then name speeds in rpm.
  const shareOf = (r: LabelReading): number | null => {
    const share = speedShareLabel(trimSpecks(r.text));
    const digits = /\d+(?:[.,]\d+)?/.exec(r.digits.replace(/\s+/g, ''))?.[0];
    return share !== null && (digits === undefined || sheetNumber(digits) === share) ? share : null;
  };
  const byShares =
    ratedRpm !== undefined && ratedRpm > 0 && frameUnit === null &&
    words.some((w, i) => shareOf(readings[i] as LabelReading) === 100 && (near[i] as { d: number }).d <= 1.5 * (w.word.b - w.word.t));
  if (byShares) note(`a "100 %" label stands by a head curve: the "%" labels by the head curves are taken as shares of the rated ${ratedRpm} rpm`);
  const take = (w: { word: Blot }, reading: LabelReading, at: { curve: RasterCurve | null; d: number }, again: boolean, index: number) => {
    if (reading.text === '' && reading.digits === '') return; // a unit word joined to its number
    const share = byShares ? shareOf(reading) : null;
    const label = share !== null ? { value: (share / 100) * (ratedRpm as number), unit: 'rpm' as const } : scanLabelOf(reading.text);
    const candidates = share !== null ? [label!.value] : labelCandidates(reading.text, reading.digits, frameUnit);
    const hgt = w.word.b - w.word.t;
    note(`${again ? 'read again: ' : ''}word at [${w.word.l}, ${w.word.t}, ${w.word.r}, ${w.word.b}] read "${reading.text}" / "${reading.digits}" → ${candidates.join(' or ') || 'no label'}; nearest head curve ${at.curve ? order.indexOf(at.curve) : '-'} (top to bottom) at ${at.d.toFixed(1)} px (text height ${hgt})`);
    if (candidates.length === 0) return;
    if (!at.curve || at.d > 1.5 * hgt) return;
    const set = byCurve.get(at.curve) ?? new Set<number>();
    for (const v of candidates) set.add(v);
    byCurve.set(at.curve, set);
    const sure = certainty.get(at.curve) ?? new Map<number, { confidence: number; text: string }>();
    for (const v of candidates) if (!((sure.get(v)?.confidence ?? -1) >= reading.confidence)) sure.set(v, { confidence: reading.confidence, text: reading.text });
    certainty.set(at.curve, sure);
    if (label?.unit) unitsOf.set(index, (unitsOf.get(index) ?? new Set<string>()).add(label.unit));
  };
  words.forEach((w, i) => take(w, readings[i] as LabelReading, near[i] as { curve: RasterCurve | null; d: number }, false, i));
  const shutOff = order.map((c) => shutOffHead(c));
  const choose = () => chooseNames(order.map((c) => [...(byCurve.get(c) ?? [])]), shutOff);
  let chosen = crossing ? null : choose();
  // No naming from the first reading: the words on or beside a head curve are read once more,
  // widened over the print beside them and in the colour of their ink (labelPicture), and what
  // that reading gives joins the candidates. Only here: a sheet named at once pays no second reading.
  if (!chosen && !crossing) {
    // Read again: a word on or beside a head curve whose first reading has a digit (a word read as
    // letters alone is seldom a label: reading it again costs more than it gives) and that was not
    // read as a whole label (number and unit, both readings agreeing), nor as an iso label ("75 %";
    // "122%" is an inch label's mark misread).
    // A unit word alone ("mm") on a head curve is a label whose number the word finder lost (run
    // together with the line it is printed on): it is read again from three text heights to its left.
    const unitAlone = (r: LabelReading) => /^(?:mm|in)$/i.test(trimSpecks(r.text));
    const again = words
      .map((w, i) => ({ w, i, r: readings[i] as LabelReading }))
      .filter(({ w, i, r }) => (near[i] as { d: number }).d <= 1.5 * (w.word.b - w.word.t) && (/\d/.test(r.text + r.digits) || unitAlone(r)) && isoLabel(r.text) === null && !(scanLabelOf(r.text)?.unit && labelCandidates(r.text, r.digits).length > 0));
    const second: LabelReading[] = [];
    const reread: { word: Blot; i: number }[] = [];
    for (const plain of new Set(again.map((k) => k.w.plain))) {
      const here = again.filter((k) => k.w.plain === plain);
      const boxes = here.map((k) => (unitAlone(k.r) ? { ...k.w.word, l: Math.max(k.w.at[0], k.w.word.l - 3 * (k.w.word.b - k.w.word.t)) } : k.w.word));
      const picture = labelPicture(image, level, raw, plain, here[0]!.w.at, boxes);
      if (picture.crops.length !== here.length) continue;
      const asWords = await readCrops(picture.map, picture.crops, reader, 'words', 255, 64);
      const asDigits = await readCrops(picture.map, picture.crops, reader, 'digits', 255, 64);
      asWords.forEach((r, j) => second.push({ text: r.text, digits: asDigits[j]?.text ?? '', confidence: r.confidence }));
      reread.push(...here.map((k, j) => ({ word: picture.boxes[j] ?? k.w.word, i: k.i })));
    }
    if (second.length > 0) {
      frameUnit = unitOf([...readings, ...second]);
      // The first readings' bare numbers count too once the second reading found the frame's unit.
      words.forEach((w, i) => take(w, readings[i] as LabelReading, near[i] as { curve: RasterCurve | null; d: number }, true, i));
      reread.forEach((w, j) => take(w, second[j] as LabelReading, nearestHead(w.word), true, w.i));
      chosen = choose();
    }
  }
  const { unit, surely } = labelUnits(unitsOf);
  const family: 'diameter' | 'speed' = unit === 'rpm' ? 'speed' : unit ? 'diameter' : (given?.family ?? 'diameter');
  // The one naming of every curve the candidates allow (chosen above): larger values higher, and
  // the shut-off heads in about the ratio of the values squared (affinity).
  const fromLabels = new Map<RasterCurve, number>();
  if (chosen) order.forEach((c, i) => fromLabels.set(c, chosen[i] as number));
  const where = (c: RasterCurve) => {
    const n = c.track.u.length;
    const [x, y] = level.toImage(c.track.u[n >> 1] as number, c.track.v[n >> 1] as number);
    return `[${(x / scale).toFixed(0)}, ${(y / scale).toFixed(0)}]`;
  };
  const givenValues = given ? [...given.values].sort((a, b) => b - a) : null;
  if (chosen && !crossing && !(givenValues && givenValues.join() !== chosen.join())) {
    // One curve alone has nothing to be checked against: it is named, and the engineer asked once.
    for (const [c, v] of fromLabels) [values.set(c, v), (c.value = v), (c.named = 'label'), (c.confidence *= heads.length > 1 ? 0.95 : 0.6)];
    if (heads.length === 1) questions.push(`The one head curve found was read as ${chosen[0]}${unit ? ` ${unit}` : ''} from its label; is that what the sheet prints?`);
    // A label the reader itself was unsure of (a 9 read as an 8 on a blurred photo keeps order and
    // affinity): its curve, and every curve named after it, is proposed unsure, and the sheet asks.
    const doubtful = new Set<number>();
    const doubts: string[] = [];
    const surest = [...fromLabels].map(([c, v]) => certainty.get(c)?.get(v)?.confidence ?? NaN).filter(Number.isFinite).sort((a, b) => a - b);
    const typical = surest.length >= 3 ? (surest[surest.length >> 1] as number) : NaN;
    for (const [c, v] of fromLabels) {
      const read = certainty.get(c)?.get(v);
      if (!read || !(read.confidence < LABEL_READ_SURE && read.confidence < typical - LABEL_READ_GAP)) continue;
      doubtful.add(v);
      doubts.push(`"${read.text.trim()}" at ${where(c)} (${read.confidence.toFixed(0)} of 100)`);
    }
    if (doubts.length > 0) questions.push(`The label${doubts.length === 1 ? '' : 's'} ${doubts.join(', ')} ${doubts.length === 1 ? 'was' : 'were'} read with little certainty; ${doubts.length === 1 ? 'its head curve and the curves named after it are' : 'their head curves and the curves named after them are'} proposed unsure. Is ${[...doubtful].join(', ')} what the sheet prints?`);
    return { values, unit, byLabels: true, family, doubtful };
  }
  if (givenValues && givenValues.length === heads.length && !crossing) {
    const fit = givenValues.every((v, i) => i === 0 || affinityHolds(givenValues[0] as number, shutOff[0] as number, v, shutOff[i] as number));
    order.forEach((c, i) => {
      const v = givenValues[i] as number;
      values.set(c, v);
      c.value = v;
      c.named = 'given';
      c.confidence *= fit ? 0.9 : 0.4;
    });
    if (!fit) questions.push(`The head curves found (top to bottom at ${order.map(where).join(', ')}) do not keep the affinity rule with the values given (${givenValues.join(', ')}): their shut-off heads ${shutOff.map((h) => h.toPrecision(3)).join(', ')} are not near the ratio of the values squared. Is a curve missing, or a value wrong?`);
    return { values, unit: surely, byLabels: false, family: given?.family ?? family };
  }
  // As many values given as head curves found, but not the same number: the one matching that
  // keeps the order and the affinity rule names the curves; what has no partner is said.
  const matched = givenValues && givenValues.length !== heads.length && !crossing ? matchByAffinity(shutOff, givenValues) : null;
  if (matched && givenValues) {
    order.forEach((c, i) => {
      const v = matched[i];
      if (v === undefined) return;
      values.set(c, v);
      c.value = v;
      c.named = 'given';
      c.confidence *= 0.85;
    });
    const missing = givenValues.filter((v) => !matched.includes(v));
    const extra = order.filter((_, i) => matched[i] === undefined);
    if (missing.length > 0) leftOut.push(`${heads.length} head curve${heads.length === 1 ? '' : 's'} found for the ${givenValues.length} values given; by the affinity rule they are ${matched.join(', ')}, and no head curve was found for ${missing.join(', ')}: trace ${missing.length === 1 ? 'it' : 'them'} by hand.`);
    if (extra.length > 0) leftOut.push(`${heads.length} lines start at the flow axis of the head panel for the ${givenValues.length} values given; by the affinity rule ${extra.length === 1 ? 'the one' : 'those'} at ${extra.map(where).join(', ')} ${extra.length === 1 ? 'is' : 'are'} not one of them and ${extra.length === 1 ? 'is' : 'are'} left out.`);
    return { values, unit: surely, byLabels: false, family: given?.family ?? family };
  }
  const readList = order.map((c) => [...(byCurve.get(c) ?? [])].join(' or ') || '?').join(', ');
  questions.push(
    crossing
      ? `The ${heads.length} head curves found cross one another, so their order does not name them; give each curve's diameter by tracing it (labels read, top to bottom: ${readList}).`
      : `The ${heads.length} head curves found (top to bottom at ${order.map(where).join(', ')}) could not all be named from the labels read (${readList})${givenValues ? ` nor from the ${givenValues.length} values given` : ''}; give the diameters (or speeds) drawn, largest first.`,
  );
  return { values, unit: surely, byLabels: false, family };
}

/** A curve's label as read on a scan: as printed, or an inch label whose mark the reader misread. */
function scanLabelOf(text: string): { value: number; unit: 'mm' | 'in' | 'rpm' | null } | null {
  // Specks the reader takes for a mark before or after the label (a comma, a dash: the stub of
  // the line it is printed on) are no part of it; an inch mark is.
  text = trimSpecks(text);
  const label = labelOf(text);
  if (label?.unit) return label;
  const inches = misreadInchLabel(text);
  if (inches !== null) return { value: inches, unit: 'in' };
  // "175 mn", "160 rm", "175 mun", "260m" (the second m under the line the label is printed
  // on), "7m" (an inch mark's strokes read as one letter): a unit misread into pieces of an m is
  // no unit, and the number stands alone (it counts only where the frame's other labels were read
  // whole, with their unit). No impeller is labelled in metres.
  const unitLost = new RegExp(`^${SHEET_NUMBER}\\s*[mnru]{1,3}$`, 'i').exec(text);
  return label ?? (unitLost ? { value: sheetNumber(unitLost[1] as string), unit: null } : null);
}

/** True when a length in inches is a whole number of sixteenths. */
const inSixteenths = (v: number) => Math.abs(v * 16 - Math.round(v * 16)) < 1e-6;

/**
 * An inch label as the reader gives it on a scan when it misreads the small inch mark: as a
 * degree sign or a star ("14°" for 14"), or as a last 7 after the decimals ("13.3757" for
 * 13.375", "12.257" for 12.25"). Impeller diameters in inches are printed to a sixteenth at
 * finest (common practice: trims are cut in sixteenths of an inch), so a last 7 is taken for the
 * mark only when the number without it is a whole number of sixteenths and the number with it is
 * not; a mark read as a sign counts for values up to 60 in only. Null for anything else. The
 * naming still needs every head curve's label, the order and the affinity of heads to agree.
 */
export function misreadInchLabel(text: string): number | null {
  const t = text.replace(/\s+/g, '');
  const sign = /^(\d{1,2}(?:[.,]\d{1,4})?)[°º*]$/.exec(t);
  if (sign) {
    const v = sheetNumber(sign[1] as string);
    return v > 0 && v <= 60 && inSixteenths(v) ? v : null;
  }
  const seven = /^(\d{1,2}[.,]\d{1,3})7$/.exec(t);
  if (seven) {
    const v = sheetNumber(seven[1] as string);
    return v > 0 && inSixteenths(v) && !inSixteenths(sheetNumber(t)) ? v : null;
  }
  return null;
}

/**
 * The unit of a frame's curve labels from the units read on each word (a word read twice counts
 * once): `unit`, the first read, serves where the labels named the curves (order and affinity
 * vouch for them); `surely` is that unit only when two words or more gave it and none gave
 * another. Where the labels did not name the curves, only `surely` is said and asked about: one
 * inch label may be a millimetre label's "197 mm" read "19°" (a scan in a serif face), and the
 * diameters given would then be taken for inches.
 */
export function labelUnits(perWord: ReadonlyMap<number, ReadonlySet<string>>): { unit: string | null; surely: string | null } {
  const units = [...perWord.values()].flatMap((u) => [...u]);
  const unit = units[0] ?? null;
  const surely = unit !== null && units.filter((k) => k === unit).length >= 2 && units.every((k) => k === unit) ? unit : null;
  return { unit, surely };
}

/**
 * An inch label with a decimal point ("8.125"") whose point the scan lost is read as two words,
 * a bare whole number ("8") and the rest ("125"" or "125"): read alone, the first names an 8 in
 * curve, the second a 12.5 in one. A bare whole number of one or two digits with a word of one to
 * three digits (and perhaps an inch mark) just right of it on its row (bottoms within a third of
 * the digits' height, the gap at most one digit height) is read as one number with a point
 * between; the second word's reading is emptied. Boxes are level pixels.
 */
export function joinPointWords(words: readonly { word: Blot }[], readings: WordReading[], note: (line: string) => void = () => undefined): void {
  joinRightNeighbour(words, readings, {
    first: (text) => /^\d{1,2}$/.test(text.replace(/\s+/g, '')),
    second: (text) => /^\d{1,3}(?:"|”|“|″)?$/.test(text.replace(/\s+/g, '')),
    overlap: 0,
    join: (r, ru) => {
      const whole = r.text.replace(/\s+/g, '');
      const rest = ru.text.replace(/\s+/g, '');
      note(`  "${r.text}" and "${ru.text}" beside it are read as one number, its point lost: "${whole}.${rest}"`);
      return { text: `${whole}.${rest}`, digits: `${whole}.${/^\d+/.exec(rest)?.[0] ?? ''}` };
    },
  });
}

/** A word's two readings (as words, and as digits) and the reader's confidence. */
type WordReading = { text: string; digits: string; confidence?: number };

/**
 * Joins each word whose reading `first` accepts with the nearest word just right of it on its row
 * whose reading `second` accepts (bottoms within a third of the first word's height, the gap at
 * most that height and no more than `overlap` of it negative): the first word takes the joined
 * reading, with the lower of the two confidences, and the second's reading is emptied. Each
 * word is joined once. Boxes are level pixels.
 */
function joinRightNeighbour(words: readonly { word: Blot }[], readings: WordReading[], rule: { first: (text: string) => boolean; second: (text: string) => boolean; overlap: number; join: (r: WordReading, ru: WordReading) => { text: string; digits: string } }): void {
  const taken = new Set<number>();
  words.forEach((w, i) => {
    const r = readings[i];
    if (!r || taken.has(i) || !rule.first(r.text)) return;
    const h = w.word.b - w.word.t;
    let best = -1;
    let bestGap = Infinity;
    words.forEach((u, j) => {
      const ru = readings[j];
      if (j === i || taken.has(j) || !ru || !rule.second(ru.text)) return;
      const gap = u.word.l - w.word.r;
      if (gap < -rule.overlap * h || gap > h || Math.abs(u.word.b - w.word.b) > h / 3 || u.word.t > w.word.b) return;
      if (gap < bestGap) [best, bestGap] = [j, gap];
    });
    if (best < 0) return;
    const ru = readings[best] as WordReading;
    const confidence = r.confidence === undefined || ru.confidence === undefined ? (r.confidence ?? ru.confidence) : Math.min(r.confidence, ru.confidence);
    readings[i] = { ...rule.join(r, ru), ...(confidence !== undefined ? { confidence } : {}) };
    readings[best] = { text: '', digits: '', ...(confidence !== undefined ? { confidence } : {}) };
    taken.add(best);
  });
}

/** A unit printed after a curve label's number, read alone: "mm", "in", an inch mark, "rpm". */
const UNIT_WORD = /^(?:mm|in|"|rpm|r\/min|min-1|1\/min)$/i;

/**
 * A label whose unit stands a little apart from its number ("440  mm" on a scan: the gap is wider
 * than the words' grouping joins, and the unit's small letters are lower than the digits) is
 * read as two words; each bare number is joined here with the unit word just right of it on
 * its row (bottoms within a third of the digits' height, the gap at most one digit height),
 * so that the label counts as whole. The unit word's reading is emptied; boxes are level pixels.
 */
export function joinUnitWords(words: readonly { word: Blot }[], readings: WordReading[], note: (line: string) => void = () => undefined): void {
  joinRightNeighbour(words, readings, {
    first: (text) => NUMBER_ONLY.test(text.replace(/\s+/g, '').trim()),
    second: (text) => UNIT_WORD.test(text.replace(/[”“″]/g, '"').replace(/\s+/g, '')),
    overlap: 0.2,
    join: (r, ru) => {
      note(`  "${r.text}" and "${ru.text}" beside it are read as one label`);
      return { text: `${r.text.trim()} ${ru.text.trim()}`, digits: r.digits };
    },
  });
}

/**
 * The value of a label read two ways (as words with its unit, and as digits), or nothing when the
 * two disagree. A bare number counts only when `frameUnit` is given (other labels of the frame
 * were read whole, all with that one unit); a value in inches only when it is a whole number of
 * sixteenths.
 */
export function labelCandidates(text: string, digits: string, frameUnit: 'mm' | 'in' | 'rpm' | null = null): number[] {
  // Only a whole label counts, its unit read too ("330 mm", 13"): a number alone may be a label
  // cut short by the grid, or its inch mark read as a digit. The digits reading must agree.
  // Where the frame's other labels were read whole, the unit of a label whose unit was lost (it
  // touched the line) is theirs; the naming still needs order and affinity to hold.
  // In a frame whose other labels were read in inches, a "%" after a small whole number of
  // sixteenths is the inch mark misread ("10.5%" for 10.5"): iso-efficiency levels under 30 %
  // are not drawn (common practice: iso-lines run from about 40 to 85 %).
  const percent = frameUnit === 'in' ? /^(\d{1,2}(?:[.,]\d{1,4})?)%$/.exec(text.replace(/\s+/g, '')) : null;
  if (percent) {
    const v = sheetNumber(percent[1] as string);
    return v > 0 && v < PERCENT_INCH_MAX && inSixteenths(v) ? [v] : [];
  }
  const read = scanLabelOf(text);
  let label = read && read.unit === null && frameUnit !== null ? { value: read.value, unit: frameUnit } : read;
  // In a frame labelled in inches, a whole number over 60 ending in 7 is a label whose inch mark was
  // read as a 7 ("147" for 14"): no impeller is that large (from memory: process pumps' impellers
  // stay well under 60 in).
  const whole = /^(\d{1,2})7$/.exec(text.replace(/[\s,.;:_\-–—'`~|]+$/g, '').trim());
  if (label && read?.unit === null && frameUnit === 'in' && label.value > 60 && whole) label = { value: sheetNumber(whole[1] as string), unit: 'in' };
  if (!label || label.unit === null || (label.unit === 'in' && label.value > MAX_INCHES)) return [...pointLost(text, digits, frameUnit), ...digitsWithUnit(text, digits, frameUnit)];
  // Impeller diameters in inches are printed to a sixteenth at finest (common practice: trims are
  // cut in sixteenths): "6.675"" is a misread "6.625"", never a label.
  if (label.unit === 'in' && !inSixteenths(label.value)) return [];
  const number = /\d+(?:[.,]\d+)?/.exec(digits.replace(/\s+/g, ''))?.[0];
  if (number === undefined) return [label.value];
  const asDigits = sheetNumber(number);
  return asDigits === label.value || sheetNumber(number.slice(0, -1)) === label.value ? [label.value] : [];
}

/** Below this, a "%" label beside a head curve in a frame labelled in inches is an inch label whose mark was misread. */
const PERCENT_INCH_MAX = 30;

/** The largest impeller diameter in inches a label may give (from memory: process pumps' impellers stay well under 60 in). */
const MAX_INCHES = 60;

/**
 * An inch label whose decimal point the reader lost (the point is a speck of a few pixels on a
 * scan): "155°" or "155" in a frame labelled in inches for 15.5", "1057" for 10.5" with its mark
 * read as a 7. Only a number of two to five digits with no point, too large for inches as read
 * (over MAX_INCHES), marked as inches (a mark read as °, *, " or "in") or in a frame whose labels
 * were read in inches; each place of a point, one to three decimals, that gives a whole number of
 * sixteenths from 2 in to MAX_INCHES is a candidate (no trailing zero after the point), when
 * the digits reading has the same digits (or none). The naming still needs order and affinity to pick one set, and only one.
 */
export function pointLost(text: string, digits: string, frameUnit: 'mm' | 'in' | 'rpm' | null): number[] {
  // A point read as a space ("14 25"" for 14.25") is a point lost too.
  const t = trimSpecks(text.replace(/[”“″]/g, '"')).replace(/(\d)\s+(?=\d)/g, '$1');
  const m = /^(\d{2,5})\s*([°º*"]|in)?$/.exec(t);
  if (!m || (m[2] === undefined && frameUnit !== 'in')) return [];
  const read = m[1] as string;
  const digitsRead = digits.replace(/\D+/g, '');
  const out = new Set<number>();
  // As read, or with a last 7 that was the inch mark.
  for (const n of read.endsWith('7') ? [read, read.slice(0, -1)] : [read]) {
    if (Number(n) <= MAX_INCHES || (digitsRead !== '' && !digitsRead.startsWith(n))) continue;
    // A sheet prints no trailing zero after a point ("23"", never "23.0"").
    for (let k = 1; k <= 3 && k < n.length && !n.endsWith('0'); k++) {
      const v = Number(`${n.slice(0, n.length - k)}.${n.slice(n.length - k)}`);
      if (v >= 2 && v <= MAX_INCHES && inSixteenths(v)) out.add(v);
    }
  }
  return [...out];
}

/**
 * A label whose words reading kept the frame's unit word but garbled the number ("19°" mm" for
 * 197 mm: a digit next to the unit misread as a mark) while the digits reading gives a whole
 * number: the digits reading's value, in millimetres only (a whole number; an inch label's
 * decimals are too easily lost to trust the digits alone). One candidate among the others: the
 * naming still needs order and affinity to pick one set, and only one.
 */
function digitsWithUnit(text: string, digits: string, frameUnit: 'mm' | 'in' | 'rpm' | null): number[] {
  if (frameUnit !== 'mm' || !/\bmm\b/i.test(text)) return [];
  const n = /^\D*(\d{2,4})\D*$/.exec(digits.replace(/\s+/g, ''));
  return n ? [Number(n[1])] : [];
}

/** The head at the lowest flow of the tracer's line (the shut-off head), or NaN. */
function shutOffHead(c: RasterCurve): number {
  let best: SheetPoint | null = null;
  let bestX = Infinity;
  for (const p of c.traced) {
    const x = c.panel.proposal.calibration.toData(p)[0];
    if (x < bestX) [best, bestX] = [p, x];
  }
  return best ? c.panel.proposal.calibration.toData(best)[1] : NaN;
}

/**
 * Affinity between two curves of one family: head in proportion to the diameter (or speed)
 * squared. Trimmed impellers follow it only roughly, so the check takes any exponent from 1.5
 * to 2.8 (common practice: H ∝ D² for trims; the band is wider so that a sound sheet passes and a misread label fails).
 */
export function affinityHolds(v1: number, h1: number, v2: number, h2: number): boolean {
  if (!(v1 > 0 && v2 > 0 && h1 > 0 && h2 > 0) || v1 === v2) return false;
  const k = Math.log(h1 / h2) / Math.log(v1 / v2);
  return k >= 1.5 && k <= 2.8;
}

/**
 * Head curves (their shut-off heads, top to bottom) and the values given when their numbers
 * differ by one or two: the one matching of curves to values, larger values higher, every
 * matched pair keeping affinity, with each value on one curve at most and each curve on one
 * value at most, that matches as many as the fewer of the two. Per curve its value, undefined
 * for a curve left without one (a line at the flow axis that is no head curve of the family).
 * Null when fewer than two would be matched, when none fits, or when two matchings fit.
 */
export function matchByAffinity(heads: readonly number[], values: readonly number[]): (number | undefined)[] | null {
  const n = heads.length;
  const want = Math.min(n, values.length);
  if (want < 2 || Math.abs(n - values.length) > 2 || values.length === n) return null;
  const sorted = [...values].sort((a, b) => b - a);
  const fits: (number | undefined)[][] = [];
  const pick: (number | undefined)[] = [];
  // Curve i takes value j or later, or (while curves may still be spared) none.
  const walk = (i: number, j: number, made: number): void => {
    if (fits.length > 1) return;
    if (i === n) {
      if (made === want) fits.push([...pick]);
      return;
    }
    if (made + (n - i) < want) return;
    for (let k = j; k < sorted.length; k++) {
      const v = sorted[k] as number;
      if (pick.some((u, m) => u !== undefined && !affinityHolds(u, heads[m] as number, v, heads[i] as number))) continue;
      if (!(heads[i] as number > 0)) continue;
      pick.push(v);
      walk(i + 1, k + 1, made + 1);
      pick.pop();
    }
    if (n > values.length) {
      pick.push(undefined);
      walk(i + 1, j, made);
      pick.pop();
    }
  };
  walk(0, 0, 0);
  return fits.length === 1 ? (fits[0] as (number | undefined)[]) : null;
}

/**
 * The one assignment of values to curves (top to bottom) from each curve's candidates with the
 * values falling strictly from top to bottom and every pair keeping affinity; null when a curve
 * has no candidate, when none fits, or when two different ones fit.
 */
export function chooseNames(candidates: readonly (readonly number[])[], heads: readonly number[]): number[] | null {
  if (candidates.some((c) => c.length === 0)) return null;
  const fits: number[][] = [];
  const pick: number[] = [];
  const walk = (i: number): void => {
    if (fits.length > 1) return;
    if (i === candidates.length) {
      fits.push([...pick]);
      return;
    }
    for (const v of candidates[i] as readonly number[]) {
      if (i > 0 && !(v < (pick[i - 1] as number))) continue;
      if (pick.some((u, j) => !affinityHolds(u, heads[j] as number, v, heads[i] as number))) continue;
      pick.push(v);
      walk(i + 1);
      pick.pop();
    }
  };
  walk(0);
  return fits.length === 1 ? (fits[0] as number[]) : null;
}

/** Share of the columns of a found line's run past the tracer's end that must show the tracer's ink for the run to be the line's. */
const OWN_INK_SHARE = 0.5;

/** Membership in the tracer's ink model at which a pixel is the line's ink (the tracer's own threshold). */
const OWN_INK_MEMBERSHIP = 0.4;

/**
 * Where a found line runs on past the tracer's end (by more than `margin`, in the line's own
 * coordinates) in ink that is not the tracer's line's (membership under the tracer's threshold at
 * most columns, within a pixel or so of the track), the column where the tracer's line ends;
 * undefined where the run is the line's own ink, or there is none. A line of no clear hue (black,
 * grey) tells nothing from a black label, and is left as found.
 */
export function notOwnInkFrom(image: RasterImage, track: Track, traced: readonly [number, number][], model: InkModel, margin: number, toSheetAt: (u: number, v: number) => SheetPoint): number | undefined {
  if (model.mode !== 'chromatic' || traced.length === 0) return undefined;
  const last = track.u[track.u.length - 1] as number;
  const tracedEnd = Math.max(...traced.map(([u]) => u));
  if (last - tracedEnd <= margin) return undefined;
  let columns = 0;
  let own = 0;
  for (let u = Math.ceil(tracedEnd); u <= last; u++) {
    const v = trackAt(track, u);
    if (v === null) continue;
    columns++;
    // The best membership within a pixel or so across the track (the track is the ink's middle).
    let best = 0;
    for (let dv = -1.5; dv <= 1.5; dv += 0.5) {
      const p = toSheetAt(u, v + dv);
      best = Math.max(best, membershipAt(image, model, p[0] * image.scale, p[1] * image.scale));
    }
    if (best >= OWN_INK_MEMBERSHIP) own++;
  }
  return columns > 0 && own < OWN_INK_SHARE * columns ? tracedEnd : undefined;
}
