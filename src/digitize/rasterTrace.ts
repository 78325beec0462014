/**
 * Raster capture: from guides clicked on a line in a scan (or a rendered raster PDF), follow
 * the line by the colour found under its guides, from guide to guide, and return its
 * centre line in sheet coordinates, thinned to a pixel tolerance that keeps the shape.
 *
 * The line's colour and width are measured under every guide; the model kept is the one whose
 * colour is found at the most guides, then a dashed one, then the one where the line stands most
 * alone. A guide whose own colour differs from the kept model's sat in a bunch or on a crossing,
 * and the trace says so. Each stretch between two guides is followed forwards; if the line is lost, it is followed
 * backwards from the far guide, and whatever stays unseen is reported with where it was lost.
 * Beyond the first and last guide (and both ways from a single guide) the line is followed on to
 * its own ends: what bends off its course (a label on it, a crossing line) is left out when the
 * line resumes on its course, and a line lost there is looked for again along its course.
 * A trace given as explicit points is used as is. Pure: works on the RGBA buffer only.
 */
import { UserError } from '../model/errors.ts';
import simplify from 'simplify-js';
import { colourDistance, estimatePaper, inkModel, lumaChroma, membership, MIN_CONTRAST, windowAround, type InkModel, type Rgb } from './colour.ts';
import { chooseOffset, followLine, indexPath, stepping, type FollowLimits, type FollowResult, type LineStyle, type Pick } from './lineFollow.ts';
import { centreFirst, findRuns, inkAxis, membershipAt, sampleInkSection, sampleLongSection, sampleSection, type ReadCounter, type Run } from './lineProfile.ts';
import { sheetPoint, type SheetPoint } from './points.ts';
import { distanceToPolyline, resampleEvenly } from './polyline.ts';
import type { RasterImage } from './raster.ts';
import { withoutGrid } from './gridLines.ts';
import { alongBand } from './rasterBand.ts';
import { dashReach, restyleAhead, restyleAlong, solidFrom, throughBunch, type BeyondBunch, type CoursePoint } from './rasterEnds.ts';
import { brokenWhereUncovered, chromaticInk, onGridLine } from './rasterFaint.ts';
import { cutFollow, foreignGuides, foreignRun, type Locate, type RoomAt } from './rasterSiblings.ts';
import { guidesOffLabels, type LabelBox, type LabelGuide } from './rasterLabels.ts';

/** Guides or options the tracer cannot use. The message says what to change. */
export class TraceInputError extends UserError {
  override name = 'TraceInputError';
}

export interface RasterTraceOptions {
  /** Follow this colour instead of the one found under the first guide. */
  colour?: Rgb;
  /** Line width in pixels, instead of the one measured under the first guide. */
  widthPx?: number;
  /** Longest stretch bridged on the prediction alone, pixels (default 50 line widths, 40–400 px). */
  maxGapPx?: number;
  /** Tolerance of the thinning, pixels (default 0.3). */
  simplifyPx?: number;
  /** How far from a guide the line may lie, pixels (default 10, or 3 line widths if more). */
  searchPx?: number;
  /**
   * 'line' (the default): beyond the first and the last guide the line is followed on to its
   * own ends (where its ink stops, or the frame); 'guides': the trace runs from the first guide
   * to the last only.
   */
  extent?: 'guides' | 'line';
  /**
   * The guides of the same impeller's (or speed's) head trace, for a trace of another quantity
   * (`companionGuides`), sheet units: where the model sampled at this trace's guides is a mix of
   * lines run together, the colour of the head curve's line is tried as this line's.
   */
  companions?: readonly (readonly SheetPoint[])[];
  /** Plot frame [left, top, right, bottom] in sheet units: a whole-line trace stops at it. */
  frame?: readonly [number, number, number, number];
  /**
   * The guides of the sheet's other traces (`siblingGuides`), sheet units: a line that runs on to
   * another trace's guide where that line stands alone is that trace's line, not this one's.
   */
  siblings?: readonly (readonly SheetPoint[])[];
}

/** A stretch the tracer could not see. */
export interface LostStretch {
  /** Last point where the line was still seen, sheet coordinates. */
  at: SheetPoint;
  /** Where it was seen again from the far guide, when it was. */
  resumedAt?: SheetPoint;
  /** Which guides the stretch lies between (1-based), or the single guide. */
  between: [number, number];
  reason: string;
  /** The stretch runs through lines of the line's colour run together, and was bridged smoothly (not lost from sight). */
  bridged?: true;
}

export interface RasterTraceResult {
  /** The centre line, sheet coordinates, thinned. */
  points: SheetPoint[];
  /** Stretches not seen; empty when the line was followed from the first guide to the last. */
  lost: LostStretch[];
  /** The line that was followed, as measured. */
  line: { colour: Rgb; paper: Rgb; widthPx: number; dashed?: boolean };
  /**
   * Sentences on stretches that were followed but cannot be vouched for (beyond the guides,
   * through a bunch or up to the frame): the trace may be right, but a person should look.
   */
  doubts: TraceDoubt[];
  /** Pixels read while tracing (each bilinear sample reads four). */
  pixelsRead: number;
  /** Guides (1-based) that sat on a label printed over the line, and the two places where the line leaves it, which were followed instead. */
  offLabels?: LabelGuide[];
}

const THRESHOLD = 0.4;

/** How far beyond the frame the grid is taken out, pixels (the frame's own lines with it). */
const GRID_MARGIN_PX = 4;

type Px = [number, number];

function fmt(p: SheetPoint): string {
  return `(${p[0].toFixed(1)}, ${p[1].toFixed(1)})`;
}

function validateGuides(image: RasterImage, guides: readonly SheetPoint[]): Px[] {
  if (guides.length === 0) throw new TraceInputError('A raster trace needs at least one guide on the line; click on the line to place one.');
  return guides.map((g, i) => {
    const x = g[0] * image.scale;
    const y = g[1] * image.scale;
    if (!Number.isFinite(x) || !Number.isFinite(y)) throw new TraceInputError(`Guide ${i + 1} has a coordinate that is not a finite number; place it again on the line.`);
    if (x < 0 || y < 0 || x > image.width || y > image.height) {
      const w = image.width / image.scale;
      const h = image.height / image.scale;
      throw new TraceInputError(`Guide ${i + 1} at ${fmt(g)} lies outside the sheet (${w.toFixed(0)} × ${h.toFixed(0)}); place it on the line.`);
    }
    return [x, y];
  });
}

/** Radius around a guide within which the ink clicked on is looked for first, pixels. */
const NEAR_GUIDE_PX = 4;

/**
 * How much farther than `NEAR_GUIDE_PX` from a guide on a grid line coloured ink is looked for,
 * pixels: the click's scatter (about a line width, 2 px) where the coloured line leaves the grid line.
 */
const FAINT_SLACK_PX = 2;

/**
 * Whether the ink around a guide whose sample has a weak hue is mostly grey: of the pixels between
 * `inner` and `outer` px of the guide that the grey reading of the sample counts as ink, over half
 * keep under a third of the sample's chroma as a share of luma (grey, not of another hue). A
 * faint coloured line keeps its hue on either side of the click; a grey line clicked where it
 * crosses or runs along a coloured one takes a weak hue from that line at the click alone.
 */
function greyInkAround(image: RasterImage, grey: InkModel, sample: Rgb, guide: Px, inner: number, outer: number): boolean {
  const hue = lumaChroma(grey.paper, ...sample);
  const share = hue.chroma / hue.luma;
  const [x0, y0, x1, y1] = windowAround(image, guide[0], guide[1], outer);
  const { data, width } = image;
  let ink = 0;
  let plain = 0;
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const d = Math.hypot(x + 0.5 - guide[0], y + 0.5 - guide[1]);
      if (d < inner || d > outer) continue;
      const i = (y * width + x) * 4;
      const r = data[i] as number;
      const g = data[i + 1] as number;
      const b = data[i + 2] as number;
      if (membership(grey, r, g, b) < 0.5) continue;
      ink++;
      const c = lumaChroma(grey.paper, r, g, b);
      if (c.chroma < (share / 3) * c.luma) plain++;
    }
  }
  return ink > 0 && plain > 0.5 * ink;
}

/** Measures the line under a guide: paper and ink colour, line width, centre and direction. */
function acquire(image: RasterImage, guide: Px, search: number, options: RasterTraceOptions, ownBand = false): { style: LineStyle; centre: Px; axis: Px; isotropy: number } | undefined {
  const paper = estimatePaper(image, guide[0], guide[1], Math.max(2 * search, 16));
  let colour: Rgb;
  if (options.colour) {
    colour = options.colour;
  } else {
    const [x0, y0, x1, y1] = windowAround(image, guide[0], guide[1], search);
    const { data, width } = image;
    let strongest = 0;
    for (let y = y0; y < y1; y++) {
      for (let x = x0; x < x1; x++) {
        const i = (y * width + x) * 4;
        strongest = Math.max(strongest, colourDistance(paper, data[i] as number, data[i + 1] as number, data[i + 2] as number));
      }
    }
    if (strongest < MIN_CONTRAST) return undefined;
    // A faint line clicked beside a darker grid line or curve: the contrast that counts is the
    // strongest close to the guide (where it was clicked), when there is ink there at all.
    const [nx0, ny0, nx1, ny1] = windowAround(image, guide[0], guide[1], NEAR_GUIDE_PX);
    let near = 0;
    for (let y = ny0; y < ny1; y++) {
      for (let x = nx0; x < nx1; x++) {
        const i = (y * width + x) * 4;
        near = Math.max(near, colourDistance(paper, data[i] as number, data[i + 1] as number, data[i + 2] as number));
      }
    }
    if (near >= MIN_CONTRAST) strongest = near;
    // The ink pixel nearest the guide among those with at least half the strongest contrast.
    let best = -1;
    let bestD = Infinity;
    for (let y = y0; y < y1; y++) {
      for (let x = x0; x < x1; x++) {
        const i = (y * width + x) * 4;
        if (colourDistance(paper, data[i] as number, data[i + 1] as number, data[i + 2] as number) < 0.5 * strongest) continue;
        const d = Math.hypot(x + 0.5 - guide[0], y + 0.5 - guide[1]);
        if (d < bestD) {
          bestD = d;
          best = y * width + x;
        }
      }
    }
    // Its colour: the mean of the most contrasted pixels within 2 px (the line's core).
    const bx = best % width;
    const by = Math.floor(best / width);
    const core: Array<[number, number, number, number]> = [];
    for (let y = Math.max(0, by - 2); y <= Math.min(image.height - 1, by + 2); y++) {
      for (let x = Math.max(0, bx - 2); x <= Math.min(width - 1, bx + 2); x++) {
        const i = (y * width + x) * 4;
        const r = data[i] as number;
        const g = data[i + 1] as number;
        const b = data[i + 2] as number;
        core.push([colourDistance(paper, r, g, b), r, g, b]);
      }
    }
    const top = Math.max(...core.map((c) => c[0]));
    const chosen = core.filter((c) => c[0] >= 0.8 * top);
    colour = [0, 1, 2].map((k) => chosen.reduce((s, c) => s + (c[k + 1] as number), 0) / chosen.length) as unknown as Rgb;
  }
  let model = inkModel(colour, paper);
  // Whether the guide sat on a grid line and the model was taken from the coloured ink beside it.
  let onGrid = false;
  // The sample read as grey unless its hue is strong: a grey grid line mixed with a little of a
  // faint line's hue keeps a weak hue, and is told by the grey ink it holds.
  const grey = inkModel(colour, paper, false);
  if (!options.colour && grey.mode !== 'chromatic') {
    // A grey sample on a grid line, with coloured ink beside the click: the guide sat where a
    // fainter coloured line crosses or runs along the grid, and the line is the coloured one.
    const at = nearestInk(image, grey, guide, search);
    const grid = at !== undefined && onGridLine(image, grey, at);
    const tinted = grid ? chromaticInk(image, paper, colour, guide, NEAR_GUIDE_PX + FAINT_SLACK_PX) : undefined;
    const faint = tinted && inkModel(tinted, paper);
    if (faint && nearestInk(image, faint, guide, NEAR_GUIDE_PX + FAINT_SLACK_PX)) {
      model = faint;
      onGrid = true;
    }
  }
  // A weak hue is held only for a dashed or dotted line: a dot or a short dash blurs into the paper
  // and keeps little of its colour, while a solid line sampled with a weak hue is most often of a
  // dull colour (brown, olive), which its grey reading follows as well. And it is a faint line's own
  // only where the ink on either side of the click keeps colour; where that ink is mostly grey, the
  // click is on a grey line that took the hue from a coloured line it crosses or runs along there.
  // Either way the sample is read as grey, as a weak hue always was.
  if (!options.colour && !onGrid && model.mode === 'chromatic' && grey.mode !== 'chromatic') {
    const at = nearestInk(image, model, guide, search);
    const stroke = at && measureAt(image, model, at, options.widthPx ?? 3);
    if (!stroke || !brokenLine(image, model, stroke.centre, stroke.width) || greyInkAround(image, grey, colour, guide, NEAR_GUIDE_PX, search)) model = grey;
  }
  const centre = nearestInk(image, model, guide, search);
  if (!centre) return undefined;
  const measured = measureAt(image, model, centre, options.widthPx ?? 3);
  if (!measured) return undefined;
  const massRange: [number, number] = model.mode === 'achromatic' ? [0.8, 1.35] : [0.55, 1.5];
  // A solid line that loses its colour where stronger ink crosses it (a faint line over a dense
  // grid) is not a dash pattern: its "gaps" are covered by that ink, where a real gap shows paper.
  // Held only to a line whose guide sat on a grid line: held to every line, it took dashed and
  // dotted lines for solid (their gaps, blurred on photos, do not read as paper). On the random
  // bed (seeds 1–200) holding it to these lines alone makes 14 curves right that were wrong and
  // 10 wrong that were right, all flagged (31.2 → 31.0 % of curves wrong).
  const pattern = brokenLine(image, model, measured.centre, measured.width, ownBand ? measured.axis : undefined);
  const broken = pattern && (!onGrid || brokenWhereUncovered(image, model, measured.centre, measured.width, pattern.axis, THRESHOLD) !== undefined) ? pattern : undefined;
  if (broken) {
    // A dash or a dot alone says little about the line's direction or width: both are measured
    // again across the whole pattern, with sections that look along the line over its gaps.
    const again = measureAt(image, model, measured.centre, measured.width, broken);
    if (again) {
      const width = options.widthPx ?? again.width;
      // Judged alone by the ink near the guide, as a solid line is, so that a guide where a
      // crossing or a poor colour sample mimics a pattern does not outrank a clean one.
      return { style: { model, width, threshold: THRESHOLD, massRange, reach: broken.reach }, centre: again.centre, axis: again.axis, isotropy: measured.isotropy };
    }
  }
  const width = options.widthPx ?? measured.width;
  return { style: { model, width, threshold: THRESHOLD, massRange }, centre: measured.centre, axis: measured.axis, isotropy: measured.isotropy };
}

/** Largest isotropy of the ink around a guide that a dash pattern is looked for in. */
const BROKEN_ISOTROPY = 0.3;

/** Pixels beyond a line's width, either side, of the band its own ink is looked for in. */
const BAND_SLACK_PX = 2;

/**
 * Whether the line through `centre` is dashed or dotted, and if so the reach along the line
 * that spans its gaps (half the longest gap plus a pixel). The line's direction comes from
 * the ink's principal axis over a few dash periods; along it, each position counts as ink when
 * any sample across the line's width is line-coloured. Two or more gaps between ink, none
 * longer than a few line widths, make a broken line; a single gap is a label or a crossing.
 * With `ownBand` (the line's direction at the guide), a window too isotropic is looked at again
 * in the line's own band alone, and a line whose ink never drops to paper for its beads.
 */
