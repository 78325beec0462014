/**
 * INVENTED four-speed family scanned (scripts/randomSheets/speedSheet.ts, seed 28), taken off with
 * the bench's own hurried guides. The 1250 rpm efficiency line is a grey line standing alone,
 * clicked twice; the sample under its guides measured it 1.83 px wide while its mass along the
 * line beyond them is 2.5–2.9 px, past the range a grey model allows (1.35 times its width).
 * Every section ahead was ambiguous, the follower coasted and lost the line at once, and the
 * trace ended at its guides: a fifth of the line, 14 points off. Measured again along the
 * followed stretch, where every section saw the line alone, the wider width is now taken.
 * Scored with the bed's scorer over 15–95 % of the curve's flow range, against the exact
 * affinity-scaled family (speed law; Karassik, Pump Handbook).
 */
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { decode } from '../../scripts/randomSheets/camera.ts';
import { scoreReplay } from '../../scripts/randomSheets/score.ts';
import { benchOptions } from '../../scripts/randomSheets/speedDump.ts';
import { makeSpeedSheet, speedTruthSource } from '../../scripts/randomSheets/speedSheet.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { hasChromium } from '../digitize/fixtures/browserSheet.ts';

describe.skipIf(!hasChromium)('a grey line wider along its course than under its guides (speed scan seed 28)', () => {
  it('is followed past its guides to its ends, within 1.5 points', async () => {
    const s = await makeSpeedSheet(28, benchOptions(28, 'scan'));
    const d = await decode(Buffer.from(s.bytes));
    const raster = { width: d.width, height: d.height, data: d.data, scale: 1 };
    const sheet = imageSheet(raster, createHash('sha256').update(s.bytes).digest('hex'), () => raster);
    try {
      const { curveSet } = await replayTakeoff(parseTakeoff(s.takeoff), sheet, { created: '2026-01-01T00:00:00.000Z' });
      const row = scoreReplay(s.family, s.truth, curveSet, speedTruthSource(s.family)).find((r) => r.id === 'efficiency-1250');
      expect(row?.error).toBeLessThan(1.5);
    } finally {
      await sheet.close();
    }
  }, 120_000);
});
