/**
 * An INVENTED speed family (scripts/randomSheets/speedSheet.ts, seed 110) whose 2320 rpm head
 * curve droops by about the drawing's resolution: it rises 0.011 m from shutoff to its peak
 * against a 0.011 m reading accuracy. The shape rule once refused that real droop and the curve
 * fell back to a straight line 0.58 m RMS off its points; every head curve must keep a proper
 * degree and follow its drawn path.
 */
import { describe, expect, it } from 'vitest';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { scoreReplay } from '../../scripts/randomSheets/score.ts';
import { makeSpeedSheet, speedTruthSource } from '../../scripts/randomSheets/speedSheet.ts';
import { hasChromium } from '../digitize/fixtures/browserSheet.ts';

describe.skipIf(!hasChromium)('a vector speed sheet with a head curve drooping by the resolution', () => {
  it('fits every head curve at degree 2 or more, within 0.02 % of span of the truth', async () => {
    const s = await makeSpeedSheet(110, { kind: 'vector', efficiencyAs: 'curves', minFlowLine: false });
    const sheet = await loadPdfSheetNode(s.bytes);
    const set = await replayTakeoff(parseTakeoff(s.takeoff), sheet, { created: '2026-01-01T00:00:00.000Z' }).finally(() => sheet.close());
    for (const m of set.curveSet.members) expect(m.curves.head?.fit?.degree, `${m.speed_rpm} rpm`).toBeGreaterThanOrEqual(2);
    expect(set.curveSet.findings.filter((f) => f.code.startsWith('fit.')).map((f) => f.message)).toEqual([]);
    const heads = scoreReplay(s.family, s.truth, set.curveSet, speedTruthSource(s.family)).filter((r) => r.quantity === 'head');
    expect(heads).toHaveLength(4);
    for (const r of heads) expect(r.error, r.id).toBeLessThan(0.02); // % of span
  }, 60_000);
});
