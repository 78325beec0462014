/**
 * The automatic take-off on the committed INVENTED vector samples (samples/sheets): from a
 * take-off holding only sheet, page, speed and units it finds every panel, curve and label the
 * hand-made take-off names, and the replay lands within the samples' acceptance of their truth.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { detectTakeoff } from '../../src/digitize/detect/detect.ts';
import { loadSheetFileNode } from '../../src/digitize/loaders/sheetNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { calibrate } from '../../src/digitize/calibration.ts';
import { parseTakeoff, parseTakeoffToDetect, type Takeoff } from '../../src/model/takeoff.ts';
import { scoreCurveSet } from '../../scripts/sheets/score.ts';
import type { Truth } from '../../scripts/sheets/truth.ts';

const DIR = join(import.meta.dirname, '..', '..', 'samples', 'sheets');
const json = (name: string) => JSON.parse(readFileSync(join(DIR, name), 'utf8')) as Record<string, unknown>;
const parts = (t: Takeoff) => t.traces.map((k) => `${k.quantity}|${k.diameter ?? ''}|${k.iso ?? ''}`).sort();

describe.each(['us-iso-colour', 'si-panels-black'])('automatic take-off of %s.pdf', (name) => {
  it('finds the panels, curves and labels of the hand take-off, asks nothing and replays within the truth', async () => {
    const hand = parseTakeoff(json(`${name}.takeoff.json`));
    const raw = { sheet: hand.sheet, page: 1, pump: { name: hand.pump.name, speed_rpm: hand.pump.speed_rpm }, units: hand.units };
    const sheet = await loadSheetFileNode(join(DIR, hand.sheet));
    try {
      const found = await detectTakeoff(parseTakeoffToDetect(raw), raw, sheet);
      expect(found.questions).toEqual([]);
      expect(found.detection.panels.map((p) => p.quantity)).toEqual(hand.panels.map((p) => (p.id === 'npsh' ? 'npshr' : p.id)));
      expect(parts(found.takeoff)).toEqual(parts(hand));
      expect(found.takeoff.panels.every((p) => p.origin === 'detected' && (p.confidence ?? 0) > 0.5)).toBe(true);
      expect(found.takeoff.traces.every((t) => t.origin === 'detected' && (t.confidence ?? 0) > 0.5)).toBe(true);
      expect(found.document.detected).toMatchObject({ questions: [] });

      // The detected calibration agrees with the hand anchors to 0.01 % of span over each panel.
      for (const p of found.takeoff.panels) {
        const h = hand.panels.find((k) => k.id === (p.id === 'npshr' ? 'npsh' : p.id)) as Takeoff['panels'][number];
        const a = calibrate(p.anchors, { xScale: p.x_scale, yScale: p.y_scale });
        const b = calibrate(h.anchors, { xScale: h.x_scale, yScale: h.y_scale });
        const [l, t, r, bt] = p.frame as [number, number, number, number];
        const xs = h.anchors.flatMap((k) => (k.x === undefined ? [] : [k.x]));
        const ys = h.anchors.flatMap((k) => (k.y === undefined ? [] : [k.y]));
        const sx = Math.max(...xs) - Math.min(...xs);
        const sy = Math.max(...ys) - Math.min(...ys);
        for (const at of [[l, t], [r, bt], [(l + r) / 2, (t + bt) / 2]] as const) {
          const da = a.toData(at as never);
          const db = b.toData(at as never);
          expect(Math.abs(da[0] - db[0]) / sx).toBeLessThan(1e-4);
          expect(Math.abs(da[1] - db[1]) / sy).toBeLessThan(1e-4);
        }
      }

      // Detecting again on the completed take-off finds the same parts, not twice as many;
      // a trace the engineer set is kept and not found again.
      const mine = { ...found.takeoff.traces[0]!, origin: 'user' as const, id: 'mine' };
      const redoRaw = { ...found.document, traces: [mine, ...found.takeoff.traces.slice(1)] };
      const redo = await detectTakeoff(parseTakeoffToDetect(redoRaw), redoRaw, sheet);
      expect(redo.takeoff.traces).toHaveLength(found.takeoff.traces.length);
      expect(redo.takeoff.traces.filter((t) => t.origin !== 'detected').map((t) => t.id)).toEqual(['mine']);
      expect(redo.takeoff.panels).toHaveLength(found.takeoff.panels.length);

      const set = (await replayTakeoff(found.takeoff, sheet, { created: '2024-01-01T00:00:00Z' })).curveSet;
      const rows = scoreCurveSet(json(`${name}.truth.json`) as unknown as Truth, set);
      expect(rows.length).toBeGreaterThan(8);
      for (const row of rows) expect(row.worst, `${row.id}: ${row.worst.toFixed(3)} against ${row.limit}`).toBeLessThan(row.limit);
      expect(set.findings.filter((f) => f.severity === 'fail')).toEqual([]);
    } finally {
      await sheet.close();
    }
  });
});
