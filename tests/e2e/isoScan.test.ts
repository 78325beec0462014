/**
 * An iso-line scan in the workbench: a sheet of the independent random bed (an INVENTED family)
 * with efficiency drawn as iso-lines across the head curves, scanned (rotation, blur, JPEG), and
 * opened with the hurried take-off the bed made for it, whose iso-line guides sit mostly where
 * the iso-lines meet the head curves, the natural place to click. The workbench must follow the
 * thin iso-line, not the thick head curve, give what the headless replay gives, read efficiency
 * for the diameters the iso-lines reach, and leave no curve wrong without a finding.
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { applyH } from '../../scripts/randomSheets/camera.ts';
import { wrongLimit } from '../../scripts/randomSheets/score.ts';
import { ARTIFACTS } from './harness.ts';
import { bedSession } from './randomBedFlow.ts';

const dir = join(ARTIFACTS, 'iso-scan');
const session = bedSession(dir);

describe('the take-off workbench on an iso-line scan with guides on the crossings', () => {
  // Seed 54 of the bed: a 150-dpi scan, efficiency as iso-lines, 8 of its 13 iso guides on crossings.
  it('follows the iso-lines from guides on the crossings, matches the headless replay and flags every curve it misses', async () => {
    const run = await session.run(54, 'scan', join(dir, 'seed-54'));
    const { plan, shot, takeoff } = run.sheet;
    expect(plan.efficiencyAs).toBe('iso');
    // The take-off really clicks iso-lines on their crossings with the head curves (within 2 px).
    const heads = plan.lines.filter((l) => l.quantity === 'head').map((l) => l.points.map((p) => applyH(shot.h, p)));
    const isoGuides = takeoff.traces.filter((t) => t.iso !== undefined).flatMap((t) => t.guides ?? []);
    const onCrossings = isoGuides.filter((g) => heads.some((h) => h.some((p) => Math.hypot(p[0] - g[0], p[1] - g[1]) < 2)));
    expect(onCrossings.length).toBeGreaterThanOrEqual(4);

    expect(Math.max(...run.gaps.map((g) => Math.max(g.percentOfSpan, g.domainPercent)))).toBeLessThanOrEqual(0.05);
    // Efficiency from the iso-lines, against the exact truth over the crossings' span.
    const iso = run.scores.filter((s) => s.source === 'iso');
    expect(iso.length).toBeGreaterThan(0);
    for (const s of run.scores) {
      const limit = wrongLimit(s);
      if (!s.flagged) expect(s.error, `${s.id} is off by ${s.error} and no finding names it`).toBeLessThanOrEqual(limit);
    }
    // An iso-line followed onto a head curve would give a diameter more than two crossings per level.
    expect(run.findings.filter((f) => /meets? the head trace of diameter .* times/.test(f))).toEqual([]);
    expect(iso.filter((s) => !s.wrong).length).toBeGreaterThanOrEqual(1);
  });
});
