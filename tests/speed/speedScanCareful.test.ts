/**
 * INVENTED four-speed families scanned (scripts/randomSheets/speedSheet.ts, seeds 2 and 22:
 * efficiency drawn as curves that run together near their peaks, over grid lines), taken off with each
 * trace's guides where its line stands alone (carefulGuides, as the speed bench's careful view),
 * and scored against the exact affinity-scaled family (speed law Q ∝ n, H ∝ n², P ∝ n³; Karassik,
 * Pump Handbook) with the bed's scorer, within a diameter family's scan tolerances: 1 % of span
 * for every curve, 1.5 points for efficiency, over 15–95 % of each curve's flow range.
 *
 * The first guide of the 1600 rpm efficiency line sits where a grid line crosses it; with the grid
 * taken out the line measured 1.16 px there against 2.1 px where it stands alone, and that width
 * called the clean guides a bunch: the model kept followed the line onto its neighbours, 3.5
 * points off.
 *
 * Seed 22: the first guide of the 1400 rpm efficiency line (green) sits where the line is drawn
 * thin and the JPEG kept little of its hue, so its sample read as grey; the two other guides
 * sampled the green. All three found the line, and the first won the tie: a grey model follows
 * the grid and the black line too, and the trace stopped at a grid line each way, 1.63 points off.
 * A grey sample whose colour belongs to a coloured guide's model is now taken for a washed-out
 * sample of that colour.
 */
import { createHash } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { decode } from '../../scripts/randomSheets/camera.ts';
import { scoreReplay, type CurveScore } from '../../scripts/randomSheets/score.ts';
import { withCarefulGuides } from '../../scripts/randomSheets/speedDump.ts';
import { makeSpeedSheet, speedTruthSource } from '../../scripts/randomSheets/speedSheet.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { hasChromium } from '../digitize/fixtures/browserSheet.ts';

describe.skipIf(!hasChromium).each([2, 22])('a scanned speed family (seed %i) taken off with guides where each line stands alone', (seed) => {
  let scores: CurveScore[];
  beforeAll(async () => {
    const s = withCarefulGuides(await makeSpeedSheet(seed, { kind: 'scan', efficiencyAs: 'curves' }));
    const d = await decode(Buffer.from(s.bytes));
    const raster = { width: d.width, height: d.height, data: d.data, scale: 1 };
    const sheet = imageSheet(raster, createHash('sha256').update(s.bytes).digest('hex'), () => raster);
    try {
      const { curveSet } = await replayTakeoff(parseTakeoff(s.takeoff), sheet, { created: '2026-01-01T00:00:00.000Z' });
      scores = scoreReplay(s.family, s.truth, curveSet, speedTruthSource(s.family));
    } finally {
      await sheet.close();
    }
  }, 120_000);

  it('has every curve of every speed within 1 % of span, and efficiency within 1.5 points', () => {
    expect(scores).toHaveLength(16);
    for (const row of scores.filter((r) => r.quantity !== 'efficiency')) expect(row.error, row.id).toBeLessThan(1);
    for (const row of scores.filter((r) => r.quantity === 'efficiency')) expect(row.error, row.id).toBeLessThan(1.5);
  });
});
