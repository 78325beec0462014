/**
 * The line's own look where a whole-line trace runs on beyond its guides: its dash pattern read
 * from a row of ink samples, and its width and pattern measured again along the stretch already
 * followed. The model sampled under a guide may be off (a dotted line blurred into a solid stroke
 * under the guide, or a width taken where the line touched a grid line or a neighbour); along the
 * followed stretch the line is seen over many widths, and that measure lets the trace go on to
 * the line's own ends. Pure: works on the RGBA buffer only.
 */
import type { InkModel } from './colour.ts';
import type { LineStyle } from './lineFollow.ts';
import { findRuns, membershipAt, sampleLongSection, sampleSection, type ReadCounter, type Run } from './lineProfile.ts';
import type { RasterImage } from './raster.ts';

type Px = [number, number];

/** Least share of the gaps and dashes seen along a broken line that must follow its pattern. */
const PATTERN_SHARE = 0.7;

/** Longest gap between dashes that a broken line may have, in line widths and at least in pixels. */
const DASH_GAP_WIDTHS = 6;
const DASH_GAP_MIN_PX = 12;

/**
 * The reach that spans the gaps of a broken line (half its longest regular gap plus a pixel),
 * from a row of samples along it `spacing` pixels apart (true where ink of the line lies), or
 * undefined when the row shows no dash pattern. Three or more gaps between ink, most of about
 * one length and none longer than a few line widths, and most dashes of about one length, make
 * a broken line; a single gap is a label or a crossing, and noise on a solid line flickers at
 * random lengths.
 */
export function dashReach(on: readonly boolean[], spacing: number, width: number): number | undefined {
  const gaps: number[] = [];
  const dashes: number[] = [];
  const first = on.indexOf(true);
  const last = on.lastIndexOf(true);
  if (first < 0) return undefined;
  let run = 0;
  for (let i = first; i <= last + 1; i++) {
    const here = i <= last && (on[i] as boolean);
    if (i > first && here !== (on[i - 1] as boolean)) {
      (here ? gaps : dashes).push(run * spacing);
      run = 0;
    }
    run++;
  }
  dashes.shift(); // the first dash may be cut by the window
  const real = gaps.filter((g) => g >= 1);
  if (real.length < 3 || dashes.length < 2) return undefined;
  const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)] as number;
  const gapMedian = median(real);
  const dashMedian = median(dashes);
  const regular = real.filter((g) => g >= 0.5 * gapMedian && g <= 1.8 * gapMedian);
  const regularDashes = dashes.filter((d) => d <= 3 * dashMedian + 2);
  if (regular.length < 3 || regular.length < PATTERN_SHARE * gaps.length || regularDashes.length < PATTERN_SHARE * dashes.length) return undefined;
  const longest = Math.max(...regular);
  if (longest > Math.max(DASH_GAP_MIN_PX, DASH_GAP_WIDTHS * width)) return undefined;
  return 0.5 * longest + 1;
}

/** Length of followed line, pixels (or line widths when more), over which its look is measured again. */
const MEASURE_PX = 60;
const MEASURE_WIDTHS = 16;

/** Least number of points, 2 px apart, of a followed stretch measured again (40 px). */
const MIN_STRETCH_POINTS = 20;

/** Sections across the followed stretch whose ink gives the line's width. */
const WIDTH_SECTIONS = 11;

/**
 * Largest ratio of the measured width to the model's that makes a narrower model worth a try:
 * above it the follower already sees the line.
 */
const WIDTH_CHANGE = 0.75;

/** Largest ratio of the measured width to the model's of a wider model (a line alone at every section; see `restyleAlong`). */
const WIDEN_LIMIT = 1.8;

/** Points `spacing` apart along a path, from its start. */
function along(points: readonly Px[], spacing: number): Px[] {
  const out: Px[] = [];
  let carry = 0;
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1] as Px;
    const b = points[i] as Px;
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
    let t = carry;
    while (t <= len) {
      out.push([a[0] + ((b[0] - a[0]) * t) / len, a[1] + ((b[1] - a[1]) * t) / len]);
      t += spacing;
    }
    carry = t - len;
  }
  return out;
}

/** The last `length` pixels of a path (its end last). */
function lastStretch(points: readonly Px[], length: number): Px[] {
  let k = points.length - 1;
  let total = 0;
  while (k > 0 && total < length) {
    total += Math.hypot((points[k] as Px)[0] - (points[k - 1] as Px)[0], (points[k] as Px)[1] - (points[k - 1] as Px)[1]);
    k--;
  }
  return points.slice(k);
}

