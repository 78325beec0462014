/**
 * Faint coloured lines under a guide that sits on a grid line. A pale coloured curve drawn over a
 * denser grey grid is often fainter than the grid itself, and a guide clicked where the curve
 * crosses or runs along a grid line then samples the grid's grey (mixed with a little of the
 * curve's hue): the line model becomes grey, and the follower runs off along the grid line.
 *
 * Two tests put this right before a model is built: whether the ink of a sampled colour lies on a
 * grid line (`onGridLine`: a straight, near horizontal or vertical run of it over many line widths,
 * with a parallel twin, which no plotted curve has), and, if so, the colour of the most chromatic
 * ink of the sample's hue near the guide (`chromaticInk`), the coloured line's own colour. A third
 * (`brokenWhereUncovered`) keeps such a line solid: it loses its colour at every grid line it
 * crosses, which a dash test that reads only its colour takes for a dash pattern. Colours are
 * differences from the paper split into luma and chroma, as in `colour.ts`. Pure: works on the
 * RGBA buffer only.
 */
import { lumaChroma, windowAround, type InkModel, type Rgb } from './colour.ts';
import { centreFirst, inkPossible, membershipAt } from './lineProfile.ts';
import { dashReach } from './rasterEnds.ts';
import type { RasterImage } from './raster.ts';

/**
 * Half-length of the straight run, pixels, that makes ink a grid line: 40 px is 6.8 mm at 150 dpi
 * and 3.4 mm at 300 dpi, longer than the straight stretch of any pump curve at the grid spacing of
 * a performance sheet, and short enough to stay between two crossing grid lines' labels.
 */
const GRID_HALF_PX = 40;

/**
 * Tilts tried, radians, either side of exactly horizontal or vertical: a scan is rotated by up to
 * 2°, and a photo's keystone tilts the grid lines near the corners by a few degrees more; 5° in
 * steps of 1° covers both.
 */
const GRID_TILTS = [0, 1, -1, 2, -2, 3, -3, 4, -4, 5, -5].map((d) => (d * Math.PI) / 180);

/**
 * Half-width across the run, pixels, within which its ink is looked for at each position: a grid
 * line of one or two pixels, and the half-pixel by which the tilt steps above miss it at the ends.
 */
const GRID_ACROSS_PX = 1.5;

/**
 * Share of the positions along the run that must hold ink for it to be a grid line: a grid line
 * is unbroken except where labels sit on it; a curve that happens to run along one for part of
 * the stretch bends away before 90 % of it.
 */
const GRID_SHARE = 0.9;

/** Membership at which a sample counts as the ink's (as the follower's threshold). */
const INK = 0.4;

/**
 * Farthest and nearest offset, pixels, at which a grid line's parallel neighbour is looked for: the
 * grid of a performance sheet repeats every 2–10 mm (12–120 px at 150–300 dpi), and a neighbour
 * closer than 3 px is the same line's blur.
 */
const GRID_TWIN_MAX_PX = 120;
const GRID_TWIN_MIN_PX = 3;

/** The offsets across a grid run, every 0.5 px, the middle (0) first (any one with ink will do). */
const GRID_ACROSS = centreFirst(GRID_ACROSS_PX);

/**
 * Whether the ink of `model` holds along the straight run through (cx, cy) in the direction
 * (ux, uy): over 90 % of 2 × 40 px, within 1.5 px across.
 */
function straightRun(image: RasterImage, model: InkModel, cx: number, cy: number, ux: number, uy: number): boolean {
  const allowed = Math.floor((1 - GRID_SHARE) * (2 * GRID_HALF_PX + 1));
  let missed = 0;
  // The box the samples across fall in, a little wider than they reach.
  const ex = Math.abs(uy) * GRID_ACROSS_PX + 0.01;
  const ey = Math.abs(ux) * GRID_ACROSS_PX + 0.01;
  for (let t = -GRID_HALF_PX; t <= GRID_HALF_PX; t++) {
    // The samples across only where their pixels could hold ink (most places looked at for a
    // grid line's twin are paper), the middle one first.
    let ink = false;
    if (inkPossible(image, model, cx + ux * t - ex, cy + uy * t - ey, cx + ux * t + ex, cy + uy * t + ey, INK)) {
      for (const s of GRID_ACROSS) {
        if (membershipAt(image, model, cx + ux * t - uy * s, cy + uy * t + ux * s) >= INK) {
          ink = true;
          break;
        }
      }
    }
    if (!ink && ++missed > allowed) return false;
  }
  return true;
}

/**
 * Whether the ink of `model` at `centre` is on a grid line: a straight run within 5° of horizontal
 * or vertical through `centre`, holding the ink over 90 % of 2 × 40 px, with a parallel run of the
 * same ink 3–120 px to one side (the next line of the grid). A plotted curve may run straight and
 * level for a while, but it has no parallel twin of its own colour beside it.
 */
export function onGridLine(image: RasterImage, model: InkModel, centre: readonly [number, number]): boolean {
  for (const vertical of [false, true]) {
    for (const tilt of GRID_TILTS) {
      const a = vertical ? Math.PI / 2 + tilt : tilt;
      const ux = Math.cos(a);
      const uy = Math.sin(a);
      if (!straightRun(image, model, centre[0], centre[1], ux, uy)) continue;
      for (let d = GRID_TWIN_MIN_PX; d <= GRID_TWIN_MAX_PX; d++) {
        for (const side of [1, -1]) if (straightRun(image, model, centre[0] - uy * d * side, centre[1] + ux * d * side, ux, uy)) return true;
      }
      return false;
    }
  }
  return false;
}

