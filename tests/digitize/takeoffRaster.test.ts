import { describe, expect, it, beforeAll } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createCanvas } from '@napi-rs/canvas';
import { PDFDocument } from 'pdf-lib';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { loadSheetFileNode } from '../../src/digitize/loaders/sheetNode.ts';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import { fromSI, parseUnit } from '../../src/units/index.ts';
import type { CurveSet } from '../../src/model/curveset.ts';
import { DIAMETERS, head, makePumpSheetPdf, pumpTakeoff } from './fixtures/pumpSheet.ts';

const gpm = parseUnit('flow', 'gpm');
const ft = parseUnit('head', 'ft');
const inch = parseUnit('diameter', 'in');
const SCALE = 3; // pixels per PDF point of the scan

/** The pump sheet's head traces only (scaled to the scan's pixels when `k` ≠ 1). */
function headTakeoff(sheet: string, k: number) {
  const doc = pumpTakeoff('drawn') as { sheet: string; panels: { id: string; anchors: { at: number[] }[] }[]; traces: { quantity: string; guides: number[][] }[] };
  doc.sheet = sheet;
  doc.panels = doc.panels.filter((p) => p.id === 'head').map((p) => ({ ...p, anchors: p.anchors.map((a) => ({ ...a, at: a.at.map((v) => v * k) })) }));
  doc.traces = doc.traces.filter((t) => t.quantity === 'head').map((t) => ({ ...t, guides: t.guides.map((g) => g.map((v) => v * k)) }));
  return parseTakeoff(doc);
}

function worstHeadError(set: CurveSet, d: number): number {
  const fit = set.members.find((m) => Math.abs(fromSI(m.diameter_m!, inch) - d) < 1e-9)!.curves.head!.fit!;
  const [lo, hi] = fit.domain;
  let worst = 0;
  for (let i = 0; i <= 100; i++) {
    const q = lo + (hi - lo) * (0.15 + 0.8 * (i / 100));
    worst = Math.max(worst, Math.abs(fromSI(evaluateUnchecked(fit, q), ft) - head(d, fromSI(q, gpm))));
  }
  return worst;
}

describe('replaying a take-off of a scanned sheet', () => {
  let dir: string;
  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'pumpscribe-scan-'));
    const vector = await loadPdfSheetNode(await makePumpSheetPdf());
    const image = await vector.render(SCALE);
    await vector.close();
    const canvas = createCanvas(image.width, image.height);
    const ctx = canvas.getContext('2d');
    const data = ctx.createImageData(image.width, image.height);
    data.data.set(image.data);
    ctx.putImageData(data, 0, 0);
    const png = await canvas.encode('png');
    writeFileSync(join(dir, 'scan.png'), png);
    const doc = await PDFDocument.create();
    doc.addPage([612, 792]).drawImage(await doc.embedPng(png), { x: 0, y: 0, width: 612, height: 792 });
    writeFileSync(join(dir, 'scan.pdf'), await doc.save());
  });

  it('detects a PDF page that is an embedded scan and follows its lines on a rendering', async () => {
    const sheet = await loadSheetFileNode(join(dir, 'scan.pdf'));
    expect(sheet.kind).toBe('raster-pdf');
    const { curveSet, traces } = await replayTakeoff(headTakeoff('scan.pdf', 1), sheet);
    await sheet.close();
    expect(traces.every((t) => t.how === 'raster')).toBe(true);
    // A scan at 216 dpi read back: within 0.2 % of the 200 ft span.
    for (const d of DIAMETERS) expect(worstHeadError(curveSet, d)).toBeLessThan(0.002 * 200);
  });

  it('reads an image sheet in pixel coordinates', async () => {
    const sheet = await loadSheetFileNode(join(dir, 'scan.png'));
    expect(sheet.kind).toBe('image');
    expect(sheet.width).toBe(612 * SCALE);
    const { curveSet } = await replayTakeoff(headTakeoff('scan.png', SCALE), sheet);
    await sheet.close();
    for (const d of DIAMETERS) expect(worstHeadError(curveSet, d)).toBeLessThan(0.002 * 200);
  });
});