function brokenLine(image: RasterImage, model: InkModel, centre: Px, width: number, ownBand?: Px): { reach: number; axis: Px; isotropy: number } | undefined {
  const radius = Math.max(14, 6 * width);
  const wide = inkAxis(image, model, centre[0], centre[1], radius, THRESHOLD);
  // Lines drawn parallel a few widths away (a family of dashed curves) spread the ink across the
  // window and make it look isotropic: the line's own band (along its direction measured close
  // to the guide) is looked at again alone.
  const axis = ownBand && (!wide || wide.isotropy > BROKEN_ISOTROPY) ? inkAxis(image, model, centre[0], centre[1], radius, THRESHOLD, { dir: ownBand, half: width + BAND_SLACK_PX }) : wide;
  if (!axis || axis.isotropy > BROKEN_ISOTROPY) return undefined;
  const length = Math.max(40, 16 * width);
  const spacing = 0.5;
  const across = Math.max(1.5, 0.5 * width + 1);
  const on: boolean[] = [];
  const offsets = centreFirst(across);
  for (let t = -length; t <= length; t += spacing) {
    // Whether any sample across is line-coloured: looked at from the middle out, stopping at the first.
    let ink = false;
    for (const s of offsets) {
      if (membershipAt(image, model, centre[0] + axis.dx * t - axis.dy * s, centre[1] + axis.dy * t + axis.dx * s) >= THRESHOLD) {
        ink = true;
        break;
      }
    }
    on.push(ink);
  }
  const reach = dashReach(on, spacing, width) ?? (ownBand ? beadReach(image, model, centre, [axis.dx, axis.dy], length, spacing, across, width) : undefined);
  if (reach === undefined) return undefined;
  return { reach, axis: [axis.dx, axis.dy], isotropy: axis.isotropy };
}

/** Least spread between the strongest and the weakest tenth of a line's ink along it that makes it beaded. */
const BEAD_DEPTH = 0.3;

/**
 * The reach of a dotted line whose dots the scan blurred together: along the line its ink never
 * drops to paper, but it swells at each dot and thins between them, regularly. Each position
 * along the line counts as a dot where the strongest membership across it is above the middle
 * of the weakest and the strongest tenth, and the dots' pattern is read as a dash pattern's.
 */
function beadReach(image: RasterImage, model: InkModel, centre: Px, axis: Px, length: number, spacing: number, across: number, width: number): number | undefined {
  const peaks: number[] = [];
  const offsets = centreFirst(across);
  for (let t = -length; t <= length; t += spacing) {
    let peak = 0;
    for (const s of offsets) peak = Math.max(peak, membershipAt(image, model, centre[0] + axis[0] * t - axis[1] * s, centre[1] + axis[1] * t + axis[0] * s));
    peaks.push(peak);
  }
  const sorted = [...peaks].sort((a, b) => a - b);
  const low = sorted[Math.floor(0.1 * (sorted.length - 1))] as number;
  const high = sorted[Math.floor(0.9 * (sorted.length - 1))] as number;
  if (high - low < BEAD_DEPTH) return undefined;
  const middle = 0.5 * (low + high);
  return dashReach(peaks.map((v) => v >= middle), spacing, width);
}

/** The nearest pixel centre to `p` whose membership is at least one half, within `radius`. */
function nearestInk(image: RasterImage, model: InkModel, p: Px, radius: number): Px | undefined {
  const [x0, y0, x1, y1] = windowAround(image, p[0], p[1], radius);
  const { data, width } = image;
  let best: Px | undefined;
  let bestD = radius;
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const i = (y * width + x) * 4;
      const dx = x + 0.5 - p[0];
      const dy = y + 0.5 - p[1];
      // Clearly farther than the best (squared, with a margin far above rounding): no root taken.
      if (dx * dx + dy * dy > bestD * bestD * (1 + 1e-9)) continue;
      const d = Math.hypot(dx, dy);
      if (d >= bestD) continue;
      if (membership(model, data[i] as number, data[i + 1] as number, data[i + 2] as number) < 0.5) continue;
      bestD = d;
      best = [x + 0.5, y + 0.5];
    }
  }
  return best;
}

/** Direction, sub-pixel centre and width of the line through an ink pixel. */
function measureAt(image: RasterImage, model: InkModel, ink: Px, widthGuess: number, broken?: { reach: number; axis?: Px }): { centre: Px; axis: Px; width: number; isotropy: number } | undefined {
  const axis = broken?.axis
    ? { dx: broken.axis[0], dy: broken.axis[1], isotropy: 0 }
    : inkAxis(image, model, ink[0], ink[1], broken ? Math.max(14, 6 * widthGuess) : Math.max(2.5 * widthGuess, 5), THRESHOLD);
  if (!axis) return undefined;
  const nx = -axis.dy;
  const ny = axis.dx;
  const spacing = 0.5;
  const n = Math.ceil(Math.max(3 * widthGuess, 8) / spacing);
  const section = new Float64Array(2 * n + 1);
  if (broken) sampleLongSection(image, model, ink[0], ink[1], nx, ny, n, spacing, broken.reach, section);
  else sampleSection(image, model, ink[0], ink[1], nx, ny, n, spacing, section);
  const runs = findRuns(section, n, spacing, THRESHOLD);
  let best = runs[0];
  for (const r of runs) if (best && Math.abs(r.centre) < Math.abs(best.centre)) best = r;
  if (!best) return undefined;
  return { centre: [ink[0] + nx * best.centre, ink[1] + ny * best.centre], axis: [axis.dx, axis.dy], width: Math.max(1, best.mass), isotropy: axis.isotropy };
}

/** Puts a guide onto the centre of the followed line near it. */
function snap(image: RasterImage, style: LineStyle, guide: Px, search: number): { centre: Px; axis: Px } | undefined {
  const ink = nearestInk(image, style.model, guide, search);
  if (!ink) return undefined;
  const m = measureAt(image, style.model, ink, style.width, style.reach ? { reach: style.reach } : undefined);
  return m && { centre: m.centre, axis: m.axis };
}

/**
 * Heading along `axis` from `from` that leads towards `towards`. When the axis is nearly
 * square to the way to go (a U-shaped line between its tips), both headings are tried for
 * a short way and the one that keeps to the line and ends nearer `towards` wins.
 */
function headingTowards(image: RasterImage, style: LineStyle, from: Px, axis: Px, towards: Px, counter: ReadCounter): Px {
  const wx = towards[0] - from[0];
  const wy = towards[1] - from[1];
  const dist = Math.hypot(wx, wy) || 1;
  const cos = (axis[0] * wx + axis[1] * wy) / dist;
  const forward: Px = cos >= 0 ? [axis[0], axis[1]] : [-axis[0], -axis[1]];
  if (Math.abs(cos) >= 0.35) return forward;
  const probe = (h: Px) => {
    const r = followLine(image, style, from, h, undefined, { maxGap: 4 * style.width, maxTravel: 20 * stepping(style.width).step }, counter);
    const n = r.points.length;
    const end: Px = [r.points[n - 2] as number, r.points[n - 1] as number];
    return { alive: r.points.length >= 10, d: Math.hypot(towards[0] - end[0], towards[1] - end[1]) };
  };
  const a = probe(forward);
  const backward: Px = [-forward[0], -forward[1]];
  const b = probe(backward);
  if (a.alive !== b.alive) return a.alive ? forward : backward;
  return b.d < a.d ? backward : forward;
}

/**
 * Removes points that stand off the line their neighbours describe: for each point, a
 * parabola is fitted by least squares, in the frame of the local chord, through the other
 * points within `window` pixels along the path, and the point goes when it lies more than
 * `limit` pixels off it. What this catches is a lone centre picked from the wrong line of a
 * merge; a real bend of a plotted curve is smooth over many points and stays.
 */
export function dropOutliers(path: readonly Px[], window: number, limit: number): Px[] {
  if (path.length < 7) return [...path];
  const along = [0];
  for (let i = 1; i < path.length; i++) {
    const a = path[i - 1] as Px;
    const b = path[i] as Px;
    along.push((along[i - 1] as number) + Math.hypot(b[0] - a[0], b[1] - a[1]));
  }
  const keep: Px[] = [];
  let lo = 0;
  let hi = 0;
  for (let i = 0; i < path.length; i++) {
    const here = along[i] as number;
    while ((along[lo] as number) < here - window) lo++;
    while (hi + 1 < path.length && (along[hi + 1] as number) <= here + window) hi++;
    const p = path[i] as Px;
    const first = path[lo] as Px;
    const last = path[hi] as Px;
    const chord = Math.hypot(last[0] - first[0], last[1] - first[1]);
    if (hi - lo < 6 || chord < window / 2) {
      keep.push(p);
      continue;
    }
    const ux = (last[0] - first[0]) / chord;
    const uy = (last[1] - first[1]) / chord;
    // Normal equations of y = a + b·t + c·t² over the neighbours (t scaled by the window).
    const m: [number, number, number, number, number, number, number, number] = [0, 0, 0, 0, 0, 0, 0, 0];
    for (let k = lo; k <= hi; k++) {
      if (k === i) continue;
      const q = path[k] as Px;
      const dx = q[0] - p[0];
      const dy = q[1] - p[1];
      const t = (dx * ux + dy * uy) / window;
      const y = -dx * uy + dy * ux;
      m[0]++;
      m[1] += t;
      m[2] += t * t;
      m[3] += t * t * t;
      m[4] += t * t * t * t;
      m[5] += y;
      m[6] += t * y;
      m[7] += t * t * y;
    }
    const [n, s1, s2, s3, s4, y0, y1, y2] = m;
    const det = n * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
    if (Math.abs(det) < 1e-12) {
      keep.push(p);
      continue;
    }
    // The fitted offset at the point itself (t = 0) is the constant term.
    const a = (y0 * (s2 * s4 - s3 * s3) - s1 * (y1 * s4 - s3 * y2) + s2 * (y1 * s3 - s2 * y2)) / det;
    if (Math.abs(a) <= limit) keep.push(p);
  }
  return keep;
}

/**
 * Removes short islands of points between two gaps that stand off the smooth join of the
 * longer stretches on either side. Inside a bundle of curves the follower may see a few
 * steps of a neighbouring line before the bundle closes again; those steps sit a line's
 * width or more off the join, while a true piece of the line lies on it.
 */
export function dropIslands(path: readonly Px[], step: number, width: number): Px[] {
  const gap = 2.5 * step;
  let gaps = 0;
  for (let i = 1; i < path.length && gaps < 2; i++) {
    const a = path[i - 1] as Px;
    const b = path[i] as Px;
    if (Math.hypot(b[0] - a[0], b[1] - a[1]) > gap) gaps++;
  }
  if (gaps < 2) return [...path]; // an island needs a gap on each side
  const stretches: Px[][] = [];
  for (const p of path) {
    const current = stretches[stretches.length - 1];
    const last = current?.[current.length - 1];
    if (!current || !last || Math.hypot(p[0] - last[0], p[1] - last[1]) > gap) stretches.push([p]);
    else current.push(p);
  }
  const length = (s: Px[]) => s.reduce((sum, p, i) => (i === 0 ? 0 : sum + Math.hypot(p[0] - (s[i - 1] as Px)[0], p[1] - (s[i - 1] as Px)[1])), 0);
  const limit = Math.max(1.5, 0.5 * width);
  const kept: Px[][] = [];
  for (let i = 0; i < stretches.length; i++) {
    const island = stretches[i] as Px[];
    const before = kept[kept.length - 1];
    const after = stretches[i + 1];
    const short = length(island) < 10 * width;
    if (short && before && after && before.length >= 7 && after.length >= 7 && length(before) > length(island) && length(after) > length(island)) {
      const p0 = before[before.length - 1] as Px;
      const p1 = after[0] as Px;
      const join = [p0, ...bridge(p0, tangentAt(before, before.length - 1, 1), p1, tangentAt([...after].reverse(), after.length - 1, -1), Math.max(0.5, step / 2)), p1];
      const off = Math.max(...island.map((p) => Math.min(...join.map((q) => Math.hypot(p[0] - q[0], p[1] - q[1])))));
      if (off > limit) continue;
    }
    kept.push(island);
  }
  return kept.flat();
}

/**
 * Joins the stretches of a path across its gaps (where the line was hidden by a label, or ran
 * inside a bundle) with a smooth curve that leaves and enters them along their directions, so
 * that a reading across a gap follows the line's bend rather than its chord.
 */
export function fillGaps(path: readonly Px[], step: number): Px[] {
  const out: Px[] = [];
  for (let i = 0; i < path.length; i++) {
    const p = path[i] as Px;
    const prev = out[out.length - 1];
    if (prev && i + 1 < path.length && out.length >= 3 && Math.hypot(p[0] - prev[0], p[1] - prev[1]) > 2.5 * step) {
      const next = path.slice(i, i + 7);
      if (next.length >= 3) out.push(...bridge(prev, tangentAt(out, out.length - 1, 1), p, tangentAt([...next].reverse(), next.length - 1, -1), step));
    }
    out.push(p);
  }
  return out;
}

/**
 * Unit direction of travel at point k of a path (sign 1 forwards, −1 backwards): the chord
 * over about 40 pixels of path before k. Near a bundle the last points lean towards the
 * neighbouring lines; a long chord averages that out, and a join between two such chords
 * stays closer to the line than one built on the local bend.
 */
function tangentAt(path: readonly Px[], k: number, sign: 1 | -1): Px {
  let j = k;
  let length = 0;
  while (j > 0 && length < 40) {
    const a = path[j - 1] as Px;
    const b = path[j] as Px;
    length += Math.hypot(b[0] - a[0], b[1] - a[1]);
    j--;
  }
  const a = path[j] as Px;
  const e = path[k] as Px;
  const chord = Math.hypot(e[0] - a[0], e[1] - a[1]) || 1;
  return [(sign * (e[0] - a[0])) / chord, (sign * (e[1] - a[1])) / chord];
}

/** Points of a cubic Hermite curve from p0 (direction d0) to p1 (direction d1), about `step` apart, ends excluded. */
function bridge(p0: Px, d0: Px, p1: Px, d1: Px, step: number): Px[] {
  const span = Math.hypot(p1[0] - p0[0], p1[1] - p0[1]);
  const n = Math.max(1, Math.ceil(span / step));
  const out: Px[] = [];
  for (let i = 1; i < n; i++) {
    const t = i / n;
    const h00 = 2 * t ** 3 - 3 * t ** 2 + 1;
    const h10 = t ** 3 - 2 * t ** 2 + t;
    const h01 = -2 * t ** 3 + 3 * t ** 2;
    const h11 = t ** 3 - t ** 2;
    out.push([h00 * p0[0] + h10 * span * d0[0] + h01 * p1[0] + h11 * span * d1[0], h00 * p0[1] + h10 * span * d0[1] + h01 * p1[1] + h11 * span * d1[1]]);
  }
  return out;
}

function pairs(flat: number[]): Px[] {
  const out: Px[] = [];
  for (let i = 0; i < flat.length; i += 2) out.push([flat[i] as number, flat[i + 1] as number]);
  return out;
}

/**
 * Whether `grey` is a washed-out sample of the line that `coloured` sampled in its own hue: read
 * as grey (its hue too weak to hold), while its colour lies on the coloured model's line, and no
 * wider. A thin stretch of a coloured line loses much of its hue in a JPEG (the colour is kept at
 * half the resolution), and a grey model of it follows the grid and every black line it meets;
 * a wider grey sample is lines of several colours run together (fresh random bed seed 1205: a
 * dashed blue NPSHr line's bunched low-flow guide, 4.5 px against 3.2 px where it stands alone),
 * and the doubt its sample raises must stand.
 */
function washedOut(grey: { style: LineStyle }, coloured: { style: LineStyle }): boolean {
  return grey.style.model.mode === 'achromatic' && coloured.style.model.mode === 'chromatic' && grey.style.width <= coloured.style.width && membership(coloured.style.model, ...grey.style.model.line) >= WASHED_MEMBERSHIP;
}

/** Membership in a coloured model above which a grey sample is taken for a washed-out sample of that colour. */
const WASHED_MEMBERSHIP = 0.5;

