import { describe, expect, it, beforeAll } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { loadSheetFileNode } from '../../src/digitize/loaders/sheetNode.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import { fromSI, parseUnit } from '../../src/units/index.ts';
import type { CurveSet, Quantity } from '../../src/model/curveset.ts';
import { DIAMETERS, efficiency, head, isoBranch, makePumpSheetPdf, power, pumpTakeoff } from './fixtures/pumpSheet.ts';

const gpm = parseUnit('flow', 'gpm');
const ft = parseUnit('head', 'ft');
const hp = parseUnit('power', 'hp');
const inch = parseUnit('diameter', 'in');

/** Largest error of a fitted curve against the truth over 15–95 % of the curve's captured flow range, in display units. */
function worstError(set: CurveSet, d: number, quantity: Quantity, truth: (d: number, q: number) => number, show: (si: number) => number): number {
  const member = set.members.find((m) => Math.abs(fromSI(m.diameter_m!, inch) - d) < 1e-9)!;
  const curve = member.curves[quantity]!;
  const fit = curve.fit!;
  const [lo, hi] = fit.domain;
  let worst = 0;
  for (let i = 0; i <= 100; i++) {
    const q = lo + (hi - lo) * (0.15 + 0.8 * (i / 100));
    const got = show(evaluateUnchecked(fit, q));
    worst = Math.max(worst, Math.abs(got - truth(d, fromSI(q, gpm))));
  }
  return worst;
}

