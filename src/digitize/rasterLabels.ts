/**
 * Guides on a label printed over its line. Sheets often print a curve's label ("256 mm", "9.25 in",
 * "72 %") on the line itself, on a patch of paper that cuts the line for the width of the text.
 * A guide clicked on the label (the natural place to say "this curve") then samples the letters:
 * the model takes the glyphs' stroke for the line's, and the follower runs around the letters.
 *
 * `labelExits` tells such a guide by the picture around it: the ink nearest the guide is a small
 * closed shape (a glyph), one of a bounded row of shapes side by side, two or more of them letters
 * (as tall as one, upright strokes filling them, on one baseline), with no other ink over the row
 * or just above and below it (the patch), and two long lines, each one stroke, end near the row
 * from opposite sides, in line with each other and with the guide (and with the trace's course
 * from its other guides, where it has any). The guide then stands for two points on those lines a
 * little way out from the patch: they say the same line, and the line is followed from where it is
 * drawn. Anything less clear (one line only, no patch, a row that runs on like a dashed or dotted
 * line, dots or dashes run together, lines run together, lines that do not pass near the guide,
 * two lines the course does not tell apart) leaves the guide as it was.
 *
 * Pure: reads the RGBA buffer only.
 */
import { colourDistance, estimatePaper, MIN_CONTRAST, windowAround } from './colour.ts';
import { floodPiece } from './flood.ts';
import { sheetPoint, type SheetPoint } from './points.ts';
import type { RasterImage } from './raster.ts';

type Px = [number, number];

/** Half-size of the square looked at around the guide, pixels: a label of eight characters at 9 pt and 300 dpi is about 160 px wide. */
const WINDOW_PX = 110;

/**
 * Shares of the contrast of the ink under the guide at which a pixel is ink: half for the letters
 * (lower, the letters of a blurred label run together, and a dotted line's dots join up into
 * letter-sized pieces), a third or so for the lines about them (the letters are printed in their
 * line's colour, and the line, thinner than their strokes, reads fainter: at half, a thin line in
 * a photo broke into pieces where the grid was taken out from under it). A fainter line of another
 * colour stays out.
 */
const LETTER_SHARE = 0.5;
const INK_SHARE = 0.35;

/** How far from the edge of a stroke its darkest middle lies, pixels (a letter's stroke is 1–4 px wide). */
const STROKE_REACH_PX = 2;

/** Half-size of the square the paper's colour is taken from, pixels. */
const PAPER_PX = 40;

/** How far from the guide the ink under it is looked for, pixels (a click between two glyphs). */
const NEAR_PX = 8;

/** Glyph height, pixels: 6.5 pt digits at 150 dpi are about 9 px high; 11 pt capitals at 300 dpi about 45. */
const GLYPH_MIN_PX = 7;
const GLYPH_MAX_PX = 50;

/**
 * A piece is letters where its ink spans this share of its height, column by column, on average:
 * a digit's upright strokes and bowls span most of it (0.6–0.9); dots or dashes run together along
 * a sloping line, a band a dot wide (0.3 or so).
 */
const LETTER_FILL = 0.5;

/** Two letters of a row stand on one line where their feet lie within this share of a letter's height (a blurred scan moves an edge by a pixel or two). */
const LETTER_ALIGN = 0.2;

/** A piece of a row is as tall as a letter at this share of the tallest piece under the guide (lower-case letters are about 0.55 of a digit's height, a decimal point or an inch mark far less). */
const TALL_SHARE = 0.5;

/** Share of the glyph under the guide's height by which the other letters of its row may reach above or below it (a decimal point, an inch mark, a lower-case unit lie within). */
const ROW_SLACK = 0.35;

/** Two glyphs of one label stand apart by less than this share of the row's height (a word space is about 0.3 of the font size). */
const GLYPH_GAP = 0.9;

/** Paper kept around the row, share of its height, along which no other ink may run: the patch the label is printed on. */
const PATCH_MARGIN = 0.2;

/** How far past the row's box (share of its height) its letters may reach at the lines' lower threshold. */
const ROW_GROW = 0.15;

/** Pieces of ink of at most this many pixels are specks of noise. */
const SPECK_PX = 3;

/** Share of the row's width over which other ink in the patch runs along it: a line across the letters, no patch. */
const PATCH_CROSSED = 0.5;

