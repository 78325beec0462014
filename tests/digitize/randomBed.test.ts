/**
 * The random sheet bed (scripts/randomSheets) checked against itself before it judges the
 * take-off: the homography maps its four corners exactly and inverts, and a take-off given
 * the exact points of every drawn line (through the camera) scores within the fit's own
 * error, so that a large error in the bench belongs to the reading, not to the bed.
 */
import { describe, expect, it } from 'vitest';
import { applyH, homographyFrom, invertH } from '../../scripts/randomSheets/camera.ts';
import { makeRandomSheet } from '../../scripts/randomSheets/randomSheet.ts';
import { scoreReplay } from '../../scripts/randomSheets/score.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';

describe('random sheet bed', () => {
  it('homographyFrom maps four points onto four points and invertH undoes it', () => {
    const from: [number, number][] = [[0, 0], [100, 0], [100, 80], [0, 80]];
    const to: [number, number][] = [[5, 3], [96, 0], [104, 85], [-2, 81]];
    const h = homographyFrom(from, to);
    from.forEach((p, i) => {
      const q = applyH(h, p);
      expect(Math.hypot(q[0] - (to[i] as number[])[0]!, q[1] - (to[i] as number[])[1]!)).toBeLessThan(1e-9);
      const back = applyH(invertH(h), q);
      expect(Math.hypot(back[0] - p[0], back[1] - p[1])).toBeLessThan(1e-9);
    });
  });

  it.each([[4, 'scan'], [6, 'scan']] as const)('sheet %i (%s): exact points score within the fit error', async (seed, kind) => {
    const s = await makeRandomSheet(seed, kind);
    const takeoff = structuredClone(s.takeoff);
    for (const trace of takeoff.traces) {
      const line = s.plan.lines.find((l) => l.id === trace.id);
      if (!line) throw new Error(`no line ${trace.id}`);
      delete trace.guides;
      trace.points = line.points.filter((_, i) => i % 5 === 0).map((p) => applyH(s.shot.h, p));
    }
    const raster = { width: 4, height: 4, data: new Uint8ClampedArray(64), scale: 1 };
    const replay = await replayTakeoff(parseTakeoff(takeoff), imageSheet(raster, '0'.repeat(64), () => raster));
    const scores = scoreReplay(s.plan.family, s.truth, replay.curveSet);
    expect(scores.length).toBeGreaterThan(3);
    // Anchor jitter (0.2 px) and the polynomial fit of non-polynomial curves: 0.5 % of span, 0.6 points.
    for (const row of scores) expect(row.error, row.id).toBeLessThan(row.quantity === 'efficiency' ? 0.6 : 0.5);
  });
});