/** Follows a line through a raster from guide to guide (see the file comment). */
export function traceRaster(original: RasterImage, guides: readonly SheetPoint[], options: RasterTraceOptions = {}): RasterTraceResult {
  const f = options.frame;
  // The printed grid is taken out of the frame first (gridLines.ts): a thin curve is then not
  // taken for a grid line where it runs along or across one. Without a frame the grid stays.
  const image = f ? withoutGrid(original, [f[0] * original.scale - GRID_MARGIN_PX, f[1] * original.scale - GRID_MARGIN_PX, f[2] * original.scale + GRID_MARGIN_PX, f[3] * original.scale + GRID_MARGIN_PX]) : original;
  // A guide on a label printed over the line stands for the two places where the line leaves the label.
  const { guides: taken, numbers, offLabels, boxes } = guidesOffLabels(image, guides);
  const labelled = offLabels.length > 0 ? { offLabels } : {};
  const first = { ...traceWithCompanions(image, taken, options, false, numbers, boxes), ...labelled };
  const span = polylineLength(first.points) * image.scale;
  const bare = first.points.length <= NOTHING_FOLLOWED;
  const short = bare || span < Math.max(LITTLE_FOLLOWED_PX, LITTLE_FOLLOWED_WIDTHS * first.line.widthPx);
  const broken = lostFromSight(first) > 0;
  if (first.line.dashed || (!short && !broken)) return first;
  // Next to nothing followed from the guides (no point but the guides', or a short stretch), or
  // the line lost from sight between them, with a solid model: a dashed or dotted line between
  // others drawn parallel to it a few widths away was taken for solid (their ink made the window
  // around the guide look isotropic, and no dash pattern was looked for), or a dotted line whose
  // dots the scan blurred together (no gap shows paper), and a solid model loses it at its first
  // gap or thinning. Its pattern is looked for again in the line's own band, and the second
  // trace is kept when it is dashed and follows clearly farther, or loses the line fewer times
  // without bridging a bunch instead, and its model is not far wider (random bed seed 103: a
  // dashed black power line between two others 13 px away, clicked once, came back empty;
  // seeds 1-200: 20 curves right that were wrong or missing and 1 wrong that was right with
  // hurried guides, 3 and 1 with careful ones; fresh seeds 841-1040, hurried: 13 and 1, the
  // broken ones flagged).
  const again = { ...traceWithCompanions(image, taken, options, true, numbers, boxes), ...labelled };
  const farther = bare ? again.points.length > first.points.length : polylineLength(again.points) * image.scale > FARTHER * span;
  const kept = again.line.dashed && (short ? farther && again.line.widthPx <= Math.max(RETRY_WIDTH * first.line.widthPx, RETRY_WIDTH_PX) : lostFromSight(again) < lostFromSight(first) && again.lost.length < first.lost.length && again.line.widthPx <= RETRY_WIDTH * first.line.widthPx);
  if (!kept) return { ...first, pixelsRead: first.pixelsRead + again.pixelsRead };
  // A guide where other lines touch the line is in a bunch whatever model follows it: what the
  // first look said of it stands (fresh random bed seed 1205: a dashed NPSHr line's second trace
  // kept to a neighbour near its bunched guide, 1.4 % of span off, and had dropped the doubt).
  const held = first.doubts.filter((d) => d.code === 'takeoff.guide-in-bunch' && !again.doubts.some((a) => a.message === d.message));
  return { ...again, doubts: [...again.doubts, ...held], pixelsRead: first.pixelsRead + again.pixelsRead };
}

/** Most points a trace can hold and still have followed nothing from its guides (its guides joined straight). */
const NOTHING_FOLLOWED = 2;

/** A solid trace shorter than this (px, or line widths when more) followed next to nothing from its guides. */
const LITTLE_FOLLOWED_PX = 100;
const LITTLE_FOLLOWED_WIDTHS = 30;

/**
 * How much wider than the first model the second may be (a share of the first's width, or pixels
 * when more: a first model sampled on a sliver of a faint line measures far too thin): a guide
 * where the line crosses a thick curve measures the crossing's blob, and the band may show a
 * "pattern" of the other lines' ink (random bed seed 167, an iso-line clicked on a head curve:
 * 9.9 px, followed onto other lines 300 px away).
 */
const RETRY_WIDTH = 1.5;
/** Held only where next to nothing was followed; where the line was lost between guides the share alone holds. */
const RETRY_WIDTH_PX = 6;

/** How much longer a second trace, with the pattern found in the line's own band, must be to be kept. */
const FARTHER = 1.5;

/** Whether the segment from a to b passes through a box (looked at every pixel or so along it). */
function meetsBox(a: Px, b: Px, box: LabelBox): boolean {
  const n = Math.max(1, Math.ceil(Math.hypot(b[0] - a[0], b[1] - a[1])));
  for (let k = 0; k <= n; k++) {
    const x = a[0] + ((b[0] - a[0]) * k) / n;
    const y = a[1] + ((b[1] - a[1]) * k) / n;
    if (x >= box.x0 && x <= box.x1 && y >= box.y0 && y <= box.y1) return true;
  }
  return false;
}

/** Length of a polyline in sheet units. */
function polylineLength(points: readonly SheetPoint[]): number {
  let length = 0;
  for (let i = 1; i < points.length; i++) length += Math.hypot((points[i] as SheetPoint)[0] - (points[i - 1] as SheetPoint)[0], (points[i] as SheetPoint)[1] - (points[i - 1] as SheetPoint)[1]);
  return length;
}

/**
 * `traceOn`, and where it took its model from a companion's colour, `traceOn` again without
 * companions: the companion's trace is kept only where it loses the line, or leaves a stretch
 * between guides unseen, no more often in all, and runs at least `COMPANION_LENGTH` as far (a
 * companion's colour measured thin at a lone guide in a bunch, or a dashed bunch's model that
 * followed the line better than a clean stroke of the head curve's colour: random bed, hurried
 * guides, photos 38 and 146).
 */
function traceWithCompanions(image: RasterImage, guides: readonly SheetPoint[], options: RasterTraceOptions, ownBand: boolean, numbers?: readonly number[], labels: readonly LabelBox[] = []): RasterTraceResult {
  const note: CompanionNote = {};
  const asSampled = traceOn(image, guides, options, ownBand, numbers, labels, note);
  if (!note.byCompanion) return asSampled;
  const { companions: _, ...alone } = options;
  const plain = traceOn(image, guides, alone, ownBand, numbers, labels);
  // Times a trace lost its line: stretches lost from sight, and stretches unseen between guides.
  const losses = (r: RasterTraceResult) => lostFromSight(r) + r.doubts.filter((d) => d.code === 'takeoff.stretch-unseen').length;
  // The companion's colour sampled thin in a bunch (its line half hidden under the others) also
  // tries the width of the head curve's line where it stands alone, and the one that loses the
  // line less often, then runs farther, is the companion's trace.
  const widened = note.canWiden ? traceOn(image, guides, options, ownBand, numbers, labels, { widened: true }) : undefined;
  const got = widened && (losses(widened) < losses(asSampled) || (losses(widened) === losses(asSampled) && polylineLength(widened.points) > polylineLength(asSampled.points))) ? widened : asSampled;
  const pixelsRead = asSampled.pixelsRead + plain.pixelsRead + (widened?.pixelsRead ?? 0);
  // A trace by the companion's colour that saw next to nothing of the line (its guides joined by a
  // bridge across the bunch) is no better, however long its path.
  const sawLittle = seenLength(got) * image.scale < Math.max(LITTLE_FOLLOWED_PX, LITTLE_FOLLOWED_WIDTHS * got.line.widthPx);
  // A model of another hue alone, as wide as the head curve's line, may be a clean sample of the
  // line's own colour as the scan printed it: the head curve's colour then has to see as much of
  // the line, not only run as far with bridges across bunches.
  const length = (r: RasterTraceResult) => (note.byHueAlone ? seenLength(r) : polylineLength(r.points));
  const better = !sawLittle && losses(got) <= losses(plain) && length(got) >= (note.grey ? COMPANION_LENGTH_GREY : COMPANION_LENGTH) * length(plain);
  // The head curve's colour is hidden where the guides sit (every guide in the bunch the curves
  // rise from), and the guides' own model is a mix of the lines there, of no clear hue, where the
  // head curve's line has one: the line of that colour is looked for where it leaves the bunch,
  // along the path the mix followed out of it. Not where the head curve's line is of a pale tint
  // only, under `LEAVING_CHROMA` (it tells no line from the others: random bed scan 1192), nor
  // where the guides' model has a hue of its own, only as a broad blob (it may be the line's own
  // colour, run together: random bed photo 38).
  if (sawLittle && !better && note.grey && lumaChroma(got.line.paper, ...got.line.colour).chroma >= LEAVING_CHROMA) {
    const left = leavingBunch(image, guides, plain, got, alone, ownBand, numbers, labels);
    if (left) return { ...left, pixelsRead: pixelsRead + left.pixelsRead };
  }
  return { ...(better ? got : plain), pixelsRead };
}

/** Least chroma (0–255 a channel, against the paper) of the head curve's line for its colour to be looked for beyond a bunch: a pale tint tells no line from the others. */
const LEAVING_CHROMA = 20;
/** Places tried along the first `LEAVING_SHARE` of the mix's path for the head curve's colour leaving the bunch. */
const LEAVING_TRIES = 40;
const LEAVING_SHARE = 0.6;
/**
 * Least length the line so found must see, as a share of the mix's path: the curves of one family
 * differ in length (a slower speed's or smaller impeller's is shorter), but a stub is no line.
 */
const LEAVING_LENGTH = 0.5;
/** How far from each such place the line of the head curve's colour is looked for, pixels or line widths: the lines fan out from the bunch. */
const LEAVING_SEARCH_PX = 25;
const LEAVING_SEARCH_WIDTHS = 8;

/**
 * The line of the head curve's colour (`byColour`: its trace from the guides, which saw next to
 * nothing) found where it leaves the bunch: tried from places spread along the first
 * `LEAVING_SHARE` of the path the guides' mixed model followed (`mixed`), the first trace by that
 * colour that sees enough of its line (and `LEAVING_LENGTH` of the mix's path) and passes every
 * guide within twice the guide-miss distance (the line rises from where the guides sit; a line of
 * that colour elsewhere, the head curve itself, does not). Undefined when none does: the mix's
 * trace then stands, with its doubts.
 */
function leavingBunch(image: RasterImage, guides: readonly SheetPoint[], mixed: RasterTraceResult, byColour: RasterTraceResult, options: RasterTraceOptions, ownBand: boolean, numbers?: readonly number[], labels: readonly LabelBox[] = []): RasterTraceResult | undefined {
  const width = byColour.line.widthPx;
  if (!(width > 0) || mixed.points.length < 2) return undefined;
  const path = resampleEvenly(mixed.points, LEAVING_TRIES + 1);
  const places = path.slice(1, Math.max(2, Math.round(LEAVING_SHARE * LEAVING_TRIES) + 1));
  const miss = (2 * Math.max(GUIDE_MISS_PX, GUIDE_MISS_WIDTHS * width)) / image.scale;
  let read = 0;
  for (const place of places) {
    const r = traceOn(image, [place], { ...options, colour: byColour.line.colour, searchPx: Math.max(LEAVING_SEARCH_PX, LEAVING_SEARCH_WIDTHS * width) }, ownBand, numbers, labels);
    read += r.pixelsRead;
    if (r.points.length < 2 || seenLength(r) * image.scale < Math.max(LITTLE_FOLLOWED_PX, LITTLE_FOLLOWED_WIDTHS * width) || seenLength(r) < LEAVING_LENGTH * polylineLength(mixed.points)) continue;
    if (!guides.every((g) => distanceToPolyline(r.points, g) <= miss)) continue;
    // The place tried is no guide of the user's: its own guide doubts are dropped. The guides sit
    // in the bunch whatever line is kept: the mix's doubts of them stand, or one is said.
    const ends = r.doubts.filter((d) => d.code !== 'takeoff.guide-in-bunch' && d.code !== 'takeoff.guide-missed' && d.code !== 'takeoff.stretch-unseen');
    const held = mixed.doubts.filter((d) => d.code === 'takeoff.guide-in-bunch');
    const first = guides[0] as SheetPoint;
    const said: TraceDoubt[] = held.length > 0 ? held : [{ code: 'takeoff.guide-in-bunch', message: `no guide sits where the line stands alone (the first near (${first[0].toFixed(1)}, ${first[1].toFixed(1)})): the line was taken where it leaves the bunch, by its head curve's colour; check the trace, or add a guide where the line stands alone` }];
    return { ...r, doubts: [...ends, ...said], pixelsRead: read };
  }
  return undefined;
}

/** What `traceOn` says of a model taken from a companion's colour, and asks of it. */
interface CompanionNote {
  /** The model came from a companion's colour. */
  byCompanion?: boolean;
  /** The guides' own model had no clear hue where the companion's line has one. */
  grey?: boolean;
  /** The guides' own model was as wide as the companion's line and had a hue, only another one. */
  byHueAlone?: boolean;
  /** That model was sampled clearly thinner than the companion's line alone, and can take its width. */
  canWiden?: boolean;
  /** Asked: the companion's model with the width of the companion's line alone. */
  widened?: boolean;
}

/**
 * Length of a trace where it saw its line, sheet units: its path less the stretches bridged
 * through a bunch (a trace of a few points bridged straight across a bunch measures long but saw
 * little; random bed, hurried guides, scan 1192: a dashed NPSHr trace by the head curve's colour,
 * 4 points over 508 units, 15 of them seen, against the plain trace's 791 seen, had been kept and
 * came out 6.4 % of span off). A trace that bridged much and saw enough can still be right (random
 * bed, careful guides, photo 146: 158 of 689 seen, right, where the plain trace saw 398 on the
 * wrong lines): only a trace that saw next to nothing is set aside.
 */
function seenLength(r: RasterTraceResult): number {
  let bridged = 0;
  for (const l of r.lost) if (l.bridged && l.resumedAt) bridged += Math.hypot(l.resumedAt[0] - l.at[0], l.resumedAt[1] - l.at[1]);
  return Math.max(0, polylineLength(r.points) - bridged);
}

/** How many stretches a trace lost from sight (not those bridged through a bunch). */
function lostFromSight(r: RasterTraceResult): number {
  return r.lost.filter((l) => !l.bridged).length;
}

/** Share of the length of a trace without companions that a trace by a companion's colour must reach to be kept. */
const COMPANION_LENGTH = 0.9;
/**
 * The same where the guides sampled no clear hue and the head curve has one: the trace without the
 * head curve's colour follows a line of no hue, on a colour sheet another impeller's black or grey
 * curve, whose length says little of the line's (speed bench seed 22, hurried guides: a 1600 rpm
 * orange efficiency line clicked at the origin, where all four meet, followed the black 1750 rpm
 * line 1071 px against the orange line's 769 px, 3.8 points off).
 */
const COMPANION_LENGTH_GREY = 0.6;

