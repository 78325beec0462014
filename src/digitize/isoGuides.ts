/**
 * Iso-line guides clicked on a crossing. The natural place to click an iso-line is where it
 * meets a head curve, but there the ink under the guide is mostly the thick head curve, and a
 * line model sampled there follows the head curve. A guide within a line width or so of a
 * traced head curve is therefore moved a few head widths along the other ink that leaves the
 * crossing: on a circle around the guide, the ink that lies away from every head trace
 * belongs to the iso-line (or, fainter, to a grid line, which runs level or upright). Where the
 * trace has another guide some way off, the iso-line leaves the crossing towards it (within
 * BEYOND_TURN), so other ink leaving elsewhere (a curve of another quantity, a label) is not
 * taken for it; failing a run that way, the darkest run is taken as before. The
 * moved guide sits on the thin line alone, so the model is the thin line's; it still says
 * which line, and the trace runs to the line's own ends as before.
 *
 * Pure: reads an RGBA raster, returns sheet points.
 */
import { colourDistance, estimatePaper, MIN_CONTRAST } from './colour.ts';
import { nearestOnPolyline } from './polyline.ts';
import { sheetPoint, type SheetPoint } from './points.ts';
import type { RasterImage } from './raster.ts';

export interface CrossedLine {
  points: readonly SheetPoint[];
  /** Line width, sheet units. */
  width: number;
}

export interface MovedGuide {
  index: number;
  from: SheetPoint;
  to: SheetPoint;
}

/** A guide this close to a head trace (in its line widths, plus pixels for the click's scatter) sits on a crossing. */
const ON_LINE_WIDTHS = 1;
const ON_LINE_PX = 3;
/** Least angle (rad) a direction must keep from level and upright to rank above a grid line (about 6°). */
const GRID_ANGLE = 0.1;

export function guidesOffCrossings(image: RasterImage, guides: readonly SheetPoint[], lines: readonly CrossedLine[]): { guides: SheetPoint[]; moved: MovedGuide[] } {
  const out = [...guides];
  const moved: MovedGuide[] = [];
  const s = image.scale;
  const usable = lines.filter((l) => l.points.length >= 2 && l.width > 0);
  if (usable.length === 0) return { guides: out, moved };
  guides.forEach((g, index) => {
    const near = usable.filter((l) => nearestOnPolyline(l.points, g).distance * s <= ON_LINE_WIDTHS * l.width * s + ON_LINE_PX);
    if (near.length === 0) return;
    const widest = Math.max(...near.map((l) => l.width * s));
    const centre: [number, number] = [g[0] * s, g[1] * s];
    const heading = towardsNeighbour(guides, index, s, Math.max(8, 3 * widest + 3) * NEIGHBOUR_RADII);
    const to = (heading && offCrossing(image, centre, widest, usable, s, heading)) ?? offCrossing(image, centre, widest, usable, s);
    if (!to) return;
    const p = sheetPoint(to[0] / s, to[1] / s);
    out[index] = p;
    moved.push({ index, from: g, to: p });
  });
  return { guides: out, moved };
}

/** A neighbouring guide at least this many circle radii away gives the iso-line's course at a guide on a crossing. */
const NEIGHBOUR_RADII = 2;

/**
 * Unit vector, pixels, from guide `index` towards the nearest other guide at least `least`
 * pixels off: the iso-line runs from a crossing towards the other guides on it, since they sit
 * on the same line. Undefined when no other guide is that far.
 */
function towardsNeighbour(guides: readonly SheetPoint[], index: number, s: number, least: number): [number, number] | undefined {
  const g = guides[index] as SheetPoint;
  let best: [number, number] | undefined;
  let bestD = Infinity;
  guides.forEach((o, k) => {
    const dx = (o[0] - g[0]) * s;
    const dy = (o[1] - g[1]) * s;
    const d = Math.hypot(dx, dy);
    if (k === index || d < least || d >= bestD) return;
    bestD = d;
    best = [dx / d, dy / d];
  });
  return best;
}

/** Largest turn, radians, between an iso-trace's direction at its end and the ink it is continued along beyond a head curve (about 35°). */
const BEYOND_TURN = 0.6;

/**
 * Where an iso-line goes on beyond a head curve it was followed up to: the trace ended at the
 * crossing `at` (sheet units) heading `dir` (a unit vector), where the thick head curve stopped
 * the follower. On a circle a few head widths around the crossing, the ink away from every
 * head trace that leaves it within BEYOND_TURN of that heading and runs on into the crossing
 * is the iso-line beyond; a guide there lets the trace go on. Undefined when none is found.
 */
export function guideBeyondCrossing(image: RasterImage, at: SheetPoint, dir: readonly [number, number], lines: readonly CrossedLine[]): SheetPoint | undefined {
  const s = image.scale;
  const usable = lines.filter((l) => l.points.length >= 2 && l.width > 0);
  const near = usable.filter((l) => nearestOnPolyline(l.points, at).distance * s <= ON_LINE_WIDTHS * l.width * s + ON_LINE_PX);
  if (near.length === 0) return undefined;
  const widest = Math.max(...near.map((l) => l.width * s));
  const to = offCrossing(image, [at[0] * s, at[1] * s], widest, usable, s, dir);
  return to && sheetPoint(to[0] / s, to[1] / s);
}

