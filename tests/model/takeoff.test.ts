import { takeoffPublishedSchema } from '../../src/model/jsonSchema.ts';
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { ZodError } from 'zod';
import { parseTakeoff, takeoffJsonSchema, TakeoffError, TAKEOFF_VERSION } from '../../src/model/takeoff.ts';

/** The shape the take-off file must accept, as written in the issue that introduced it. */
const EXAMPLE = {
  sheet: 'sheet.pdf',
  page: 1,
  pump: { name: 'Invented pump', speed_rpm: 1780, specific_gravity: 1.0 },
  units: { flow: 'gpm', head: 'ft', power: 'hp', npsh: 'ft', diameter: 'in' },
  panels: [{ id: 'head', anchors: [{ at: [72.1, 640.5], x: 0, y: 0 }, { at: [540.0, 640.5], x: 1600, y: 0 }, { at: [72.1, 80.2], x: 0, y: 180 }] }],
  traces: [
    { panel: 'head', quantity: 'head', diameter: 13, guides: [[80, 300], [300, 320], [520, 420]] },
    { panel: 'head', quantity: 'efficiency', iso: 80, guides: [[250, 200], [260, 300]] },
    { panel: 'power', quantity: 'power', diameter: 13, points: [[80, 700], [300, 690]] },
  ],
};

const withPowerPanel = () => ({ ...EXAMPLE, panels: [...EXAMPLE.panels, { id: 'power', anchors: EXAMPLE.panels[0]!.anchors }] });

describe('the take-off file', () => {
  it('accepts the documented minimal shape and fills in format, version and defaults', () => {
    const t = parseTakeoff(withPowerPanel());
    expect(t.format).toBe('pumpscribe.takeoff');
    expect(t.version).toBe(TAKEOFF_VERSION);
    expect(t.panels[0]!.x_scale).toBe('linear');
    expect(t.traces[0]!.method).toBe('auto');
    expect(t.traces[1]!.iso).toBe(80);
  });

  it('accepts panels with log axes, a frame, axis units and axis-only anchors', () => {
    const t = parseTakeoff({
      ...withPowerPanel(),
      panels: [
        { id: 'head', x_scale: 'log', y_scale: 'log', frame: [72, 80, 540, 640], units: { x: 'm3/h', y: 'm' }, anchors: [{ at: [72, 640], x: 10 }, { at: [540, 640], x: 1000 }, { at: [72, 640], y: 1 }, { at: [72, 80], y: 100 }] },
        { id: 'power', anchors: EXAMPLE.panels[0]!.anchors },
      ],
    });
    expect(t.panels[0]!.units?.x).toBe('m3/h');
  });

  it('refers a trace to a panel that exists, or says which is missing', () => {
    // The example names a "power" panel it does not define.
    expect(() => parseTakeoff(EXAMPLE)).toThrow(TakeoffError);
    expect(() => parseTakeoff(EXAMPLE)).toThrow(/Trace 3 refers to panel "power", which the take-off does not define/);
  });

  it('rejects traces without diameter or iso value, iso-traces of head, and anchors without values', () => {
    const bad = (patch: Record<string, unknown>) => () => parseTakeoff({ ...withPowerPanel(), ...patch });
    expect(bad({ traces: [{ panel: 'head', quantity: 'head', guides: [[1, 2]] }] })).toThrow(ZodError);
    expect(bad({ traces: [{ panel: 'head', quantity: 'head', iso: 50, guides: [[1, 2]] }] })).toThrow(/only efficiency and power traces can be iso-traces/);
    expect(bad({ traces: [{ panel: 'head', quantity: 'head', diameter: 13 }] })).toThrow(/needs guides, points or captured points/);
    expect(bad({ panels: [{ id: 'head', anchors: [{ at: [1, 2] }] }] })).toThrow(/an anchor needs an x value, a y value or both/);
    expect(bad({ panels: [{ id: 'head', anchors: [{ at: [1, 2], x: 1 }] }, { id: 'head', anchors: [{ at: [1, 2], x: 1 }] }] })).toThrow(/Two panels share the id "head"/);
  });

  it('refuses a newer version and something that is not an object', () => {
    expect(() => parseTakeoff({ ...withPowerPanel(), version: 7 })).toThrow(/version 7, newer than this tool reads/);
    expect(() => parseTakeoff([1, 2])).toThrow(/must hold a JSON object/);
  });

  it('publishes a JSON Schema that matches the file in schemas/', () => {
    const schema = takeoffJsonSchema();
    expect(schema.$schema).toBe('https://json-schema.org/draft/2020-12/schema');
    expect(Object.keys(schema.properties as object)).toEqual(expect.arrayContaining(['sheet', 'page', 'pump', 'units', 'panels', 'traces']));
    const published = JSON.parse(readFileSync(join(import.meta.dirname, '..', '..', 'schemas', 'takeoff.schema.json'), 'utf8'));
    expect(published).toEqual(JSON.parse(JSON.stringify(takeoffPublishedSchema()))); // regenerate with: npm run schemas
  });
});
