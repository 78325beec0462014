/**
 * Parallel pumps, fixed-speed studies and the viscosity correction on a speed family must run on
 * the rated (fastest) drawn curve, never on "the largest diameter": the members of a speed family
 * may all carry the one impeller diameter, in any order. A trim or another diameter is refused
 * with one sentence. The invented four-speed family is listed slowest first, every member
 * carrying its 200 mm impeller; the results must equal those of the same family in rated order
 * without diameters (the same numbers: exact equality).
 */
import { describe, expect, it } from 'vitest';
import { inventedSpeedFamily, speedFamilyPointsText } from '../../src/demo/inventedSpeedFamily.ts';
import { dutyCheck } from '../../src/duty/dutyCheck.ts';
import { DutyError } from '../../src/duty/errors.ts';
import { membersRatedFirst, ratedMember } from '../../src/duty/speed.ts';
import type { CurveSet } from '../../src/model/curveset.ts';
import { parseStudy } from '../../src/model/study.ts';
import { runStudy } from '../../src/study/runStudy.ts';
import { ISSUE_STUDY } from '../study/issueStudy.ts';
import { buildSpeedSetFromText } from './buildSpeedSet.ts';

const plain = buildSpeedSetFromText(speedFamilyPointsText(inventedSpeedFamily(), { seed: 7 }));
/** The same family, slowest first, each member carrying the one 200 mm impeller. */
const withDiameters: CurveSet = { ...plain, members: [...plain.members].reverse().map((m) => ({ ...m, diameter_m: 0.2 })) };

function study(option: Record<string, unknown>, liquid: Record<string, unknown> = { temperature: 30 }) {
  return parseStudy({
    ...ISSUE_STUDY,
    liquid,
    duty: { flow: 90 },
    suction: { surface_above_eye: [1.0, 1.0], pipes: [{ diameter: 154.1, length: 10, roughness: 0.045, k: 1.0 }] },
    discharge: { static_head: [6, 8], pipes: [{ diameter: 154.1, length: 100, roughness: 0.045, k: 3 }] },
    options: [{ name: 'speed family', curveset: 'x', impeller: 'drawn', ...option }],
  });
}

describe('a speed family whose members carry the impeller diameter', () => {
  it('has the fastest drawn curve as its rated member', () => {
    expect(ratedMember(withDiameters).speed_rpm).toBe(1450);
    expect(membersRatedFirst(withDiameters).map((m) => m.speed_rpm)).toEqual([1450, 1300, 1150, 1000]);
  });

  it('the duty check with two pumps in parallel lists and runs the rated curve first, as without diameters', () => {
    const input = { flow_m3s: 160 / 3600, head_m: 16, static_head_m: 6, parallel_count: 2, variable_speed: true };
    const a = dutyCheck(withDiameters, input);
    const b = dutyCheck(plain, input);
    // The listed operating points, rated curve first (labels differ: these members carry a diameter).
    expect(a.operating_points.map((p) => p.result)).toEqual(b.operating_points.map((p) => p.result));
    expect(a.speed).toEqual(b.speed);
    expect(a.parallel).toEqual(b.parallel);
  });

  it('refuses a trimmed diameter on a speed family with one sentence', () => {
    expect(() => dutyCheck(withDiameters, { flow_m3s: 0.02, head_m: 16, extra_diameters_m: [0.19] })).toThrow(DutyError);
    expect(() => dutyCheck(withDiameters, { flow_m3s: 0.02, head_m: 16, extra_diameters_m: [0.19] })).toThrow(/speed family .* no impeller trim/);
  });

  it('a throttled study runs at rated speed, and a viscous one corrects the rated curve', () => {
    for (const liquid of [{ temperature: 30 }, { temperature: 30, viscosity: 60, density: 880, vapour_pressure: 1 }]) {
      const a = runStudy(study({ control: 'throttle', pumps: 2 }, liquid), () => withDiameters).ranked[0]!;
      const b = runStudy(study({ control: 'throttle', pumps: 2 }, liquid), () => plain).ranked[0]!;
      expect(a.rated_speed_rpm).toBe(1450);
      expect(a.operating_points).toEqual(b.operating_points);
      expect(a.viscous).toEqual(b.viscous);
    }
  });

  it('a study asking for a trim or a given diameter on a speed family is refused with one sentence', () => {
    expect(() => runStudy(study({ impeller: 'trim' }), () => withDiameters)).toThrow(/speed family/);
    expect(() => runStudy(study({ impeller: 'given', diameter: 190 }), () => withDiameters)).toThrow(/speed family/);
  });
});
