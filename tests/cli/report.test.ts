/** The text report of a curve set: a BEP the findings doubt is marked where it is printed (invented curves, not real products). */
import { describe, expect, it } from 'vitest';
import { buildCurveSet } from '../../src/fit/build.ts';
import { linspace } from '../../src/fit/polynomial.ts';
import type { CurvePoint } from '../../src/model/curveset.ts';
import { formatReport } from '../../src/cli/report.ts';

const base = {
  pump: { name: 'Invented test pump' },
  speed_rpm: 2900,
  fluid: { name: 'water', density_kg_m3: 998.2, specific_gravity: 1 },
  display_units: { flow: 'm3/h', head: 'm', npsh: 'm', power: 'kW', diameter: 'mm' },
};
const pts = (f: (q: number) => number, qs: number[]) => qs.map((q) => [q, f(q)] as CurvePoint);
const head = (q: number) => 60 - 2000 * q * q;
const eff = (q: number) => 0.8 * (q / 0.06) * (2 - q / 0.06);

describe('the text report', () => {
  it('marks a BEP past the captured end of the head curve as not reliable, and leaves a sound one alone', () => {
    const short = buildCurveSet({ ...base, members: [{ diameter_m: 0.25, points: { head: pts(head, linspace(0, 0.045, 12)), efficiency: pts(eff, linspace(0.007, 0.1, 14)) } }] });
    expect(formatReport(short)).toMatch(/BEP 216 m³\/h at [\d.]+ m, 80 % \(not reliable: see the findings\)/);
    const whole = buildCurveSet({ ...base, members: [{ diameter_m: 0.25, points: { head: pts(head, linspace(0, 0.1, 15)), efficiency: pts(eff, linspace(0.007, 0.1, 14)) } }] });
    expect(formatReport(whole)).toMatch(/BEP 216 m³\/h at [\d.]+ m, 80 %;/);
  });
});