/** One trace on the image with the grid taken out; `ownBand`: a dash pattern is looked for in the line's own band; `note.byCompanion` says the model came from a companion's colour. */
function traceOn(image: RasterImage, guides: readonly SheetPoint[], options: RasterTraceOptions, ownBand: boolean, numbers?: readonly number[], labels: readonly LabelBox[] = [], note: CompanionNote = {}): RasterTraceResult {
  // The user's number of each guide (1-based): a guide on a label stands for two here.
  const name = (k: number) => numbers?.[k - 1] ?? k;
  const px = validateGuides(image, guides);
  const counter: ReadCounter = { reads: 0 };
  const toSheetPt = (p: Px) => sheetPoint(p[0] / image.scale, p[1] / image.scale);
  let search = options.searchPx ?? 10;

  // The line's model (colour, width) is sampled at every guide, and taken where the line
  // stands most alone: where the ink around the guide is most like one straight stroke
  // (least isotropic). A guide inside a bunch or on a crossing samples the other lines too.
  let chosen: ReturnType<typeof acquire>;
  let first = 0;
  // A dash pattern shows only where a dash and its gaps are seen clearly: one guide that finds
  // the line broken outweighs others that took it for solid (a blurred dotted line can look
  // solid under one guide, and a solid model then loses it at the first gap).
  // A model sampled off the line (a stronger grid line or a neighbour beside the guide) finds
  // no ink of its colour at most other guides: the model that finds ink at the most guides wins.
  // A guide where other lines touch the line (a bunch, a crossing) vouches for a model by half:
  // its own line may be hidden under the others there, and what it sampled may be another
  // line's colour. Among models that agree as well with the guides, one sampled where the line
  // has room of its own wins.
  // The two places a guide on a label stands for sample the line only where no guide as clicked
  // does: they were placed by the tracer, and a place just past a label may hold a grid crossing
  // that reads as a dash pattern (random bed photo 74: a blue head curve taken for dashed there).
  const standIn = px.map((_, k) => numbers !== undefined && numbers.filter((n) => n === numbers[k]).length > 1);
  const asClicked = standIn.includes(false);
  const sampled = px.map((g) => acquire(image, g, search, options, ownBand));
  const candidates = sampled.map((c, k) => (asClicked && standIn[k] ? undefined : c));
  const room = candidates.map((c) => (c ? clearance(image, c.style, c.centre, c.axis, counter) : 0));
  // Room counts only where the ink looks like one stroke at all (not a blob of text or a
  // crossing) and no wider than the thinnest line measured under a guide (not lines run together).
  const measured = candidates.map((c) => c?.style.width ?? Infinity);
  const thinnest = Math.min(...measured);
  // That thinnest is taken among the guides where the line has room, is one stroke and is not
  // far wider than the middle width measured (a label), when any is so: a width measured where
  // other ink touches the line may come out far too thin (a curve drawn over a grid line loses
  // the grid's darkness with it where the grid is taken out), and would call every clean guide a
  // bunch (speed bench seed 2, careful guides: 1.16 px on a grid line against 2.1 px where the
  // line stands alone; the thin model followed the efficiency line onto its neighbours, 3.5
  // points off).
  const finite = measured.filter(Number.isFinite).sort((a, b) => a - b);
  const middle = finite[Math.floor((finite.length - 1) / 2)] ?? Infinity;
  const alone = candidates.map((c, j) => c !== undefined && (room[j] as number) > BUNCH_CLEARANCE && c.isotropy <= SOLO_ISOTROPY && c.style.width <= SOLO_WIDTH * middle);
  const thinnestAlone = alone.includes(true) ? Math.min(...measured.filter((_, j) => alone[j])) : thinnest;
  const bunched = candidates.map((c, j) => c !== undefined && ((room[j] as number) <= BUNCH_CLEARANCE || c.isotropy > SOLO_ISOTROPY || c.style.width > SOLO_WIDTH * thinnestAlone));
  // A dash pattern counts only where the ink under the guide looks like one stroke of the line's
  // width: lines run together (wider than the thinnest line sampled, and no clean stroke) show
  // gaps where their dashes fall out of step, and a model of the bunch would follow the bunch.
  const blob = (a: Acquired) => a.isotropy > SOLO_ISOTROPY && a.style.width > BLOB_WIDTH * thinnest;
  const broken = (a: Acquired) => (a.style.reach && !blob(a) ? 1 : 0);
  // A model vouched for by a guide finds its ink where the guide was clicked, within about a
  // line's width: in a bunch, the ink of a neighbour's colour also lies within the search radius
  // of every guide, and would vouch for any colour sampled there.
  const vouchRadius = Math.max(VOUCH_MIN_PX, Math.min(search, VOUCH_WIDTHS * thinnest + VOUCH_SLACK_PX));
  const support = candidates.map((c) => (c && px.length > 1 ? px.reduce((sum, g, j) => sum + (nearestInk(image, c.style.model, g, vouchRadius) !== undefined ? (bunched[j] ? 0.5 : 1) : 0), 0) : 0));
  const solo = (i: number) => (bunched[i] ? 0 : 1);
  candidates.forEach((got, i) => {
    if (!got) return;
    const s = support[i] as number;
    const best = support[first - 1] ?? -1;
    const tie = chosen && s === best && broken(got) === broken(chosen);
    // Of two models as well vouched for, a coloured one wins over a grey sample of its own colour
    // (speed bench seed 22, careful guides: a green line's thin stretch read as grey under the
    // first guide, and the grey model stopped at a grid line each way, 1.63 points off).
    const even = tie && solo(i) === solo(first - 1);
    const hueOver = even && washedOut(chosen as Acquired, got);
    const hueUnder = even && washedOut(got, chosen as Acquired);
    // A line is dashed all along or nowhere: a dash pattern read under one guide, wider than a
    // clean solid sample of the same ink under another guide, that the line's own band does not
    // show at that sample is letters printed over the line there (a label), not its dashes.
    // The solid sample is the same ink as the dashed one, or a fainter reading of it (a line's thin
    // stroke reads lighter than the letters printed over it), not a grid line beside it.
    const sameInk = (dashed: Acquired, solid: Acquired) => membership(dashed.style.model, ...solid.style.model.line) >= GUIDE_MEMBERSHIP;
    const patternHere = (dashed: Acquired, solid: Acquired, k: number) =>
      solo(k) === 0 || !sameInk(dashed, solid) || dashed.style.width <= Math.max(LETTERED_WIDTH * solid.style.width, solid.style.width + LETTERED_PX) || brokenLine(image, dashed.style.model, solid.centre, solid.style.width, solid.axis) !== undefined;
    const patternWins = s === best && (broken(got) > broken(chosen as Acquired) ? patternHere(got, chosen as Acquired, first - 1) : broken(chosen as Acquired) > broken(got) && !patternHere(chosen as Acquired, got, i));
    if (!chosen || s > best || patternWins || (tie && solo(i) > solo(first - 1)) || hueOver || (even && !hueUnder && got.isotropy < chosen.isotropy - 0.02)) {
      chosen = got;
      first = i + 1;
    }
  });
  // A sample where lines run together is a mix of their colours, and a model of the mix follows
  // the bunch or loses the line. A sheet in colour mostly draws one impeller's curves in one
  // colour on every panel, and its head curve most often stands alone where it was clicked: the
  // colour of the same impeller's head curve (`companions`) is tried at this trace's guides
  // where the model chosen is far wider or thinner than the head line, or grey where it has a
  // hue (`companionChoice`; random bed scan 66, careful guides: a pink efficiency curve between
  // blue and olive ones over its whole length, sampled as a 4.7 px mix, 8 points off; photo 74,
  // hurried guides: a pink one sampled as a grey blend at low flow, 36 points off).
  // `traceWithCompanions` keeps the result only where it does better.
  if (chosen && !options.colour && options.companions) {
    const mix = chosen;
    const better = companionChoice(image, px, options.companions, search, options, ownBand, mix, first - 1, (c) => px.filter((g) => nearestInk(image, c.style.model, g, vouchRadius) !== undefined).length, standIn, asClicked, counter);
    if (better) {
      chosen = note.widened && better.widened ? better.widened : better.got;
      first = better.guide + 1;
      note.byCompanion = true;
      note.canWiden = better.widened !== undefined;
      note.grey = mix.style.model.mode !== 'chromatic';
      note.byHueAlone = better.byHueAlone;
    }
  }
  const acquired = chosen;
  if (!acquired) {
    return {
      points: [],
      lost: [{ at: guides[0] as SheetPoint, between: [name(1), name(guides.length)], reason: `no line stands out from the paper within ${search} px of any guide` }],
      line: { colour: options.colour ?? [0, 0, 0], paper: [255, 255, 255], widthPx: 0 },
      pixelsRead: counter.reads,
      doubts: [],
    };
  }
  const style = acquired.style;
  search = options.searchPx ?? Math.max(10, 3 * style.width);
  const { step } = stepping(style.width);
  const maxGap = options.maxGapPx ?? Math.min(400, Math.max(40, 50 * style.width));
  const lost: LostStretch[] = [];

  const snapped = px.map((g, i) => (i === first - 1 ? { centre: acquired.centre, axis: acquired.axis } : snap(image, style, g, search)));

  // The other traces' guides: a follow that runs over one where its line stands alone has left
  // this trace's line for that one, and is cut back to where it joined it.
  const foreign = foreignGuides(options.siblings, image, px, style.width);
  const locate: Locate = (g) => snap(image, style, g, search);
  const roomAt: RoomAt = (centre, axis) => clearance(image, style, centre, axis, counter);
  const ONTO_OTHER = "the line ran onto another trace's line (over that trace's guide), and was cut back to where it joined it";
  /** Cuts a follow where it ran onto another trace's line; true when it did. */
  const keepOffOthers = (result: FollowResult): boolean => {
    const run = foreignRun(image, style, foreign, pairs(result.points), 1, locate, roomAt, counter);
    if (run) cutFollow(result, run.start, ONTO_OTHER);
    return run !== undefined;
  };
  /** How many points of an extension to keep before it runs onto another trace's line (all when it does not). */
  const offOthers = (points: readonly Px[]): number | undefined => foreignRun(image, style, foreign, points, 0, locate, roomAt, counter)?.start;
  snapped.forEach((s, i) => {
    if (!s) lost.push({ at: guides[i] as SheetPoint, between: [i + 1, i + 1], reason: `guide ${name(i + 1)} has no line of the traced colour within ${search.toFixed(0)} px` });
  });

  const path: Px[] = [];
  const doubts: EndDoubt[] = [];
  // A guide whose own sample is another colour than the line's sits where lines of other
  // colours bunch or cross: the line was found there by the model of another guide, and nothing
  // vouches that the trace kept to its own line at that place.
  if (!options.colour) {
    const contrast = colourDistance(style.model.paper, ...style.model.line);
    // Every guide's sample, the two places a guide on a label stands for too.
    sampled.forEach((c, i) => {
      if (!c || i === first - 1 || !snapped[i]) return;
      // Either far from the line's colour, or of another hue than the line's (a neighbour of a
      // similar lightness: the colour model tells hues apart where a plain distance does not).
      if (colourDistance(style.model.line, ...c.style.model.line) > 0.4 * contrast || membership(style.model, ...c.style.model.line) < GUIDE_MEMBERSHIP) doubts.push({ at: (snapped[i] as { centre: Px }).centre, what: 'bunch', guide: i + 1 });
    });
  }
  // No guide where the line stands alone: every guide has other ink running beside the line, so
  // nothing tells which line of the bunch the trace is on. A lone guide where other lines touch
  // the line (no room beside it) says so too: no other guide vouches for the line taken there,
  // and a model sampled over lines run together follows the bunch (random bed, hurried guides,
  // fresh seeds 441-640: a faint dotted NPSHr line clicked once in its low-flow bunch, 10.6 % of
  // span off, had said nothing).
  const placed = snapped.filter((g): g is { centre: Px; axis: Px } => g !== undefined);
  if (placed.length > 0 && !doubts.some((d) => d.what === 'bunch') && placed.every((g) => inkBeside(image, style, g.centre, g.axis, counter) || (px.length === 1 && clearance(image, style, g.centre, g.axis, counter) <= BUNCH_CLEARANCE))) {
    doubts.push({ at: (placed[0] as { centre: Px }).centre, what: 'no-room', guide: snapped.indexOf(placed[0]) + 1, count: placed.length });
  }
  // A model taken from a companion's colour was taken because every guide sampled lines run
  // together: the guides sit in a bunch, whatever room the companion's model sees beside the line
  // (random bed, hurried guides, photo 1205: an NPSHr trace by the head curve's width, 1.003 % of
  // span off, had said nothing).
  const companionGuide = snapped[first - 1];
  if (note.byCompanion && companionGuide && !doubts.some((d) => d.what === 'bunch' || d.what === 'no-room')) {
    doubts.push({ at: ((placed.length > 1 ? placed[0] : companionGuide) as { centre: Px }).centre, what: 'no-room', guide: first, count: placed.length });
  }
  if (px.length === 1) {
    // A short stretch each way from the guide; the line is then followed on to its own ends as
    // any trace is, with the same smoothness test and the same search beyond a lost stretch.
    const s = snapped[0] as { centre: Px; axis: Px };
    const near: FollowLimits = { maxGap, maxTravel: maxGap + 16 * step };
    const ahead = followLine(image, style, s.centre, s.axis, undefined, near, counter);
    const behind = followLine(image, style, s.centre, [-s.axis[0], -s.axis[1]], undefined, near, counter);
    path.push(...pairs(behind.points).slice(1).reverse(), s.centre, ...pairs(ahead.points).slice(1));
  } else {
    let heading: Px | undefined;
    for (let i = 0; i + 1 < px.length; i++) {
      const a = snapped[i];
      const b = snapped[i + 1];
      const from: Px = path.length > 0 ? (path[path.length - 1] as Px) : (a?.centre ?? (px[i] as Px));
      const to: Px = b?.centre ?? (px[i + 1] as Px);
      if (path.length === 0) path.push(from);
      const chord = Math.hypot(to[0] - from[0], to[1] - from[1]);
      const limits: FollowLimits = {
        maxGap,
        maxTravel: 4 * chord + 50 * style.width + 100,
        ...(b ? { passRadius: Math.max(2 * stepping(style.width).step, 1.5 * style.width) } : {}),
      };
      const axis = a?.axis ?? heading ?? [to[0] - from[0], to[1] - from[1]];
      const h = heading ?? headingTowards(image, style, from, axis, to, counter);
      const fwd = followLine(image, style, from, h, to, limits, counter);
      // A pass that came to the next guide is vouched for by both guides (another trace's guide on
      // its way sits on a crossing or where the lines run together); one that did not may have
      // left its line.
      const fwdOnto = !fwd.reached && keepOffOthers(fwd);
      path.push(...pairs(fwd.points).slice(1));
      if (fwd.reached) {
        if (b) path.push(to);
        heading = [fwd.dx, fwd.dy];
        continue;
      }
      const lostAt = path[path.length - 1] as Px;
      if (!b) {
        lost.push({ at: toSheetPt(lostAt), between: [i + 1, i + 2], reason: fwd.reason ?? 'the line was lost' });
        heading = undefined;
        path.push(to);
        continue;
      }
      // Seen from the far guide, backwards, until it runs into the forward pass. Where the
      // forward pass took a wrong branch at a crossing, the backward pass comes back along
      // the right line to that crossing and meets it there; what the forward pass found
      // beyond the meeting point is dropped.
      const forwardStart = path.length - (fwd.points.length / 2 - 1);
      const meetIndex = indexPath(fwd.track, Math.max(2, style.width));
      const backHeading = headingTowards(image, style, to, b.axis, from, counter);
      const bwd = followLine(image, style, to, backHeading, undefined, limits, counter, meetIndex);
      const bwdOnto = bwd.met === undefined && keepOffOthers(bwd);
      const back = pairs(bwd.points).reverse();
      if (bwd.met !== undefined) {
        path.length = forwardStart - 1 + (fwd.trackPoints[bwd.met] as number);
      } else if ((fwd.merges.length > 0 || fwdOnto) && (bwd.merges.length > 0 || bwdOnto)) {
        // Neither pass came out of the bundle on the other's line (or one ran onto another
        // trace's line and was cut back), so each is kept up to where it entered the bundle, and
        // the two ends are joined smoothly through it: inside the bundle the line lies within a
        // line width or two of its neighbours.
        path.length = forwardStart - 1 + (fwd.merges[0] ?? fwd.points.length / 2);
        const kept = pairs(bwd.points).slice(0, bwd.merges[0] ?? bwd.points.length / 2);
        const p0 = path[path.length - 1] as Px;
        const p1 = kept[kept.length - 1] as Px;
        // Laid along the bunch's own edges, where they can be seen.
        path.push(...alongBand(image, style, [p0, ...bridge(p0, tangentAt(path, path.length - 1, 1), p1, tangentAt(kept, kept.length - 1, -1), stepping(style.width).step), p1], counter).slice(1, -1));
        lost.push({ at: toSheetPt(p0), resumedAt: toSheetPt(p1), between: [i + 1, i + 2], reason: 'the line runs together with other lines of its colour here; the stretch is bridged smoothly', bridged: true });
        back.length = 0;
        back.push(...kept.reverse());
      } else {
        lost.push({ at: toSheetPt(lostAt), resumedAt: toSheetPt(back[0] as Px), between: [i + 1, i + 2], reason: fwd.reason ?? 'the line was lost' });
      }
      path.push(...back);
      heading = [-backHeading[0], -backHeading[1]];
    }
  }

  // Between the guides, a stretch the trace holds no point over, longer than the follower carries
  // a line unseen or than `UNSEEN_PX`, and not said to be lost: the follower coasted there on its
  // prediction (the forward pass keeps no points where it coasts, and the backward pass may meet
  // its track far beyond its last point seen), or a bunch's model took the whole bunch for the line.
  const unseen = unseenBetweenGuides(path, px, Math.min(maxGap, UNSEEN_PX), lost);
  if (unseen) doubts.push(unseen);
  if ((px.length === 1 || options.extent !== 'guides') && path.length >= 2) doubts.push(...extendToEnds(image, style, path, maxGap, options.frame, counter, offOthers, labels));
  else if (options.frame && path.length >= 2) clipToFrame(path, options.frame, image.scale, style.width);

  if (options.frame && options.extent !== 'guides' && path.length >= 2) {
    for (const end of [path[0] as Px, path[path.length - 1] as Px]) if (atFrameEdge(end, options.frame, image.scale, style.width)) doubts.push({ at: end, what: 'frame' });
  }

  const thinned = simplify(
    fillGaps(dropOutliers(dropIslands(path, stepping(style.width).step, style.width), Math.max(12, 4 * style.width), Math.max(1.5, 0.5 * style.width)), stepping(style.width).step).map(
      ([x, y]) => ({ x, y }),
    ),
    options.simplifyPx ?? 0.3,
    true,
  );
  // A guide the finished trace does not pass over: the line clicked on there ran together with
  // a neighbour (one line model sampled over both, or a bridge laid along the other), and the
  // trace may lie on the neighbour or between the two at that place. A guide already doubted as
  // sitting in a bunch is not said twice.
  if (thinned.length >= 2) {
    const course = thinned.map((p): Px => [p.x, p.y]);
    const miss = Math.max(GUIDE_MISS_PX, GUIDE_MISS_WIDTHS * style.width);
    px.forEach((g, i) => {
      if (!snapped[i] || doubts.some((d) => (d.what === 'bunch' || d.what === 'no-room') && d.guide === i + 1)) return;
      if (distanceToPolyline(course, g) > miss) doubts.push({ at: g, what: 'missed', guide: i + 1 });
    });
  }
  void step;
  return {
    points: thinned.map((p) => sheetPoint(p.x / image.scale, p.y / image.scale)),
    lost: numbers ? lost.map((l) => ({ ...l, between: [name(l.between[0]), name(l.between[1])] as [number, number] })) : lost,
    line: { colour: style.model.line, paper: style.model.paper, widthPx: style.width, ...(style.reach ? { dashed: true } : {}) },
    pixelsRead: counter.reads,
    doubts: doubts.map((d) => doubtSentence(d.guide === undefined ? d : { ...d, guide: name(d.guide) }, toSheetPt(d.at))),
  };
}

