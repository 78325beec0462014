/**
 * Other traces' guides as marks the raster follower must not run over. A guide of another trace
 * says which line is that trace's where it was clicked; where that line stands alone there (no
 * other ink touches it), a trace of another line that passes over the guide has left its own
 * line for the other one: at a fork after a bunch it took the wrong branch, or it ran onto a
 * neighbour without a break. The stretch it followed on the other line is then found (the points
 * within a fraction of a width of that line, followed from the guide) so that the trace can be
 * cut where it joined it. Pure: pixel coordinates in and out.
 */
import { followLine, indexPath, nearestOnPath, stepping, type FollowResult, type LineStyle, type PathIndex } from './lineFollow.ts';
import { colourDistance, inkModel, membership, MIN_CONTRAST } from './colour.ts';
import type { ReadCounter } from './lineProfile.ts';
import type { RasterImage } from './raster.ts';

type Px = [number, number];

/** Another trace's guide, in pixels, with the stretch of its line near it once followed. */
export interface ForeignGuide {
  at: Px;
  /** Undefined until looked at; null when the line there is not one to avoid (not alone, or not seen). */
  line?: PathIndex | null;
}

/** The line under a guide, as the tracer measures it: its centre and direction, or undefined. */
export type Locate = (guide: Px) => { centre: Px; axis: Px } | undefined;
/** Room beside a line at a point, pixels (0 where other lines touch it). */
export type RoomAt = (centre: Px, axis: Px) => number;

/**
 * The other traces' guides that can tell this trace's line from another: inside the image, and
 * farther than `OWN_GUIDE_WIDTHS` line widths (and 8 px) from every guide of this trace (two
 * traces clicked close together sit where their lines run together, and say nothing).
 */
export function foreignGuides(siblings: readonly (readonly (readonly [number, number])[])[] | undefined, image: RasterImage, own: readonly Px[], width: number): ForeignGuide[] {
  if (!siblings) return [];
  const apart = Math.max(8, OWN_GUIDE_WIDTHS * width);
  const out: ForeignGuide[] = [];
  for (const list of siblings) {
    for (const g of list) {
      const at: Px = [g[0] * image.scale, g[1] * image.scale];
      if (!(at[0] >= 0 && at[1] >= 0 && at[0] <= image.width && at[1] <= image.height)) continue;
      if (own.some((o) => Math.hypot(o[0] - at[0], o[1] - at[1]) < apart)) continue;
      out.push({ at });
    }
  }
  return out;
}

/** Distance from this trace's guides, in line widths, within which another trace's guide says nothing. */
const OWN_GUIDE_WIDTHS = 4;

/**
 * The first place, at or after point `from` of `points`, where the path runs over another trace's
 * guide whose line stands alone there: `hit` is the point nearest the guide, `start` the first
 * point of the unbroken stretch, ending at `hit`, that lies on that guide's line. Undefined when
 * the path passes over no such guide.
 */
export function foreignRun(
  image: RasterImage,
  style: LineStyle,
  guides: ForeignGuide[],
  points: readonly Px[],
  from: number,
  locate: Locate,
  roomAt: RoomAt,
  counter: ReadCounter,
): { hit: number; start: number } | undefined {
  if (guides.length === 0 || points.length - from < 2) return undefined;
  const reach = Math.max(2.5, 1.25 * style.width);
  let best: { hit: number; start: number } | undefined;
  for (const g of guides) {
    // Cheap test first: the path comes near the guide at all.
    let hit = -1;
    let hitD = reach + 2;
    for (let i = from; i < points.length; i++) {
      const p = points[i] as Px;
      const d = Math.hypot(p[0] - g.at[0], p[1] - g.at[1]);
      if (d < hitD) {
        hitD = d;
        hit = i;
      }
    }
    if (hit < 0) continue;
    if (g.line === undefined) g.line = lineAt(image, style, g.at, locate, roomAt, counter);
    if (!g.line) continue;
    const on = (p: Px) => nearestOnPath(g.line as PathIndex, p[0], p[1]) >= 0;
    if (!on(points[hit] as Px)) continue;
    let start = hit;
    while (start - 1 >= from && on(points[start - 1] as Px)) start--;
    let end = hit;
    while (end + 1 < points.length && on(points[end + 1] as Px)) end++;
    // A line that crosses the other one shares a point with it, not a stretch.
    if (length(points, start, end) < Math.max(ALONG_PX, ALONG_WIDTHS * style.width)) continue;
    if (!best || hit < best.hit) best = { hit, start };
  }
  return best;
}

/** Least length of a path's stretch on another trace's line, pixels and line widths, for it to follow that line (not cross it). */
const ALONG_PX = 20;
const ALONG_WIDTHS = 8;

function length(points: readonly Px[], from: number, to: number): number {
  let total = 0;
  for (let i = from + 1; i <= to; i++) total += Math.hypot((points[i] as Px)[0] - (points[i - 1] as Px)[0], (points[i] as Px)[1] - (points[i - 1] as Px)[1]);
  return total;
}

/**
 * The stretch of the line under another trace's guide, followed with this trace's style both
 * ways from it up to where it runs into other ink (its first merge) or `SIBLING_TRAVEL_WIDTHS`
 * line widths (and 120 px), indexed within a fraction of a width; null when no line of this
 * trace's colour lies there, or it does not stand alone there.
 */
