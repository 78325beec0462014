/**
 * Quicker ways of the scan detection that must give what the plain ways give: upright rules found
 * without turning the page, and a course's decisions taken on the normal-equation fit (offCourse
 * with `near`) against those of the QR fit. INVENTED pictures and tracks only.
 */
import { describe, expect, it } from 'vitest';
import type { InkMap } from '../../src/digitize/detect/ink.ts';
import { horizontalRules, transpose, verticalRules } from '../../src/digitize/detect/rasterFrames.ts';
import { offCourse, type Track } from '../../src/digitize/detect/rasterLines.ts';

/** A small seeded generator (numbers in [0, 1)), so that each run draws the same pictures. */
function random(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/** An ink map with upright and level strokes of random length, thickness and darkness, gaps and specks. */
function strokes(seed: number): InkMap {
  const next = random(seed);
  const width = 300;
  const height = 240;
  const ink = new Uint8Array(width * height);
  for (let k = 0; k < 40; k++) {
    const upright = next() < 0.6;
    const across = Math.floor(next() * (upright ? width : height));
    const from = Math.floor(next() * 200);
    const length = 20 + Math.floor(next() * 200);
    const thick = 1 + Math.floor(next() * 4);
    const dark = 60 + Math.floor(next() * 190);
    for (let a = from; a < from + length; a++) {
      if (next() < 0.03) a += 1 + Math.floor(next() * 5); // a gap, bridged or not
      for (let c = across; c < across + thick; c++) {
        const [x, y] = upright ? [c, a] : [a, c];
        if (x < width && y < height) ink[y * width + x] = dark;
      }
    }
  }
  for (let k = 0; k < 2000; k++) ink[Math.floor(next() * width * height)] = Math.floor(next() * 256);
  return { width, height, ink };
}

describe('upright rules without turning the page', () => {
  it.each([1, 2, 3, 4, 5, 6, 7, 8])('verticalRules gives what horizontalRules gives on the turned map (picture %i)', (seed) => {
    const map = strokes(seed);
    for (const [threshold, minLength] of [[50, 20], [100, 40], [150, 15]] as const) {
      const turned = horizontalRules(transpose(map), threshold, minLength);
      expect(turned.length).toBeGreaterThan(0);
      expect(verticalRules(map, threshold, minLength)).toEqual(turned);
    }
  });
});

describe('a course decided on the quick fit', () => {
  /** A bent line with noise and a few columns off it (a label or a crossing), rows around 300–700. */
  function bent(seed: number): Track {
    const next = random(seed);
    const a = 300 + 400 * next();
    const b = 200 * (next() - 0.5);
    const c = 100 * (next() - 0.5);
    const t: Track = { u: [], v: [], len: [], room: [] };
    for (let u = 100; u < 500; u += next() < 0.1 ? 3 : 1) {
      const x = (u - 100) / 400;
      t.u.push(u + 0.5);
      t.v.push(a + b * x + c * x * x + (next() - 0.5) * 2 + (next() < 0.05 ? 6 : 0));
      t.len.push(2);
      t.room.push(Infinity);
    }
    return t;
  }

  it.each([11, 12, 13, 14, 15, 16])('offCourse with near takes every decision the QR fit takes (track %i)', (seed) => {
    const t = bent(seed);
    const next = random(seed + 100);
    for (const side of ['end', 'start'] as const) {
      for (const robust of [false, true]) {
        const exact = offCourse(t, side, 150, robust);
        expect(exact).not.toBeNull();
        const endU = side === 'end' ? (t.u.at(-1) as number) : (t.u[0] as number);
        const sign = side === 'end' ? 1 : -1;
        for (const tol of [0.5, 2, 3, 6]) {
          const quick = offCourse(t, side, 150, robust, tol);
          for (let k = 0; k < 200; k++) {
            const u = endU + sign * next() * 300;
            const probe = (exact as (u: number, v: number) => number)(u, 500);
            // Points at every distance from the course, some exactly on the threshold.
            const v = 500 + (next() < 0.2 ? 0 : (next() - 0.5) * 20) + (k % 7 === 0 ? Math.sign(next() - 0.5) * (tol - probe) : 0);
            const e = (exact as (u: number, v: number) => number)(u, v);
            const q = (quick as (u: number, v: number) => number)(u, v);
            expect(q > tol).toBe(e > tol);
            if (Number.isFinite(e)) expect(Math.abs(q - e)).toBeLessThan(1e-6);
            else expect(q).toBe(e);
          }
        }
      }
    }
  });

  it('a track too short for a course has none either way', () => {
    const t: Track = { u: [1.5, 2.5, 3.5, 4.5, 5.5, 6.5, 7.5], v: [1, 2, 3, 4, 5, 6, 7], len: [], room: [] };
    expect(offCourse(t, 'end', 10)).toBeNull();
    expect(offCourse(t, 'end', 10, true, 3)).toBeNull();
  });
});