/**
 * The most line-like sample across the path (within the line's width and a pixel) at each
 * position `spacing` apart along it.
 */
function peakRow(image: RasterImage, model: InkModel, points: readonly Px[], width: number, counter: ReadCounter): { peaks: number[] } {
  const spacing = ROW_SPACING;
  const across = Math.max(1.5, 0.5 * width + 1);
  const at = along(points, spacing);
  const peaks: number[] = [];
  for (let i = 0; i < at.length; i++) {
    const a = at[Math.max(0, i - 4)] as Px;
    const b = at[Math.min(at.length - 1, i + 4)] as Px;
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1;
    const nx = -(b[1] - a[1]) / len;
    const ny = (b[0] - a[0]) / len;
    const p = at[i] as Px;
    let best = 0;
    for (let s = -across; s <= across; s += 1) best = Math.max(best, membershipAt(image, model, p[0] + nx * s, p[1] + ny * s, counter));
    peaks.push(best);
  }
  return { peaks };
}

/** Spacing, pixels, of the peaks read along a followed stretch: finer than the shortest gap a dash pattern counts (1 px). */
const ROW_SPACING = 1;

/** Least swing of the peaks along a line, between its dashes and its gaps, that shows a pattern in a blurred line. */
const MIN_SWING = 0.25;

/**
 * Ink or gap at each position of a row of peaks. A crisp broken line drops to paper between its
 * dashes, and the line's own threshold tells them apart; a blurred one (a fine dotted line in a
 * soft scan) keeps some colour in its gaps, which then stay above that threshold, so where the
 * peaks swing widely the cut lies halfway between the row's low and high peaks.
 */
export function inkOrGap(peaks: readonly number[], threshold: number): boolean[] {
  const sorted = [...peaks].sort((a, b) => a - b);
  const lo = sorted[Math.floor(0.1 * (sorted.length - 1))] ?? 0;
  const hi = sorted[Math.floor(0.9 * (sorted.length - 1))] ?? 0;
  const cut = hi - lo >= MIN_SWING ? Math.max(threshold, (lo + hi) / 2) : threshold;
  return peaks.map((p) => p >= cut);
}

/**
 * The line's model measured again along the last stretch of a followed path: its dash pattern
 * (along the path itself, which knows the line's direction better than the ink around one
 * guide) when the model takes it for solid, and its width (the median mass of the one ink run at
 * the path across it; on a line found broken here, each section takes the most line-like sample
 * within the pattern's reach). Undefined when the stretch is
 * too short to measure, shows no ink, or gives the model the follower already has.
 */
