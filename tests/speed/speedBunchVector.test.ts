/**
 * INVENTED speed families drawn by the independent renderer (scripts/randomSheets/speedSheet.ts)
 * as vector PDFs printed by Chromium, where a hurried take-off puts a guide nearer another
 * speed's path than its own: efficiency curves that bunch at low flow and cross near their
 * peaks (seeds 2 and 8), and a head curve's only guide where an iso-efficiency line crosses it
 * (seed 9). Every curve is its own stroked path, so each trace must take its own speed's path:
 * the captured points lie on the exact curve of their speed (speed law Q ∝ n, η constant along
 * Q/n; Karassik, Pump Handbook), head, power and NPSHr fit within 0.1 % of span and efficiency
 * within 1.5 points, and no capture is left to a guess.
 */
import { describe, expect, it } from 'vitest';
import { scoreReplay } from '../../scripts/randomSheets/score.ts';
import { drawnRangeAtSpeed, exactAtSpeed, makeSpeedSheet, speedTruthSource, type SpeedSheet, type SpeedSheetOptions } from '../../scripts/randomSheets/speedSheet.ts';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import { replayTakeoff, type ReplayResult } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { hasChromium } from '../digitize/fixtures/browserSheet.ts';

async function replay(s: SpeedSheet): Promise<ReplayResult> {
  const sheet = await loadPdfSheetNode(s.bytes);
  try {
    return await replayTakeoff(parseTakeoff(s.takeoff), sheet, { created: '2026-01-01T00:00:00.000Z' });
  } finally {
    await sheet.close();
  }
}

/** Worst distance of a trace's captured points from its own speed's exact curve, % of the panel's value span (15–95 % of its flow range). */
function worstPointError(s: SpeedSheet, result: ReplayResult, id: string): number {
  const line = s.plan.lines.find((l) => l.id === id);
  const panel = s.plan.panels.find((p) => p.id === line?.panel);
  const cal = result.calibrations.get(line?.panel ?? '');
  const trace = result.traces.find((t) => t.id === id);
  if (!line || line.speed === undefined || !panel || !cal || !trace) throw new Error(`no trace ${id}`);
  const span = panel.y.max - panel.y.min;
  const [a, b] = drawnRangeAtSpeed(s.family, line.quantity, line.speed);
  let worst = 0;
  for (const p of trace.points) {
    const [x, y] = cal.toData(p) as unknown as [number, number];
    if (x < a + 0.15 * (b - a) || x > a + 0.95 * (b - a)) continue;
    worst = Math.max(worst, (100 * Math.abs(y - exactAtSpeed(s.family, line.quantity, line.speed, x))) / span);
  }
  return worst;
}

const CASES: [number, SpeedSheetOptions][] = [
  [2, { kind: 'vector', efficiencyAs: 'curves' }],
  [8, { kind: 'vector', efficiencyAs: 'curves' }],
  [9, { kind: 'vector', efficiencyAs: 'iso' }],
];

describe.skipIf(!hasChromium)('vector speed sheets whose guides sit in a bunch', () => {
  for (const [seed, options] of CASES) {
    it(`seed ${seed} (${options.efficiencyAs}): every trace takes its own speed's path`, async () => {
      const s = await makeSpeedSheet(seed, options);
      const result = await replay(s);
      for (const line of s.plan.lines.filter((l) => l.speed !== undefined)) {
        // Exact geometry: only the calibration's rounding and the flattening of the printed path remain.
        expect(worstPointError(s, result, line.id), line.id).toBeLessThan(0.01);
      }
      const scores = scoreReplay(s.family, s.truth, result.curveSet, speedTruthSource(s.family));
      for (const row of scores) expect(row.error, row.id).toBeLessThan(row.quantity === 'efficiency' ? 1.5 : 0.1);
      const codes = result.curveSet.findings.filter((f) => f.severity !== 'note').map((f) => f.code);
      expect(codes).not.toContain('affinity.speed-curve');
      expect(codes).not.toContain('takeoff.guide-in-bunch');
      expect(codes).not.toContain('takeoff.iso-crossings');
    }, 60_000);
  }
});
