/** Which readings of raster traces count: refused guides (takeoff.ts) and iso crossings used as efficiency points (isoCrossings.ts). */
import { describe, expect, it } from 'vitest';
import { REFUSED_GUIDE_WIDTHS, refusedGuides } from '../../src/digitize/takeoff.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import type { LostStretch } from '../../src/digitize/rasterTrace.ts';

// A straight trace along y = 100 from x = 0 to 300, sheet units; its line is 2 units wide.
const points = Array.from({ length: 31 }, (_, i) => sheetPoint(10 * i, 100));
const refused = (x: number, y: number, guide = 2): LostStretch => ({ at: sheetPoint(x, y), between: [guide, guide], reason: `guide ${guide} has no line of the traced colour within 10 px` });

describe('refused guides', () => {
  it('does not count a refused guide the trace passes within a few line widths of: its line was hidden there', () => {
    expect(refusedGuides([refused(150, 100 + 0.9 * REFUSED_GUIDE_WIDTHS * 2)], points, 2)).toBe(0);
  });

  it('counts a refused guide the trace does not pass, and every refused guide when the line width is unknown', () => {
    expect(refusedGuides([refused(150, 100 + 1.2 * REFUSED_GUIDE_WIDTHS * 2)], points, 2)).toBe(1);
    expect(refusedGuides([refused(150, 100)], points, undefined)).toBe(1);
    expect(refusedGuides([refused(150, 100)], [], 2)).toBe(1);
  });

  it('never counts a lost stretch between two guides as a refused guide', () => {
    expect(refusedGuides([{ at: sheetPoint(150, 140), between: [1, 2], reason: 'the line was lost' }], points, 2)).toBe(0);
  });
});

describe('iso crossings used as efficiency points', () => {
  it('leaves out every crossing of an iso trace with a head trace it meets more than twice, and keeps the others', async () => {
    const { readableCrossings } = await import('../../src/digitize/isoCrossings.ts');
    const at = (x: number) => sheetPoint(x, 100);
    // Invented: the trace meets head 370 four times (it ran along it) and head 330 twice (a U-shaped iso-line).
    const crossings = [370, 330, 370, 370, 330, 370].map((key, i) => ({ key, at: at(10 * i), touching: false }));
    expect(readableCrossings(crossings).map((c) => c.key)).toEqual([330, 330]);
    expect(readableCrossings(crossings.filter((c) => c.key === 330))).toHaveLength(2);
  });
});