/** How far from the row a cut line may end, share of the row's height plus pixels: the patch reaches past the letters by a third of their height or so, and farther past a faint last mark the letters' threshold leaves out (an inch mark). */
const EXIT_REACH = 1;
const EXIT_REACH_PX = 6;

/** A line is long when its ink spans more than this many row heights (or leaves the window). */
const LONG_SPAN = 2;

/**
 * A cut line is one stroke where no more than `OFF_STROKE_SHARE` of its ink out from the patch
 * lies farther than `STROKE_PX` from its straight way: a stroke 3 px wide, blurred by a scan to
 * 5 px, lies within 2.5 px of its middle, and a pump curve bends from its chord by under a pixel
 * over the two or three letter heights looked at; lines run together lie apart by their distance,
 * and a letter the line ran into holds a tenth or so of the ink there.
 */
const STROKE_PX = 3;
const OFF_STROKE_SHARE = 0.25;

/** Largest angle, radians (about 25°), between a cut line's own direction and the way across the label to the other cut line. */
const EXIT_TURN = 0.45;

/**
 * The most the way across the label of the line taken may turn from the trace's course (about 20°:
 * the chord between a curve's guides on either side turns from its direction at the label by less
 * on a performance sheet's gentle curves; a head curve falling under the label of a rising
 * efficiency curve's guide turns by more), and, where several lines pass under the label near the
 * guide, the least by which every other must turn farther (about 11°).
 */
const COURSE_TURN = 0.35;
const COURSE_MARGIN = 0.2;

/** Least distance, pixels, of another guide that gives the trace's course (a hurried second click a few pixels from the first gives none). */
const COURSE_MIN_PX = 40;

/**
 * How far off the straight way between the two cut lines the guide may lie, share of the row's
 * height plus pixels: a click on the line's course through the label (a curve bends from that
 * chord by a pixel or two), not on another line passing under the same label.
 */
const GUIDE_OFF = 0.3;
const GUIDE_OFF_PX = 3;

/**
 * The stretches of a cut line, distance from the row in row heights, whose ink gives its direction
 * out from the patch; the new guide sits in the near one. Both start a row height out: where the
 * patch is narrower than the text, the line runs into the last letter and joins it.
 */
const NEAR_BAND = [1.1, 1.9] as const;
const FAR_BAND = [1.9, 2.7] as const;

interface Component {
  pixels: number[];
  x0: number;
  y0: number;
  x1: number;
  y1: number;
  edge: boolean;
}

