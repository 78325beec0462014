/**
 * Blots of ink on a scan: a short label whose glyphs the scan ran together ("69%" as one blot,
 * wider than two text heights) is kept when asked for words, and a thin line's stretch of the
 * same box is not (invented pictures).
 */
import { describe, expect, it } from 'vitest';
import type { InkMap } from '../../src/digitize/detect/ink.ts';
import { inkBlots } from '../../src/digitize/detect/rasterText.ts';

/** A 200 × 60 picture with `fill` applied to it. */
function picture(fill: (set: (x: number, y: number) => void) => void): InkMap {
  const width = 200;
  const height = 60;
  const ink = new Uint8Array(width * height);
  fill((x, y) => (ink[y * width + x] = 200));
  return { width, height, ink };
}

const h = 17;
const word = { minHeight: 0.6 * h, maxHeight: 1.6 * h, maxWidth: 4 * h, fill: 0.25 };

describe('blots of ink', () => {
  // Three glyph-like blocks 17 px tall, hollow (2 px strokes), touching: one blot 42 px wide.
  const glyphs = picture((set) => {
    for (let g = 0; g < 3; g++) {
      const x0 = 20 + 14 * g;
      for (let y = 20; y < 37; y++) for (let x = x0; x < x0 + 14; x++) if (y < 22 || y > 34 || x < x0 + 2 || x > x0 + 11) set(x, y);
    }
  });
  // A line 2 px wide rising 17 px over 42 px: the same box, thinly filled.
  const line = picture((set) => {
    for (let x = 20; x < 62; x++) {
      const y = Math.round(36 - ((x - 20) * 16) / 41);
      set(x, y);
      set(x, y + 1);
    }
  });

  it('drops a blot wider than the limit when no words are asked for', () => {
    expect(inkBlots(glyphs, 100, [], 2 * h)).toEqual([]);
  });

  it('keeps a run-together word as tall as text and filled like print', () => {
    expect(inkBlots(glyphs, 100, [], 2 * h, word)).toEqual([{ l: 20, t: 20, r: 62, b: 37 }]);
  });

  it('does not keep a thin line\'s stretch of the same size', () => {
    expect(inkBlots(line, 100, [], 2 * h, word)).toEqual([]);
  });
});