export function restyleAlong(image: RasterImage, style: LineStyle, path: readonly Px[], counter: ReadCounter): LineStyle | undefined {
  // Evenly spaced: a stretch bridged between two guides may be a few points far apart.
  const stretch = along(lastStretch(path, Math.max(MEASURE_PX, MEASURE_WIDTHS * style.width)), 2);
  if (stretch.length < MIN_STRETCH_POINTS) return undefined;
  // A line already known to be broken keeps its pattern; only a solid model's line is read for one.
  const broken = style.reach ? undefined : dashReach(inkOrGap(peakRow(image, style.model, stretch, style.width, counter).peaks, style.threshold), ROW_SPACING, style.width);
  const reach = broken ?? 0;
  const spacing = 0.5;
  const n = Math.ceil((2 * style.width + 3) / spacing);
  const section = new Float64Array(2 * n + 1);
  const runs: Run[] = [];
  const masses: number[] = [];
  let alone = 0;
  for (let k = 0; k < WIDTH_SECTIONS; k++) {
    const i = Math.min(stretch.length - 2, Math.floor((k * (stretch.length - 1)) / WIDTH_SECTIONS));
    const a = stretch[i] as Px;
    const b = stretch[i + 1] as Px;
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
    if (len === 0) continue;
    const nx = -(b[1] - a[1]) / len;
    const ny = (b[0] - a[0]) / len;
    if (reach > 0) sampleLongSection(image, style.model, a[0], a[1], nx, ny, n, spacing, reach, section, counter);
    else sampleSection(image, style.model, a[0], a[1], nx, ny, n, spacing, section, counter);
    // One run of ink where the line is: two there are the line split by another line along it
    // (its halves are no measure of its width).
    const here = findRuns(section, n, spacing, style.threshold, runs).filter((r) => Math.abs(r.centre) <= 0.5 * style.width + 1);
    if (here.length === 1) masses.push((here[0] as Run).mass);
    if (here.length === 1 && runs.length === 1) alone++;
  }
  if (masses.length < Math.ceil(WIDTH_SECTIONS / 2)) return undefined;
  masses.sort((x, y) => x - y);
  const measured = Math.max(1, masses[Math.floor(masses.length / 2)] as number);
  // A pattern found anew along with a much narrower width is no dotted line but the stretch
  // wobbling across the edges of a line split by another (each swing of the peaks a false dot).
  if (broken !== undefined && !style.reach && measured < WIDTH_CHANGE * style.width) return undefined;
  // A narrower line: a width sampled where the line touched other ink comes out too wide. A
  // wider model than the guide's would take neighbours and grid lines for the line, and is
  // taken only where every section saw the line alone, and its mass beyond the model's range
  // (a grey line's core darker than the sample under its guide: its mass along the line past
  // the model's range, every section ambiguous, and the line lost at the guide; speed bench
  // scan seed 28, the 1250 rpm efficiency line clicked twice, 14 points off).
  const wider = alone === WIDTH_SECTIONS && measured > (style.massRange[1] as number) * style.width && measured <= WIDEN_LIMIT * style.width;
  const newWidth = measured < WIDTH_CHANGE * style.width || wider ? measured : style.width;
  const newReach = broken ?? style.reach ?? 0;
  if (newWidth === style.width && (newReach ?? 0) === (style.reach ?? 0)) return undefined;
  return { ...style, width: newWidth, ...(newReach ? { reach: newReach } : {}) };
}

/** A place on a line's predicted course beyond a followed stretch: the point, the unit tangent there, and how far off it (pixels) the line may lie. */
export interface CoursePoint {
  at: Px;
  tangent: Px;
  allowed: number;
}

/**
 * Sections across the course ahead that must show one clean run of about one width, narrower than
 * the model's, before that width is taken: enough to outweigh a grid line or a letter of a label
 * crossing the course (each shows at one or two sections), few enough to be found within the
 * course's reach (`courseAhead`: 20 widths of the model's) after a bunch fans out.
 */
const AHEAD_SECTIONS = 6;

/**
 * Least share of the sections that see ink near the course whose run is of the narrow width: a
 * line that stays in the bunch beyond the end (the model's width right after all) shows wide
 * runs at nearly all of them. A quarter: a dotted or dashed line shows its width only at its
 * dots (its gaps and the lines still half merged show other runs), and on the bed (seeds 1–80)
 * a quarter lowered the wrong share where a half did less; what the new width follows must
 * still continue the line smoothly and farther than before.
 */
const AHEAD_SHARE = 0.25;

/**
 * Spread allowed among the narrow runs of the farther half of the sections, as a ratio of the
 * upper to the lower quartile of their masses: one line's runs agree within compression noise
 * (1.1 to 1.3 seen on the bed's scans); a mix of grid lines, letters and line does not.
 */
const AHEAD_SPREAD = 1.6;

/**
 * The line's width measured ahead of a followed stretch, along its predicted course: where a
 * trace ends in a bunch (the lines of several diameters running together, the width under its
 * guides that of the bunch), the model's width is too wide for the line where it separates, and
 * the follower loses it there. Each section across the course takes the one run of the line's
 * colour within the allowed distance of the course; when most such runs are of one width clearly
 * narrower than the model's (`WIDTH_CHANGE`), that width is returned. Only narrower: a wider
 * model would take the bunch or a neighbour for the line. Undefined otherwise.
 */