/**
 * The point, on a circle of a few head widths around `centre` (pixels), where the darkest ink
 * away from every head trace crosses it (only within BEYOND_TURN of `heading`, when given);
 * undefined when there is none.
 */
function offCrossing(image: RasterImage, centre: readonly [number, number], headWidth: number, lines: readonly CrossedLine[], s: number, heading?: readonly [number, number]): [number, number] | undefined {
  const radius = Math.max(8, 3 * headWidth + 3);
  const paper = estimatePaper(image, centre[0], centre[1], 2 * radius + 8);
  const steps = Math.max(48, Math.ceil((2 * Math.PI * radius) / 0.7));
  const contrast = new Float64Array(steps);
  const clear = new Uint8Array(steps);
  for (let k = 0; k < steps; k++) {
    const a = (2 * Math.PI * k) / steps;
    const x = centre[0] + radius * Math.cos(a);
    const y = centre[1] + radius * Math.sin(a);
    const xi = Math.floor(x);
    const yi = Math.floor(y);
    if (xi < 0 || yi < 0 || xi >= image.width || yi >= image.height) continue;
    const i = (yi * image.width + xi) * 4;
    contrast[k] = colourDistance(paper, image.data[i] as number, image.data[i + 1] as number, image.data[i + 2] as number);
    const p = sheetPoint(x / s, y / s);
    clear[k] = lines.every((l) => nearestOnPolyline(l.points, p).distance * s > 0.5 * l.width * s + 2) ? 1 : 0;
  }
  // Runs of ink on the circle, away from the head traces.
  const peak = Math.max(...contrast);
  const threshold = Math.max(MIN_CONTRAST, 0.25 * peak);
  let best: { angle: number; score: number } | undefined;
  let start = -1;
  // Start the walk at a sample without ink, so that no run is split by the wrap-around.
  let origin = 0;
  while (origin < steps && contrast[origin]! >= threshold) origin++;
  if (origin === steps) return undefined;
  for (let j = 1; j <= steps; j++) {
    const k = (origin + j) % steps;
    const ink = contrast[k]! >= threshold && clear[k] === 1;
    if (ink && start < 0) start = j;
    if ((!ink || j === steps) && start >= 0) {
      const end = ink ? j : j - 1;
      let top = 0;
      let sum = 0;
      for (let m = start; m <= end; m++) {
        const v = contrast[(origin + m) % steps]!;
        top = Math.max(top, v);
        sum += v * m;
      }
      let weight = 0;
      for (let m = start; m <= end; m++) weight += contrast[(origin + m) % steps]!;
      const mid = sum / weight;
      const angle = (2 * Math.PI * (origin + mid)) / steps;
      if (heading && Math.cos(angle) * heading[0] + Math.sin(angle) * heading[1] < Math.cos(BEYOND_TURN)) {
        start = -1;
        continue;
      }
      // The iso-line runs on into the crossing: ink all along the ray from the circle inwards.
      // Text, a label or a line passing by the crossing breaks off.
      const reach = rayInk(image, centre, angle, radius, paper, threshold, lines, s);
      if (reach < 0.8) {
        start = -1;
        continue;
      }
      // A grid line leaves the crossing level or upright; an iso-line seldom does.
      const squareness = Math.min(Math.abs(Math.sin(angle)), Math.abs(Math.cos(angle)));
      const score = top * (squareness < GRID_ANGLE ? 0.5 : 1);
      if (!best || score > best.score) best = { angle, score };
      start = -1;
    }
  }
  if (!best) return undefined;
  return [centre[0] + radius * Math.cos(best.angle), centre[1] + radius * Math.sin(best.angle)];
}

/**
 * Share of the ray from the circle (radius) in to a third of it, away from the head traces,
 * along which ink (within a pixel and a half across) reaches the threshold.
 */
function rayInk(image: RasterImage, centre: readonly [number, number], angle: number, radius: number, paper: readonly [number, number, number], threshold: number, lines: readonly CrossedLine[], s: number): number {
  const dx = Math.cos(angle);
  const dy = Math.sin(angle);
  let seen = 0;
  let inked = 0;
  for (let t = radius; t >= radius / 3; t -= 1) {
    const x = centre[0] + t * dx;
    const y = centre[1] + t * dy;
    const p = sheetPoint(x / s, y / s);
    if (!lines.every((l) => nearestOnPolyline(l.points, p).distance * s > 0.5 * l.width * s + 2)) continue;
    seen++;
    let top = 0;
    for (let a = -1.5; a <= 1.5; a += 0.5) {
      const xi = Math.floor(x - a * dy);
      const yi = Math.floor(y + a * dx);
      if (xi < 0 || yi < 0 || xi >= image.width || yi >= image.height) continue;
      const i = (yi * image.width + xi) * 4;
      top = Math.max(top, colourDistance(paper, image.data[i] as number, image.data[i + 1] as number, image.data[i + 2] as number));
    }
    if (top >= threshold) inked++;
  }
  return seen > 0 ? inked / seen : 0;
}
