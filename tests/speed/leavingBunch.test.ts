/**
 * A hurried guide at the origin of a speed family's efficiency curves, where all four rise from
 * one point (src/digitize/rasterTrace.ts, `leavingBunch`): the colour sampled there is a mix, and
 * the head curve's colour, tried at the guide, sees nothing of its line, hidden under the others.
 * The line of the head curve's colour is then looked for where it leaves the bunch, along the
 * path the mix followed. Speed bench sheet 54 (an INVENTED family drawn by the independent
 * renderer, as a scan): the 1000 rpm efficiency trace has one guide, at the origin; it had
 * followed the 1450 rpm line, 12.7 points off. Scored against the exact affinity-scaled family
 * (Q ∝ n, H ∝ n², P ∝ n³; Karassik, Pump Handbook) with the bench's own scorer.
 */
import { describe, expect, it } from 'vitest';
import { benchOptions, cachedSpeedSheet, sheetOf } from '../../scripts/randomSheets/speedDump.ts';
import { scoreReplay } from '../../scripts/randomSheets/score.ts';
import { speedTruthSource } from '../../scripts/randomSheets/speedSheet.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { hasChromium } from '../digitize/fixtures/browserSheet.ts';

describe.skipIf(!hasChromium)('a lone guide where a speed family\'s efficiency curves rise together', () => {
  it('takes the line of its head curve\'s colour where it leaves the bunch, within 1.5 points, still saying the guide sits in a bunch', async () => {
    const s = await cachedSpeedSheet(54, benchOptions(54, 'scan'));
    const trace = s.takeoff.traces.find((t) => t.id === 'efficiency-1000');
    expect(trace?.guides?.length).toBe(1);
    const sheet = await sheetOf(s);
    try {
      const result = await replayTakeoff(parseTakeoff(s.takeoff), sheet, { created: '2026-01-01T00:00:00.000Z' });
      const row = scoreReplay(s.family, s.truth, result.curveSet, speedTruthSource(s.family)).find((r) => r.id === 'efficiency-1000');
      expect(row?.error).toBeLessThan(1.5);
      // The scorer's flags (the findings that name this trace): the guide's doubt stands, and the trace no longer lies on a neighbour's line.
      expect(row?.flags).toContain('takeoff.guide-in-bunch');
      expect(row?.flags).not.toContain('takeoff.trace-neighbour');
    } finally {
      await sheet.close();
    }
  }, 120_000);
});
