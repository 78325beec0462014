/** Placing text labels beside curve ends, on the family chart and on the sheet, without overlaps. */
import { segmentInBox } from '../../digitize/polyline.ts';

/** A label's place: left end and baseline, px, and its width. */
export interface LabelBox {
  x: number;
  y: number;
  width: number;
}

/**
 * Curve-end labels that would overlap are moved apart: a label whose box would touch one already
 * placed is moved down below it (at least `gap` px between baselines), keeping their order.
 * A label's box is `gap` px high and as wide as its `width` (measured in the font it is drawn
 * in), or, without one, its text at `charWidth` px a character. `fixed` boxes (drawn labels that
 * stay where they are) are kept clear of in the same way.
 *
 * A label only ever moves down, to just below a placed label it touches, and is then clear of
 * that label for good; so it moves at most once per placed label and the loop ends. The
 * comparison allows for rounding: `(y + gap) - y` may come out a hair under `gap` in floating
 * point, which must not count as touching (it once kept the page busy for ever).
 */
export function spreadLabels<L extends { x: number; y: number; text: string; width?: number }>(labels: readonly L[], gap: number, charWidth = 6.2, fixed: readonly LabelBox[] = []): L[] {
  const out = labels.map((l) => ({ ...l })).sort((a, b) => a.y - b.y);
  const width = (l: L) => l.width ?? l.text.length * charWidth;
  const touching = gap - 1e-6 * Math.max(1, Math.abs(gap));
  // Boxes already there (a panel's name on the sheet) count as placed labels that never move.
  const placed: LabelBox[] = fixed.map((b) => ({ ...b }));
  for (const cur of out) {
    // Each pass moves the label below at least one more placed label, or ends.
    for (let pass = 0, moved = true; moved && pass <= placed.length; pass++) {
      moved = false;
      for (const p of placed) {
        const apart = cur.x >= p.x + p.width || p.x >= cur.x + width(cur);
        if (!apart && Math.abs(cur.y - p.y) < touching && p.y + gap > cur.y) {
          cur.y = p.y + gap;
          moved = true;
        }
      }
    }
    placed.push({ x: cur.x, y: cur.y, width: width(cur) });
  }
  return out;
}

/** A label box with its height: left, top, width and height, px. */
export interface Rect {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** True when the segment a–b touches the rectangle (Liang–Barsky clipping, `segmentInBox`). */
export function segmentTouches(r: Rect, a: readonly [number, number], b: readonly [number, number]): boolean {
  return segmentInBox(a, b, [r.x, r.y, r.x + r.width, r.y + r.height]) !== null;
}

/**
 * The place, of several in order of preference, that the fewest drawn lines cross: the first
 * one no line crosses, or else the one crossed by the fewest segments. Used for a panel's name,
 * which must not hide the curves (power and NPSHr curves end in the frame's top right corner,
 * head curves start in its top left).
 */
export function clearestPlace(places: readonly Rect[], lines: readonly (readonly (readonly [number, number])[])[]): number {
  let best = 0;
  let fewest = Infinity;
  for (let i = 0; i < places.length; i++) {
    const r = places[i] as Rect;
    let hits = 0;
    for (const line of lines) for (let k = 1; k < line.length; k++) if (segmentTouches(r, line[k - 1] as readonly [number, number], line[k] as readonly [number, number])) hits++;
    if (hits === 0) return i;
    if (hits < fewest) {
      fewest = hits;
      best = i;
    }
  }
  return best;
}