/**
 * Whether other ink (of any colour) runs beside the line at `centre`: at the centre and a few
 * widths either way along `axis`, a section across the line finds, besides the line's own run,
 * another run of ink within three widths of it, at two of the three places at least (a grid line
 * crossing the line shows at one place; a line running beside it, at all).
 */
function inkBeside(image: RasterImage, style: LineStyle, centre: Px, axis: Px, counter: ReadCounter): boolean {
  const near = 3 * style.width + 3;
  let crowded = 0;
  const seen = acrossAt(image, style, centre, axis, near, counter, (found) => {
    let own = -1;
    found.forEach((r, i) => {
      if (own < 0 || Math.abs(r.centre) < Math.abs((found[own] as Run).centre)) own = i;
    });
    if (found.some((r, i) => i !== own && r.mass >= 0.4 * style.width && Math.abs(r.centre) <= near)) crowded++;
    return true;
  });
  return seen && crowded >= 2;
}

/**
 * Sections of ink of any colour (as a share of the line's contrast with the paper) across the
 * line at `centre` and two widths and 4 px either way along `axis`, reaching `near` and a width
 * beyond; `visit` gets each section's runs and stops the walk by returning false. False when the
 * line has no contrast to measure by.
 */
function acrossAt(image: RasterImage, style: LineStyle, centre: Px, axis: Px, near: number, counter: ReadCounter, visit: (found: Run[]) => boolean): boolean {
  const paper = style.model.paper;
  const full = colourDistance(paper, ...style.model.line);
  if (full <= 0) return false;
  const spacing = 0.5;
  const n = Math.ceil((near + style.width) / spacing);
  const section = new Float64Array(2 * n + 1);
  const runs: Run[] = [];
  const along = 2 * style.width + 4;
  for (const k of [-1, 0, 1]) {
    sampleInkSection(image, paper, full, centre[0] + axis[0] * along * k, centre[1] + axis[1] * along * k, -axis[1], axis[0], n, spacing, section, counter);
    if (!visit(findRuns(section, n, spacing, style.threshold, runs))) break;
  }
  return true;
}

/**
 * The model taken from the colour of the same impeller's head curve (see `traceOn`): its
 * guides are sampled, and a sample counts where it is of a clear hue and its line stands alone
 * (room beside it, one solid stroke). Where the chosen model measures over `SOLO_WIDTH` times as
 * wide as that line (a broad mix of lines run together), under its width over `SOLO_WIDTH` (the
 * blend where two colours meet), or is of no clear hue (colours run together read grey), the
 * colour is measured at this trace's guides and kept at a guide where it finds one clean solid
 * stroke, clearly thinner than a broad mix, clearly wider than a thin one and no more than
 * `SOLO_WIDTH` times the head line's width, or no more than `SOLO_WIDTH` times the wider of the
 * two beside a grey one, with its ink found at half the guides or more (`found`). Of several, the
 * one found at the most guides, then the thinnest. Undefined when none is so.
 */
function companionChoice(
  image: RasterImage,
  px: readonly Px[],
  companions: readonly (readonly SheetPoint[])[],
  search: number,
  options: RasterTraceOptions,
  ownBand: boolean,
  mix: Acquired,
  mixGuide: number,
  found: (c: Acquired) => number,
  standIn: readonly boolean[],
  asClicked: boolean,
  counter: ReadCounter,
): { got: Acquired; guide: number; widened?: Acquired; byHueAlone: boolean } | undefined {
  let out: { got: Acquired; guide: number; found: number; alone: number; rgb: Rgb } | undefined;
  let byHueAlone = false;
  for (const list of companions) {
    // The colour of the companion where its line has the most room.
    let colour: { rgb: Rgb; room: number; width: number } | undefined;
    for (const g of list) {
      const at: Px = [g[0] * image.scale, g[1] * image.scale];
      if (!(at[0] >= 0 && at[1] >= 0 && at[0] < image.width && at[1] < image.height)) continue;
      const c = acquire(image, at, search, {});
      if (!c || c.style.model.mode !== 'chromatic' || c.style.reach || c.isotropy > SOLO_ISOTROPY) continue;
      const room = clearance(image, c.style, c.centre, c.axis, counter);
      if (room > BUNCH_CLEARANCE && (!colour || room > colour.room)) colour = { rgb: c.style.model.line, room, width: c.style.width };
    }
    // The chosen model is no mix where it is about as wide as the companion's line alone. A mix
    // measures wider (lines run together read as one broad stroke) or far thinner (the sample
    // caught the blend where two colours meet, which no line of the bunch matches along its length).
    if (!colour) continue;
    const wider = mix.style.width > SOLO_WIDTH * colour.width;
    const thinner = SOLO_WIDTH * mix.style.width < colour.width;
    // Or of no clear hue where the head curve has one: colours run together read grey.
    const grey = mix.style.model.mode !== 'chromatic';
    // Or of another hue than the head curve's: a neighbour's colour, or the blend of several.
    const otherHue = !grey && membership(mix.style.model, ...colour.rgb) < GUIDE_MEMBERSHIP;
    if (!wider && !thinner && !grey && !otherHue) continue;
    if (!wider && !thinner && !grey) byHueAlone = true;
    const { rgb, width: alone } = colour;
    const fits = (w: number) => (wider ? SOLO_WIDTH * w <= mix.style.width : thinner ? w >= SOLO_WIDTH * mix.style.width && w <= SOLO_WIDTH * alone : w <= SOLO_WIDTH * Math.max(alone, mix.style.width));
    px.forEach((g, k) => {
      if (asClicked && standIn[k]) return;
      let got = acquire(image, g, search, { ...options, colour: rgb }, ownBand);
      // Where the bunch hides the head curve's colour at the guide (a line drawn over it there), it
      // is looked for farther along the guide's own line, on its course (random bed scan 87,
      // hurried guides: a teal efficiency line clicked near the origin under a blue one, found
      // 12 px on where the two part; it had come out 57 points off). That place vouches as the guide.
      // Only at the guide the chosen model was sampled under (`mixGuide`), on the course its line had there.
      let along = false;
      const far = !got && k === mixGuide ? acquire(image, g, ALONG_REACH_PX, { ...options, colour: rgb }, ownBand) : undefined;
      if (far) {
        const off = Math.abs((far.centre[0] - mix.centre[0]) * mix.axis[1] - (far.centre[1] - mix.centre[1]) * mix.axis[0]);
        const turn = Math.abs(far.axis[0] * mix.axis[0] + far.axis[1] * mix.axis[1]);
        if (off <= Math.max(ALONG_OFF_PX, mix.style.width) && turn >= Math.cos(ALONG_TURN) && far.style.width >= ALONG_WIDTH * colour.width) {
          got = far;
          along = true;
        }
      }
      // A dashed or dotted line is tried with the head curve's colour as a solid one is: its own
      // sample, taken among neighbours' dashes, may read as solid and lose the line at its first
      // gap, where the head colour finds the pattern (speed bench seed 40, hurried guides: a red
      // dashed NPSHr line clicked once among three others, 25 % of span short, now whole).
      if (!got || got.isotropy > SOLO_ISOTROPY || !fits(got.style.width)) return;
      const n = found(got) + (along ? 1 : 0);
      if (2 * n < px.length) return;
      if (!out || n > out.found || (n === out.found && got.style.width < out.got.style.width)) out = { got, guide: k, found: n, alone, rgb };
    });
  }
  if (!out) return undefined;
  // Sampled clearly thinner than the companion's line alone: the line may lie half under the others there.
  const thin = SOLO_WIDTH * out.got.style.width < out.alone;
  const widened = thin ? acquire(image, px[out.guide] as Px, search, { ...options, colour: out.rgb, widthPx: out.alone }, ownBand) : undefined;
  return { got: out.got, guide: out.guide, byHueAlone, ...(widened && !widened.style.reach ? { widened } : {}) };
}

/** How far from its guide the head curve's colour is looked for along the guide's own line, pixels, where it is hidden under the bunch at the guide. */
const ALONG_REACH_PX = 30;
/** How far off the course of the guide's line (px, or the sample's width when more) and how far turned from it that colour may be found. */
const ALONG_OFF_PX = 2;
const ALONG_TURN = (20 * Math.PI) / 180;
/** Least width of the stroke found there, in the head curve's line width alone: a sliver of the colour at a bunch's edge is no line (random bed scan 892, hurried guides: a 1 px sliver beside a 2.6 px line led the trace off, 2.9 points). */
const ALONG_WIDTH = 0.5;

/** What `acquire` finds under a guide. */
type Acquired = NonNullable<ReturnType<typeof acquire>>;

/**
 * How much room the line has at `centre`, pixels: the least gap, over sections across the line at
 * the centre and a few widths either way along `axis`, between the edge of the line's own run of
 * ink (of any colour) and the nearest other run; 0 where the line's run is much wider than the
 * line (other lines touch it), and the sections' reach (3 widths and 3 px) where nothing lies
 * beside. A colour sampled where the room is small may be another line's.
 */
function clearance(image: RasterImage, style: LineStyle, centre: Px, axis: Px, counter: ReadCounter): number {
  const near = 3 * style.width + 3;
  let room = near;
  acrossAt(image, style, centre, axis, near, counter, (found) => {
    let own: Run | undefined;
    for (const r of found) if (!own || Math.abs(r.centre) < Math.abs(own.centre)) own = r;
    if (!own) return true;
    if (own.mass > WIDE_RUN * style.width) {
      room = 0;
      return false;
    }
    for (const r of found) {
      if (r === own || r.mass < 0.4 * style.width) continue;
      const gap = r.centre > own.centre ? r.lowEdge - own.highEdge : own.lowEdge - r.highEdge;
      room = Math.min(room, Math.max(0, gap));
    }
    return true;
  });
  return room;
}

/** Ink across a line, in its widths, beyond which other lines touch it there. */
const WIDE_RUN = 1.6;

/** Room beside a guide's line, pixels, up to which other lines touch it: its colour sample counts as taken in a bunch. */
const BUNCH_CLEARANCE = 0.5;

/** Isotropy of the ink under a guide above which it is not one clean stroke, whatever room it has. */
const SOLO_ISOTROPY = 0.45;

/**
 * Width of a dashed sample, in the thinnest width measured under any guide, above which (and not
 * one clean stroke) it is lines run together, whose dashes fall out of step: a thin dashed line's
 * own sample measures up to about twice the width of a solid sample of it.
 */
const BLOB_WIDTH = 3;

/** Width of a dashed sample, in a clean solid sample's, above which its pattern is held to the line's own band at the solid sample (letters printed over a line read wider than it). */
const LETTERED_WIDTH = 1.2;

/** ... and by at least this many pixels (a thin line's widths differ by a fraction of a pixel from noise alone). */
const LETTERED_PX = 1;

/** Width of the line under a guide, in the thinnest width measured under any, above which it is lines run together. */
const SOLO_WIDTH = 1.5;

/**
 * How near a guide's click, pixels, a line model must find its ink for that guide to vouch for
 * it: three quarters of the thinnest width measured under any guide and 1.5 px (a click's
 * scatter), and at least 2.5 px.
 */
const VOUCH_WIDTHS = 0.75;
const VOUCH_SLACK_PX = 1.5;
const VOUCH_MIN_PX = 2.5;

/**
 * Farthest a finished trace may pass from one of its guides, pixels, or line widths when more,
 * before that guide counts as missed. A click lands within about a pixel of the line's centre
 * (hurried clicks on the random bed: up to 1.2 px), and a trace on the clicked line passes within
 * half its width of it. On the random bed (scripts/randomSheets, hurried guides, seeds 1–200),
 * 125 of the 169 traces passing farther from a guide were wrong, and 44 of the 1715 sound ones
 * did, all but one of those with another finding already; seeds 201–320: 88 of 105 wrong.
 */
const GUIDE_MISS_PX = 2.75;
const GUIDE_MISS_WIDTHS = 0.4;

/** Membership in the line's model below which the colour under a guide is another line's. */
const GUIDE_MEMBERSHIP = 0.6;

/** A finding-worthy doubt about a followed stretch: a stable code and a sentence saying what to do. */
export interface TraceDoubt {
  code: 'takeoff.end-at-frame' | 'takeoff.guide-in-bunch' | 'takeoff.guide-missed' | 'takeoff.end-through-bunch' | 'takeoff.end-after-gap' | 'takeoff.stretch-unseen';
  message: string;
}

/** Longest stretch between guides a trace may hold no point over without saying so, pixels (the random bed: longer chords through bunches went wrong unseen). */
const UNSEEN_PX = 140;

/**
 * The first stretch between the outermost guides over which `path` holds no point for more than
 * `limit` pixels, unless a lost stretch between the same guides was recorded: a doubt at its start.
 */
function unseenBetweenGuides(path: readonly Px[], guides: readonly Px[], limit: number, lost: readonly LostStretch[]): EndDoubt | undefined {
  if (path.length < 2 || guides.length < 2) return undefined;
  // Each guide's place on the path: the index of the nearest point.
  const places = guides.map((g) => {
    let best = 0;
    let bestD = Infinity;
    path.forEach((q, k) => {
      const d = (q[0] - g[0]) ** 2 + (q[1] - g[1]) ** 2;
      if (d < bestD) {
        bestD = d;
        best = k;
      }
    });
    return best;
  });
  const first = Math.min(...places);
  const last = Math.max(...places);
  for (let k = first + 1; k <= last; k++) {
    const a = path[k - 1] as Px;
    const b = path[k] as Px;
    if (Math.hypot(b[0] - a[0], b[1] - a[1]) <= limit) continue;
    // The guides on either side of the stretch, in the order given (1-based).
    const before = places.reduce((g, p, i) => (p < k && (g < 0 || p >= (places[g] as number)) ? i : g), -1);
    const guide = before < 0 ? 1 : before + 1;
    if (lost.some((l) => l.between[0] === guide || l.between[1] === guide + 1)) continue;
    return { at: a, what: 'unseen', guide };
  }
  return undefined;
}

/**
 * Why a stretch beyond the guides cannot be vouched for: it ran into the panel's frame, which
 * a pump curve seldom reaches (its end lies inside the chart), so the follower may have left
 * its line for a grid line or another curve on the way.
 */
