/** The one 8-connected flood fill the page reader and the label finder share. */
import { describe, expect, it } from 'vitest';
import { floodPiece } from '../../src/digitize/flood.ts';

// 6 × 4: a piece of four pixels joined corner to corner, and a lone pixel apart from it.
const W = 6;
const H = 4;
const ink = new Set([0, 7, 14, 15, 5]);

function fill(start: number, stopAfter = Infinity) {
  const seen = new Set([start]);
  const got: [number, number][] = [];
  const whole = floodPiece(start, W, H, (n) => (ink.has(n) && !seen.has(n) ? (seen.add(n), true) : false), (_, x, y) => {
    got.push([x, y]);
    return got.length < stopAfter;
  });
  return { whole, got };
}

describe('floodPiece', () => {
  it('visits every pixel of the piece once, across corners, and no pixel of another piece', () => {
    const { whole, got } = fill(0);
    expect(whole).toBe(true);
    expect(got.map(([x, y]) => `${x},${y}`).sort()).toEqual(['0,0', '1,1', '2,2', '3,2']);
  });

  it('stops at once when a visit says so', () => {
    const { whole, got } = fill(0, 2);
    expect(whole).toBe(false);
    expect(got).toHaveLength(2);
  });
});