/**
 * Least chroma, 0–255 units, of ink that counts as coloured: JPEG noise and the colour fringes of
 * its half-resolution chroma give grey ink up to about 5, and uneven light on tinted paper gives
 * patches of paper up to about 9 against the paper's mean colour; the palest coloured lines of the
 * random bed (a red 0.8 px wide at 150 dpi on tinted paper) keep 12 or more.
 */
const CHROMA_MIN = 10;

/**
 * Least chroma as a share of the ink's luma for it to count as coloured: grey ink has none, and a
 * blurred coloured line keeps at least a fifth (a thin purple one keeps about a quarter).
 */
const CHROMA_SHARE = 0.2;

/**
 * Least chroma, 0–255 units, of a grey sample for its hue to be told: half the least chroma of
 * coloured ink. A grey sample that mixes grid and a coloured line keeps 8–10 of the line's hue.
 */
const HUE_MIN = 4;

/**
 * Cosine between the chroma directions of a grey sample and of coloured ink, above which the ink
 * is of the hue mixed into the sample: the line's own pixels give 0.97–0.99 on the random bed, a
 * line of a neighbouring hue (a blue iso-line beside a purple curve) 0.7–0.75.
 */
const HUE_COS = 0.9;

/** Share of the most chromatic pixel's chroma that the pixels averaged into the colour keep. */
const CORE_SHARE = 0.8;

/**
 * The colour of the coloured line mixed into a grey `sample` taken near `p`: the most chromatic ink
 * within `radius` pixels of `p` of the sample's own hue (when the sample has any; else of any hue),
 * averaged with the pixels within 2 px of it of its hue and at least 80 % of its chroma. Undefined
 * when no pixel there is coloured (chroma at least 8 and a fifth of its luma).
 */
export function chromaticInk(image: RasterImage, paper: Rgb, sample: Rgb, p: readonly [number, number], radius: number): Rgb | undefined {
  const [x0, y0, x1, y1] = windowAround(image, p[0], p[1], radius);
  const { data, width } = image;
  const hue = lumaChroma(paper, ...sample);
  const sameHue = (c: { cx: number; cy: number; cz: number; chroma: number }, h: { cx: number; cy: number; cz: number; chroma: number }) =>
    c.cx * h.cx + c.cy * h.cy + c.cz * h.cz >= HUE_COS * c.chroma * h.chroma;
  let top: ReturnType<typeof lumaChroma> | undefined;
  let best = -1;
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      if (Math.hypot(x + 0.5 - p[0], y + 0.5 - p[1]) > radius) continue;
      const i = (y * width + x) * 4;
      const c = lumaChroma(paper, data[i] as number, data[i + 1] as number, data[i + 2] as number);
      if (c.chroma < CHROMA_MIN || c.chroma < CHROMA_SHARE * Math.abs(c.luma) || (top && c.chroma <= top.chroma)) continue;
      if (hue.chroma >= HUE_MIN && !sameHue(c, hue)) continue;
      top = c;
      best = y * width + x;
    }
  }
  if (!top) return undefined;
  const bx = best % width;
  const by = Math.floor(best / width);
  let r = 0;
  let g = 0;
  let b = 0;
  let n = 0;
  for (let y = Math.max(0, by - 2); y <= Math.min(image.height - 1, by + 2); y++) {
    for (let x = Math.max(0, bx - 2); x <= Math.min(width - 1, bx + 2); x++) {
      const i = (y * width + x) * 4;
      const c = lumaChroma(paper, data[i] as number, data[i + 1] as number, data[i + 2] as number);
      if (c.chroma < CORE_SHARE * top.chroma || !sameHue(c, top)) continue;
      r += data[i] as number;
      g += data[i + 1] as number;
      b += data[i + 2] as number;
      n++;
    }
  }
  return [r / n, g / n, b / n];
}

/**
 * Share of the line's own contrast with the paper (Euclidean RGB) from which other ink at a place
 * hides the line there: a grid line darker than half a faint line's contrast covers it where they
 * cross, while a grid line much paler than a dark line (a light grey grid under a black curve)
 * leaves a dash gap of that line a gap.
 */
const HIDES = 0.5;

/**
 * Whether a line found broken (dashed or dotted) under a guide is still broken when the places
 * where other, stronger ink covers it count as line: a solid faint line crossing a dense grid loses
 * its colour at each grid line and looks dashed, while a real gap in a dash pattern shows paper.
 * `axis` is the line's direction as the dash test found it; the row of samples is the same as the
 * dash test's (±max(40, 16 widths) px along the line, every 0.5 px, any sample across the width).
 */
export function brokenWhereUncovered(image: RasterImage, model: InkModel, centre: readonly [number, number], width: number, axis: readonly [number, number], threshold: number): number | undefined {
  const length = Math.max(40, 16 * width);
  const spacing = 0.5;
  const across = Math.max(1.5, 0.5 * width + 1);
  const paper = model.paper;
  const contrast = Math.hypot(model.ax, model.ay, model.az);
  const { data } = image;
  const on: boolean[] = [];
  for (let t = -length; t <= length; t += spacing) {
    let line = 0;
    let other = 0;
    for (let s = -across; s <= across; s += 0.5) {
      const x = centre[0] + axis[0] * t - axis[1] * s;
      const y = centre[1] + axis[1] * t + axis[0] * s;
      line = Math.max(line, membershipAt(image, model, x, y));
      const px = Math.floor(x);
      const py = Math.floor(y);
      if (px < 0 || py < 0 || px >= image.width || py >= image.height) continue;
      const i = (py * image.width + px) * 4;
      other = Math.max(other, Math.hypot(paper[0] - (data[i] as number), paper[1] - (data[i + 1] as number), paper[2] - (data[i + 2] as number)));
    }
    on.push(line >= threshold || other >= HIDES * contrast);
  }
  return dashReach(on, spacing, width);
}