/** A label's patch, pixels: the row of letters with the margin of paper kept around it. */
export interface LabelBox {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** A guide (1-based) that sat on a label printed over its line, and the two places followed instead. */
export interface LabelGuide {
  guide: number;
  at: [SheetPoint, SheetPoint];
}

/**
 * The guides with each one on a label printed over its line replaced by the two places where the
 * line leaves the label, in order along the trace (the one nearer the previous guide first);
 * `numbers` gives the user's number (1-based) of each guide returned. Guides that are not finite
 * or lie off the image are kept as they are (the tracer says what is wrong with them).
 */
export function guidesOffLabels(image: RasterImage, guides: readonly SheetPoint[]): { guides: SheetPoint[]; numbers: number[]; offLabels: LabelGuide[]; boxes: LabelBox[] } {
  const out: SheetPoint[] = [];
  const numbers: number[] = [];
  const offLabels: LabelGuide[] = [];
  const boxes: LabelBox[] = [];
  guides.forEach((g, i) => {
    const p: Px = [g[0] * image.scale, g[1] * image.scale];
    const before = guides[i - 1];
    const after = guides[i + 1];
    // The course: from the nearest guide on either side that lies some way off (two guides a few
    // pixels apart give no direction), else from the guide itself.
    const away = (step: 1 | -1): SheetPoint | undefined => {
      for (let j = i + step; j >= 0 && j < guides.length; j += step) {
        const q = guides[j] as SheetPoint;
        if (Math.hypot(q[0] - g[0], q[1] - g[1]) * image.scale >= COURSE_MIN_PX) return q;
      }
      return undefined;
    };
    const from = away(-1) ?? g;
    const to = away(1) ?? g;
    const way = Math.hypot(to[0] - from[0], to[1] - from[1]);
    const course: Px | undefined = way > 0 ? [(to[0] - from[0]) / way, (to[1] - from[1]) / way] : undefined;
    const found = Number.isFinite(p[0]) && Number.isFinite(p[1]) && p[0] >= 0 && p[1] >= 0 && p[0] < image.width && p[1] < image.height ? labelExits(image, p, course) : undefined;
    if (!found) {
      out.push(g);
      numbers.push(i + 1);
      return;
    }
    const d = (a: Px, q: SheetPoint) => Math.hypot(a[0] - q[0] * image.scale, a[1] - q[1] * image.scale);
    const [a, b] = found.exits;
    boxes.push(found.box);
    const flip = before ? d(b, before) < d(a, before) : after ? d(a, after) < d(b, after) : b[0] < a[0];
    const pair = (flip ? [b, a] : [a, b]).map((q) => sheetPoint(q[0] / image.scale, q[1] / image.scale)) as [SheetPoint, SheetPoint];
    out.push(...pair);
    numbers.push(i + 1, i + 1);
    offLabels.push({ guide: i + 1, at: pair });
  });
  return { guides: out, numbers, offLabels, boxes };
}

/**
 * The two points where the line a guide's label is printed over leaves the label (see the file
 * comment), or undefined when the guide is not on such a label. Where several lines pass under the
 * label near the guide, `course` (a unit direction: the way from the trace's guide before to its
 * guide after) picks the one in line with it; without it, or when it does not clearly, undefined.
 * Pixel coordinates.
 */
export function labelExits(image: RasterImage, guide: Px, course?: Px): { exits: [Px, Px]; box: LabelBox } | undefined {
  const paper = estimatePaper(image, guide[0], guide[1], PAPER_PX);
  const { data, width } = image;
  const contrast = (x: number, y: number) => {
    const i = (y * width + x) * 4;
    return colourDistance(paper, data[i] as number, data[i + 1] as number, data[i + 2] as number);
  };
  // The ink under the guide sets the thresholds: `LETTER_SHARE` of its contrast for the letters,
  // `INK_SHARE` for the lines.
  // That ink is the one nearest the guide (a darker line's end beside the label does not count):
  // the strongest contrast within a stroke's reach of the nearest pixel that stands out at all.
  let at: Px | undefined;
  let atD = Infinity;
  for (let y = Math.max(0, Math.floor(guide[1] - NEAR_PX)); y < Math.min(image.height, Math.ceil(guide[1] + NEAR_PX)); y++) {
    for (let x = Math.max(0, Math.floor(guide[0] - NEAR_PX)); x < Math.min(width, Math.ceil(guide[0] + NEAR_PX)); x++) {
      const d = (x + 0.5 - guide[0]) ** 2 + (y + 0.5 - guide[1]) ** 2;
      if (d < atD && contrast(x, y) >= 2 * MIN_CONTRAST) {
        atD = d;
        at = [x, y];
      }
    }
  }
  if (!at) return undefined;
  let strongest = 0;
  for (let y = Math.max(0, at[1] - STROKE_REACH_PX); y <= Math.min(image.height - 1, at[1] + STROKE_REACH_PX); y++) {
    for (let x = Math.max(0, at[0] - STROKE_REACH_PX); x <= Math.min(width - 1, at[0] + STROKE_REACH_PX); x++) strongest = Math.max(strongest, contrast(x, y));
  }
  const threshold = INK_SHARE * strongest;
  const letters = LETTER_SHARE * strongest;
  // Most guides sit on a line: the ink nearest them runs on past a glyph's size, which a fill
  // from it tells after a few hundred pixels, before any window is looked at.
  if (!smallPieceAt(image, guide, (x, y) => contrast(x, y) >= letters)) return undefined;

  // First the row of letters the guide sits on, in a window around the guide.
  const near = inkIn(image, windowAround(image, guide[0], guide[1], WINDOW_PX), contrast, letters);
  if (near.w < 4 * GLYPH_MAX_PX || near.h < 4 * GLYPH_MAX_PX) return undefined;
  const found = rowAt(near, guide);
  if (!found) return undefined;
  // Then the lines about it, in a window around the row that reaches far enough out on every side.
  const rowH = found.y1 - found.y0;
  if (rowH > GLYPH_MAX_PX) return undefined;
  const reachOut = (FAR_BAND[1] + 0.5) * rowH;
  const cx = (found.x0 + found.x1) / 2;
  const cy = (found.y0 + found.y1) / 2;
  const half = Math.max((found.x1 - found.x0) / 2, rowH / 2) + reachOut;
  const wx0 = Math.max(0, Math.floor(cx - half));
  const wy0 = Math.max(0, Math.floor(cy - half));
  const around = inkIn(image, [wx0, wy0, Math.min(width, Math.ceil(cx + half)), Math.min(image.height, Math.ceil(cy + half))], contrast, threshold);
  const { w, h, label, components } = around;
  const box = { x0: found.x0 - wx0, y0: found.y0 - wy0, x1: found.x1 - wx0, y1: found.y1 - wy0 };
  // The row's letters, read fatter at the lines' threshold: the pieces within its box and a little
  // more (a letter a line ran into reaches out of it, and is the line's).
  const grow = Math.max(2, ROW_GROW * rowH);
  const row = new Set<number>();
  components.forEach((c, k) => {
    if (!c.edge && c.x0 >= box.x0 - grow && c.x1 <= box.x1 + grow && c.y0 >= box.y0 - grow && c.y1 <= box.y1 + grow) row.add(k);
  });
  const long = (c: Component) => c.edge || Math.hypot(c.x1 - c.x0, c.y1 - c.y0) > LONG_SPAN * rowH;
  const gx = guide[0] - wx0;
  const gy = guide[1] - wy0;

  // The patch: no other ink over the row or within a margin above and below it, but for the end of
  // a cut line poking into a corner. A line printed across the letters with no patch under them
  // runs along the row (where it does not join the letters and make them no glyphs).
  const m = Math.max(2, PATCH_MARGIN * rowH);
  const spans = new Map<number, [number, number]>();
  for (let y = Math.max(0, Math.floor(box.y0 - m)); y < Math.min(h, Math.ceil(box.y1 + m)); y++) {
    for (let x = box.x0; x < box.x1; x++) {
      const c = label[y * w + x] as number;
      if (c < 0 || row.has(c)) continue;
      const span = spans.get(c) ?? [x, x];
      spans.set(c, [Math.min(span[0], x), Math.max(span[1], x)]);
    }
  }
  for (const [k, [a, b]] of spans) {
    const c = components[k] as Component;
    // Other small pieces there (dots or dashes of lines run together, letters of another label):
    // no clean patch. (A speck of noise is left aside.)
    if ((!long(c) && c.pixels.length > SPECK_PX) || b - a > PATCH_CROSSED * (box.x1 - box.x0)) return undefined;
  }

  // The lines cut by the patch: long ink whose end lies close to the row.
  const reach = EXIT_REACH * rowH + EXIT_REACH_PX;
  const toBox = (x: number, y: number) => Math.hypot(Math.max(box.x0 - x, 0, x - box.x1), Math.max(box.y0 - y, 0, y - box.y1));
  const exits: Array<{ end: Px; out: Px; along: Px }> = [];
  components.forEach((c, k) => {
    if (row.has(k) || !long(c)) return;
    let end = -1;
    let endD = Infinity;
    for (const p of c.pixels) {
      const d = toBox((p % w) + 0.5, Math.floor(p / w) + 0.5);
      if (d < endD) {
        endD = d;
        end = p;
      }
    }
    if (endD > reach) return;
    const e: Px = [(end % w) + 0.5, Math.floor(end / w) + 0.5];
    // The line's direction out from the patch, from its ink near the patch to its ink a row height
    // or two out (its very end may have run into the first or last letter, where the patch is
    // narrower than the text). Taken twice: the second time from the ink within a stroke's width
    // of the first way only (a letter the line ran into lies off it).
    const bands: Array<{ x: number; y: number; near: boolean }> = [];
    for (const p of c.pixels) {
      const x = (p % w) + 0.5;
      const y = Math.floor(p / w) + 0.5;
      const d = toBox(x, y);
      if (d >= NEAR_BAND[0] * rowH && d <= FAR_BAND[1] * rowH) bands.push({ x, y, near: d < FAR_BAND[0] * rowH });
    }
    const way = (kept: (q: { x: number; y: number }) => boolean): { mid: Px; along: Px } | undefined => {
      const n = [0, 0, 0];
      const f = [0, 0, 0];
      for (const q of bands) {
        if (!kept(q)) continue;
        const sum = q.near ? n : f;
        sum[0] = (sum[0] as number) + q.x;
        sum[1] = (sum[1] as number) + q.y;
        sum[2] = (sum[2] as number) + 1;
      }
      if (!n[2] || !f[2]) return undefined;
      const mid: Px = [(n[0] as number) / (n[2] as number), (n[1] as number) / (n[2] as number)];
      const dx = (f[0] as number) / (f[2] as number) - mid[0];
      const dy = (f[1] as number) / (f[2] as number) - mid[1];
      const len = Math.hypot(dx, dy);
      return len > 0 ? { mid, along: [dx / len, dy / len] } : undefined;
    };
    const off = (q: { x: number; y: number }, l: { mid: Px; along: Px }) => Math.abs((q.x - l.mid[0]) * l.along[1] - (q.y - l.mid[1]) * l.along[0]);
    const rough = way(() => true);
    const fine = rough && way((q) => off(q, rough) <= STROKE_PX);
    if (!fine) return;
    const { mid, along } = fine;
    // One stroke there: nearly all its ink in both stretches lies within a stroke's width of that
    // way. Lines run together beside the label make one wide piece of ink, whose middle is on none of them.
    if (bands.filter((q) => off(q, fine) > STROKE_PX).length > OFF_STROKE_SHARE * bands.length) return;
    let out = e;
    let outD = Infinity;
    for (const p of c.pixels) {
      const x = (p % w) + 0.5;
      const y = Math.floor(p / w) + 0.5;
      const d = (x - mid[0]) ** 2 + (y - mid[1]) ** 2;
      if (d < outD) {
        outD = d;
        out = [x, y];
      }
    }
    exits.push({ end: e, out, along });
  });

  // Two cut lines in line with each other across the label, the guide on the way between them.
  const pairs: Array<{ exits: [Px, Px]; box: LabelBox; u: Px }> = [];
  const offLimit = GUIDE_OFF * rowH + GUIDE_OFF_PX;
  for (let a = 0; a < exits.length; a++) {
    for (let b = a + 1; b < exits.length; b++) {
      const A = exits[a] as (typeof exits)[number];
      const B = exits[b] as (typeof exits)[number];
      // The way across, between the two places on the lines out from the patch (their very ends
      // may lie on a letter they ran into).
      const vx = B.out[0] - A.out[0];
      const vy = B.out[1] - A.out[1];
      const len = Math.hypot(vx, vy);
      if (len < rowH) continue;
      const ux = vx / len;
      const uy = vy / len;
      // A leaves the patch away from B, and B away from A.
      if (-(A.along[0] * ux + A.along[1] * uy) < Math.cos(EXIT_TURN) || B.along[0] * ux + B.along[1] * uy < Math.cos(EXIT_TURN)) continue;
      const t = (gx - A.out[0]) * ux + (gy - A.out[1]) * uy;
      if (t < 0 || t > len) continue;
      const off = Math.abs((gx - A.out[0]) * uy - (gy - A.out[1]) * ux);
      if (off > offLimit) continue;
      pairs.push({
        exits: [
          [A.out[0] + wx0, A.out[1] + wy0],
          [B.out[0] + wx0, B.out[1] + wy0],
        ],
        // The patch reaches to where the cut lines end.
        box: { x0: Math.min(box.x0, A.end[0], B.end[0]) + wx0, y0: Math.min(box.y0 - m, A.end[1], B.end[1]) + wy0, x1: Math.max(box.x1, A.end[0], B.end[0]) + wx0, y1: Math.max(box.y1 + m, A.end[1], B.end[1]) + wy0 },
        u: [ux, uy],
      });
    }
  }
  // The trace's course from its other guides, where it has any, holds the line taken: a line under
  // the label that runs across the trace's course is another's. And lines that cross under the
  // label pass near the guide alike: the course tells which is the trace's, when it clearly does;
  // else nothing does.
  const turn = (u: Px) => (course ? Math.acos(Math.min(1, Math.abs(u[0] * course[0] + u[1] * course[1]))) : 0);
  const ranked = pairs.map((p) => ({ p, turn: turn(p.u) })).sort((x, y) => x.turn - y.turn);
  const [first, second] = ranked;
  if (!first || first.turn > COURSE_TURN) return undefined;
  if (second && (!course || second.turn - first.turn < COURSE_MARGIN)) return undefined;
  return { exits: first.p.exits, box: first.p.box };
}

/** The ink of a window of the image as a mask, and its connected pieces; coordinates within the window. */
function inkIn(image: RasterImage, [x0, y0, x1, y1]: readonly [number, number, number, number], contrast: (x: number, y: number) => number, threshold: number): { x0: number; y0: number; w: number; h: number; label: Int32Array; components: Component[] } {
  const w = x1 - x0;
  const h = y1 - y0;
  const ink = new Uint8Array(Math.max(0, w * h));
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) ink[y * w + x] = contrast(x0 + x, y0 + y) >= threshold ? 1 : 0;
  return { x0, y0, w, h, ...connected(ink, w, h) };
}

