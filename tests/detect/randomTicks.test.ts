/**
 * The random bed's renderer prints every tick label exactly: a sheet whose labels are rounded
 * (12.5 printed "13") is a sheet no maker prints, and a detector rightly refuses it.
 */
import { describe, expect, it } from 'vitest';
import { tickDecimals } from '../../scripts/randomSheets/svg.ts';

describe('tick labels of the random bed', () => {
  it.each([
    [1, 0], [2, 0], [2.5, 1], [5, 0], [10, 0], [25, 0], [250, 0],
    [0.5, 1], [0.25, 2], [0.2, 1], [0.1, 1], [0.05, 2], [0.025, 3],
  ])('a step of %f needs %i decimals', (step, decimals) => {
    expect(tickDecimals(step)).toBe(decimals);
  });

  it('prints every multiple of a 2.5 step as itself, as a sum of steps reaches it', () => {
    let v = 0;
    const printed: string[] = [];
    for (let k = 0; k <= 6; k++, v += 2.5) printed.push(v.toFixed(tickDecimals(2.5)));
    expect(printed).toEqual(['0.0', '2.5', '5.0', '7.5', '10.0', '12.5', '15.0']);
  });
});
