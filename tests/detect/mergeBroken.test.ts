/**
 * Pieces of one vector curve that the stroke joining left apart are joined (`mergeBroken` in
 * src/digitize/detect/lines.ts): a piece that starts a little to the right of another's end, or
 * one that overlaps it for a short stretch lying on it (a dotted line's dots shared out between
 * two pieces: vector bed seed 539, a power curve along a grid line, asked about as a curve of its own).
 */
import { describe, expect, it } from 'vitest';
import { mergeBroken } from '../../src/digitize/detect/lines.ts';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import type { Box } from '../../src/digitize/detect/panels.ts';

const frame: Box = [0, 0, 600, 400];
/** Points of the line y = 300 − 0.2·x + off, x from `a` to `b` in steps of `step`. */
const run = (a: number, b: number, step = 1.6, off = 0): SheetPoint[] => {
  const out: SheetPoint[] = [];
  for (let x = a; x <= b + 1e-9; x += step) out.push(sheetPoint(x, 300 - 0.2 * x + off));
  return out;
};

describe('mergeBroken', () => {
  it('joins a piece that starts just past the end of another', () => {
    const got = mergeBroken([{ points: run(0, 100), style: 'red' }, { points: run(104, 300), style: 'red' }], frame);
    expect(got).toHaveLength(1);
  });

  it('joins two pieces that overlap for a few units lying on each other, their points in order along the flow', () => {
    const a = [...run(0, 90), ...run(93.8, 97, 0.8)];
    const b = [...run(88.6, 91.8, 0.8), ...run(99, 300)];
    const got = mergeBroken([{ points: a, style: 'red' }, { points: b, style: 'red' }], frame);
    expect(got).toHaveLength(1);
    const xs = (got[0] as SheetPoint[]).map((p) => p[0]);
    expect(xs).toEqual([...xs].sort((p, q) => p - q));
    expect(xs.length).toBe(a.length + b.length);
  });

  it('keeps apart two lines of one style that overlap side by side', () => {
    const got = mergeBroken([{ points: run(0, 100), style: 'red' }, { points: run(92, 300, 1.6, 2), style: 'red' }], frame);
    expect(got).toHaveLength(2);
  });

  it('keeps apart pieces of two styles', () => {
    expect(mergeBroken([{ points: run(0, 100), style: 'red' }, { points: run(92, 300), style: 'blue' }], frame)).toHaveLength(2);
  });
});
