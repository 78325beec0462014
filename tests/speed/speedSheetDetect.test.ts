/**
 * The automatic take-off (`--detect`) on INVENTED speed families drawn by the independent
 * renderer (scripts/randomSheets/speedSheet.ts), with no panels and no traces given:
 * - curves labelled in shares of the rated speed ("100 %", "90 %" …) are named by speed from
 *   the take-off's pump.speed_rpm, on a vector sheet and on a scan;
 * - a minimum-flow line labelled "min. flow" is kept as the limit line, not taken for an iso-line.
 * Scored with the bed's own scorer against the exact family (speed law Q ∝ n, H ∝ n², P ∝ n³;
 * Karassik, Pump Handbook), at the diameter family's tolerances: vector 0.1 % of span and 0.5
 * points of efficiency, over 15–95 % of each curve's flow range.
 */
import { createHash } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { decode } from '../../scripts/randomSheets/camera.ts';
import { siFactor } from '../../scripts/randomSheets/pumpFamily.ts';
import { scoreReplay } from '../../scripts/randomSheets/score.ts';
import { exactAtSpeed, makeSpeedSheet, minFlowAtSpeed, speedTruthSource, type SpeedSheet } from '../../scripts/randomSheets/speedSheet.ts';
import { detectTakeoff, type DetectedTakeoff } from '../../src/digitize/detect/detect.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import type { Sheet } from '../../src/digitize/sheet.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { minFlowAt } from '../../src/fit/speedFamilyLimits.ts';
import type { CurveSet } from '../../src/model/curveset.ts';
import { parseTakeoffToDetect } from '../../src/model/takeoff.ts';
import { hasChromium } from '../digitize/fixtures/browserSheet.ts';

async function sheetOf(s: SpeedSheet): Promise<Sheet> {
  if (s.takeoff.sheet.endsWith('.pdf')) return loadPdfSheetNode(s.bytes);
  const d = await decode(Buffer.from(s.bytes));
  const raster = { width: d.width, height: d.height, data: d.data, scale: 1 };
  return imageSheet(raster, createHash('sha256').update(s.bytes).digest('hex'), () => raster);
}

/** The automatic take-off of a speed sheet from sheet, page, pump and units alone, and its replay. */
async function detect(s: SpeedSheet): Promise<{ found: DetectedTakeoff; set: CurveSet }> {
  const raw: Record<string, unknown> = { ...s.takeoff };
  delete raw.panels;
  delete raw.traces;
  const sheet = await sheetOf(s);
  try {
    const found = await detectTakeoff(parseTakeoffToDetect(raw), raw, sheet, { reader: textReaderNode() });
    const set = (await replayTakeoff(found.takeoff, sheet, { created: '2026-01-01T00:00:00.000Z' })).curveSet;
    return { found, set };
  } finally {
    await sheet.close();
  }
}

describe.skipIf(!hasChromium)('the automatic take-off of speed families', () => {
  let percent: SpeedSheet;
  let minFlow: SpeedSheet;
  let scan: SpeedSheet;
  beforeAll(async () => {
    // Seed 4: SI, labelled in % of rated, efficiency curves. Seed 9: labelled in % of rated, iso-lines and a minimum-flow line.
    percent = await makeSpeedSheet(4, { kind: 'vector', efficiencyAs: 'curves' });
    minFlow = await makeSpeedSheet(9, { kind: 'vector', efficiencyAs: 'iso', minFlowLine: true });
    scan = await makeSpeedSheet(4, { kind: 'scan', efficiencyAs: 'curves' });
  }, 120_000);

  it('names the curves of a vector sheet labelled "100 %", "90 %" … by speed, every curve within 0.1 % of span', async () => {
    expect(percent.family.labels).toBe('percent');
    const { found, set } = await detect(percent);
    expect(found.questions).toEqual([]);
    const heads = found.takeoff.traces.filter((t) => t.quantity === 'head');
    expect(heads.map((t) => t.speed).sort((a, b) => (b as number) - (a as number))).toEqual(percent.family.speeds);
    expect(found.takeoff.traces.every((t) => t.diameter === undefined)).toBe(true);
    expect(set.family).toBe('speed');
    const scores = scoreReplay(percent.family, percent.truth, set, speedTruthSource(percent.family));
    expect(scores).toHaveLength(percent.truth.length);
    for (const row of scores) expect(row.error, row.id).toBeLessThan(row.quantity === 'efficiency' ? 0.5 : 0.1);
  }, 60_000);

  it('keeps a line labelled "min. flow" as the minimum-flow limit, not as an iso-line, and reads efficiency from the iso-lines', async () => {
    const { found, set } = await detect(minFlow);
    const limits = found.takeoff.traces.filter((t) => t.limit === 'min-flow');
    expect(limits).toHaveLength(1);
    expect(limits[0]!.quantity).toBe('head');
    // Every iso-line found carries a level the sheet draws: none is the minimum-flow line taken for one.
    const drawnLevels = new Set(minFlow.plan.lines.filter((l) => l.iso !== undefined).map((l) => l.iso));
    for (const t of found.takeoff.traces.filter((k) => k.iso !== undefined)) expect(drawnLevels.has(t.iso), `${t.id}`).toBe(true);
    expect(set.findings.filter((f) => f.severity === 'fail').map((f) => f.message)).toEqual([]);
    // The line kept in the curve set: its flow at each speed's head against Q_min·n/n_rated, within 0.1 % of the flow axis span.
    const si = siFactor(minFlow.family);
    const xSpan = minFlow.plan.panels[0]!.x.max - minFlow.plan.panels[0]!.x.min;
    for (const n of minFlow.family.speeds) {
      const q = minFlowAtSpeed(minFlow.family, n);
      const at = minFlowAt(set.limits, exactAtSpeed(minFlow.family, 'head', n, q) * si.head);
      expect(at?.beyond_line, `${n} rpm`).toBe(false);
      expect((100 * Math.abs((at?.flow_m3s ?? 0) / si.flow - q)) / xSpan, `${n} rpm`).toBeLessThan(0.1);
    }
    const scores = scoreReplay(minFlow.family, minFlow.truth, set, speedTruthSource(minFlow.family));
    expect(scores.filter((s) => s.source === 'iso')).toHaveLength(4);
    for (const row of scores) expect(row.error, row.id).toBeLessThan(row.quantity === 'efficiency' ? 0.5 : 0.1);
  }, 60_000);

  it('names the head curves of a scan labelled in % of rated speed, and restores the NPSHr axis\'s lost decimal points', async () => {
    const { found } = await detect(scan);
    const heads = found.takeoff.traces.filter((t) => t.quantity === 'head' && t.origin === 'detected');
    expect(heads.map((t) => t.speed).sort((a, b) => (b as number) - (a as number))).toEqual(scan.family.speeds);
    // Its NPSHr axis prints 0.0, 2.5, 5.0, 7.5; two labels read with their point outweigh the
    // "25" and "75" read without one: the axis runs to 7.5, not 75.
    const npshr = found.takeoff.panels.find((p) => p.quantity === 'npshr');
    expect(npshr).toBeDefined();
    expect(Math.max(...npshr!.anchors.map((a) => a.y ?? -Infinity))).toBe(7.5);
  }, 120_000);
});
