import { describe, expect, it } from 'vitest';
import { inkModel } from '../../src/digitize/colour.ts';
import { chooseOffset, courseOffset, type LineStyle, type Pick } from '../../src/digitize/lineFollow.ts';
import type { Run } from '../../src/digitize/lineProfile.ts';

const style: LineStyle = { model: inkModel([0, 0, 0], [255, 255, 255]), width: 2, threshold: 0.4, massRange: [0.8, 1.35] };

/** A clean run of the line's width centred at `centre` (offset from the prediction, pixels). */
const run = (centre: number): Run => ({ centre, mass: 2, start: centre - 1, end: centre + 1, lowEdge: centre - 1, highEdge: centre + 1 });

describe('the run choice at a fork', () => {
  it('takes the candidate nearest the prediction when no course is given, or when the course agrees', () => {
    const pick: Pick = { offset: 0, clean: false };
    expect(chooseOffset([run(0.4), run(3.5)], style, 1.5, pick)).toBe('found');
    expect(pick.offset).toBeCloseTo(0.4);
    expect(pick.clean).toBe(true);
    expect(chooseOffset([run(0.4), run(3.5)], style, 1.5, pick, () => 0.2)).toBe('found');
    expect(pick.offset).toBeCloseTo(0.4);
  });

  it('coasts (ambiguous) where the line\'s course lies clearly nearer another candidate than the one the prediction chose', () => {
    const pick: Pick = { offset: 99, clean: false };
    expect(chooseOffset([run(0.4), run(3.5)], style, 1.5, pick, () => 3.2)).toBe('ambiguous');
    expect(pick.offset).toBe(99); // nothing picked
  });

  it('does not ask for the course where the section holds one candidate only', () => {
    let asked = 0;
    const pick: Pick = { offset: 0, clean: false };
    expect(
      chooseOffset([run(0.6)], style, 1.5, pick, () => {
        asked++;
        return 5;
      }),
    ).toBe('found');
    expect(asked).toBe(0);
  });
});

describe('the course of a followed line', () => {
  it('carries the bending of the line so far on to the next section (a circle of radius 200 px)', () => {
    const r = 200;
    const points: number[] = [];
    const clean: boolean[] = [];
    // An arc from angle 0 to 0.3 rad, points 1.5 px apart, centre (0, 0): (r cos a, r sin a).
    for (let a = 0; a <= 0.3; a += 1.5 / r) {
      points.push(r * Math.cos(a), r * Math.sin(a));
      clean.push(true);
    }
    const last = points.length / 2 - 1;
    const aEnd = last * (1.5 / r);
    // The next section, 3 px on along the tangent: the circle lies √(r² + 9) − r ≈ 3²/(2r) px from
    // it towards the centre, along the section's normal.
    const tx = -Math.sin(aEnd);
    const ty = Math.cos(aEnd);
    const qx = r * Math.cos(aEnd) + 3 * tx;
    const qy = r * Math.sin(aEnd) + 3 * ty;
    // Normal pointing to the circle's centre.
    const nx = -Math.cos(aEnd);
    const ny = -Math.sin(aEnd);
    const offset = courseOffset(points, clean, 40, qx, qy, nx, ny);
    expect(offset).toBeDefined();
    expect(offset as number).toBeCloseTo(Math.hypot(qx, qy) - r, 2);
    // Points taken at an edge of a merge (not clean) are left out of the fit.
    const bent = [...points];
    const dirty = [...clean];
    for (let k = last - 3; k <= last - 1; k++) {
      bent[k * 2 + 1] = (bent[k * 2 + 1] as number) + 5;
      dirty[k] = false;
    }
    expect(courseOffset(bent, dirty, 40, qx, qy, nx, ny) as number).toBeCloseTo(Math.hypot(qx, qy) - r, 2);
  });

  it('gives no course from too short a stretch of line', () => {
    expect(courseOffset([0, 0, 1.5, 0, 3, 0], [true, true, true], 40, 4.5, 0, 0, 1)).toBeUndefined();
  });
});
