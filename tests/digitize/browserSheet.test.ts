import { describe, expect, it, beforeAll } from 'vitest';
import { proposePanels } from '../../src/digitize/autoCalibrate.ts';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import { fromSI, parseUnit } from '../../src/units/index.ts';
import type { CurveSet, Quantity } from '../../src/model/curveset.ts';
import { browserTakeoff, D, eff, hasChromium, head, power, printBrowserSheet } from './fixtures/browserSheet.ts';

const m3h = parseUnit('flow', 'm3/h');
const metre = parseUnit('head', 'm');
const kW = parseUnit('power', 'kW');
const mm = parseUnit('diameter', 'mm');

function worst(set: CurveSet, d: number, quantity: Quantity, truth: (d: number, q: number) => number, show: (si: number) => number): number {
  const fit = set.members.find((m) => Math.abs(fromSI(m.diameter_m!, mm) - d) < 1e-6)!.curves[quantity]!.fit!;
  const [lo, hi] = fit.domain;
  let w = 0;
  for (let i = 0; i <= 100; i++) {
    const q = lo + (hi - lo) * (0.15 + 0.8 * (i / 100));
    w = Math.max(w, Math.abs(show(evaluateUnchecked(fit, q)) - truth(d, fromSI(q, m3h))));
  }
  return w;
}

describe.skipIf(!hasChromium)('a sheet printed to PDF by Chromium (a second renderer)', () => {
  let pdf: Uint8Array;
  beforeAll(async () => {
    pdf = await printBrowserSheet();
  }, 120_000);

  async function replay(kind: 'drawn' | 'iso') {
    const sheet = await loadPdfSheetNode(pdf);
    try {
      return await replayTakeoff(parseTakeoff(browserTakeoff(kind)), sheet);
    } finally {
      await sheet.close();
    }
  }

  it('reproduces head and power within 0.1 % of span and drawn (dashed) efficiency within 1 point', async () => {
    const { curveSet, traces } = await replay('drawn');
    expect(traces.every((t) => t.how === 'vector')).toBe(true);
    for (const d of D) {
      expect(worst(curveSet, d, 'head', head, (si) => fromSI(si, metre))).toBeLessThan(0.001 * 100); // span 100 m
      expect(worst(curveSet, d, 'power', power, (si) => fromSI(si, kW))).toBeLessThan(0.001 * 120); // span 120 kW
      expect(worst(curveSet, d, 'efficiency', eff, (si) => 100 * si)).toBeLessThan(1);
    }
  });

  it('reads efficiency from dashed iso-lines within 1.5 points', async () => {
    const { curveSet } = await replay('iso');
    for (const d of D) expect(worst(curveSet, d, 'efficiency', eff, (si) => 100 * si)).toBeLessThan(1.5);
  });

  it('proposes the head panel (with its right-hand efficiency axis) and the power panel from the tick labels', async () => {
    const sheet = await loadPdfSheetNode(pdf);
    const proposals = proposePanels(await sheet.text(), await sheet.paths());
    await sheet.close();
    expect(proposals.length).toBe(3);
    for (const p of proposals) expect(p.calibration.maxPercentOfSpan).toBeLessThan(0.01);
  });
});