interface EndDoubt {
  at: Px;
  what: 'frame' | 'bunch' | 'no-room' | 'bunch-end' | 'gap-beside' | 'onto-other' | 'missed' | 'unseen';
  /** The guide concerned (1-based), for a doubt about a guide. */
  guide?: number;
  /** How many guides the doubt holds for. */
  count?: number;
}

function doubtSentence(d: EndDoubt, at: SheetPoint): TraceDoubt {
  if (d.what === 'onto-other') {
    return {
      code: 'takeoff.end-through-bunch',
      message: `beyond its guides the line runs near ${fmt(at)} onto another trace's line (over that trace's guide), and the trace ends there; check the trace's end, or add a guide on the line beyond that place where it stands alone`,
    };
  }
  if (d.what === 'bunch-end') {
    return {
      code: 'takeoff.end-through-bunch',
      message: `beyond its guides the trace runs through a stretch near ${fmt(at)} where the line runs together with other lines of its colour, and may have come out on a neighbour; check the trace's end, or add a guide near the line's end where it stands alone`,
    };
  }
  if (d.what === 'gap-beside') {
    return {
      code: 'takeoff.end-after-gap',
      message: `beyond its guides the line breaks off and is taken up again near ${fmt(at)} on its own course, but another line of its colour runs close beside it there, and the trace may have gone on along that one; check the trace's end, or add a guide on the line beyond the break`,
    };
  }
  if (d.what === 'missed') {
    return {
      code: 'takeoff.guide-missed',
      message: `the trace does not pass over guide ${d.guide ?? ''} near ${fmt(at)}: the line clicked on there runs together with another, and the trace may lie on the other line or between the two; check the trace there, or move the guide to where the line stands alone`,
    };
  }
  if (d.what === 'unseen') {
    return {
      code: 'takeoff.stretch-unseen',
      message: `after guide ${d.guide ?? ''} near ${fmt(at)} the trace holds no point of the line over a stretch longer than the tracer carries a line unseen (the line runs together with other lines there, or is hidden), so part of the trace between guides ${d.guide ?? ''} and ${(d.guide ?? 0) + 1} is a guess; check the trace there, or add a guide where the line stands alone`,
    };
  }
  if (d.what === 'no-room') {
    return {
      code: 'takeoff.guide-in-bunch',
      message: `${(d.count ?? 1) > 1 ? `no guide sits where the line stands alone: at every guide (the first near ${fmt(at)})` : `the one guide, near ${fmt(at)}, sits where`} other lines touch the line or run close beside it, so nothing tells which line of the bunch the trace is on; check the trace, or add a guide where the line stands alone`,
    };
  }
  if (d.what === 'bunch') {
    return {
      code: 'takeoff.guide-in-bunch',
      message: `guide ${d.guide ?? ''} near ${fmt(at)} sits where the line runs together with or crosses other lines (the colour under it is not the line's); check the trace there, or move the guide to where the line stands alone`,
    };
  }
  return {
    code: 'takeoff.end-at-frame',
    message: `the trace runs on to the panel's frame near ${fmt(at)}, where a drawn curve seldom ends; check that the line really reaches the frame, or add a guide at the line's end`,
  };
}

/**
 * The points of an extension (a follow beyond the guides) to keep, without its start point,
 * cut where it leaves the frame, and what casts doubt on them. `kept` limits the points to
 * those a smoothness test accepted.
 */
function judgeExtension(result: FollowResult, kept: number | undefined, frame: readonly [number, number, number, number] | undefined, scale: number, width: number): [Px[], EndDoubt | undefined] {
  const got = pairs(result.points).slice(1);
  let inside = got.length;
  if (frame) {
    const out = got.findIndex((p) => !insideFramePx(p, frame, scale, width));
    if (out >= 0) inside = out;
  }
  const count = Math.min(inside, kept ?? inside);
  const points = got.slice(0, count);
  if (count === 0) return [points, undefined];
  return [points, undefined];
}

/** True when a follow ended after coasting (it lost its line) rather than on the line itself: more than a few steps lie between its last accepted point and where it stopped. */
function coastedAtEnd(result: FollowResult, width: number): boolean {
  const n = result.points.length;
  const m = result.track.length;
  if (n < 2 || m < 2) return false;
  return Math.hypot((result.track[m - 2] as number) - (result.points[n - 2] as number), (result.track[m - 1] as number) - (result.points[n - 1] as number)) > 4 * stepping(width).step;
}

/**
 * Distances of a pixel position in from the frame's left, right, top and bottom edges (the frame
 * in sheet units), the frame's width, and the margin within which an end counts as at an edge:
 * four line widths and at least 14 px (the follower stops a little short of the frame line).
 */
function inFromFrame(p: Px, frame: readonly [number, number, number, number], scale: number, width: number): { left: number; right: number; top: number; bottom: number; span: number; margin: number } {
  const l = Math.min(frame[0], frame[2]) * scale;
  const r = Math.max(frame[0], frame[2]) * scale;
  const t = Math.min(frame[1], frame[3]) * scale;
  const b = Math.max(frame[1], frame[3]) * scale;
  return { left: p[0] - l, right: r - p[0], top: p[1] - t, bottom: b - p[1], span: r - l, margin: Math.max(14, 4 * width) };
}

/**
 * True when a trace's end lies on the frame's right, top or bottom edge (`inFromFrame`'s
 * margin), away from its left edge, where curves start at zero flow.
 */
function atFrameEdge(p: Px, frame: readonly [number, number, number, number], scale: number, width: number): boolean {
  const d = inFromFrame(p, frame, scale, width);
  if (d.left < 0.03 * d.span) return false;
  return d.right < d.margin || d.top < d.margin || d.bottom < d.margin;
}

/** True when a pixel position lies within `inFromFrame`'s margin of any edge of the frame, the left one included. */
function nearFrame(p: Px, frame: readonly [number, number, number, number], scale: number, width: number): boolean {
  const d = inFromFrame(p, frame, scale, width);
  return Math.min(d.left, d.right, d.top, d.bottom) < d.margin;
}

/** True when a pixel position lies inside the frame (sheet units), with half a line width to spare. */
function insideFramePx(p: Px, frame: readonly [number, number, number, number], scale: number, width: number): boolean {
  const m = 0.5 * width + 1;
  const l = Math.min(frame[0], frame[2]) * scale - m;
  const r = Math.max(frame[0], frame[2]) * scale + m;
  const t = Math.min(frame[1], frame[3]) * scale - m;
  const b = Math.max(frame[1], frame[3]) * scale + m;
  return p[0] >= l && p[0] <= r && p[1] >= t && p[1] <= b;
}

function clipToFrame(path: Px[], frame: readonly [number, number, number, number], scale: number, width: number): void {
  const kept = path.filter((p) => insideFramePx(p, frame, scale, width));
  if (kept.length >= 2) path.splice(0, path.length, ...kept);
}

/**
 * Follows the line on beyond its first and last point to where its own ink stops (or the
 * frame), so that a trace keeps the curve's end whatever guides the user clicked. Each end is
 * followed along the direction of the last 40 pixels of the path; what the follower accepts
 * before it loses the line for longer than `maxGap` is added, and nothing it only coasted on.
 */
function extendToEnds(
  image: RasterImage,
  traced: LineStyle,
  path: Px[],
  maxGap: number,
  frame: readonly [number, number, number, number] | undefined,
  counter: ReadCounter,
  offOthers: (points: readonly Px[]) => number | undefined = () => undefined,
  labels: readonly LabelBox[] = [],
): EndDoubt[] {
  const limits: FollowLimits = { maxGap, maxTravel: 2 * (image.width + image.height) };
  const doubts: EndDoubt[] = [];
  const outward = (stretch: Px[]): Px[] => {
    const all: Px[] = [...stretch];
    const out: Px[] = [];
    let end = stretch[stretch.length - 1] as Px;
    let heading = tangentAt(stretch, stretch.length - 1, 1);
    // Where the line was last found again (an index into `out`), or -1.
    let resumed = -1;
    // The model this end is followed with: the trace's, or one measured again along the line.
    let style = traced;
    let restyled = false;
    for (let round = 0; round < MAX_REACQUIRE; round++) {
      let result = followLine(image, style, end, heading, undefined, limits, counter);
      let [inside] = judgeExtension(result, undefined, frame, image.scale, style.width);
      let smooth = keepSmooth(all, inside, style, maxGap, { image, counter, doubts });
      // Lost on the way (the follower coasted at the end, inside the frame): the model sampled
      // under a guide may not fit the line here (a dotted line taken for solid, a width taken
      // where the line touched other ink). The line's look is measured again along what was
      // followed, once an end, and that model is kept when it follows the line clearly farther.
      if (!restyled && inside.length >= result.points.length / 2 - 1 && coastedAtEnd(result, style.width)) {
        restyled = true;
        // Measured along what was followed, and else ahead on the line's course: where the trace
        // ends in a bunch, what was followed is the bunch, and the line's own width shows only
        // where it parts from the others.
        // Each measured only when the one before gave nothing better.
        const tries = [
          () => restyleAlong(image, style, all, counter),
          () => restyleAhead(image, style, courseAhead(all, end, heading, style, maxGap), counter),
          // The dash pattern read along the course ahead, as along a followed stretch: a dashed
          // line whose guides sat where its pattern did not show, lost at its first gap. Only a
          // pattern found anew counts here (a width alone is the try before's).
          () => {
            if (style.reach) return undefined;
            const dashed = restyleAlong(image, style, courseAhead(all, end, heading, style, maxGap).map((c) => c.at), counter);
            return dashed?.reach ? dashed : undefined;
          },
        ];
        for (const [k, measure] of tries.entries()) {
          const again = measure();
          if (!again) continue;
          // A shorter gap bridged on the try: a line the new model sees shows at once (what hides
          // it farther on is looked past by the search for the lost line), and a try that finds
          // nothing ends soon.
          const retry = followLine(image, again, end, heading, undefined, { ...limits, maxGap: Math.min(maxGap, Math.max(RETRY_GAP_PX, RETRY_GAP_WIDTHS * traced.width)) }, counter);
          const [within] = judgeExtension(retry, undefined, frame, image.scale, again.width);
          const seen: EndDoubt[] = [];
          const kept = keepSmooth(all, within, again, maxGap, { image, counter, doubts: seen });
          if (pathLength([end, ...kept], 0) > pathLength([end, ...smooth], 0) + Math.max(FOUND_AGAIN_PX, 12 * traced.width)) {
            style = again;
            result = retry;
            inside = within;
            smooth = kept;
            doubts.push(...seen);
            // A width taken ahead, not under a guide, came out of the bunch on the line nearest
            // the course: nothing vouches that it is this trace's line rather than a neighbour. (A
            // dash pattern read ahead is held to the line's course as one read along it is.)
            if (k === 1 && !doubts.some((d) => d.what === 'bunch-end')) doubts.push({ at: end, what: 'bunch-end' });
            break;
          }
        }
      }
      // A broken line's follower that ran on along solid ink to the frame (a grid line of its
      // grey, taken up beyond the line's end) left the line where the ink turned solid. Only at
      // the frame: a dotted line drawn along a grid line to its own end reads solid as well, and
      // there the follower stops at the line's end, inside the frame.
      const last = smooth[smooth.length - 1];
      // The pattern is read on the line beyond any label it was printed under (the letters and the
      // paper patch around them would read as dashes and gaps): from past the last step through it.
      let onLabel = stretch.length - 1;
      while (onLabel >= 0 && !labels.some((b) => meetsBox(stretch[onLabel] as Px, (stretch[onLabel - 1] ?? stretch[onLabel]) as Px, b))) onLabel--;
      const solid = last && frame && nearFrame(last, frame, image.scale, style.width) ? solidFrom(image, style, stretch.slice(onLabel + 1), [end, ...smooth], counter) : undefined;
      if (solid !== undefined) smooth.length = Math.max(0, solid - 1);
      // Over another trace's guide the extension is on that trace's line: it ends where it joined it.
      const onto = offOthers(smooth);
      if (onto !== undefined) {
        smooth.length = onto;
        all.push(...smooth);
        out.push(...smooth);
        doubts.push({ at: (smooth[smooth.length - 1] ?? end) as Px, what: 'onto-other' });
        break;
      }
      if (resumed >= 0 && pathLength([end, ...smooth], 0) < Math.max(FOUND_AGAIN_PX, 12 * style.width)) {
        // What was found again ends soon (a label beside the line's end, a piece of a grid
        // line): the line ended before the gap. Take the found part back.
        all.length -= out.length - resumed;
        out.length = resumed;
        break;
      }
      // Beyond the guides nothing vouches for the line that came out of a stretch where it ran
      // together with others of its colour (a bunch): a neighbour may have been taken for it.
      const crowded = doubts.some((d) => d.what === 'bunch-end') ? undefined : crowdedAt(image, style, smooth, counter);
      if (crowded) doubts.push({ at: crowded, what: 'bunch-end' });
      // Where the last follow ran into other ink of the line's colour for good (a merge it did not
      // come out of): the course there is the bunch's, not the line's.
      const mergedFrom = result.merges.length > 0 && (result.merges[result.merges.length - 1] as number) - 1 < smooth.length ? all.length + Math.max(0, (result.merges[result.merges.length - 1] as number) - 1) : all.length;
      all.push(...smooth);
      out.push(...smooth);
      // The follower left the frame or the image on the line's own course: the line ends there.
      if (smooth.length === inside.length && (inside.length < result.points.length / 2 - 1 || result.reason === 'the line runs off the image')) break;
      // Otherwise the line was lost (its end, or another line or a grid line that the follower
      // took for it): look for it again further along its own course.
      // A line taken up beyond a bunch runs on from there for a piece's length, along the course
      // from before the bunch (near it and about parallel) and with the same ink.
      const runsOn = (base: readonly Px[]) => (found: { at: Px; heading: Px }) => {
        const probe = pairs(followLine(image, style, found.at, found.heading, undefined, { maxGap: 2 * stepping(style.width).step, maxTravel: 2 * pieceLength(style.width) }, counter).points);
        return pathLength(probe, 0) >= pieceLength(style.width) && continuesAcross(base, probe, style, image, counter) === 'on';
      };
      let again: ReturnType<typeof reacquire>;
      let beyond: BeyondBunch | undefined;
      let kept = all.length;
      // Looked for again along the line's course from before the last follow ran into other ink
      // of its colour for good (inside a bunch the follower keeps to the bunch's middle, and that
      // course leads out of it between the lines), else from where the follow was cut.
      const cutMerge = style.width <= BUNCH_MODEL_PX && mergedFrom < all.length && mergedFrom >= all.length - out.length + 2 && pathLength(all, mergedFrom - 1) >= Math.max(MERGE_CUT_PX, MERGE_CUT_WIDTHS * style.width);
      for (const upTo of cutMerge ? [mergedFrom, all.length] : [all.length]) {
        const base = upTo === all.length ? all : all.slice(0, upTo);
        if (base.length < 2) continue;
        // From the cut course, only past the bunch the follow ran into (the line is seen again at
        // once where it entered it, and followed into it again).
        const past = upTo === all.length ? 0 : Math.hypot((all[all.length - 1] as Px)[0] - (base[base.length - 1] as Px)[0], (all[all.length - 1] as Px)[1] - (base[base.length - 1] as Px)[1]);
        again = reacquire(image, style, base, maxGap + past, frame, counter, past);
        // Past the bunch only within a gap of it (ink along the cut course, the bunch itself, would
        // carry the search on far beyond),
        // and, as a line taken up beyond a bunch, running on along that course with the same ink.
        if (again && upTo < all.length && (again.far || !runsOn(base)(again))) again = undefined;
        if (again) {
          kept = upTo;
          break;
        }
        // Not found again alone on its course: the line may run on inside a bunch (lines of its
        // colour running together with it or crossing it at a shallow angle). It is carried on
        // along its course and taken up where it stands apart again, with a doubt.
        // A model as wide as a bunch (sampled where the lines run together) tells no line in it apart.
        if (style.width > BUNCH_MODEL_PX) continue;
        const from = base[base.length - 1] as Px;
        const course = courseAhead(base, from, tangentAt(base, base.length - 1, 1), style, maxGap, BUNCH_REACH_PX).filter((c) => !frame || insideFramePx(c.at, frame, image.scale, style.width));
        beyond = throughBunch(image, style, inImage(image, course), counter, (p) => inkOnCourse(image, style, p, counter), runsOn(base));
        if (beyond) {
          kept = upTo;
          break;
        }
      }
      if (!again && !beyond) break;
      const cut = kept < all.length;
      out.length -= all.length - kept;
      all.length = kept;
      if (beyond) {
        const last = all[all.length - 1] as Px;
        resumed = out.length;
        const carried = bridge(last, tangentAt(all, all.length - 1, 1), beyond.at, beyond.heading, stepping(style.width).step);
        if (!doubts.some((d) => d.what === 'bunch-end')) doubts.push({ at: last, what: 'bunch-end' });
        all.push(...carried, beyond.at);
        out.push(...carried, beyond.at);
        end = beyond.at;
        heading = beyond.heading;
        continue;
      }
      if (!again) break;
      // Taken up past a bunch on the course from before it: nothing vouches that it came out on its own line.
      if (cut && !doubts.some((d) => d.what === 'bunch-end')) doubts.push({ at: all[all.length - 1] as Px, what: 'bunch-end' });
      // Found beyond a gap's length (past what hid it): another line of its colour close beside
      // the place would have passed the same test.
      if (again.far && !doubts.some((d) => d.what === 'gap-beside')) {
        const probe = pairs(followLine(image, style, again.at, again.heading, undefined, { maxGap: 2 * stepping(style.width).step, maxTravel: pieceLength(style.width) }, counter).points);
        const lastSeen = all[all.length - 1] as Px;
        if (probe.length >= 2 && besideAnother(image, style, probe, acrossDrift(style, Math.hypot(again.at[0] - lastSeen[0], again.at[1] - lastSeen[1])), counter)) doubts.push({ at: again.at, what: 'gap-beside' });
      }
      end = again.at;
      heading = again.heading;
      resumed = out.length;
      all.push(end);
      out.push(end);
    }
    return out;
  };
  const tail = outward(path);
  const head = outward([...path].reverse());
  // Each end's whole stretch beyond its outermost guide, not only each piece followed on it: a
  // line that runs together with a neighbour from the guide to its end came out of no bunch
  // and ended in none piece by piece, yet nothing tells the two lines apart there.
  if (!doubts.some((d) => d.what === 'bunch-end')) {
    const step = stepping(traced.width).step;
    for (const stretch of [[path[path.length - 1] as Px, ...tail], [path[0] as Px, ...head]]) {
      // Looked at a step apart along the stretch: a follow across a dotted line's gaps keeps few points.
      const count = Math.ceil(pathLength(stretch, 0) / step) + 1;
      const dense = stretch.length >= 2 ? resampleEvenly(stretch.map(([x, y]) => sheetPoint(x, y)), Math.max(2, count)).map((q): Px => [q[0], q[1]]) : stretch;
      const crowded = crowdedAt(image, traced, dense, counter);
      if (crowded) {
        doubts.push({ at: crowded, what: 'bunch-end' });
        break;
      }
    }
  }
  path.unshift(...head.reverse());
  path.push(...tail);
  if (frame) clipToFrame(path, frame, image.scale, traced.width);
  return doubts;
}

