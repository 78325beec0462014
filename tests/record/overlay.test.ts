import { describe, expect, it } from 'vitest';
import { buildOverlay } from '../../src/record/overlay.ts';
import { clipPolyline } from '../../src/digitize/polyline.ts';
import { systemHead } from '../../src/duty/systemCurve.ts';
import { fromSI } from '../../src/units/index.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { sample } from './samples.ts';

/** Span of a panel's anchors on each axis, in the panel's units. */
function spans(anchors: readonly { x?: number | undefined; y?: number | undefined }[]) {
  const xs = anchors.flatMap((a) => (a.x === undefined ? [] : [a.x]));
  const ys = anchors.flatMap((a) => (a.y === undefined ? [] : [a.y]));
  return { x: Math.max(...xs) - Math.min(...xs), y: Math.max(...ys) - Math.min(...ys) };
}

describe.each([
  ['si-panels-black', 'vector-pdf'],
  ['si-panels-colour-scan', 'image'],
])('overlay on %s', (name, kind) => {
  it('puts every operating point and duty point where the study computed it (read back through the calibration, within 0.5 % of span)', async () => {
    const s = await sample(name);
    expect(s.kind).toBe(kind);
    const ov = buildOverlay(s.takeoff, s.replay.calibrations, s.result);
    const head = ov.panels.find((p) => p.role === 'head');
    expect(head).toBeDefined();
    if (!head) return;
    const cal = s.replay.calibrations.get(head.id);
    if (!cal) throw new Error('no calibration');
    const span = spans(s.takeoff.panels.find((p) => p.id === head.id)?.anchors ?? []);
    let checked = 0;
    s.result.ranked.forEach((r, i) => {
      for (const key of ['low', 'high'] as const) {
        const op = r.operating_points[key];
        if (!op) continue;
        const m = head.marks.find((x) => x.option === i && x.kind === `operating-${key}`);
        expect(m, `${r.name} ${key}`).toBeDefined();
        if (!m) continue;
        const back = cal.toData(m.at);
        expect(Math.abs(back[0] - fromSI(op.flow_m3s / r.pumps, head.xUnit)) / span.x).toBeLessThan(0.005);
        expect(Math.abs(back[1] - fromSI(op.head_m, head.yUnit)) / span.y).toBeLessThan(0.005);
        expect(m.inside).toBe(true);
        checked++;
      }
    });
    expect(checked).toBeGreaterThanOrEqual(6);
  });

  it('draws system curves that read back as the system head at each flow, inside the frame', async () => {
    const s = await sample(name);
    const ov = buildOverlay(s.takeoff, s.replay.calibrations, s.result);
    const head = ov.panels.find((p) => p.role === 'head');
    if (!head) throw new Error('no head panel');
    const cal = s.replay.calibrations.get(head.id);
    if (!cal) throw new Error('no calibration');
    const span = spans(s.takeoff.panels.find((p) => p.id === head.id)?.anchors ?? []);
    let points = 0;
    for (const path of head.paths.filter((p) => p.kind === 'system-high' || p.kind === 'system-low')) {
      const r = s.result.ranked[path.option];
      if (!r) throw new Error('option missing');
      const sys = path.kind === 'system-high' ? r.systems.high : r.systems.low;
      for (const line of path.lines) {
        for (const p of line) {
          expect(p[0]).toBeGreaterThanOrEqual(head.frame[0] - 1e-6);
          expect(p[0]).toBeLessThanOrEqual(head.frame[2] + 1e-6);
          expect(p[1]).toBeGreaterThanOrEqual(head.frame[1] - 1e-6);
          expect(p[1]).toBeLessThanOrEqual(head.frame[3] + 1e-6);
          const [q, h] = cal.toData(p);
          const qSI = q / fromSI(1, head.xUnit);
          expect(Math.abs(h - fromSI(systemHead(sys, qSI * r.pumps), head.yUnit)) / span.y).toBeLessThan(0.005);
          points++;
        }
      }
    }
    expect(points).toBeGreaterThan(100);
  });

  it('marks the operating flow on the efficiency, power and NPSHr panels with the value read there', async () => {
    const s = await sample(name);
    const ov = buildOverlay(s.takeoff, s.replay.calibrations, s.result);
    const roles = ov.panels.map((p) => p.role);
    expect(roles).toEqual(['head', 'efficiency', 'power', 'npshr']);
    const best = s.result.ranked[0];
    if (!best?.duty) throw new Error('no duty');
    for (const p of ov.panels.slice(1)) {
      const cal = s.replay.calibrations.get(p.id);
      if (!cal) throw new Error('no calibration');
      const span = spans(s.takeoff.panels.find((x) => x.id === p.id)?.anchors ?? []);
      const line = p.paths.find((x) => x.option === 0 && x.kind === 'flow-line');
      const m = p.marks.find((x) => x.option === 0 && x.kind === 'reading');
      expect(line?.lines.length).toBe(1);
      const expected = p.role === 'efficiency' ? fromSI(best.duty.per_pump.efficiency ?? Number.NaN, p.yUnit) : p.role === 'power' ? fromSI(best.duty.per_pump.power_W ?? Number.NaN, p.yUnit) : fromSI(best.npsh?.duty?.npsh3_m ?? Number.NaN, p.yUnit);
      if (!m) throw new Error(`no reading on ${p.id}`);
      const back = cal.toData(m.at);
      expect(Math.abs(back[0] - fromSI(best.duty.flow_m3s, p.xUnit)) / span.x).toBeLessThan(0.005);
      expect(Math.abs(back[1] - expected) / span.y).toBeLessThan(0.005);
      for (const q of line?.lines[0] ?? []) expect(Math.abs(cal.toData(q)[0] - fromSI(best.duty.flow_m3s, p.xUnit)) / span.x).toBeLessThan(0.005);
    }
  });
});

describe('clipPolyline', () => {
  it('cuts a line at the frame and splits it where it leaves and comes back', () => {
    const pts = [sheetPoint(-10, 5), sheetPoint(5, 5), sheetPoint(5, 20), sheetPoint(8, 5), sheetPoint(20, 5)];
    const out = clipPolyline(pts, [0, 0, 10, 10]);
    expect(out.length).toBe(2);
    expect(out[0]?.[0]).toEqual([0, 5]);
    expect(out[0]?.[2]).toEqual([5, 10]);
    expect(out[1]?.[out[1].length - 1]).toEqual([10, 5]);
  });
});
