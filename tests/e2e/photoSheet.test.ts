/**
 * A photo-like sheet in the workbench: a sheet of the independent random bed (an INVENTED family)
 * taken by a hand-held camera (keystone perspective, rotation, uneven light, blur, JPEG), opened
 * with the hurried take-off the bed made for it (four anchors a panel, one to three guides a
 * line at random places). The workbench must choose the projective calibration for every panel,
 * give what the headless replay gives (same code, within 0.05 % of span), and leave no curve
 * wrong without a finding naming it.
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { wrongLimit } from '../../scripts/randomSheets/score.ts';
import { ARTIFACTS } from './harness.ts';
import { bedSession } from './randomBedFlow.ts';

const dir = join(ARTIFACTS, 'photo');
const session = bedSession(dir);

describe('the take-off workbench on a photo of a printed sheet', () => {
  // Seed 29 of the bed: a photo with 5.6 % keystone, efficiency in its own panel.
  it('calibrates projectively, matches the headless replay and flags every curve it misses', async () => {
    const run = await session.run(29, 'photo', join(dir, 'seed-29'));
    expect(run.sheet.shot.keystone).toBeGreaterThan(0.03);
    // Each panel's calibration is said in the provenance; four anchors on a keystoned photo show perspective.
    const calibrations = (run.workbench.provenance.notes ?? []).filter((n) => /calibration, residual/.test(n));
    expect(calibrations.length).toBe(run.sheet.takeoff.panels.length);
    for (const note of calibrations) expect(note).toMatch(/projective calibration/);
    // The workbench and the headless replay run the same code on the same pixels.
    expect(run.gaps.length).toBeGreaterThanOrEqual(run.sheet.truth.length);
    expect(Math.max(...run.gaps.map((g) => Math.max(g.percentOfSpan, g.domainPercent)))).toBeLessThanOrEqual(0.05);
    // Against the exact truth: within the bed's tolerance (1 % of span; 1.5 points from curves, 2 from iso-lines), or flagged.
    expect(run.scores.length).toBe(run.sheet.truth.length);
    for (const s of run.scores) {
      const limit = wrongLimit(s);
      if (!s.flagged) expect(s.error, `${s.id} is off by ${s.error} and no finding names it`).toBeLessThanOrEqual(limit);
    }
    // Most of this sheet reads within the tolerance on its own (8 curves, all within it on the bench).
    expect(run.scores.filter((s) => !s.wrong).length).toBeGreaterThanOrEqual(Math.ceil(0.75 * run.scores.length));
  });
});
