/** Placing text labels beside curve ends, on the family chart and on the sheet, without overlaps. */

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
