/**
 * The workbench edits the take-off record itself: a take-off file read into the workbench and
 * written again comes back field for field, for every committed sample and for a file that uses
 * the fields the workbench has no screen for (maker, model, size, type, stages, suction, extent,
 * capture method, captured_by, a US file without a power unit).
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { fromTakeoffFile, toTakeoffFile } from '../../src/ui/store/takeoffFile.ts';
import { movePoint, setGuides } from '../../src/ui/store/actions/traces.ts';
import { setSheetUnits, SHEET_UNIT_SYSTEMS } from '../../src/ui/store/actions/setup.ts';
import { axisUnits, powerUnit } from '../../src/ui/store/draft.ts';
import { unitSystemOf } from '../../src/ui/store/store.ts';

const SAMPLES = join(import.meta.dirname, '..', '..', 'samples', 'sheets');
const OPENED = { name: 'sheet.pdf', kind: 'pdf' as const, mime: 'application/pdf', page: 1, pageCount: 1, width: 612, height: 792, sha256: 'b'.repeat(64) };

/** An invented US take-off with every optional field the file format has. */
export const RICH_US_TAKEOFF = {
  format: 'pumpscribe.takeoff',
  version: 1,
  sheet: '../sheets/invented-ds-8x6.pdf',
  page: 1,
  sheet_sha256: 'c'.repeat(64),
  pump: { name: 'Invented double-suction pump DS-8x6 (not a real product)', speed_rpm: 1780, specific_gravity: 1, maker: 'Invented Pump Works', model: 'DS', size: '8x6-14', type: 'between bearings, axially split', stages: 1, suction: 'double' },
  units: { flow: 'gpm', head: 'ft', diameter: 'in' },
  panels: [
    { id: 'head', anchors: [{ at: [100, 500], x: 0, y: 0 }, { at: [500, 500], x: 2000, y: 0 }, { at: [100, 100], x: 0, y: 200 }], x_scale: 'linear', y_scale: 'linear' },
    { id: 'npsh', anchors: [{ at: [100, 700], x: 0, label: 'x left' }, { at: [500, 700], x: 2000, label: 'x right' }, { at: [100, 700], y: 0 }, { at: [100, 550], y: 30 }], x_scale: 'linear', y_scale: 'linear', frame: [100, 550, 500, 700], units: { y: 'ft' } },
  ],
  traces: [
    { id: 'h14', panel: 'head', quantity: 'head', diameter: 14, guides: [[150, 150], [450, 260]], method: 'vector', extent: 'line', captured: [[110, 140], [300, 180], [490, 300]], captured_by: 'vector' },
    { id: 'h13', panel: 'head', quantity: 'head', diameter: 13, points: [[110, 170], [300, 210], [480, 320]], method: 'auto' },
    { id: 'n14', panel: 'npsh', quantity: 'npshr', diameter: 14, guides: [[300, 650]], method: 'raster' },
  ],
  notes: ['Invented for the tests: no real product or data.'],
};

function roundTrip(raw: unknown) {
  const draft = fromTakeoffFile(structuredClone(raw), OPENED);
  return { draft, written: toTakeoffFile(draft) };
}

describe('one record: a take-off file read and written again', () => {
  it('comes back field for field for the rich US file (pump details, extent, method, no power unit)', () => {
    const { draft, written } = roundTrip(RICH_US_TAKEOFF);
    expect(written.omitted).toEqual([]);
    expect(written.takeoff).toEqual(parseTakeoff(RICH_US_TAKEOFF));
    // No power unit in the file: none is made up, and the screen shows what the curve set will (hp for gpm).
    expect(written.takeoff.units).toEqual({ flow: 'gpm', head: 'ft', diameter: 'in' });
    expect(powerUnit(draft.units)).toBe('hp');
    // The sheet's own units on screen, not SI.
    expect(unitSystemOf(draft)).toBe('us');
    expect(axisUnits(draft.units, draft.panels[0]!)).toEqual({ x: 'gpm', y: 'ft' });
  });

  it('comes back field for field for every committed sample take-off', () => {
    const files = readdirSync(SAMPLES).filter((f) => f.endsWith('.takeoff.json'));
    expect(files.length).toBeGreaterThan(3);
    for (const f of files) {
      const raw = JSON.parse(readFileSync(join(SAMPLES, f), 'utf8'));
      expect(roundTrip(raw).written.takeoff, f).toEqual(parseTakeoff(raw));
    }
  });

  it('keeps an L/s sheet in L/s', () => {
    const raw = { ...structuredClone(RICH_US_TAKEOFF), units: { flow: 'L/s', head: 'm', power: 'kW', diameter: 'mm' } };
    const { draft, written } = roundTrip(raw);
    expect(unitSystemOf(draft)).toBe('own');
    expect(axisUnits(draft.units, draft.panels[0]!).x).toBe('L/s');
    expect(written.takeoff.units.flow).toBe('L/s');
  });

  it('writes hand-edited points without the capture they replaced, and a new capture without the old captured_by', () => {
    const { draft } = roundTrip(RICH_US_TAKEOFF);
    const edited = toTakeoffFile(movePoint('h14', 1, [300, 182])(draft)!.draft).takeoff.traces[0]!;
    expect(edited.points).toEqual([[110, 140], [300, 182], [490, 300]]);
    expect(edited.captured).toBeUndefined();
    expect(edited.captured_by).toBeUndefined();
    expect(edited.extent).toBe('line');
    const recaptured = toTakeoffFile(setGuides('h14', [[150, 151]], [[110, 141], [490, 301]])(draft)!.draft).takeoff.traces[0]!;
    expect(recaptured).toMatchObject({ guides: [[150, 151]], captured: [[110, 141], [490, 301]], method: 'vector', extent: 'line' });
    expect(recaptured.captured_by).toBeUndefined();
  });

  it('changing the sheet units moves panels that follow the record, and those with their own units where they matched', () => {
    const { draft } = roundTrip(RICH_US_TAKEOFF);
    const si = setSheetUnits(SHEET_UNIT_SYSTEMS.si)(draft)!.draft;
    expect(axisUnits(si.units, si.panels[0]!)).toEqual({ x: 'm3/h', y: 'm' });
    expect(si.panels[1]!.units).toEqual({ y: 'm' });
  });
});
