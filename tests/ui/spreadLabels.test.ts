/**
 * Curve-end labels moved apart on the family chart and the sheet: no two touching labels stay
 * touching, order is kept, and a stack of labels whose positions round badly in floating point
 * still comes to rest (a label at y, moved to y + gap, may read as a hair closer than gap).
 */
import { describe, expect, it } from 'vitest';
import { clearestPlace, segmentTouches, spreadLabels } from '../../src/ui/geometry/labels.ts';

const label = (y: number, x = 100, text = '250 mm') => ({ x, y, text });

describe('curve-end labels moved apart', () => {
  it('keeps labels clear of fixed boxes (a panel\'s name on the sheet), which never move', () => {
    const fixed = [{ x: 300, y: 50, width: 90 }];
    const out = spreadLabels([{ x: 320, y: 48, text: '330 mm', width: 50 }, { x: 100, y: 48, text: '310 mm', width: 50 }], 17, undefined, fixed);
    expect(out.map((l) => [l.text, l.y])).toEqual([
      ['330 mm', 67],
      ['310 mm', 48],
    ]);
    expect(fixed).toEqual([{ x: 300, y: 50, width: 90 }]);
  });

  it('uses a label\'s measured width where it has one: two labels 33 px apart touch when each is 44 px wide', () => {
    // "279 mm" in a 10.5 px sans-serif font is about 44 px wide; six characters at 6.2 px make only 37.
    const by = spreadLabels([{ x: 100, y: 100, text: '279 mm', width: 44 }, { x: 133, y: 102, text: '320 mm', width: 44 }], 11);
    expect(by.map((l) => l.y)).toEqual([100, 111]);
    const byChars = spreadLabels([label(100, 100, '279 mm'), label(102, 138, '320 mm')], 11);
    expect(byChars.map((l) => l.y)).toEqual([100, 102]);
  });

  it('moves a touching label below the one placed, and leaves labels apart in x alone', () => {
    const out = spreadLabels([label(100), label(104), label(104, 400)], 11);
    expect(out.map((l) => [l.x, l.y])).toEqual([
      [100, 100],
      [100, 111],
      [400, 104],
    ]);
  });

  it('comes to rest where (y + gap) − y rounds under gap', () => {
    // (250.10217767961106 + 11) − 250.10217767961106 < 11 in double precision.
    const y = 250.10217767961106;
    expect(y + 11 - y).toBeLessThan(11);
    const out = spreadLabels([label(y), label(y + 1), label(y + 2), label(y + 3)], 11);
    const ys = out.map((l) => l.y);
    for (let i = 1; i < ys.length; i++) expect((ys[i] as number) - (ys[i - 1] as number)).toBeGreaterThan(10.99);
  });

  it('comes to rest on many labels at random places, each clear of the others', () => {
    let seed = 7;
    const rand = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    const labels = Array.from({ length: 60 }, () => label(500 * rand(), 100 + 40 * rand(), `${Math.round(200 + 200 * rand())} mm`));
    const out = spreadLabels(labels, 11);
    for (const a of out) for (const b of out) {
      if (a === b) continue;
      const apartX = a.x >= b.x + b.text.length * 6.2 || b.x >= a.x + a.text.length * 6.2;
      if (!apartX) expect(Math.abs(a.y - b.y)).toBeGreaterThan(10.99);
    }
  });
});

describe('the place of a panel name that the lines leave clear', () => {
  const box = { x: 100, y: 100, width: 50, height: 17 };
  it('a segment through, into or beside the box is told apart', () => {
    expect(segmentTouches(box, [90, 105], [160, 110])).toBe(true); // across
    expect(segmentTouches(box, [120, 108], [300, 300])).toBe(true); // starts inside
    expect(segmentTouches(box, [90, 90], [160, 95])).toBe(false); // above
    expect(segmentTouches(box, [160, 90], [170, 130])).toBe(false); // to the right
    expect(segmentTouches(box, [95, 95], [155, 122])).toBe(true); // corner to corner
  });

  it('takes the first place no line crosses, else the one crossed least', () => {
    const topRight = { x: 300, y: 10, width: 80, height: 17 };
    const topLeft = { x: 10, y: 10, width: 80, height: 17 };
    // A power curve rising to the top right corner.
    const power: [number, number][] = [[0, 200], [200, 120], [390, 12]];
    expect(clearestPlace([topRight, topLeft], [power])).toBe(1);
    expect(clearestPlace([topRight, topLeft], [])).toBe(0);
    // Both crossed: the one crossed by fewer segments.
    const across: [number, number][] = [[0, 20], [400, 20]];
    expect(clearestPlace([topRight, topLeft], [across, power])).toBe(1);
  });
});
