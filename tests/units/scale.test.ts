import { describe, expect, it } from 'vitest';
import { linearTicks, niceLinearScale, niceStep, niceTicks, ScaleError, scaleLinear, scaleLog, scaleOf } from '../../src/units/index.ts';

// Tolerances: round trips to 1e-12 relative (double rounding only).
const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(b)));

describe('scaleLinear', () => {
  it('linear(x) maps a domain value to a range value', () => {
    const s = scaleLinear([0, 400], [62, 496]);
    expect(s.map(0)).toBe(62);
    expect(s.map(400)).toBe(496);
    expect(s.map(100)).toBe(170.5);
    expect(s.map(-100)).toBe(-46.5);
  });
  it('linear.invert(y) maps a range value to a domain value', () => {
    const s = scaleLinear([0, 400], [62, 496]);
    expect(s.invert(62)).toBe(0);
    expect(s.invert(170.5)).toBe(100);
  });
  it('linear.invert is the exact inverse of linear, for a reversed range too (screen y points down)', () => {
    for (const s of [scaleLinear([0.3, 87.1], [164, 14]), scaleLinear([-40, 250], [0, 1]), scaleLinear([1e-5, 3e-3], [10, 610])]) {
      for (const x of [s.domain[0], s.domain[1], (s.domain[0] + s.domain[1]) / 3, 1.7 * s.domain[1]]) close(s.invert(s.map(x)), x);
      for (const y of [s.range[0], s.range[1], 0.42]) close(s.map(s.invert(y)), y);
    }
  });
  it('a degenerate domain maps every value to the middle of the range, and inverts to the domain value', () => {
    const s = scaleLinear([5, 5], [0, 100]);
    expect(s.map(5)).toBe(50);
    expect(s.map(123)).toBe(50);
    expect(s.invert(17)).toBe(5);
  });
  it('a degenerate range inverts every value to the middle of the domain', () => {
    expect(scaleLinear([0, 10], [7, 7]).invert(7)).toBe(5);
  });
  it('refuses a non-finite domain or range (a programmer error)', () => {
    expect(() => scaleLinear([0, Number.NaN], [0, 1])).toThrow(ScaleError);
    expect(() => scaleLinear([0, 1], [0, Number.POSITIVE_INFINITY])).toThrow(ScaleError);
  });
  it('linear.ticks gives round values inside the domain', () => {
    expect(scaleLinear([0, 370], [0, 1]).ticks(6)).toEqual([0, 100, 200, 300]);
    expect(scaleLinear([0, 370], [0, 1]).ticks(10)).toEqual([0, 50, 100, 150, 200, 250, 300, 350]);
    expect(scaleLinear([0.3, 0.87], [0, 1]).ticks(4)).toEqual([0.4, 0.6, 0.8]);
    expect(scaleLinear([10, -10], [0, 1]).ticks(4)).toEqual([-10, -5, 0, 5, 10]);
    expect(linearTicks(5, 5)).toEqual([5]);
  });
});

describe('scaleLog', () => {
  it('log(x) maps decades to equal lengths', () => {
    const s = scaleLog([1, 1000], [0, 300]);
    expect(s.map(1)).toBe(0);
    close(s.map(10), 100);
    close(s.map(100), 200);
    expect(s.map(1000)).toBe(300);
  });
  it('log.invert(y) maps a range value to a domain value, the exact inverse of log(x)', () => {
    const s = scaleLog([0.5, 2000], [400, 20]);
    close(s.invert(s.map(7.3)), 7.3);
    close(s.invert(400), 0.5);
    close(s.invert(20), 2000);
    for (const y of [20, 111, 399.5]) close(s.map(s.invert(y)), y);
  });
  it('a negative domain works by symmetry', () => {
    const s = scaleLog([-100, -1], [0, 2]);
    close(s.map(-10), 1);
    close(s.invert(1), -10);
    expect(s.ticks()).toEqual([-100, -50, -20, -10, -5, -2, -1]);
  });
  it('a degenerate domain maps to the middle of the range', () => {
    expect(scaleLog([10, 10], [0, 100]).map(10)).toBe(50);
    expect(scaleLog([10, 10], [0, 100]).invert(3)).toBe(10);
  });
  it('refuses a domain that includes or crosses zero (a programmer error)', () => {
    expect(() => scaleLog([0, 10], [0, 1])).toThrow(ScaleError);
    expect(() => scaleLog([-1, 10], [0, 1])).toThrow(ScaleError);
  });
  it('log.ticks gives powers of ten, with 2 and 5 times them when the decades are few', () => {
    expect(scaleLog([1, 100], [0, 1]).ticks(5)).toEqual([1, 2, 5, 10, 20, 50, 100]);
    expect(scaleLog([1, 1e6], [0, 1]).ticks(5)).toEqual([1, 10, 100, 1000, 10000, 100000, 1000000]);
    expect(scaleLog([3, 40], [0, 1]).ticks(5)).toEqual([5, 10, 20]);
  });
  it('scaleOf picks the kind', () => {
    expect(scaleOf('log', [1, 10], [0, 1]).kind).toBe('log');
    expect(scaleOf('linear', [1, 10], [0, 1]).kind).toBe('linear');
  });
});

describe('nice axes', () => {
  it('niceStep chooses 1, 2 or 5 times a power of ten, and 1 for an empty or odd span', () => {
    expect(niceStep(370, 6)).toBe(100);
    expect(niceStep(0.57, 4)).toBe(0.2);
    expect(niceStep(9, 4)).toBe(5);
    expect(niceStep(0, 4)).toBe(1);
    expect(niceStep(Number.NaN, 4)).toBe(1);
  });
  it('niceTicks widens the span to whole steps and covers it', () => {
    expect(niceTicks(0, 370, 6)).toEqual({ ticks: [0, 100, 200, 300, 400], lo: 0, hi: 400 });
    expect(niceTicks(0.3, 0.87, 4).ticks).toEqual([0.2, 0.4, 0.6, 0.8, 1]);
    expect(niceTicks(-13, 47, 6)).toEqual({ ticks: [-20, -10, 0, 10, 20, 30, 40, 50], lo: -20, hi: 50 });
  });
  it('niceTicks widens a degenerate span by 10 % each way (by 1 around zero)', () => {
    expect(niceTicks(5, 5, 4)).toEqual({ ticks: [4.5, 5, 5.5], lo: 4.5, hi: 5.5 });
    expect(niceTicks(0, 0, 4).ticks).toEqual([-1, -0.5, 0, 0.5, 1]);
  });
  it('niceTicks refuses a non-finite span instead of looping', () => {
    expect(() => niceTicks(0, Number.NEGATIVE_INFINITY)).toThrow(ScaleError);
    expect(() => niceTicks(Number.NaN, 1)).toThrow(ScaleError);
  });
  it('niceLinearScale maps the widened axis onto the range, with its ticks', () => {
    const s = niceLinearScale(0, 370, [62, 496], 6);
    expect(s.domain).toEqual([0, 400]);
    expect(s.tickValues).toEqual([0, 100, 200, 300, 400]);
    expect(s.map(400)).toBe(496);
    expect(s.invert(496)).toBe(400);
  });
});
