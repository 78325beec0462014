/** Placing text labels beside curve ends, on the family chart and on the sheet, without overlaps. */

/**
 * Curve-end labels that would overlap are moved apart: a label whose box would touch one already
 * placed is moved down below it (at least `gap` px between baselines), keeping their order.
 * A label's box is its text at `charWidth` px a character, `gap` px high.
 */
export function spreadLabels<L extends { x: number; y: number; text: string }>(labels: readonly L[], gap: number, charWidth = 6.2): L[] {
  const out = labels.map((l) => ({ ...l })).sort((a, b) => a.y - b.y);
  const width = (l: L) => l.text.length * charWidth;
  const placed: L[] = [];
  for (const cur of out) {
    for (let moved = true; moved; ) {
      moved = false;
      for (const p of placed) {
        const apart = cur.x >= p.x + width(p) || p.x >= cur.x + width(cur);
        if (!apart && Math.abs(cur.y - p.y) < gap) {
          cur.y = p.y + gap;
          moved = true;
        }
      }
    }
    placed.push(cur);
  }
  return out;
}
