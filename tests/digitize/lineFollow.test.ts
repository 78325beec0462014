import { describe, expect, it } from 'vitest';
import { inkModel } from '../../src/digitize/colour.ts';
import { thinnedRun, type LineStyle, type Pick } from '../../src/digitize/lineFollow.ts';
import type { Run } from '../../src/digitize/lineProfile.ts';

const blue = inkModel([40, 80, 200], [255, 255, 255]);
const style: LineStyle = { model: blue, width: 3, threshold: 0.3, massRange: [0.55, 1.5] };
const run = (centre: number, mass: number): Run => ({ centre, mass, start: centre - mass / 2, end: centre + mass / 2, lowEdge: centre - mass / 2, highEdge: centre + mass / 2 });

describe('line following through a line of another colour', () => {
  it('takes one thinned run at the prediction as the line, not a thinned run away from it or beside another candidate', () => {
    const pick: Pick = { offset: 0, clean: true };
    expect(thinnedRun([run(0.4, 1.2)], style, 1.8, pick)).toBe(true);
    expect(pick.offset).toBeCloseTo(0.3, 9);
    expect(pick.clean).toBe(false); // steered by at most a tenth of the width; not clean
    expect(thinnedRun([run(2.5, 1.2)], style, 1.8, pick)).toBe(false); // off the prediction
    expect(thinnedRun([run(0.4, 1.2), run(-4, 2.8)], style, 1.8, pick)).toBe(false); // another candidate in view
    expect(thinnedRun([run(0.4, 0.5)], style, 1.8, pick)).toBe(false); // too little ink: a speck
    expect(thinnedRun([run(0.2, 3)], style, 1.8, pick)).toBe(false); // a full run is chooseOffset's, not a thinned one
  });
});
