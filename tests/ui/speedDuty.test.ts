/**
 * The workbench's duty study on a speed family (one INVENTED impeller drawn at 1450/1300/1150/
 * 1000 rpm, src/demo/inventedSpeedFamily.ts): no trim is offered, the first option is variable
 * speed, its speed is the one the duty check of the command line finds (the same
 * src/duty/speed.ts), and NPSH3 at that speed follows the speed-family rule (nearest drawn speed
 * at or above, scaled by n², with its caution), as the duty check reads it.
 */
import { describe, expect, it } from 'vitest';
import { inventedSpeedFamily, speedFamilyPointsText } from '../../src/demo/inventedSpeedFamily.ts';
import { dutyCheck } from '../../src/duty/dutyCheck.ts';
import { npsh3ForSpeed } from '../../src/fit/speedFamily.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import type { CurveSet, Member } from '../../src/model/curveset.ts';
import { runDuty, speedSentence } from '../../src/ui/views/dutyPanel.ts';
import { EMPTY_DUTY, FIRST_OPTION, formOptions, nextOption, SPEED_FIRST_OPTION, studyOfForm } from '../../src/ui/views/studyForm.ts';
import { chartUnits } from '../../src/ui/views/familyChart.ts';
import { buildSpeedSetFromText } from '../speed/buildSpeedSet.ts';

const fam = inventedSpeedFamily();
const built = buildSpeedSetFromText(speedFamilyPointsText(fam, { seed: 7 }));

/**
 * The same family with the 1300 rpm NPSH3 curve drawn 10 % above the n² law, as drawn NPSH3
 * curves often are at reduced speed: NPSH3 between 1150 and 1300 rpm must then come from the
 * 1300 rpm curve, and reading the rated curve scaled down instead would show 10 % less.
 */
function withHigherNpsh3At1300(set: CurveSet): CurveSet {
  const members = set.members.map((m): Member => {
    const fit = m.curves.npshr?.fit;
    if (m.speed_rpm !== 1300 || !fit || !m.curves.npshr) return m;
    return { ...m, curves: { ...m.curves, npshr: { ...m.curves.npshr, fit: { ...fit, coefficients: fit.coefficients.map((c) => 1.1 * c) } } } };
  });
  return { ...set, members };
}
const set = withHigherNpsh3At1300(built);

/** A duty between the drawn 1150 and 1300 rpm curves: 80 m³/h against 6 m static, 13 m at the duty. */
const DUTY = { ...EMPTY_DUTY, flow: '80', head: '13', staticHead: '6', suctionStatic: '1' };

