/**
 * Raster capture on generated scans of INVENTED sheets (200–250 dpi, turned 1.5°, blurred,
 * noised, JPEG-compressed), against their exact truth. The captured sheet points are turned
 * into data values through the exact drawing transform, so that these figures measure the
 * line following alone (calibration is tested on its own).
 * Acceptance of the take-off engine: every curve within 0.5 % of its axis span over 15–95 %
 * of its flow range; efficiency within 1.5 points from curves and 2 points from iso-lines.
 */
import { describe, expect, it } from 'vitest';
import { loadImageRasterNode } from '../../src/digitize/loaders/imageNode.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { makeSheet, type Variant } from '../../scripts/sheets/makeSheet.ts';
import { curveError, efficiencyAtHeadPoint, toData } from '../../scripts/sheets/truth.ts';

async function readAll(variant: Variant) {
  const made = await makeSheet(variant);
  const image = await loadImageRasterNode(made.sheetBytes);
  const traces = made.takeoff.traces.map((t) => {
    const result = traceRaster(image, (t.guides ?? []).map(([x, y]) => sheetPoint(x, y)));
    return { trace: t, result, data: result.points.map((p) => toData(made.truth, t.panel as never, p)) };
  });
  return { made, traces };
}

describe('raster capture on generated scans', () => {
  it('reads a black-only scan with iso-lines crossing the head curves within the acceptance', async () => {
    const { made, traces } = await readAll({
      spec: { name: 'scan-a', system: 'us', layout: 'iso', ink: 'black', labelsOnLines: true, seed: 21 },
      scan: { dpi: 200, rotationDeg: 1.5, noise: 8, blur: 0.8, jpegQuality: 75, seed: 21 },
    });
    for (const { trace, result, data } of traces) {
      expect(result.lost, trace.id).toEqual([]);
      if (trace.iso !== undefined) {
        // Each point of an iso-trace stands for the efficiency of the head curve through it.
        const worst = Math.max(...data.map(([q, h]) => Math.abs(efficiencyAtHeadPoint(made.truth.family, q, h) - (trace.iso as number))));
        expect(worst, trace.id).toBeLessThan(2); // points of efficiency
      } else {
        const e = curveError(made.truth, made.truth.curves.find((c) => c.id === trace.id)!, data);
        expect(e.coverage, trace.id).toBe(1);
        expect(e.worst, trace.id).toBeLessThan(0.5); // % of axis span
      }
    }
  });

  it('reads a coloured scan with four efficiency curves running together in their own panel within the acceptance', async () => {
    const { made, traces } = await readAll({
      spec: { name: 'scan-b', system: 'si', layout: 'panels', ink: 'colour', labelsOnLines: true, seed: 22 },
      scan: { dpi: 250, rotationDeg: -1.5, noise: 8, blur: 0.7, jpegQuality: 80, seed: 22 },
    });
    for (const { trace, data } of traces) {
      const curve = made.truth.curves.find((c) => c.id === trace.id)!;
      const e = curveError(made.truth, curve, data);
      expect(e.coverage, trace.id).toBe(1);
      expect(e.worst, trace.id).toBeLessThan(curve.quantity === 'efficiency' ? 1.5 : 0.5); // points / % of span
    }
  });
});
