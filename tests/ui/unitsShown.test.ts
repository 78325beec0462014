/**
 * Every screen starts in the curve set's own units: an L/s sheet is shown, typed and downloaded
 * in L/s, and SI or US only when asked for. Uses the INVENTED demo family.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import { curveSetToCsv } from '../../src/export/csvTable.ts';
import { chartUnits } from '../../src/ui/views/familyChart.ts';
import { runDuty } from '../../src/ui/views/dutyPanel.ts';
import { EMPTY_DUTY, studyOfForm, studySystemOf } from '../../src/ui/views/studyForm.ts';
import { choiceWords } from '../../src/ui/views/words.ts';
import { migrateSaved, AUTOSAVE_FORMAT, AUTOSAVE_VERSION } from '../../src/ui/persist/records.ts';
import { draftWithPanel } from './fixtures.ts';
import { fromTakeoffFile } from '../../src/ui/store/takeoffFile.ts';
import { setSheetUnits, SHEET_UNIT_SYSTEMS } from '../../src/ui/store/actions/setup.ts';
import { unitSystemOf } from '../../src/ui/store/store.ts';

const si = parseCurveSetJson(readFileSync('samples/demo/invented-si3-si.curveset.json', 'utf8'), 'demo');
const litres = { ...si, display_units: { ...si.display_units, flow: 'L/s' } };

describe('units shown', () => {
  it('the chart and the tables of an L/s set default to L/s; SI and US only when chosen', () => {
    expect(chartUnits(litres).flow.token).toBe('L/s');
    expect(chartUnits(litres, 'own').flow.token).toBe('L/s');
    expect(chartUnits(litres, 'si').flow.token).toBe('m3/h');
    expect(chartUnits(litres, 'us').flow.token).toBe('gpm');
    expect(choiceWords('own', chartUnits(litres))).toBe('its own units (L/s, m, kW, mm)');
  });

  it('the CSV download of an L/s set is in L/s by default, on a grid of round L/s', () => {
    const own = curveSetToCsv(litres, { system: 'own' });
    expect(own).toContain('flow [L/s]');
    expect(own).toContain('# flow grid: 0 to 95 L/s in steps of 5');
    expect(curveSetToCsv(litres, { system: 'si' })).toContain('flow [m3/h]');
    // The head of the 260 mm impeller at 20 L/s is its fitted curve at 0.020 m³/s (6 significant figures).
    const member = litres.members.find((m) => Math.abs((m.diameter_m ?? 0) - 0.26) < 1e-9)!;
    const row = own.split('\n').find((l) => l.startsWith('260,20,'))!.split(',');
    expect(Number(row[2])).toBeCloseTo(evaluateUnchecked(member.curves.head!.fit!, 0.02), 3);
  });

  it('a duty typed in L/s is converted into the study\'s SI units; a US sheet passes its numbers as typed', () => {
    const study = studyOfForm({ ...EMPTY_DUTY, flow: '50', head: '40', staticHead: '20', roughness: '0.05' }, chartUnits(litres))!;
    expect(study.units).toBe('si');
    expect(study.duty.flow).toBeCloseTo(180, 9); // 50 L/s = 180 m³/h
    expect(study.duty.head).toBe(40);
    const us = chartUnits(litres, 'us');
    expect(studySystemOf(us)).toBe('us');
    expect(studyOfForm({ ...EMPTY_DUTY, flow: '800', head: '130' }, us)!.duty).toEqual({ flow: 800, head: 130 });
  });

  it('the same duty gives the same operating point typed in L/s or in m³/h', () => {
    const a = runDuty(litres, { ...EMPTY_DUTY, flow: '50', head: '40', staticHead: '20' }, 'own');
    const b = runDuty(litres, { ...EMPTY_DUTY, flow: '180', head: '40', staticHead: '20' }, 'si');
    if (!a || !b || !('result' in a) || !('result' in b)) throw new Error('both duties should run');
    expect(a.result.ranked[0]!.duty?.flow_m3s).toBeCloseTo(b.result.ranked[0]!.duty!.flow_m3s, 9);
  });

  it('a kept document with a unit choice this version does not know opens in the sheet\'s own units', () => {
    const draft = { ...draftWithPanel(), units: { flow: 'L/s', head: 'm', diameter: 'mm' } };
    const raw = { format: AUTOSAVE_FORMAT, version: AUTOSAVE_VERSION, id: 'a', savedAt: '2026', draft, library: null, step: 'trace', target: { quantity: 'head', lines: 'curve' }, unitSystem: 'imperial', sheetKey: null };
    expect(migrateSaved(raw, () => 'x')?.unitSystem).toBe('own');
  });
});

describe('a panel without traces is taken for what its y unit measures, in any spelling', () => {
  const sheet = { name: 'invented.pdf', kind: 'pdf' as const, mime: 'application/pdf', page: 1, pageCount: 1, width: 600, height: 800 };
  const anchors = [{ at: [100, 500], x: 0, y: 0 }, { at: [500, 500], x: 100, y: 0 }, { at: [100, 100], x: 0, y: 50 }];
  const file = (y: string) => ({
    format: 'pumpscribe.takeoff', version: 1, sheet: 'invented.pdf', page: 1,
    pump: { name: 'Invented pump (not a real product)', speed_rpm: 2900, specific_gravity: 1 },
    units: { flow: 'm3/h', head: 'm', diameter: 'mm' },
    panels: [{ id: 'h', anchors, x_scale: 'linear', y_scale: 'linear' }, { id: 'p', anchors, x_scale: 'linear', y_scale: 'linear', units: { y } }],
    traces: [{ id: 't1', panel: 'h', quantity: 'head', diameter: 250, points: [[110, 400], [300, 300]] }],
  });
  it.each([['HP', 'power'], ['kw', 'power'], ['bhp', 'power'], ['%', 'efficiency'], ['Percent', 'efficiency'], ['FT', 'head'], ['m', 'head']])('y in "%s" plots %s', (y, plots) => {
    expect(fromTakeoffFile(file(y), sheet).panels[1]!.plots).toBe(plots);
  });
});

describe('choosing L/s as the sheet\'s flow unit', () => {
  it('changes the record\'s flow unit and panels that followed the old one, and the review then starts in the sheet\'s own units', () => {
    const before = draftWithPanel();
    const after = setSheetUnits({ ...before.units, flow: 'L/s' })(before)!.draft;
    expect(after.units.flow).toBe('L/s');
    expect(unitSystemOf(after)).toBe('own');
    expect(unitSystemOf(setSheetUnits(SHEET_UNIT_SYSTEMS.si)(after)!.draft)).toBe('si');
  });
});