/**
 * The box (image pixels) of the row of letters the guide sits on: the glyph under it (the ink
 * nearest the guide is a small closed piece; the tallest such piece within a few pixels is taken,
 * so a click on a decimal point finds its digits),
 * and the glyphs level with it joined one by one where they stand close beside the row. Undefined
 * when the ink under the guide is no glyph, the row holds one glyph only, or it runs on to the
 * window's side (a dashed or dotted line).
 */
function rowAt(ink: ReturnType<typeof inkIn>, guide: Px): { x0: number; y0: number; x1: number; y1: number } | undefined {
  const { w, h, label, components } = ink;
  const gx = guide[0] - ink.x0;
  const gy = guide[1] - ink.y0;
  const glyph = (c: Component) => !c.edge && c.y1 - c.y0 <= GLYPH_MAX_PX && c.x1 - c.x0 <= 1.5 * GLYPH_MAX_PX;
  let seed: Component | undefined;
  let nearest: Component | undefined;
  let nearestD = Infinity;
  for (let y = Math.max(0, Math.floor(gy - NEAR_PX)); y < Math.min(h, Math.ceil(gy + NEAR_PX)); y++) {
    for (let x = Math.max(0, Math.floor(gx - NEAR_PX)); x < Math.min(w, Math.ceil(gx + NEAR_PX)); x++) {
      const c = components[label[y * w + x] as number];
      if (!c) continue;
      const d = (x + 0.5 - gx) ** 2 + (y + 0.5 - gy) ** 2;
      if (d < nearestD) {
        nearestD = d;
        nearest = c;
      }
      if (glyph(c) && (!seed || c.y1 - c.y0 > seed.y1 - seed.y0)) seed = c;
    }
  }
  // The ink nearest the guide is long: the guide is on a line, not on a label.
  if (!nearest || !glyph(nearest) || !seed || seed.y1 - seed.y0 < GLYPH_MIN_PX) return undefined;
  // Letters of one row keep within the seed's height and a share of it above and below.
  const seedH = seed.y1 - seed.y0;
  const top = seed.y0 - ROW_SLACK * seedH;
  const bottom = seed.y1 + ROW_SLACK * seedH;
  const row = new Set([seed]);
  let box = { x0: seed.x0, y0: seed.y0, x1: seed.x1, y1: seed.y1 };
  for (let grown = true; grown; ) {
    grown = false;
    for (const c of components) {
      if (row.has(c) || !glyph(c) || c.y0 < top || c.y1 > bottom) continue;
      const gap = Math.max(c.x0 - box.x1, box.x0 - c.x1);
      if (gap > GLYPH_GAP * seedH) continue;
      row.add(c);
      box = { x0: Math.min(box.x0, c.x0), y0: Math.min(box.y0, c.y0), x1: Math.max(box.x1, c.x1), y1: Math.max(box.y1, c.y1) };
      grown = true;
    }
  }
  // Letters: two or more pieces standing on one line, their feet alike (letters sit on a baseline), each as tall
  // as a letter and with upright strokes filling its height (letters run together count once); the
  // dots or dashes of a sloping line run together fill a thin slanting band of theirs, and a piece
  // of a grid line left where a line crossed it is one stroke.
  const lettersIn = (c: Component) => {
    const height = c.y1 - c.y0;
    if (height < Math.max(GLYPH_MIN_PX, TALL_SHARE * seedH) || columnFill(c, w) < LETTER_FILL) return 0;
    return 1;
  };
  const tallOnes = [...row].filter((c) => lettersIn(c) > 0);
  const alike = (a: Component, b: Component) => Math.abs(a.y1 - b.y1) <= LETTER_ALIGN * seedH;
  const tall = Math.max(0, ...tallOnes.map((a) => tallOnes.filter((b) => alike(a, b)).reduce((n, b) => n + lettersIn(b), 0)));
  if (tall < 2 || box.x0 <= 1 || box.x1 >= w - 2) return undefined;
  return { x0: box.x0 + ink.x0, y0: box.y0 + ink.y0, x1: box.x1 + ink.x0, y1: box.y1 + ink.y0 };
}

