/**
 * Turns a PDF page's operator list (as pdf.js produces it) into painted paths in sheet
 * coordinates, and measures how much of the page is covered by pictures.
 *
 * Pure: it takes the arrays and the operator codes as input, so that the Node and the browser
 * loaders share it and tests can feed it hand-made lists. The graphics state (save/restore,
 * transform, form XObjects, stroke colour, line width, dash) is tracked here because pdf.js
 * hands over path coordinates in the current user space.
 */
import { sheetPoint, type SheetPoint } from './points.ts';
import type { PathSegment, VectorPath } from './sheet.ts';

/** The operator codes this module needs, looked up from pdf.js's `OPS` by the loader. */
export interface OperatorCodes {
  save: number;
  restore: number;
  transform: number;
  setLineWidth: number;
  setDash: number;
  setGState: number;
  setStrokeRGBColor: number;
  setFillRGBColor: number;
  setStrokeTransparent: number;
  setFillTransparent: number;
  constructPath: number;
  stroke: number;
  closeStroke: number;
  fill: number;
  eoFill: number;
  fillStroke: number;
  eoFillStroke: number;
  closeFillStroke: number;
  closeEOFillStroke: number;
  endPath: number;
  clip: number;
  eoClip: number;
  beginAnnotation: number;
  endAnnotation: number;
  paintFormXObjectBegin: number;
  paintFormXObjectEnd: number;
  paintImageXObject: number;
  paintInlineImageXObject: number;
  paintImageMaskXObject: number;
  paintImageXObjectRepeat: number;
  paintImageMaskXObjectRepeat: number;
  paintSolidColorImageMask: number;
  paintInlineImageXObjectGroup: number;
  paintImageMaskXObjectGroup: number;
}

export const OPERATOR_NAMES: readonly (keyof OperatorCodes)[] = [
  'save', 'restore', 'transform', 'setLineWidth', 'setDash', 'setGState', 'setStrokeRGBColor', 'setFillRGBColor',
  'setStrokeTransparent', 'setFillTransparent', 'constructPath', 'stroke', 'closeStroke', 'fill', 'eoFill', 'fillStroke',
  'eoFillStroke', 'closeFillStroke', 'closeEOFillStroke', 'endPath', 'clip', 'eoClip', 'beginAnnotation', 'endAnnotation', 'paintFormXObjectBegin', 'paintFormXObjectEnd',
  'paintImageXObject', 'paintInlineImageXObject', 'paintImageMaskXObject', 'paintImageXObjectRepeat',
  'paintImageMaskXObjectRepeat', 'paintSolidColorImageMask', 'paintInlineImageXObjectGroup', 'paintImageMaskXObjectGroup',
];

/** Picks the codes this module needs out of pdf.js's OPS table. */
export function operatorCodesFrom(ops: Record<string, number>): OperatorCodes {
  const codes = {} as Record<keyof OperatorCodes, number>;
  for (const name of OPERATOR_NAMES) codes[name] = ops[name] ?? -1;
  return codes;
}

/** Drawing codes inside a constructPath buffer (pdf.js does not export them). */
const DRAW = { move: 0, line: 1, cubic: 2, quadratic: 3, close: 4 } as const;

/** A PDF matrix [a b c d e f]: x' = a·x + c·y + e, y' = b·x + d·y + f. */
export type Matrix = readonly [number, number, number, number, number, number];

export const IDENTITY: Matrix = [1, 0, 0, 1, 0, 0];

/** The matrix applying `inner` first, then `outer`. */
export function multiply(outer: Matrix, inner: Matrix): Matrix {
  const [a, b, c, d, e, f] = outer;
  const [p, q, r, s, t, u] = inner;
  return [a * p + c * q, b * p + d * q, a * r + c * s, b * r + d * s, a * t + c * u + e, b * t + d * u + f];
}

export function apply(m: Matrix, x: number, y: number): SheetPoint {
  return sheetPoint(m[0] * x + m[2] * y + m[4], m[1] * x + m[3] * y + m[5]);
}

interface GraphicsState {
  ctm: Matrix;
  stroke: string | null;
  fill: string | null;
  lineWidth: number;
  dashed: boolean;
  /** Bounding box of the clipping area in sheet coordinates, or null for the whole page. */
  clip: [number, number, number, number] | null;
}