export function restyleAhead(image: RasterImage, style: LineStyle, course: readonly CoursePoint[], counter: ReadCounter): LineStyle | undefined {
  const spacing = 0.5;
  const runs: Run[] = [];
  let seen = 0;
  const narrow: number[] = [];
  // One buffer for all sections, grown when one is wider (each section is read over its own 2n + 1 samples).
  let section = new Float64Array(0);
  for (const c of course) {
    const n = Math.ceil((c.allowed + 2 * style.width + 2) / spacing);
    if (section.length < 2 * n + 1) section = new Float64Array(2 * n + 1);
    const nx = -c.tangent[1];
    const ny = c.tangent[0];
    if (style.reach) sampleLongSection(image, style.model, c.at[0], c.at[1], nx, ny, n, spacing, style.reach, section, counter);
    else sampleSection(image, style.model, c.at[0], c.at[1], nx, ny, n, spacing, section, counter);
    const near = findRuns(section, n, spacing, style.threshold, runs).filter((r) => Math.abs(r.centre) <= c.allowed);
    if (near.length === 0) continue;
    seen++;
    // Two runs within reach of the course are the lines of the bunch parting: no measure yet.
    if (near.length !== 1) continue;
    const mass = (near[0] as Run).mass;
    if (mass >= MIN_WIDTH_PX && mass < WIDTH_CHANGE * style.width) narrow.push(mass);
  }
  if (narrow.length < AHEAD_SECTIONS || narrow.length < AHEAD_SHARE * seen) return undefined;
  // The lines of a bunch part gradually: near the end the run is still two lines half merged,
  // and the line's own width shows in the farther half of the sections.
  const far = narrow.slice(Math.floor(narrow.length / 2)).sort((a, b) => a - b);
  const q1 = far[Math.floor(0.25 * (far.length - 1))] as number;
  const q3 = far[Math.ceil(0.75 * (far.length - 1))] as number;
  if (q3 > AHEAD_SPREAD * q1) return undefined;
  const measured = Math.max(1, far[Math.floor(far.length / 2)] as number);
  return { ...style, width: measured };
}

/** Least mass, pixels, of a run taken for the line ahead: thinner runs are noise or the fringe of a letter. */
const MIN_WIDTH_PX = 0.6;


/**
 * Length of the windows, in line widths and at least in pixels, over which an extension of a
 * broken line is read for solid ink: as long as `brokenLine` reads a pattern under a guide (16
 * widths, 40 px), so that a dotted line shows several dots and gaps in each window, and a grid
 * line crossing it (solid over a line width or two) fills only a few of them.
 */
const SOLID_WINDOW_WIDTHS = 16;
const SOLID_WINDOW_PX = 40;

/**
 * Share of a window's positions above the cut between the line's dots and gaps for the stretch
 * to count as solid: the gaps of a dotted or dashed line leave a quarter or more of it below,
 * while a solid stroke in a noisy scan misses a few per cent.
 */
const SOLID_SHARE = 0.9;

/**
 * Where an extension of a broken (dashed or dotted) line runs on along solid ink: the index of
 * the first point of `points` (ordered outward from the end of `followed`) from which every
 * window up to the extension's end is ink nearly all along, or undefined when `followed` shows
 * no dash pattern or the extension ends on gaps. Beyond its own end a dotted line's follower can
 * take up a grid line of the same grey and run on along it, smoothly enough that no smoothness
 * test cuts it. A blurred dotted line is often taken for solid under its guides (its gaps keep
 * some colour), so the pattern is read along the followed stretch, the cut between ink and gap
 * set from that stretch's own levels: halfway between its low peaks (the gaps, tenth
 * percentile) and its median (the dots); grid lines crossed on the way read as long dashes and
 * would lift a cut set from the highest peaks above the dots.
 */
export function solidFrom(image: RasterImage, style: LineStyle, followed: readonly Px[], points: readonly Px[], counter: ReadCounter): number | undefined {
  if (points.length < 2) return undefined;
  const length = Math.max(SOLID_WINDOW_PX, SOLID_WINDOW_WIDTHS * style.width);
  const window = Math.ceil(length / ROW_SPACING);
  const row = along(points, ROW_SPACING);
  if (row.length < window) return undefined;
  const behind = along(lastStretch(followed, 2 * length), ROW_SPACING);
  if (behind.length < 2 * window - 2) return undefined;
  const levels = peakRow(image, style.model, behind, style.width, counter).peaks;
  const sorted = [...levels].sort((a, b) => a - b);
  const gap = sorted[Math.floor(0.1 * (sorted.length - 1))] as number;
  const dot = sorted[Math.floor(0.5 * (sorted.length - 1))] as number;
  const cut = Math.max(style.threshold, (gap + dot) / 2);
  if (dashReach(levels.map((p) => p >= cut), ROW_SPACING, style.width) === undefined) return undefined;
  const { peaks } = peakRow(image, style.model, row, style.width, counter);
  // Windows a quarter apart, the last one ending at the extension's end.
  const starts: number[] = [];
  for (let start = 0; start + window < peaks.length; start += Math.ceil(window / 4)) starts.push(start);
  starts.push(peaks.length - window);
  const solid = (start: number) => peaks.slice(start, start + window).filter((p) => p >= cut).length >= SOLID_SHARE * window;
  // Only solid ink that the follower kept to until it stopped.
  let first = starts.length;
  while (first > 0 && solid(starts[first - 1] as number)) first--;
  if (first === starts.length) return undefined;
  // Back from the row's position to the extension's point nearest it.
  const at = row[starts[first] as number] as Px;
  let best = 0;
  let bestD = Infinity;
  points.forEach((p, i) => {
    const d = Math.hypot(p[0] - at[0], p[1] - at[1]);
    if (d < bestD) {
      bestD = d;
      best = i;
    }
  });
  return best;
}

