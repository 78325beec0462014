/**
 * A take-off labelled by speed, replayed headless with explicit points on a synthetic sheet
 * (no drawn sheet: explicit points are used as they are). Head traces per speed, an
 * iso-efficiency line crossing them, and a minimum-flow line. The invented family is the
 * four-speed demo family; its iso-efficiency line follows an affinity parabola (η constant along
 * H ∝ Q²; Karassik, Pump Handbook), so each crossing must read 70 % at Q = Q0·n/n0.
 */
import { describe, expect, it } from 'vitest';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import type { Sheet } from '../../src/digitize/sheet.ts';
import { parseTakeoff, TakeoffError, type TakeoffInput } from '../../src/model/takeoff.ts';
import { inventedSpeedFamily } from '../../src/demo/inventedSpeedFamily.ts';

const fam = inventedSpeedFamily();
// Sheet mapping (invented): x = 100 + 4·Q[m³/h], y = 600 − 20·H[m].
const toSheet = (q: number, h: number): [number, number] => [100 + 4 * q * 3600, 600 - 20 * h];
const sheet: Sheet = {
  kind: 'image',
  width: 1000,
  height: 700,
  sha256: '0'.repeat(64),
  page: 1,
  render: () => Promise.reject(new Error('not drawn')),
  paths: () => Promise.resolve([]),
  text: () => Promise.resolve([]),
  close: () => Promise.resolve(),
};
// η = 0.76·x(2 − x) = 0.70 on the high-flow side at x = 1 + √(1 − 0.70/0.76), x = Q/(Q_bep·n/n0).
const xIso = 1 + Math.sqrt(1 - 0.7 / 0.76);
const qIso = (n: number) => xIso * 0.03 * (n / 1450);

function takeoff(extra: Partial<TakeoffInput> = {}, traceExtra: TakeoffInput['traces'] = []): TakeoffInput {
  const heads = fam.speeds_rpm.map((n) => ({
    panel: 'main',
    quantity: 'head' as const,
    speed: n,
    points: Array.from({ length: 15 }, (_, i) => {
      const q = (fam.endFlow_m3s * (n / 1450) * i) / 14;
      return toSheet(q, fam.head(q, n));
    }),
  }));
  const iso = {
    panel: 'main',
    quantity: 'efficiency' as const,
    iso: 70,
    points: Array.from({ length: 30 }, (_, i) => {
      const n = 900 + (650 * i) / 29;
      return toSheet(qIso(n), fam.head(qIso(n), n));
    }),
  };
  const minFlow = { panel: 'main', quantity: 'head' as const, limit: 'min-flow' as const, points: [toSheet(0.006, 26), toSheet(0.006, 6)] };
  return {
    sheet: 'synthetic.png',
    pump: { name: 'Invented demo pump VS-4 (not a real product)', speed_rpm: 1450 },
    units: { flow: 'm3/h', head: 'm', diameter: 'mm' },
    panels: [{ id: 'main', anchors: [{ at: toSheet(0, 0), x: 0, y: 0 }, { at: toSheet(0.05, 0), x: 180, y: 0 }, { at: toSheet(0, 30), x: 0, y: 30 }] }],
    traces: [...heads, iso, minFlow, ...traceExtra],
    ...extra,
  };
}

describe('a take-off labelled by speed', () => {
  it('replays into a speed family, with iso-efficiency crossings as efficiency points per speed and the minimum-flow line kept', async () => {
    const { curveSet } = await replayTakeoff(parseTakeoff(takeoff()), sheet, { created: '2026-01-01T00:00:00.000Z' });
    expect(curveSet.family).toBe('speed');
    expect(curveSet.members.map((m) => m.speed_rpm).sort((a, b) => b - a)).toEqual([1450, 1300, 1150, 1000]);
    expect(curveSet.members.every((m) => m.diameter_m === undefined)).toBe(true);
    for (const m of curveSet.members) {
      const pts = m.curves.efficiency?.points ?? [];
      expect(pts).toHaveLength(1);
      // 70 % at Q0·n/n0, flow within 1 % (the iso polyline is straight between its 30 points).
      expect(pts[0]![1]).toBeCloseTo(0.7, 12);
      expect(Math.abs(pts[0]![0] / qIso(m.speed_rpm) - 1)).toBeLessThan(0.01);
    }
    // A vertical line at 21.6 m³/h = 0.006 m³/s, within 1e-9 relative (exact anchors).
    expect(Math.abs((curveSet.limits?.min_flow?.flow_m3s ?? 0) / 0.006 - 1)).toBeLessThan(1e-9);
    expect(curveSet.findings.some((f) => f.code === 'affinity.summary')).toBe(true);
    expect(curveSet.findings.some((f) => f.code === 'affinity.outlier' || f.code === 'affinity.deviation')).toBe(false);
  });

  it('refuses a sheet that labels some traces by diameter and others by speed, with one sentence', () => {
    const mixed = takeoff({}, [{ panel: 'main', quantity: 'head', diameter: 200, points: [toSheet(0, 20), toSheet(0.01, 19)] }]);
    expect(() => parseTakeoff(mixed)).toThrow(TakeoffError);
    expect(() => parseTakeoff(mixed)).toThrow(/a sheet holds one family/);
  });

  it('refuses a trace carrying both a diameter and a speed', () => {
    const both = takeoff({}, [{ panel: 'main', quantity: 'head', diameter: 200, speed: 1450, points: [toSheet(0, 20), toSheet(0.01, 19)] }]);
    expect(() => parseTakeoff(both)).toThrow(/a diameter or a speed, not both/);
  });

  it('keeps a stated minimum flow from the take-off when no line is traced', async () => {
    const t = takeoff({ min_flow: 18 });
    t.traces = t.traces.filter((tr) => tr.limit === undefined);
    const { curveSet } = await replayTakeoff(parseTakeoff(t), sheet, { created: '2026-01-01T00:00:00.000Z' });
    expect(Math.abs((curveSet.limits?.min_flow?.flow_m3s ?? 0) - 18 / 3600)).toBeLessThan(1e-12);
  });
});
