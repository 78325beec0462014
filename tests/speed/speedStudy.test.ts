/**
 * The duty study with variable-speed control on a speed family: the speed comes from the
 * bracketing drawn curves (speed affinity law; Karassik, Pump Handbook; Lobanoff & Ross) and
 * must agree with the exact invented family's speed at the study's own system head within 0.5 %.
 */
import { describe, expect, it } from 'vitest';
import { runStudy } from '../../src/study/runStudy.ts';
import { inventedSpeedFamily, speedFamilyPointsText } from '../../src/demo/inventedSpeedFamily.ts';
import { buildSpeedSetFromText } from './buildSpeedSet.ts';
import { SPEED_CONTROL_STUDY } from './speedStudyInput.ts';

const fam = inventedSpeedFamily();
const set = buildSpeedSetFromText(speedFamilyPointsText(fam, { seed: 7 }));

describe('a study on a speed family under speed control', () => {
  it('runs at the exact family speed within 0.5 %, with the NPSH3 caution among the findings', () => {
    const r = runStudy(SPEED_CONTROL_STUDY, () => set).ranked[0]!;
    const q = 90 / 3600;
    // The system head at the duty at the highest static head, as the study computed it from its pipes.
    const need = r.operating_points.high!.head_m;
    // Exact speed: fam.head(q, n) = need, by bisection.
    let lo = 600;
    let hi = 1800;
    for (let i = 0; i < 200; i++) {
      const mid = 0.5 * (lo + hi);
      if (fam.head(q, mid) < need) lo = mid; else hi = mid;
    }
    const exact = 0.5 * (lo + hi);
    expect(exact).toBeGreaterThan(1000);
    expect(exact).toBeLessThan(1450);
    expect(Math.abs((r.speed_rpm as number) / exact - 1)).toBeLessThan(0.005);
    expect(r.findings.map((f) => f.message).join(' ')).toMatch(/NPSH3 at \d+ rpm is the \d+ rpm curve scaled/);
  });
});