export interface OperatorListInput {
  fnArray: ArrayLike<number>;
  argsArray: ArrayLike<unknown>;
}

export interface PageContent {
  paths: VectorPath[];
  /** Fraction of the page area covered by pictures (0…1, overlaps counted once per picture). */
  imageCoverage: number;
  /** Number of pictures painted. */
  images: number;
  /** Pixels per sheet unit of the picture covering most of the page (the finer of its two axes); absent without pictures of known size. */
  pictureScale?: number;
}

/**
 * Reads the paths and pictures of one page.
 * `viewport` maps PDF user space to sheet coordinates (pdf.js `viewport.transform` at scale 1);
 * `width`/`height` are the page size in sheet units.
 */
export function readOperatorList(list: OperatorListInput, ops: OperatorCodes, viewport: Matrix, width: number, height: number): PageContent {
  const stack: GraphicsState[] = [];
  let gs: GraphicsState = { ctm: IDENTITY, stroke: '#000000', fill: '#000000', lineWidth: 1, dashed: false, clip: null };
  // A clip operator marks the next path as a clipping path (pdf.js emits it before the path).
  let clipNext = false;
  const paths: VectorPath[] = [];
  let imageArea = 0;
  let images = 0;
  let pictureScale: number | undefined;
  let largestPicture = 0;
  const pageArea = Math.max(width * height, 1e-9);

  // Annotations (a reviewer's ink, stamps, form fields) are not the sheet's drawing: skipped.
  let annotation = 0;
  for (let i = 0; i < list.fnArray.length; i++) {
    const fn = list.fnArray[i] as number;
    const args = list.argsArray[i] as unknown[] | null;
    if (fn === ops.beginAnnotation) annotation++;
    else if (fn === ops.endAnnotation) annotation = Math.max(0, annotation - 1);
    if (annotation > 0) continue;
    switch (fn) {
      case ops.save:
        stack.push({ ...gs });
        break;
      case ops.restore:
        gs = stack.pop() ?? gs;
        break;
      case ops.transform:
        if (args && isMatrix(args)) gs.ctm = multiply(gs.ctm, args as unknown as Matrix);
        break;
      case ops.paintFormXObjectBegin: {
        stack.push({ ...gs });
        const m = args?.[0];
        if (m && isMatrix(m as ArrayLike<unknown>)) gs.ctm = multiply(gs.ctm, Array.from(m as ArrayLike<number>) as unknown as Matrix);
        break;
      }
      case ops.paintFormXObjectEnd:
        gs = stack.pop() ?? gs;
        break;
      case ops.setLineWidth:
        if (typeof args?.[0] === 'number') gs.lineWidth = Math.abs(args[0]);
        break;
      case ops.setDash:
        gs.dashed = Array.isArray(args?.[0]) && (args[0] as unknown[]).some((v) => typeof v === 'number' && v > 0);
        break;
      case ops.setGState:
        applyGState(gs, args?.[0]);
        break;
      case ops.setStrokeRGBColor:
        gs.stroke = colourOf(args) ?? gs.stroke;
        break;
      case ops.setFillRGBColor:
        gs.fill = colourOf(args) ?? gs.fill;
        break;
      case ops.setStrokeTransparent:
        gs.stroke = null;
        break;
      case ops.setFillTransparent:
        gs.fill = null;
        break;
      case ops.clip:
      case ops.eoClip:
        clipNext = true;
        break;
      case ops.constructPath: {
        const m = multiply(viewport, gs.ctm);
        const path = pathFrom(args, ops, gs, m);
        if (path) paths.push(path);
        if (clipNext) {
          gs.clip = intersectBoxes(gs.clip, pathBox(args, m));
          clipNext = false;
        }
        break;
      }
      case ops.paintImageXObject:
      case ops.paintInlineImageXObject:
      case ops.paintImageMaskXObject:
      case ops.paintImageXObjectRepeat:
      case ops.paintImageMaskXObjectRepeat:
      case ops.paintSolidColorImageMask:
      case ops.paintInlineImageXObjectGroup:
      case ops.paintImageMaskXObjectGroup: {
        // A picture fills the unit square of its user space.
        const m = multiply(viewport, gs.ctm);
        const area = clippedArea(m, width, height);
        imageArea += area;
        images++;
        const density = pictureDensity(fn === ops.paintImageXObject ? args?.slice(1, 3) : [(args?.[0] as { width?: unknown } | undefined)?.width, (args?.[0] as { height?: unknown } | undefined)?.height], m);
        if (density !== undefined && area > largestPicture) [largestPicture, pictureScale] = [area, density];
        break;
      }
      default:
        break;
    }
  }
  return { paths, imageCoverage: Math.min(1, imageArea / pageArea), images, ...(pictureScale !== undefined ? { pictureScale } : {}) };
}