function lineAt(image: RasterImage, style: LineStyle, at: Px, locate: Locate, roomAt: RoomAt, counter: ReadCounter): PathIndex | null {
  // The ink clicked must be of this trace's colour: a guide on a line of another colour crossing
  // or running close to this trace's line locates this trace's own line a few pixels off, which
  // says nothing of the other trace's line (speed bench scan seed 24: a coloured line's guide where
  // it crosses the grey 2450 rpm efficiency line near their peaks cut that line there, 5.8 points off).
  if (!clickedOwnColour(image, style, at)) return null;
  const line = locate(at);
  if (!line) return null;
  if (Math.hypot(line.centre[0] - at[0], line.centre[1] - at[1]) > Math.max(3, 1.5 * style.width)) return null;
  if (roomAt(line.centre, line.axis) <= 0.5 || armsAround(image, style, line.centre) !== 2) return null;
  const { step } = stepping(style.width);
  const limits = { maxGap: 3 * step, maxTravel: Math.max(120, SIBLING_TRAVEL_WIDTHS * style.width) };
  const flat: number[] = [];
  for (const sign of [1, -1]) {
    const got = followLine(image, style, line.centre, [sign * line.axis[0], sign * line.axis[1]], undefined, limits, counter);
    const keep = got.merges.length > 0 ? (got.merges[0] as number) : got.points.length / 2;
    flat.push(...got.points.slice(0, 2 * keep));
  }
  if (flat.length < 8) return null;
  return indexPath(flat, Math.max(1.5, 0.75 * style.width));
}

/** Pixels around a guide in which its most contrasted ink (what was clicked) is looked for. */
const CLICK_RADIUS_PX = 1;

/**
 * Whether the most contrasted pixel within `CLICK_RADIUS_PX` of `at` (the ink clicked) is of the
 * trace's colour: at least half a member of its model, and of no clear hue when the model is grey.
 */
function clickedOwnColour(image: RasterImage, style: LineStyle, at: Px): boolean {
  const { data, width, height } = image;
  const paper = style.model.paper;
  let best = -1;
  let rgb: [number, number, number] = [0, 0, 0];
  for (let y = Math.floor(at[1]) - CLICK_RADIUS_PX; y <= Math.floor(at[1]) + CLICK_RADIUS_PX; y++) {
    for (let x = Math.floor(at[0]) - CLICK_RADIUS_PX; x <= Math.floor(at[0]) + CLICK_RADIUS_PX; x++) {
      if (x < 0 || y < 0 || x >= width || y >= height) continue;
      const i = (y * width + x) * 4;
      const c = colourDistance(paper, data[i] as number, data[i + 1] as number, data[i + 2] as number);
      if (c > best) {
        best = c;
        rgb = [data[i] as number, data[i + 1] as number, data[i + 2] as number];
      }
    }
  }
  if (best < 0) return false;
  // A grey model takes any dark ink in; a clicked colour of clear hue is another line's.
  if (style.model.mode !== 'chromatic' && inkModel(rgb, paper).mode === 'chromatic') return false;
  return membership(style.model, ...rgb) >= 0.5;
}

/**
 * How many arms of ink (of any colour, a tenth of the line's contrast with the paper or more) leave a
 * circle of `ARM_RADIUS_WIDTHS` line widths (and 8 px) around `centre`: two for a line standing
 * alone, more at a crossing, a fork or among lines running close together.
 */
function armsAround(image: RasterImage, style: LineStyle, centre: Px): number {
  const paper = style.model.paper;
  // Faint ink counts too: a thin iso-line or a light curve crossing there makes the guide a
  // crossing, whichever line it was meant for.
  const wanted = Math.max(MIN_CONTRAST, 0.1 * colourDistance(paper, ...style.model.line));
  const radius = Math.max(8, ARM_RADIUS_WIDTHS * style.width);
  const count = Math.ceil((2 * Math.PI * radius) / 0.75);
  const { data, width, height } = image;
  const ink: boolean[] = [];
  for (let k = 0; k < count; k++) {
    const a = (2 * Math.PI * k) / count;
    const x = Math.floor(centre[0] + radius * Math.cos(a));
    const y = Math.floor(centre[1] + radius * Math.sin(a));
    if (x < 0 || y < 0 || x >= width || y >= height) {
      ink.push(false);
      continue;
    }
    const i = (y * width + x) * 4;
    ink.push(colourDistance(paper, data[i] as number, data[i + 1] as number, data[i + 2] as number) >= wanted);
  }
  let arms = 0;
  for (let k = 0; k < count; k++) if (ink[k] && !ink[(k + count - 1) % count]) arms++;
  return arms === 0 && ink[0] ? 1 : arms;
}

/** Radius, in line widths, of the circle on which the arms of ink around another trace's guide are counted. */
const ARM_RADIUS_WIDTHS = 3;

/** How far, in line widths, another trace's line is followed from its guide. */
const SIBLING_TRAVEL_WIDTHS = 60;

/** Cuts a follow back to its first `count` accepted points (its track and merges with it); it no longer counts as reached. */
export function cutFollow(result: FollowResult, count: number, reason: string): void {
  const keep = Math.max(1, count);
  result.points.length = Math.min(result.points.length, 2 * keep);
  let t = 0;
  while (t < result.trackPoints.length && (result.trackPoints[t] as number) <= keep) t++;
  result.trackPoints.length = Math.max(1, t);
  result.track.length = 2 * result.trackPoints.length;
  while (result.merges.length > 0 && (result.merges[result.merges.length - 1] as number) >= keep) result.merges.pop();
  result.reached = false;
  delete result.met;
  result.reason = reason;
}
