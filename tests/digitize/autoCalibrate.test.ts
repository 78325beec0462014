import { describe, expect, it } from 'vitest';
import { proposePanels, numericLabels } from '../../src/digitize/autoCalibrate.ts';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { LAYOUT, makePumpSheetPdf } from './fixtures/pumpSheet.ts';
import { drawPdf, rgb } from './fixtures/pdfBytes.ts';

describe('proposing panel calibrations from tick labels', () => {
  it('finds the three panels of a sheet and calibrates each from its labelled ticks', async () => {
    const sheet = await loadPdfSheetNode(await makePumpSheetPdf());
    const proposals = proposePanels(await sheet.text(), await sheet.paths());
    await sheet.close();
    expect(proposals).toHaveLength(3);
    const [headPanel, effPanel, powerPanel] = proposals;
    expect(headPanel!.xScale).toBe('linear');
    expect(headPanel!.x.labels.map((l) => l.value)).toEqual([0, 400, 800, 1200, 1600]);
    expect(headPanel!.y.labels.map((l) => l.value).sort((a, b) => a - b)).toEqual([0, 40, 80, 120, 160, 200]);
    // The proposal reproduces the drawing's own mapping (labels snapped onto their lines): 1e-6 of the span.
    const d = headPanel!.calibration.toData(sheetPoint(LAYOUT.x(1234), LAYOUT.head.y(77.7)));
    expect(Math.abs(d[0] - 1234)).toBeLessThan(1e-6 * 1600);
    expect(Math.abs(d[1] - 77.7)).toBeLessThan(1e-6 * 200);
    const e = effPanel!.calibration.toData(sheetPoint(LAYOUT.x(500), LAYOUT.eff.y(42)));
    expect(e[1]).toBeCloseTo(42, 5);
    const p = powerPanel!.calibration.toData(sheetPoint(LAYOUT.x(500), LAYOUT.power.y(42)));
    expect(p[1]).toBeCloseTo(42, 5);
    expect(headPanel!.calibration.maxPercentOfSpan).toBeLessThan(1e-4);
  });

  it('recognises log axes from labels whose log10 spaces evenly', async () => {
    // Log–log chart: x = 100 + 150·log10(Q/10), Q 10…10000; y = 400 − 120·log10(H), H 1…100.
    const X = (q: number) => 100 + 150 * Math.log10(q / 10);
    const Y = (h: number) => 400 - 120 * Math.log10(h);
    const bytes = await drawPdf(612, 500, (d) => {
      for (const q of [10, 100, 1000, 10000]) {
        d.stroke(`M ${X(q)} 160 L ${X(q)} 404`, rgb(0.6, 0.6, 0.6), 0.4);
        const w = d.font.widthOfTextAtSize(String(q), 9);
        d.text(String(q), X(q) - w / 2, 414, 9);
      }
      for (const h of [1, 10, 100]) {
        d.stroke(`M 96 ${Y(h)} L 550 ${Y(h)}`, rgb(0.6, 0.6, 0.6), 0.4);
        const w = d.font.widthOfTextAtSize(String(h), 9);
        d.text(String(h), 92 - w, Y(h) + 3.15, 9);
      }
      d.text('Flow', 300, 440, 9);
    });
    const sheet = await loadPdfSheetNode(bytes);
    const [panel] = proposePanels(await sheet.text(), await sheet.paths());
    await sheet.close();
    expect(panel).toBeDefined();
    expect(panel!.xScale).toBe('log');
    expect(panel!.yScale).toBe('log');
    const d = panel!.calibration.toData(sheetPoint(X(316.23), Y(31.6)));
    expect(d[0] / 316.23 - 1).toBeCloseTo(0, 6);
    expect(d[1] / 31.6 - 1).toBeCloseTo(0, 6);
  });

  it('finds a second value axis on the right of a panel (left-aligned labels) sharing the flow axis', async () => {
    // Head 0…200 ft on the left, efficiency 0…100 % on the right, of one plot 80…560 × 60…360.
    const bytes = await drawPdf(612, 420, (d) => {
      for (let q = 0; q <= 1600; q += 400) {
        d.stroke(`M ${80 + 0.3 * q} 360 L ${80 + 0.3 * q} 364`);
        const w = d.font.widthOfTextAtSize(String(q), 8);
        d.text(String(q), 80 + 0.3 * q - w / 2, 373, 8);
      }
      for (let h = 0; h <= 200; h += 50) {
        d.stroke(`M 76 ${360 - 1.5 * h} L 80 ${360 - 1.5 * h}`);
        d.text(String(h), 74 - d.font.widthOfTextAtSize(String(h), 8), 360 - 1.5 * h + 2.8, 8);
      }
      for (let e = 0; e <= 100; e += 20) {
        d.stroke(`M 560 ${360 - 3 * e} L 564 ${360 - 3 * e}`);
        d.text(String(e), 566, 360 - 3 * e + 2.8, 8);
      }
      d.stroke('M 80 60 L 560 60 L 560 360 L 80 360 Z');
    });
    const sheet = await loadPdfSheetNode(bytes);
    const proposals = proposePanels(await sheet.text(), await sheet.paths());
    await sheet.close();
    expect(proposals).toHaveLength(2);
    const right = proposals.find((p) => p.y.labels.some((l) => l.value === 100 && Math.abs(l.at - 60) < 1e-6))!;
    const left = proposals.find((p) => p.y.labels.some((l) => l.value === 200))!;
    expect(right.calibration.toData(sheetPoint(300, 360 - 3 * 84))[1]).toBeCloseTo(84, 5);
    expect(left.calibration.toData(sheetPoint(300, 360 - 1.5 * 84))[1]).toBeCloseTo(84, 5);
    expect(right.calibration.toData(sheetPoint(80 + 0.3 * 700, 200))[0]).toBeCloseTo(700, 5);
  });

  it('reads a log axis labelled 10 with raised exponents as powers of ten', async () => {
    const X = (q: number) => 100 + 150 * Math.log10(q);
    const bytes = await drawPdf(612, 300, (d) => {
      for (const k of [0, 1, 2, 3]) {
        d.stroke(`M ${X(10 ** k)} 50 L ${X(10 ** k)} 204`);
        d.text('10', X(10 ** k) - 6, 216, 9);
        d.text(String(k), X(10 ** k) + 4.008, 212, 6);
      }
      for (const h of [0, 50, 100]) {
        d.stroke(`M 96 ${200 - 1.5 * h} L 100 ${200 - 1.5 * h}`);
        d.text(String(h), 94 - d.font.widthOfTextAtSize(String(h), 9), 200 - 1.5 * h + 3.15, 9);
      }
    });
    const sheet = await loadPdfSheetNode(bytes);
    const [panel] = proposePanels(await sheet.text(), await sheet.paths());
    await sheet.close();
    expect(panel!.xScale).toBe('log');
    expect(panel!.x.labels.map((l) => l.value)).toEqual([1, 10, 100, 1000]);
    expect(panel!.calibration.toData(sheetPoint(X(42), 100))[0]).toBeCloseTo(42, 6);
  });

  it('proposes nothing for a page without numeric labels on lines', async () => {
    const bytes = await drawPdf(300, 300, (d) => {
      d.text('Head 13 in', 20, 40, 9);
      d.text('100', 200, 200, 9); // a lone number beside no line
      d.stroke('M 10 10 L 200 150');
    });
    const sheet = await loadPdfSheetNode(bytes);
    expect(proposePanels(await sheet.text(), await sheet.paths())).toEqual([]);
    await sheet.close();
  });

  it('reads thousands separators and percent signs as numbers, and skips rotated text', () => {
    const labels = numericLabels([
      { text: '1,200', at: sheetPoint(0, 0), size: 8, width: 20, angle: 0 },
      { text: '80%', at: sheetPoint(0, 20), size: 8, width: 14, angle: 0 },
      { text: '40', at: sheetPoint(0, 40), size: 8, width: 9, angle: -Math.PI / 2 },
      { text: '12 in', at: sheetPoint(0, 60), size: 8, width: 18, angle: 0 },
    ]);
    expect(labels.map((l) => l.value)).toEqual([1200, 80]);
  });

  it('joins a number placed glyph by glyph, but not numbers a word space apart', () => {
    const glyph = (text: string, x: number) => ({ text, at: sheetPoint(x, 100), size: 10, width: 5.56, angle: 0 });
    const labels = numericLabels([glyph('1', 50), glyph('2', 55.56), glyph('0', 61.12), glyph('0', 66.68), glyph('4', 90), glyph('0', 95.56)]);
    expect(labels.map((l) => l.value)).toEqual([1200, 40]);
    expect(labels[0]!.cx).toBeCloseTo(50 + (4 * 5.56) / 2, 9);
  });
});