/**
 * Places on the line's predicted course beyond `end`, a step apart from two steps out to
 * `AHEAD_WIDTHS` widths (at least `AHEAD_PX`, at most a gap): on the parabola through the last
 * stretch of `all`, or straight on along `heading` when that stretch is too short to fit one
 * (a trace of a single guide lost at once), each with the distance off the course that
 * `keepSmooth` would allow there.
 */
function courseAhead(all: readonly Px[], end: Px, heading: Px, style: LineStyle, maxGap: number, length?: number): CoursePoint[] {
  const window = smoothWindow(style.width);
  const course = parabolaThrough(all, window);
  const { step } = stepping(style.width);
  const limit = smoothLimit(style);
  const reach = length ?? Math.min(maxGap, Math.max(AHEAD_PX, AHEAD_WIDTHS * style.width));
  const out: CoursePoint[] = [];
  for (let d = 2 * step; d <= reach; d += step) {
    const [at, tangent] = course ? course(d) : [[end[0] + d * heading[0], end[1] + d * heading[1]] as Px, heading];
    // Straight on, the line's own bending carries it off the course by more as it goes.
    const allowed = limit + (course ? 0.03 : 0.08) * Math.max(0, d - window / 4);
    out.push({ at, tangent, allowed });
  }
  return out;
}

/** The course points that lie inside the image (a section there reads only pixels of the image), up to the first that does not. */
function inImage(image: RasterImage, course: readonly CoursePoint[]): CoursePoint[] {
  const k = course.findIndex((c) => c.at[0] < 1 || c.at[1] < 1 || c.at[0] > image.width - 1 || c.at[1] > image.height - 1);
  return k < 0 ? [...course] : course.slice(0, k);
}

/**
 * Least length, pixels and line widths, of the stretch a follow ran inside a bunch for its
 * course to be taken from before it: a shorter stretch bends the course little.
 */
const MERGE_CUT_PX = 30;
const MERGE_CUT_WIDTHS = 10;

/** Length, pixels, of course along which a line lost in a bunch is looked for where it stands apart again. */
const BUNCH_REACH_PX = 300;

/** Widest line model, pixels, that a line is carried through a bunch with: drawn curves are a few pixels wide at 300 dpi. */
const BUNCH_MODEL_PX = 8;

/** Reach, pixels and line widths (the model's, often a bunch's), of the course ahead on which a line's width is measured again. */
const AHEAD_PX = 60;
const AHEAD_WIDTHS = 20;

/**
 * Where an extension runs through a bunch: the first point of a stretch at least `BUNCH_WIDTHS`
 * line widths long where another clean run of the line's colour and width lies beside it (within
 * two widths of its edge), whether the extension goes on after it, ends inside it, or ends a
 * little past it (a label or a gap between, then a short piece: that piece may be a neighbour's).
 * There the follower may have come out on a neighbour, or ended on one, and nothing (no guide)
 * vouches for the line it kept to.
 */
function crowdedAt(image: RasterImage, style: LineStyle, points: readonly Px[], counter: ReadCounter): Px | undefined {
  if (points.length < 3) return undefined;
  const { spacing } = stepping(style.width);
  const near = 4 * style.width + 3;
  const n = Math.ceil((near + style.width) / spacing);
  const section = new Float64Array(2 * n + 1);
  const runs: Run[] = [];
  const lo = style.massRange[0] * style.width;
  const hi = Math.min(style.massRange[1], 1.2) * style.width;
  const bunch = BUNCH_WIDTHS * style.width;
  let start = -1;
  let startAlong = 0;
  let along = 0;
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1] as Px;
    const b = points[i] as Px;
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
    along += len;
    if (len === 0) continue;
    const nx = -(b[1] - a[1]) / len;
    const ny = (b[0] - a[0]) / len;
    if (style.reach) sampleLongSection(image, style.model, b[0], b[1], nx, ny, n, spacing, style.reach, section, counter);
    else sampleSection(image, style.model, b[0], b[1], nx, ny, n, spacing, section, counter);
    const beside = findRuns(section, n, spacing, style.threshold, runs).some(
      (r) => (Math.abs(r.centre) > 0.75 * style.width && Math.abs(r.centre) <= near && r.mass >= lo && r.mass <= hi) || (r.start <= 0 && r.end >= 0 && r.mass > 1.6 * style.width && r.mass < 4 * style.width),
    );
    if (beside) {
      if (start < 0) {
        start = i;
        startAlong = along;
      }
    } else if (start >= 0) {
      // Out of a bunch long enough to count: a doubt, whatever follows.
      if (along - startAlong >= bunch) return points[start] as Px;
      start = -1;
    }
  }
  // Ends inside the bunch: the line it ends on may be a neighbour that ran on beside it.
  if (start >= 0 && along - startAlong >= bunch) return points[start] as Px;
  return undefined;
}

/** Length of a path from point k to its end. */
function pathLength(points: readonly Px[], k: number): number {
  let total = 0;
  for (let i = k + 1; i < points.length; i++) total += Math.hypot((points[i] as Px)[0] - (points[i - 1] as Px)[0], (points[i] as Px)[1] - (points[i - 1] as Px)[1]);
  return total;
}

/** Length of a stretch, in line widths, where an extension running beside another line of its colour counts as a bunch. */
const BUNCH_WIDTHS = 10;

/** Least length, pixels (or 12 line widths), of a line found again beyond a gap: a drawn curve goes on, a label's stroke does not. */
const FOUND_AGAIN_PX = 40;

/** Longest gap, pixels (or line widths when more), bridged on the prediction alone on a try with a model measured again. */
const RETRY_GAP_PX = 80;
const RETRY_GAP_WIDTHS = 25;

/** Times an extension may find its line again after losing it. */
const MAX_REACQUIRE = 4;

/**
 * Where the line shows again along its own course beyond the end of `all`: the parabola through
 * its last stretch is followed on in steps, and at each a section across it looks for one clean
 * run of the line's colour and width within the tolerance `keepSmooth` allows at that distance,
 * with no other candidate near. A candidate counts only when the line followed from it for a
 * short way keeps to the same course. Where ink lies along the course (a label written over the
 * line), the search runs on to `maxGap` past it (`OBSTACLE_REACH` gaps at most); a line found
 * beyond `maxGap` must start right after that ink and head along the course (`FAR_TURN`), and
 * `far` says so. Undefined when nothing qualifies.
 */
function reacquire(image: RasterImage, style: LineStyle, all: readonly Px[], maxGap: number, frame: readonly [number, number, number, number] | undefined, counter: ReadCounter, beyond = 0): { at: Px; heading: Px; far: boolean } | undefined {
  const window = smoothWindow(style.width);
  const course = parabolaThrough(all, window);
  if (!course) return undefined;
  const { step, spacing } = stepping(style.width);
  const limit = smoothLimit(style);
  const runs: Run[] = [];
  const pick: Pick = { offset: 0, clean: false };
  // Ink on the course (a label written over the line, a crossing, a bunch) hides the line for as
  // long as it lasts: the search runs a gap beyond it, up to `OBSTACLE_REACH` gaps in all.
  let reach = maxGap;
  const farthest = OBSTACLE_REACH * maxGap;
  let inkFrom = -1;
  let inkTo = -1;
  const maxN = Math.ceil((limit + 0.03 * farthest + 2 * style.width + 2) / spacing) + 1;
  const section = new Float64Array(2 * maxN + 1);
  for (let d = 2 * step; d <= reach; d += step) {
    const [p, t] = course(d);
    if (p[0] < 1 || p[1] < 1 || p[0] > image.width - 1 || p[1] > image.height - 1) return undefined;
    if (frame && !insideFramePx(p, frame, image.scale, style.width)) return undefined;
    if (inkOnCourse(image, style, p, counter)) {
      if (inkFrom < 0 || d - inkTo > 2 * step) inkFrom = d;
      inkTo = d;
      // A stretch of ink along the course, not a line across it: what hides the line.
      if (inkTo - inkFrom >= Math.max(10, 4 * style.width)) reach = Math.min(farthest, Math.max(reach, inkTo + maxGap));
    }
    // Within `beyond` of the end only ink on the course is noted (a line taken up there would be
    // the bunch the trace was cut back from).
    if (d < beyond) continue;
    const allowed = limit + 0.03 * Math.max(0, d - window / 4);
    const n = Math.min(maxN, Math.ceil((allowed + 2 * style.width + 2) / spacing));
    const nx = -t[1];
    const ny = t[0];
    if (style.reach) sampleLongSection(image, style.model, p[0], p[1], nx, ny, n, spacing, style.reach, section, counter);
    else sampleSection(image, style.model, p[0], p[1], nx, ny, n, spacing, section, counter);
    if (chooseOffset(findRuns(section, n, spacing, style.threshold, runs), style, allowed, pick) !== 'found' || !pick.clean) continue;
    // Beyond a gap's length only right after what hid it: a label written over a line is cut out
    // of it with a small margin, and the line goes on at once.
    if (d > maxGap && d - inkTo > Math.max(15, 6 * style.width)) continue;
    const at: Px = [p[0] + nx * pick.offset, p[1] + ny * pick.offset];
    const probe = followLine(image, style, at, t, undefined, { maxGap: 2 * step, maxTravel: Math.max(24, 8 * style.width) }, counter);
    const seen = pairs(probe.points);
    const first = seen[0] as Px;
    const lastSeen = seen[seen.length - 1] as Px;
    if (seen.length < RESUME_POINTS || Math.hypot(lastSeen[0] - first[0], lastSeen[1] - first[1]) < Math.max(10, 4 * style.width)) continue;
    if (keepSmooth(all, seen, style, 0).length < seen.length) continue;
    // Past what hid it, the course is predicted far ahead: the piece must also head along it.
    if (d > maxGap) {
      const chord = Math.hypot(lastSeen[0] - first[0], lastSeen[1] - first[1]);
      if (((lastSeen[0] - first[0]) * t[0] + (lastSeen[1] - first[1]) * t[1]) / chord < Math.cos(FAR_TURN)) continue;
    }
    return { at, heading: t, far: d > maxGap };
  }
  return undefined;
}

/** How far, in maximum gaps, the search for a lost line runs on past ink that lies on its course. */
const OBSTACLE_REACH = 2;

/** Largest angle, radians (about 6°), between the course and a line taken up past what hid it. */
const FAR_TURN = 0.1;

/**
 * Whether ink of any colour (at least half the line's contrast with the paper) lies within a
 * line width (2 px at least) of a point on the line's course.
 */
function inkOnCourse(image: RasterImage, style: LineStyle, p: Px, counter: ReadCounter): boolean {
  const paper = style.model.paper;
  const wanted = 0.5 * colourDistance(paper, ...style.model.line);
  const [x0, y0, x1, y1] = windowAround(image, p[0], p[1], Math.max(2, style.width));
  const { data, width } = image;
  counter.reads += (x1 - x0) * (y1 - y0);
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const i = (y * width + x) * 4;
      if (colourDistance(paper, data[i] as number, data[i + 1] as number, data[i + 2] as number) >= wanted) return true;
    }
  }
  return false;
}

/**
 * The part of an extension that continues the line smoothly: each point must lie within about
 * half a line width of the parabola through the last `window` pixels of accepted line before it
 * (in the frame of their chord), the tolerance growing slowly with the distance from the last
 * accepted point. A drawn curve is smooth; what the follower picks up on the way (a label on the
 * line, a crossing iso-line, a grid line) bends away from that parabola. Such a stretch is left
 * out when the line is seen again on its own course beyond it, within `maxSkip` pixels;
 * otherwise the extension is cut at the stretch's start (the line's own end, or a neighbour it
 * ran into).
 *
 * The line counts as seen again in either of two ways: `RESUME_POINTS` points and `resumeLength`
 * pixels each close to the parabola (a short break), or, with `across` given, a continuous piece
 * of ink at least `pieceLength(width)` long that continues the line across the break (see
 * `continuesAcross`): over a longer break (a label written on the line, a crossing, a worn
 * stretch of a scan) the parabola alone drifts by more than the point test allows, while the
 * piece beyond, taken as a whole, still shows the line's own position and direction. A piece
 * taken up where another line of the colour runs close beside it is kept with a doubt.
 */