describe('replaying a take-off of a vector sheet headless', () => {
  let dir: string;
  let pdf: Uint8Array;
  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'pumpscribe-takeoff-'));
    pdf = await makePumpSheetPdf();
    writeFileSync(join(dir, 'sheet.pdf'), pdf);
  });

  async function replay(kind: 'iso' | 'drawn') {
    const takeoff = parseTakeoff(pumpTakeoff(kind));
    const sheet = await loadSheetFileNode(join(dir, 'sheet.pdf'), { page: 1 });
    try {
      return await replayTakeoff(takeoff, sheet, { takeoffName: 'pump.takeoff.json', created: '2026-01-01T00:00:00.000Z' });
    } finally {
      await sheet.close();
    }
  }

  it('reproduces every head and power curve within 0.1 % of the axis span', async () => {
    const { curveSet, traces } = await replay('drawn');
    expect(traces.every((t) => t.how === 'vector')).toBe(true);
    for (const d of DIAMETERS) {
      // Axis spans: head 200 ft, power 100 hp; acceptance 0.1 % of span.
      expect(worstError(curveSet, d, 'head', head, (si) => fromSI(si, ft))).toBeLessThan(0.001 * 200);
      expect(worstError(curveSet, d, 'power', power, (si) => fromSI(si, hp))).toBeLessThan(0.001 * 100);
      expect(worstError(curveSet, d, 'efficiency', efficiency, (si) => si * 100)).toBeLessThan(1);
    }
  });

  it('reads efficiency from iso-lines within 1.5 points', async () => {
    const { curveSet } = await replay('iso');
    for (const d of DIAMETERS) {
      const member = curveSet.members.find((m) => Math.abs(fromSI(m.diameter_m!, inch) - d) < 1e-9)!;
      // Three levels × two branches cross each head curve once each.
      expect(member.curves.efficiency!.points).toHaveLength(6);
      for (const [q, eta] of member.curves.efficiency!.points) {
        expect(Math.abs(eta * 100 - efficiency(d, fromSI(q, gpm)))).toBeLessThan(0.05); // crossing points, in points of %
      }
      expect(worstError(curveSet, d, 'efficiency', efficiency, (si) => si * 100)).toBeLessThan(1.5);
    }
  });

  it('gives a diameter the iso-lines meet at two flows only the efficiency of its neighbour by the affinity law, with a warning', async () => {
    const full = await replay('iso');
    expect(full.curveSet.findings.filter((f) => f.code === 'fit.efficiency-from-family')).toEqual([]);
    // The 70 % and 80 % iso-lines stopped between the 12 in and 11 in head curves (a vector trace
    // is cut at its guides): the 11 in curve meets the 76 % level alone, once each side of its peak.
    const doc = pumpTakeoff('iso') as { traces: { id: string; iso?: number; guides: number[][] }[] };
    for (const t of doc.traces) {
      if (t.iso !== 70 && t.iso !== 80) continue;
      const b = isoBranch(t.iso, t.id.endsWith('R') ? 1 : 0);
      const between = [(b[2]![0] + b[3]![0]) / 2, (b[2]![1] + b[3]![1]) / 2];
      t.guides = [b[0]!, between];
    }
    const sheet = await loadSheetFileNode(join(dir, 'sheet.pdf'));
    try {
      const { curveSet } = await replayTakeoff(parseTakeoff(doc), sheet);
      const member = (d: number) => curveSet.members.find((m) => Math.abs(fromSI(m.diameter_m!, inch) - d) < 1e-9)!;
      expect(member(11).curves.efficiency!.points).toHaveLength(2);
      expect(member(12).curves.efficiency!.points).toHaveLength(6);
      const warned = curveSet.findings.filter((f) => f.code === 'fit.efficiency-from-family');
      expect(warned).toHaveLength(1);
      expect(warned[0]!.severity).toBe('warn');
      expect(warned[0]!.message).toMatch(/^The 11 in efficiency meets the iso-lines at 2 flows only, .* the 12 in efficiency curve by the affinity law .* check it against the sheet before using it at a duty\.$/);
      expect(curveSet.findings.filter((f) => f.code === 'fit.too-few-points')).toEqual([]);
      // The invented sheet's efficiency keeps the trim law exactly (a trimmed impeller 2 points
      // per inch lower, the same shape): the borrowed curve meets it within the crossings' accuracy.
      expect(worstError(curveSet, 11, 'efficiency', efficiency, (si) => si * 100)).toBeLessThan(0.3);
      // Without a neighbour with a curve of its own, nothing is borrowed and the fit failure stands.
      const alone = pumpTakeoff('iso') as { traces: { id: string; iso?: number; diameter?: number }[] };
      alone.traces = alone.traces.filter((t) => (t.iso === undefined || t.iso === 76) && t.diameter !== 12 && t.diameter !== 13);
      const lone = await replayTakeoff(parseTakeoff(alone), sheet);
      expect(lone.curveSet.findings.filter((f) => f.code === 'fit.too-few-points').map((f) => f.severity)).toEqual(['fail']);
      expect(lone.curveSet.members[0]!.curves.efficiency!.fit).toBeUndefined();
    } finally {
      await sheet.close();
    }
  });

  it('cuts each trace at its first and last guide, or takes the whole drawn line with extent "line"', async () => {
    const sheet = await loadSheetFileNode(join(dir, 'sheet.pdf'));
    const middle = (extent?: string) => {
      const doc = pumpTakeoff('drawn') as { traces: { id: string; guides: number[][]; extent?: string }[] };
      doc.traces = doc.traces.filter((t) => t.id === 'H13').map((t) => ({ ...t, guides: [t.guides[1]!, t.guides[2]!], ...(extent ? { extent } : {}) }));
      return parseTakeoff(doc);
    };
    const flows = async (extent?: string) => {
      const { curveSet } = await replayTakeoff(middle(extent), sheet);
      return curveSet.members[0]!.curves.head!.fit!.domain.map((q) => fromSI(q, gpm));
    };
    const cut = await flows();
    expect(cut[0]).toBeCloseTo(0.5 * 1600, -1); // the middle guide, within 10 gpm
    const whole = await flows('line');
    expect(whole[0]).toBeCloseTo(0, 6);
    expect(whole[1]).toBeCloseTo(1600, 6);
    await sheet.close();
  });

  it('warns when captured points leave the panel frame', async () => {
    const sheet = await loadSheetFileNode(join(dir, 'sheet.pdf'));
    const withFrame = (frame: number[]) => {
      const doc = pumpTakeoff('drawn') as { panels: { id: string; frame?: number[] }[] };
      doc.panels[0]!.frame = frame;
      return parseTakeoff(doc);
    };
    const inside = await replayTakeoff(withFrame([80, 60, 560, 360]), sheet);
    expect(inside.curveSet.findings.filter((f) => f.code === 'takeoff.outside-frame')).toEqual([]);
    const narrow = await replayTakeoff(withFrame([80, 60, 300, 360]), sheet);
    const warned = narrow.curveSet.findings.filter((f) => f.code === 'takeoff.outside-frame');
    expect(warned.map((f) => f.subject.trace).sort()).toEqual(['H11', 'H12', 'H13']);
    expect(warned.every((f) => f.severity === 'warn')).toBe(true);
    await sheet.close();
  });

  it('leaves out the traces of a panel whose anchors define no calibration, as a fail, and reads the other panels', async () => {
    const sheet = await loadSheetFileNode(join(dir, 'sheet.pdf'));
    const doc = pumpTakeoff('drawn') as { panels: { id: string; anchors: { at: [number, number] }[] }[] };
    const power = doc.panels.find((p) => p.id === 'power')!;
    // A hurried slip: every anchor of the power panel on one horizontal line of the sheet.
    power.anchors = power.anchors.map((a, i) => ({ ...a, at: [100 + 50 * i, 200] as [number, number] }));
    const { curveSet } = await replayTakeoff(parseTakeoff(doc), sheet);
    const left = curveSet.findings.filter((f) => f.code === 'takeoff.panel-uncalibrated');
    expect(left.map((f) => f.severity)).toEqual(['fail']);
    expect(left[0]?.message).toMatch(/^Panel "power": .* were left out of the curve set until its anchors are set\.$/);
    expect(curveSet.members.every((m) => m.curves.head !== undefined && m.curves.power === undefined)).toBe(true);
    // With no panel that can be calibrated there is nothing to read: the replay refuses with the panel's sentence.
    for (const p of doc.panels) p.anchors = p.anchors.map((a, i) => ({ ...a, at: [100 + 50 * i, 200] as [number, number] }));
    await expect(replayTakeoff(parseTakeoff(doc), sheet)).rejects.toThrow(/anchors lie on one line/);
    await sheet.close();
  });

  it('carries the captured points and the sheet SHA-256 in the curve set', async () => {
    const { curveSet } = await replay('drawn');
    expect(curveSet.provenance.source?.sha256).toBe(createHash('sha256').update(pdf).digest('hex'));
    expect(curveSet.provenance.source?.page).toBe(1);
    expect(curveSet.provenance.takeoff).toBe('pump.takeoff.json');
    expect(curveSet.members).toHaveLength(3);
    expect(curveSet.members[0]!.curves.head!.points.length).toBeGreaterThan(30);
    expect(curveSet.display_units).toEqual({ flow: 'gpm', head: 'ft', npsh: 'ft', power: 'hp', diameter: 'in' });
  });
});