/**
 * Sections of a line seen apart from the others in a row, in line widths and at least in pixels
 * of course, before it counts as out of the bunch: the lines of a bunch part gradually, and a
 * single clean section is as often a gap between two of them.
 */
const APART_WIDTHS = 6;
const APART_PX = 15;

/** Least distance, in line widths and at least in pixels, between the line and any other ink beside it for the line to stand apart. */
const APART_SEPARATION_WIDTHS = 2.5;
const APART_SEPARATION_PX = 4;

/**
 * Least share of the sections between a trace's end and where the line is taken up again that
 * must show ink on the course: a line followed through a bunch has ink all along it; one that
 * ended and has empty paper ahead has none, and is not carried on.
 */
const BUNCH_INK_SHARE = 0.7;

/**
 * Extra distance off the predicted course, per pixel along it (about 5°), within which a run of the
 * line's colour that is the only one in its section is taken for the line: over a long bunch
 * the course predicted from before it drifts from the line, and on a coloured sheet the other
 * lines of the bunch do not show in the line's colour at all.
 */
const LONE_TURN = 0.08;

/** Most extra distance, pixels and line widths (the larger), that `LONE_TURN` adds to the course's tolerance. */
const LONE_MAX_PX = 8;
const LONE_MAX_WIDTHS = 4;

/** What `throughBunch` found beyond a bunch: where the line stands apart again, and how far along the course (index). */
export interface BeyondBunch {
  at: Px;
  heading: Px;
  index: number;
}

/**
 * Where a line that ran into a bunch (lines of its colour running together with it, or crossing
 * it at a shallow angle) comes out of it, found by continuity of course: along the course
 * predicted from where the line was seen last (`course`, its tolerance growing with the
 * distance), each section across it is read for runs of the line's colour. Inside the bunch the
 * runs near the course are wider than the line (lines merged) or several close together; where
 * the lines part, the run nearest the course is of about the line's width and no other ink lies
 * within `APART_SEPARATION_WIDTHS` of it. The line counts as out of the bunch when that holds
 * for `APART_WIDTHS` in a row, the run's offset moving smoothly, and the nearest run is clearly
 * nearer the course than any other (else nothing tells which of the parting lines it is, and the
 * search ends: a stop with its doubt beats a wrong line). Undefined as well when the course
 * shows no bunch (paper ahead: the line ended), and when the lines have not parted within the
 * course. The ink model carries the colour: on a coloured sheet only lines of about the line's
 * colour show in the sections.
 */