/** The mean share of a piece's height its ink spans, column by column (window width `w`). */
function columnFill(c: Component, w: number): number {
  const top = new Map<number, number>();
  const bottom = new Map<number, number>();
  for (const p of c.pixels) {
    const x = p % w;
    const y = (p - x) / w;
    top.set(x, Math.min(top.get(x) ?? Infinity, y));
    bottom.set(x, Math.max(bottom.get(x) ?? -Infinity, y));
  }
  let sum = 0;
  for (const [x, t] of top) sum += (bottom.get(x) as number) - t + 1;
  return sum / top.size / (c.y1 - c.y0);
}

/** Whether the ink nearest the guide (within `NEAR_PX`) is a piece no larger than a glyph. */
function smallPieceAt(image: RasterImage, guide: Px, isInk: (x: number, y: number) => boolean): boolean {
  let start = -1;
  let best = Infinity;
  for (let y = Math.max(0, Math.floor(guide[1] - NEAR_PX)); y < Math.min(image.height, Math.ceil(guide[1] + NEAR_PX)); y++) {
    for (let x = Math.max(0, Math.floor(guide[0] - NEAR_PX)); x < Math.min(image.width, Math.ceil(guide[0] + NEAR_PX)); x++) {
      const d = (x + 0.5 - guide[0]) ** 2 + (y + 0.5 - guide[1]) ** 2;
      if (d < best && isInk(x, y)) {
        best = d;
        start = y * image.width + x;
      }
    }
  }
  if (start < 0) return false;
  const seen = new Set([start]);
  let [x0, y0, x1, y1] = [Infinity, Infinity, -Infinity, -Infinity];
  const take = (q: number) => {
    if (seen.has(q) || !isInk(q % image.width, Math.floor(q / image.width))) return false;
    seen.add(q);
    return true;
  };
  return floodPiece(start, image.width, image.height, take, (_, x, y) => {
    x0 = Math.min(x0, x);
    y0 = Math.min(y0, y);
    x1 = Math.max(x1, x + 1);
    y1 = Math.max(y1, y + 1);
    return y1 - y0 <= GLYPH_MAX_PX && x1 - x0 <= 1.5 * GLYPH_MAX_PX;
  });
}

/** Connected components (8-neighbour) of a mask; `label` holds each pixel's component, -1 for none. */
function connected(mask: Uint8Array, w: number, h: number): { label: Int32Array; components: Component[] } {
  const label = new Int32Array(w * h).fill(-1);
  const components: Component[] = [];
  for (let start = 0; start < mask.length; start++) {
    if (!mask[start] || (label[start] as number) >= 0) continue;
    const k = components.length;
    const c: Component = { pixels: [], x0: Infinity, y0: Infinity, x1: -Infinity, y1: -Infinity, edge: false };
    components.push(c);
    label[start] = k;
    const take = (q: number) => {
      if (!mask[q] || (label[q] as number) >= 0) return false;
      label[q] = k;
      return true;
    };
    floodPiece(start, w, h, take, (p, x, y) => {
      c.pixels.push(p);
      c.x0 = Math.min(c.x0, x);
      c.y0 = Math.min(c.y0, y);
      c.x1 = Math.max(c.x1, x + 1);
      c.y1 = Math.max(c.y1, y + 1);
      if (x === 0 || y === 0 || x === w - 1 || y === h - 1) c.edge = true;
    });
  }
  return { label, components };
}