/** Pixels per sheet unit of a picture `[width, height]` pixels painted into the unit square mapped by `m` (the finer axis). */
function pictureDensity(size: unknown[] | undefined, m: Matrix): number | undefined {
  const [w, h] = size ?? [];
  if (typeof w !== 'number' || typeof h !== 'number' || !(w > 0) || !(h > 0)) return undefined;
  const across = Math.hypot(m[0], m[1]);
  const down = Math.hypot(m[2], m[3]);
  if (!(across > 0) || !(down > 0)) return undefined;
  return Math.max(w / across, h / down);
}

function isMatrix(v: ArrayLike<unknown>): boolean {
  if (v.length !== 6) return false;
  for (let i = 0; i < 6; i++) if (typeof v[i] !== 'number' || !Number.isFinite(v[i] as number)) return false;
  return true;
}

function applyGState(gs: GraphicsState, entries: unknown): void {
  if (!Array.isArray(entries)) return;
  for (const entry of entries) {
    if (!Array.isArray(entry)) continue;
    const [key, value] = entry as [unknown, unknown];
    if (key === 'LW' && typeof value === 'number') gs.lineWidth = Math.abs(value);
    if (key === 'D' && Array.isArray(value)) {
      const dash = value[0];
      gs.dashed = Array.isArray(dash) && dash.some((v) => typeof v === 'number' && v > 0);
    }
  }
}

/** '#rrggbb' from pdf.js colour arguments (a hex string, or three bytes in older versions). */
function colourOf(args: unknown[] | null): string | null {
  const first = args?.[0];
  if (typeof first === 'string' && /^#[0-9a-f]{6}$/i.test(first)) return first.toLowerCase();
  const triple = args && args.length >= 3 ? args : first && typeof first === 'object' ? Array.from(first as ArrayLike<number>) : null;
  if (triple && triple.length >= 3 && triple.slice(0, 3).every((v) => typeof v === 'number')) {
    return `#${(triple.slice(0, 3) as number[]).map((v) => Math.round(Math.max(0, Math.min(255, v))).toString(16).padStart(2, '0')).join('')}`;
  }
  return null;
}

function pathFrom(args: unknown[] | null, ops: OperatorCodes, gs: GraphicsState, m: Matrix): VectorPath | null {
  if (!args) return null;
  const paint = args[0] as number;
  const strokes = [ops.stroke, ops.closeStroke, ops.fillStroke, ops.eoFillStroke, ops.closeFillStroke, ops.closeEOFillStroke].includes(paint);
  const fills = [ops.fill, ops.eoFill, ops.fillStroke, ops.eoFillStroke, ops.closeFillStroke, ops.closeEOFillStroke].includes(paint);
  if (!strokes && !fills) return null; // a clipping path or an ended path paints nothing
  const holder = args[1];
  const data = (Array.isArray(holder) ? holder[0] : holder) as ArrayLike<number> | null | undefined;
  if (!data || data.length === 0) return null;
  const segments = segmentsOf(data, m);
  if (segments.length === 0) return null;
  const scale = Math.sqrt(Math.abs(m[0] * m[3] - m[1] * m[2]));
  return {
    segments,
    stroke: strokes ? gs.stroke : null,
    fill: fills ? gs.fill : null,
    lineWidth: gs.lineWidth * scale,
    dashed: gs.dashed,
    ...(gs.clip ? { clip: gs.clip } : {}),
  };
}

/** Bounding box of a constructPath's points in sheet coordinates (an empty path clips everything away). */
function pathBox(args: unknown[] | null, m: Matrix): [number, number, number, number] {
  const holder = args?.[1];
  const data = (Array.isArray(holder) ? holder[0] : holder) as ArrayLike<number> | null | undefined;
  const segments = data ? segmentsOf(data, m) : [];
  let box: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const s of segments) {
    const pts = s.kind === 'cubic' ? [s.c1, s.c2, s.to] : s.kind === 'close' ? [] : [s.to];
    for (const p of pts) box = [Math.min(box[0], p[0]), Math.min(box[1], p[1]), Math.max(box[2], p[0]), Math.max(box[3], p[1])];
  }
  return box;
}