export function throughBunch(
  image: RasterImage,
  style: LineStyle,
  course: readonly CoursePoint[],
  counter: ReadCounter,
  inkAt: (p: Px) => boolean,
  holds: (found: BeyondBunch) => boolean,
): BeyondBunch | undefined {
  if (course.length < 2) return undefined;
  const spacing = style.width < 2.5 ? 0.5 : 1;
  const runs: Run[] = [];
  const w = style.width;
  const step = Math.hypot((course[1] as CoursePoint).at[0] - (course[0] as CoursePoint).at[0], (course[1] as CoursePoint).at[1] - (course[0] as CoursePoint).at[1]) || 1;
  const need = Math.max(3, Math.ceil(Math.max(APART_PX, APART_WIDTHS * w) / step));
  const separation = Math.max(APART_SEPARATION_PX, APART_SEPARATION_WIDTHS * w);
  const lo = 0.5 * w;
  const hi = 1.5 * w;
  let inked = 0;
  let apart = 0;
  let firstApart = -1;
  let lastOffset = 0;
  let firstOffset = 0;
  let lastGood = -1;
  // Sections in a row with nothing in view that a line standing apart may pass (its own gaps).
  const quiet = Math.max(2, Math.ceil(Math.max(12, 4 * w, 2 * (style.reach ?? 0)) / step));
  let along = 0;
  // One buffer for all sections, grown when one is wider (each section is read over its own 2n + 1 samples).
  let section = new Float64Array(0);
  for (let k = 0; k < course.length; k++) {
    const c = course[k] as CoursePoint;
    if (k > 0) along += step;
    // A run alone in a wide window may lie off the predicted course by a few degrees more.
    const alone = c.allowed + Math.min(LONE_TURN * along, Math.max(LONE_MAX_PX, LONE_MAX_WIDTHS * w));
    const n = Math.ceil((alone + separation + 2 * w + 2) / spacing);
    if (section.length < 2 * n + 1) section = new Float64Array(2 * n + 1);
    const nx = -c.tangent[1];
    const ny = c.tangent[0];
    if (style.reach) sampleLongSection(image, style.model, c.at[0], c.at[1], nx, ny, n, spacing, style.reach, section, counter);
    else sampleSection(image, style.model, c.at[0], c.at[1], nx, ny, n, spacing, section, counter);
    const found = findRuns(section, n, spacing, style.threshold, runs).filter((r) => r.mass >= lo);
    if (found.some((r) => r.start - alone <= 0 && r.end + alone >= 0) || inkAt(c.at)) inked++;
    // A line lost in a bunch has the bunch's ink on its course from where it was lost; paper
    // there is the line's own end, and the course is read no farther.
    if (k + 1 === quiet && inked < BUNCH_INK_SHARE * quiet) return undefined;
    const tolerance = Math.max(1, 0.5 * w) + 0.1 * step * (k - lastGood);
    // On a line already seen apart: the run that continues it (its own gaps, a crossing grid line
    // or a faint stretch are passed over for a short while; a line beside it ends the stretch).
    if (apart > 0) {
      let next: Run | undefined;
      for (const r of found) if (Math.abs(r.centre - lastOffset) <= tolerance && (!next || Math.abs(r.centre - lastOffset) < Math.abs(next.centre - lastOffset))) next = r;
      const n2 = next;
      const beside = n2 !== undefined && found.some((r) => r !== n2 && Math.abs(r.centre - n2.centre) < separation && r.mass >= lo);
      if (beside) {
        apart = 0;
        firstApart = -1;
        continue;
      }
      if (!n2 || n2.mass > hi) {
        if (k - lastGood > quiet) {
          apart = 0;
          firstApart = -1;
        }
        continue;
      }
      lastOffset = n2.centre;
      lastGood = k;
      apart++;
    } else {
      // The run nearest the course, and the nearest other ink to it and to the course.
      let best: Run | undefined;
      for (const r of found) if (!best || Math.abs(r.centre) < Math.abs(best.centre)) best = r;
      if (!best) continue;
      const b = best;
      const others = found.filter((r) => r !== b);
      const rival = others.reduce((m, r) => Math.min(m, Math.abs(r.centre)), Infinity);
      // Off the course by more than its tolerance only when no other line is in view.
      const reach = others.every((r) => r.mass < lo) ? alone : c.allowed;
      if (Math.abs(b.centre) > reach || b.mass < lo || b.mass > hi) continue;
      if (others.some((r) => Math.abs(r.centre - b.centre) < separation)) continue;
      if (rival - Math.abs(b.centre) < Math.max(1.5 * w, 2)) continue;
      firstApart = k;
      firstOffset = b.centre;
      lastOffset = b.centre;
      lastGood = k;
      apart = 1;
    }
    if (apart >= need) {
      // A bunch passed on the way: ink on the course most of the way to where the line stands apart.
      if (firstApart < 2 || inked < BUNCH_INK_SHARE * (k + 1)) return undefined;
      const at = course[firstApart] as CoursePoint;
      const found: BeyondBunch = { at: [at.at[0] - at.tangent[1] * firstOffset, at.at[1] + at.tangent[0] * firstOffset], heading: at.tangent, index: firstApart };
      if (holds(found)) return found;
      // Not a line that runs on from there (a fragment, a letter, a line too faint to follow):
      // looked for farther along the course.
      apart = 0;
      firstApart = -1;
    }
  }
  return undefined;
}