describe('the duty study of the workbench on a speed family', () => {
  it('offers variable speed first and never a trim', () => {
    expect(formOptions(EMPTY_DUTY, 'speed')).toEqual([SPEED_FIRST_OPTION]);
    expect(formOptions(EMPTY_DUTY, 'diameter')).toEqual([FIRST_OPTION]);
    let options = formOptions(EMPTY_DUTY, 'speed');
    for (let i = 0; i < 6; i++) options = [...options, nextOption(options, 'speed')];
    expect(options.every((o) => o.impeller === 'drawn')).toBe(true);
    expect(new Set(options.map((o) => o.control))).toEqual(new Set(['speed', 'throttle']));
    const study = studyOfForm(DUTY, chartUnits(set), 'speed')!;
    expect(study.options.map((o) => [o.impeller, o.control])).toEqual([['drawn', 'speed']]);
  });

  it('runs the duty at the speed the duty check finds (the command line\'s `duty`), within 0.1 %, and at the exact family\'s speed within 0.5 %', () => {
    const outcome = runDuty(set, DUTY, 'own');
    if (!outcome || !('result' in outcome)) throw new Error(`the duty should run: ${JSON.stringify(outcome)}`);
    const r = outcome.result.ranked[0]!;
    const speed = r.speed_rpm as number;
    expect(speed).toBeGreaterThan(1150);
    expect(speed).toBeLessThan(1300);
    // The same duty through the duty check the CLI runs: flow 80 m³/h, head 13 m, static 6 m.
    const report = dutyCheck(set, { flow_m3s: 80 / 3600, head_m: 13, static_head_m: 6 });
    expect(report.trim.method).toBe('speed');
    expect(Math.abs(speed / (report.trim.speed_rpm as number) - 1)).toBeLessThan(0.001);
    // The exact invented family: head(q, n) = 6 + 7·(q/qd)² at q = qd, solved by bisection.
    let lo = 1000;
    let hi = 1450;
    for (let i = 0; i < 200; i++) {
      const mid = 0.5 * (lo + hi);
      if (fam.head(80 / 3600, mid) < 13) lo = mid; else hi = mid;
    }
    expect(Math.abs(speed / (0.5 * (lo + hi)) - 1)).toBeLessThan(0.005);
    expect(speedSentence(set, r)).toMatch(/^Variable speed: the pump runs at 1\d{3} rpm \(\d+(\.\d+)? % of the rated 1450 rpm\) at the highest static head, between the drawn 1150 rpm and 1300 rpm curves\.$/);
  });

  it('reads NPSH3 at that speed from the drawn 1300 rpm curve, with its caution, as the duty check does', () => {
    const outcome = runDuty(set, DUTY, 'own');
    if (!outcome || !('result' in outcome)) throw new Error('the duty should run');
    const r = outcome.result.ranked[0]!;
    const speed = r.speed_rpm as number;
    const rule = npsh3ForSpeed(set, speed)!;
    expect(rule.from_speed_rpm).toBe(1300);
    const q = 80 / 3600;
    const expected = evaluateUnchecked(rule.fit, q);
    // Exact to rounding: the same function, the same flow.
    expect(r.npsh?.duty?.npsh3_m).toBeCloseTo(expected, 9);
    const report = dutyCheck(set, { flow_m3s: q, head_m: 13, static_head_m: 6 });
    expect(r.npsh!.duty!.npsh3_m / (report.trim.point!.npshr_m as number)).toBeCloseTo(1, 3);
    // The rated curve scaled down would read 10 % less: the test tells the two rules apart.
    const fromRated = npsh3ForSpeed({ members: set.members.filter((m) => m.speed_rpm === 1450) }, speed)!;
    expect(expected / evaluateUnchecked(fromRated.fit, q)).toBeGreaterThan(1.05);
    expect(r.findings.map((f) => f.message).join(' ')).toMatch(/NPSH3 at \d+ rpm is the 1300 rpm curve scaled by \(n\/n_drawn\)²/);
    expect(r.motor?.selection.rating).toBeDefined();
  });

  it('draws the head curve at the operating speed through the operating point on the family chart', () => {
    const outcome = runDuty(set, DUTY, 'own');
    if (!outcome || !('result' in outcome)) throw new Error('the duty should run');
    const speed = outcome.result.ranked[0]!.speed_rpm as number;
    const curves = outcome.overlay.curves ?? [];
    expect(curves.map((c) => c.label)).toEqual([`Variable speed: ${Math.round(speed)} rpm`]);
    // The curve passes through the duty (80 m³/h, 13 m) within 0.5 % of head, read between its two nearest drawn points.
    const q = 80 / 3600;
    const pts = curves[0]!.points;
    const k = pts.findIndex((p) => p[0] >= q);
    const [a, b] = [pts[k - 1]!, pts[k]!];
    const h = a[1] + ((b[1] - a[1]) * (q - a[0])) / (b[0] - a[0]);
    expect(Math.abs(h / 13 - 1)).toBeLessThan(0.005);
  });

  it('refuses an option that still asks for a trim, with the study\'s sentence', () => {
    const outcome = runDuty(set, { ...DUTY, options: [FIRST_OPTION] }, 'own');
    expect(outcome && 'error' in outcome ? outcome.error : '').toMatch(/speed family .* no impeller trim/);
  });
});