function intersectBoxes(a: [number, number, number, number] | null, b: [number, number, number, number]): [number, number, number, number] {
  if (!a) return b;
  return [Math.max(a[0], b[0]), Math.max(a[1], b[1]), Math.min(a[2], b[2]), Math.min(a[3], b[3])];
}

/** Decodes a pdf.js path buffer into segments in sheet coordinates. */
export function segmentsOf(data: ArrayLike<number>, m: Matrix): PathSegment[] {
  const out: PathSegment[] = [];
  let cx = 0;
  let cy = 0;
  let sx = 0;
  let sy = 0;
  let i = 0;
  const n = data.length;
  const at = (k: number) => data[k] as number;
  while (i < n) {
    const code = at(i++);
    if (code === DRAW.move && i + 2 <= n) {
      cx = sx = at(i);
      cy = sy = at(i + 1);
      i += 2;
      out.push({ kind: 'move', to: apply(m, cx, cy) });
    } else if (code === DRAW.line && i + 2 <= n) {
      cx = at(i);
      cy = at(i + 1);
      i += 2;
      out.push({ kind: 'line', to: apply(m, cx, cy) });
    } else if (code === DRAW.cubic && i + 6 <= n) {
      out.push({ kind: 'cubic', c1: apply(m, at(i), at(i + 1)), c2: apply(m, at(i + 2), at(i + 3)), to: apply(m, at(i + 4), at(i + 5)) });
      cx = at(i + 4);
      cy = at(i + 5);
      i += 6;
    } else if (code === DRAW.quadratic && i + 4 <= n) {
      // Degree elevation: the cubic with control points p0 + 2/3 (q − p0) and p + 2/3 (q − p).
      const qx = at(i);
      const qy = at(i + 1);
      const x = at(i + 2);
      const y = at(i + 3);
      out.push({
        kind: 'cubic',
        c1: apply(m, cx + (2 / 3) * (qx - cx), cy + (2 / 3) * (qy - cy)),
        c2: apply(m, x + (2 / 3) * (qx - x), y + (2 / 3) * (qy - y)),
        to: apply(m, x, y),
      });
      cx = x;
      cy = y;
      i += 4;
    } else if (code === DRAW.close) {
      out.push({ kind: 'close' });
      cx = sx;
      cy = sy;
    } else {
      break; // an unknown code: the rest of the buffer cannot be decoded safely
    }
  }
  return out;
}

/** Area of the transformed unit square, clipped to the page by its bounding box. */
function clippedArea(m: Matrix, width: number, height: number): number {
  const corners = [apply(m, 0, 0), apply(m, 1, 0), apply(m, 1, 1), apply(m, 0, 1)];
  const xs = corners.map((p) => p[0]);
  const ys = corners.map((p) => p[1]);
  const x0 = Math.max(0, Math.min(...xs));
  const x1 = Math.min(width, Math.max(...xs));
  const y0 = Math.max(0, Math.min(...ys));
  const y1 = Math.min(height, Math.max(...ys));
  if (x1 <= x0 || y1 <= y0) return 0;
  const box = (Math.max(...xs) - Math.min(...xs)) * (Math.max(...ys) - Math.min(...ys));
  const parallelogram = Math.abs(m[0] * m[3] - m[1] * m[2]);
  // Scale the clipped box by how much of the box the (possibly rotated) picture fills.
  return (x1 - x0) * (y1 - y0) * (box > 0 ? Math.min(1, parallelogram / box) : 0);
}
