import { describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import { parseTakeoff, parseTakeoffToDetect } from '../../src/model/takeoff.ts';

const minimal = { sheet: 'sheet.pdf', page: 1, pump: { name: 'Invented pump (not a real product)', speed_rpm: 1450 }, units: { flow: 'm3/h', head: 'm', diameter: 'mm' } };
const panel = { id: 'head', anchors: [{ at: [0, 100], x: 0 }, { at: [100, 100], x: 100 }, { at: [0, 100], y: 0 }, { at: [0, 0], y: 50 }] };

describe('take-off file for the automatic take-off', () => {
  it('parseTakeoffToDetect accepts sheet, page, speed and units alone; parseTakeoff still needs panels and traces', () => {
    expect(parseTakeoffToDetect(minimal).panels).toBeUndefined();
    expect(() => parseTakeoff(minimal)).toThrow(ZodError);
  });

  it('panels and traces carry who set them and how sure the detector is, within 0 to 1', () => {
    const doc = {
      ...minimal,
      panels: [{ ...panel, origin: 'detected', confidence: 0.9, quantity: 'head' }],
      traces: [{ panel: 'head', quantity: 'head', diameter: 250, origin: 'user', captured: [[0, 0], [1, 1]], captured_by: 'vector' }],
      detected: { by: 'test', questions: ['Which diameter is the lowest curve?'] },
    };
    const t = parseTakeoff(doc);
    expect(t.panels[0]?.origin).toBe('detected');
    expect(t.traces[0]?.origin).toBe('user');
    expect(t.detected?.questions).toHaveLength(1);
    expect(() => parseTakeoff({ ...doc, panels: [{ ...panel, confidence: 1.5 }] })).toThrow(ZodError);
    expect(() => parseTakeoff({ ...doc, panels: [{ ...panel, origin: 'guessed' }] })).toThrow(ZodError);
  });

  it('diameters given for a sheet that prints none must be positive', () => {
    expect(parseTakeoffToDetect({ ...minimal, diameters: [250, 230] }).diameters).toEqual([250, 230]);
    expect(() => parseTakeoffToDetect({ ...minimal, diameters: [250, -1] })).toThrow(ZodError);
  });
});