function keepSmooth(base: readonly Px[], extension: readonly Px[], style: LineStyle, maxSkip: number, across?: { image: RasterImage; counter: ReadCounter; doubts: EndDoubt[] }): Px[] {
  const width = style.width;
  const limit = smoothLimit(style);
  const window = smoothWindow(width);
  const shortWindow = Math.max(30, 10 * width);
  const resumeLength = Math.max(10, 4 * width);
  const all: Px[] = [...base];
  const kept: Px[] = [];
  let resume: Px[] = [];
  let shortOnly = false;
  const resumeLengthShort = Math.max(40, 15 * width);
  let skippedFrom: Px | undefined;
  // The continuous piece of ink seen since the line went off course (a candidate for `continuesAcross`).
  let piece: Px[] = [];
  const joined = 2.5 * stepping(width).step;
  const wanted = pieceLength(width);
  const takeUp = (points: readonly Px[]) => {
    all.push(...points);
    kept.push(...points);
    resume = [];
    piece = [];
    shortOnly = false;
    skippedFrom = undefined;
  };
  for (const p of extension) {
    const last = all[all.length - 1] as Px;
    if (across && skippedFrom) {
      const prev = piece[piece.length - 1];
      if (prev && Math.hypot(p[0] - prev[0], p[1] - prev[1]) > joined) piece = [];
      piece.push(p);
      while (piece.length >= RESUME_POINTS && pathLength(piece, 0) >= wanted) {
        const verdict = continuesAcross(all, piece, style, across.image, across.counter);
        if (verdict === 'off') {
          piece.shift();
          continue;
        }
        if (besideAnother(across.image, style, piece, acrossDrift(style, Math.hypot((piece[0] as Px)[0] - last[0], (piece[0] as Px)[1] - last[1])), across.counter) && !across.doubts.some((d) => d.what === 'gap-beside')) across.doubts.push({ at: piece[0] as Px, what: 'gap-beside' });
        takeUp(piece);
        break;
      }
      if (!skippedFrom) continue;
    }
    // Judged on a long stretch (steady over a gap) and on a short one (where the line bends fast,
    // near an efficiency peak): either may vouch for the point. A point the short one alone vouches
    // for after a gap (the label on a line's end also lies after a gap, and bends gently) must hold
    // for longer before the line counts as found again.
    const away = Math.hypot(p[0] - last[0], p[1] - last[1]);
    const tolerance = limit + 0.03 * Math.max(0, away - window / 4);
    const longOk = offParabola(all, window, p) <= tolerance;
    if (longOk || offParabola(all, shortWindow, p) <= tolerance) {
      if (!skippedFrom && (longOk || away <= Math.max(6, 3 * width))) {
        all.push(p);
        kept.push(p);
        continue;
      }
      if (!skippedFrom) {
        skippedFrom = last;
        if (across) piece = [p];
      }
      resume.push(p);
      if (!longOk) shortOnly = true;
      const r0 = resume[0] as Px;
      if (resume.length >= RESUME_POINTS && Math.hypot(p[0] - r0[0], p[1] - r0[1]) >= (shortOnly ? resumeLengthShort : resumeLength)) takeUp(resume);
      continue;
    }
    shortOnly = false;
    resume = [];
    if (!skippedFrom) {
      skippedFrom = last;
      if (across) piece = [p];
    }
    if (Math.hypot(p[0] - skippedFrom[0], p[1] - skippedFrom[1]) > maxSkip) break;
  }
  return kept;
}

/** Length, pixels, of a continuous piece of ink judged as a whole for continuing a line across a break. */
const pieceLength = (width: number) => Math.max(30, 10 * width);

/**
 * Whether `piece` (continuous ink beyond a break) continues the line that `all` ends with, as a
 * drawn curve runs on across a label or a gap in its ink: the piece runs along the parabola
 * through the line before the break (the slope of its offsets from it small: `ACROSS_SLOPE`, plus
 * what half a smoothness limit of scatter at its ends makes of it), near it where it starts
 * (`acrossDrift`), and carries about as much of the line's colour across it (`ACROSS_INK`). The
 * parabola carries the line's own bending over the break. The line's last stretch before the
 * break may be bent by what broke it, so the course is also taken from where that stretch begins.
 * Only across a break longer than five widths (and 15 px): across a shorter one, the points
 * themselves are judged (keepSmooth).
 */
function continuesAcross(all: readonly Px[], piece: readonly Px[], style: LineStyle, image: RasterImage, counter: ReadCounter): 'on' | 'off' {
  const a = all[all.length - 1] as Px;
  const b = piece[0] as Px;
  if (Math.hypot(b[0] - a[0], b[1] - a[1]) < Math.max(15, 5 * style.width)) return 'off';
  if (runsOnAcross(all, piece, style)) return sameInk(all, piece, style, image, counter) ? 'on' : 'off';
  // The line's last stretch before the break may be bent by what broke it (a label's strokes, a
  // crossing, a guide clicked on the label): judged again from where that stretch begins.
  const trim = Math.max(12, 4 * style.width);
  let k = all.length - 1;
  while (k > 0 && pathLength(all, k - 1) < trim) k--;
  const earlier = all.slice(0, k);
  return runsOnAcross(earlier, piece, style) && sameInk(all, piece, style, image, counter) ? 'on' : 'off';
}

/** The course test of `continuesAcross`: the piece runs along the parabola through the line's end, near it. */
function runsOnAcross(all: readonly Px[], piece: readonly Px[], style: LineStyle): boolean {
  const window = smoothWindow(style.width);
  const fit = fitParabola(all, window);
  if (!fit) return false;
  const a = all[all.length - 1] as Px;
  const b = piece[0] as Px;
  const z = piece[piece.length - 1] as Px;
  const chord = Math.hypot(z[0] - b[0], z[1] - b[1]);
  if (chord <= 0) return false;
  const gap = Math.hypot(b[0] - a[0], b[1] - a[1]);
  // Along the course: where the piece starts, seen from the line's end.
  const along = (b[0] - a[0]) * fit.ux + (b[1] - a[1]) * fit.uy;
  if (along <= 0) return false;
  // Signed offsets of the piece's points from the parabola: the piece must run along it (about
  // parallel) and near it (where it starts, within the drift allowed).
  const limit = smoothLimit(style);
  const { ux, uy } = fit;
  const offsets = piece.map((p) => {
    const t = ((p[0] - a[0]) * ux + (p[1] - a[1]) * uy) / window;
    return -(p[0] - a[0]) * uy + (p[1] - a[1]) * ux - (fit.a + fit.b * t + fit.c * t * t);
  });
  // Least-squares line through the offsets against the distance along the piece: its level (the
  // offset where the piece starts) and its slope (the piece's heading against the course's).
  const along0: number[] = [0];
  for (let i = 1; i < piece.length; i++) along0.push((along0[i - 1] as number) + Math.hypot((piece[i] as Px)[0] - (piece[i - 1] as Px)[0], (piece[i] as Px)[1] - (piece[i - 1] as Px)[1]));
  const n = piece.length;
  const ms = along0.reduce((x, y) => x + y, 0) / n;
  const mo = offsets.reduce((x, y) => x + y, 0) / n;
  let sso = 0;
  let sss = 0;
  for (let i = 0; i < n; i++) {
    sso += ((along0[i] as number) - ms) * ((offsets[i] as number) - mo);
    sss += ((along0[i] as number) - ms) ** 2;
  }
  const slope = sss > 0 ? sso / sss : Infinity;
  const level = mo - slope * ms;
  return Math.abs(level) <= acrossDrift(style, gap) && Math.abs(slope) <= ACROSS_SLOPE + (0.5 * limit) / chord;
}

/** The ink test of `continuesAcross`: about as much of the line's colour across the piece as across the line before it. */
function sameInk(all: readonly Px[], piece: readonly Px[], style: LineStyle, image: RasterImage, counter: ReadCounter): boolean {
  // The same ink: a lighter or thinner line (a grid line, another curve) that the colour model
  // still admits carries clearly less of the line's colour across it, a bolder one more.
  const before = inkAcross(image, style, all.slice(-Math.max(RESUME_POINTS, Math.round(piece.length))), counter);
  const after = inkAcross(image, style, piece, counter);
  return before > 0 && after > 0 && after / before >= 1 / ACROSS_INK && after / before <= ACROSS_INK;
}

/**
 * How far, pixels, the start of a piece beyond a break of `gap` pixels may lie off the parabola
 * through the line before it: the smoothness limit, a line width (where the line thins or
 * thickens at the break, its centre moves), and about 1° of heading per pixel of break (0.02 px/px).
 */
const acrossDrift = (style: LineStyle, gap: number) => smoothLimit(style) + style.width + 0.02 * gap;

/** Largest ratio between the ink across a piece beyond a break and across the line before it. */
const ACROSS_INK = 1.4;

/**
 * How much of the line's colour a stretch of line carries across it: the median, over up to
 * seven points, of the mass (membership integrated across, pixels) of the run nearest the point
 * in a section across the stretch's chord. 0 when no run lies within a width of the points.
 */
function inkAcross(image: RasterImage, style: LineStyle, points: readonly Px[], counter: ReadCounter): number {
  if (points.length < 2) return 0;
  const { spacing } = stepping(style.width);
  const n = Math.ceil((2 * style.width + 2) / spacing);
  const section = new Float64Array(2 * n + 1);
  const runs: Run[] = [];
  const b = points[0] as Px;
  const z = points[points.length - 1] as Px;
  const chord = Math.hypot(z[0] - b[0], z[1] - b[1]) || 1;
  const nx = -(z[1] - b[1]) / chord;
  const ny = (z[0] - b[0]) / chord;
  const masses: number[] = [];
  const count = Math.min(7, points.length);
  for (let k = 0; k < count; k++) {
    const at = points[Math.floor((k * (points.length - 1)) / Math.max(1, count - 1))] as Px;
    if (style.reach) sampleLongSection(image, style.model, at[0], at[1], nx, ny, n, spacing, style.reach, section, counter);
    else sampleSection(image, style.model, at[0], at[1], nx, ny, n, spacing, section, counter);
    let best: Run | undefined;
    for (const r of findRuns(section, n, spacing, style.threshold, runs)) if (Math.abs(r.centre) <= style.width + 1 && (!best || Math.abs(r.centre) < Math.abs(best.centre))) best = r;
    masses.push(best ? best.mass : 0);
  }
  masses.sort((x, y) => x - y);
  return masses[Math.floor(masses.length / 2)] as number;
}

/**
 * How much, px per px along it, the offsets of a piece beyond a break from the line's parabola may
 * grow (its heading differ from the course's: about 2°), besides what half a smoothness limit of
 * scatter at its ends makes of it.
 */
const ACROSS_SLOPE = 0.035;

/**
 * Whether another line of the traced colour and width runs close beside the start of a piece taken
 * up across a break (within twice the position tolerance `drift` and two widths, or four widths
 * and 4 px): the prediction across the break could as well have led to that line, so the piece
 * may belong to it rather than to the traced one. Sections across the piece at its start and its
 * middle.
 */
function besideAnother(image: RasterImage, style: LineStyle, piece: readonly Px[], drift: number, counter: ReadCounter): boolean {
  const { spacing } = stepping(style.width);
  const near = Math.max(4 * style.width + 4, 2 * drift + 2 * style.width);
  const n = Math.ceil((near + style.width) / spacing);
  const section = new Float64Array(2 * n + 1);
  const runs: Run[] = [];
  const lo = style.massRange[0] * style.width;
  const hi = Math.min(style.massRange[1], 1.2) * style.width;
  const b = piece[0] as Px;
  const z = piece[piece.length - 1] as Px;
  const chord = Math.hypot(z[0] - b[0], z[1] - b[1]) || 1;
  const nx = -(z[1] - b[1]) / chord;
  const ny = (z[0] - b[0]) / chord;
  for (const at of [b, piece[Math.floor(piece.length / 2)] as Px]) {
    if (style.reach) sampleLongSection(image, style.model, at[0], at[1], nx, ny, n, spacing, style.reach, section, counter);
    else sampleSection(image, style.model, at[0], at[1], nx, ny, n, spacing, section, counter);
    if (findRuns(section, n, spacing, style.threshold, runs).some((r) => Math.abs(r.centre) > 1.25 * style.width && Math.abs(r.centre) <= near && r.mass >= lo && r.mass <= hi)) return true;
  }
  return false;
}

/** Points seen again on the line's course after a stretch off it, before the line counts as resumed. */
const RESUME_POINTS = 5;

/**
 * How far, pixels, a point of an extension may lie off the parabola through the line before it:
 * about half a line width; more for a dashed or dotted line, whose centre is found from the dash
 * nearest each section and wanders by a fraction of a width more.
 */
const smoothLimit = (style: LineStyle) => (style.reach ? Math.max(1.6, 0.8 * style.width) : Math.max(1.2, 0.6 * style.width));

/** Length of line, pixels, over which the smoothness of an extension is judged. */
const smoothWindow = (width: number) => Math.max(100, 25 * width);

/**
 * How far `p` lies off the least-squares parabola through the points of `all` within `window`
 * pixels (along the path) of its end, in the frame of their chord; 0 when too few points or
 * too short a chord make the parabola meaningless.
 */
function offParabola(all: readonly Px[], window: number, p: Px): number {
  const fit = fitParabola(all, window);
  if (!fit) return 0;
  const { last, ux, uy, a, b, c } = fit;
  const t = ((p[0] - last[0]) * ux + (p[1] - last[1]) * uy) / window;
  const y = -(p[0] - last[0]) * uy + (p[1] - last[1]) * ux;
  return Math.abs(y - (a + b * t + c * t * t));
}

/**
 * The course of the line beyond the end of `all`: for a distance d along the chord of its last
 * `window` pixels, the point on their least-squares parabola and the unit tangent there.
 */
function parabolaThrough(all: readonly Px[], window: number): ((d: number) => [Px, Px]) | undefined {
  const fit = fitParabola(all, window);
  if (!fit) return undefined;
  const { last, ux, uy, a, b, c } = fit;
  return (d: number) => {
    const t = d / window;
    const y = a + b * t + c * t * t;
    const slope = (b + 2 * c * t) / window;
    const norm = Math.hypot(1, slope);
    return [
      [last[0] + d * ux - y * uy, last[1] + d * uy + y * ux],
      [(ux - uy * slope) / norm, (uy + ux * slope) / norm],
    ];
  };
}

/** Least-squares parabola y = a + b·t + c·t² (t = along / window) through the last `window` pixels of a path, in the frame of their chord. */
function fitParabola(all: readonly Px[], window: number): { last: Px; ux: number; uy: number; a: number; b: number; c: number } | undefined {
  let k = all.length - 1;
  let length = 0;
  while (k > 0 && length < window) {
    const a = all[k - 1] as Px;
    const b = all[k] as Px;
    length += Math.hypot(b[0] - a[0], b[1] - a[1]);
    k--;
  }
  if (all.length < 2) return undefined;
  const first = all[k] as Px;
  const last = all[all.length - 1] as Px;
  const chord = Math.hypot(last[0] - first[0], last[1] - first[1]);
  if (all.length - k < 6 || chord <= 0.5 * window) return undefined;
  const ux = (last[0] - first[0]) / chord;
  const uy = (last[1] - first[1]) / chord;
  const m = [0, 0, 0, 0, 0, 0, 0, 0];
  for (let i = k; i < all.length; i++) {
    const q = all[i] as Px;
    const t = ((q[0] - last[0]) * ux + (q[1] - last[1]) * uy) / window;
    const y = -(q[0] - last[0]) * uy + (q[1] - last[1]) * ux;
    m[0]! += 1;
    m[1]! += t;
    m[2]! += t * t;
    m[3]! += t * t * t;
    m[4]! += t * t * t * t;
    m[5]! += y;
    m[6]! += t * y;
    m[7]! += t * t * y;
  }
  const [n, s1, s2, s3, s4, y0, y1, y2] = m as [number, number, number, number, number, number, number, number];
  const det = n * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
  if (Math.abs(det) <= 1e-12) return undefined;
  const a = (y0 * (s2 * s4 - s3 * s3) - s1 * (y1 * s4 - s3 * y2) + s2 * (y1 * s3 - s2 * y2)) / det;
  const b = (n * (y1 * s4 - s3 * y2) - y0 * (s1 * s4 - s3 * s2) + s2 * (s1 * y2 - y1 * s2)) / det;
  const c = (n * (s2 * y2 - y1 * s3) - s1 * (s1 * y2 - y1 * s2) + y0 * (s1 * s3 - s2 * s2)) / det;
  return { last, ux, uy, a, b, c };
}

/** A trace as the take-off file gives it: explicit points (used as is) or guides to follow. */
export type RasterTraceInput = { points: readonly SheetPoint[] } | { guides: readonly SheetPoint[] };

/** Captures one trace on a raster sheet: explicit points are returned unchanged; guides are followed. */
export function captureRasterTrace(image: RasterImage, trace: RasterTraceInput, options: RasterTraceOptions = {}): RasterTraceResult {
  if ('points' in trace) {
    return { points: [...trace.points], lost: [], line: { colour: [0, 0, 0], paper: [255, 255, 255], widthPx: 0 }, pixelsRead: 0, doubts: [] };
  }
  return traceRaster(image, trace.guides, options);
}
