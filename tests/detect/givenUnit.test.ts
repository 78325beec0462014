/**
 * Diameters typed in the sheet's unit while the take-off names another (15.5 and 12.625 given in
 * a take-off in mm, the sheet labelled in inches) are a slip that would put 15.5 mm impellers in
 * the curve set: the detector asks, never names silently.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { givenUnitQuestion } from '../../src/digitize/detect/detect.ts';
import { closeTextReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { detectBedScan } from '../../scripts/detectSheets/scanBed.ts';

afterAll(async () => closeTextReaderNode());

const si = { flow: 'm3/h', head: 'm', power: 'kW', diameter: 'mm' };
const us = { flow: 'gpm', head: 'ft', power: 'hp', diameter: 'in' };

describe('the unit of the diameters given', () => {
  it('asks when the labels read are in another unit than the take-off\'s diameters', () => {
    expect(givenUnitQuestion('in', { units: si, diameters: [15.5, 12.625] })).toMatch(/labels its curves in inches.*diameters are in millimetres.*\(15\.5, 12\.625\) were taken as mm/);
    expect(givenUnitQuestion('mm', { units: us, diameters: [390, 346] })).toMatch(/in millimetres.*in inches/);
  });

  it('asks, with no label read, when the values fit no impeller in the take-off\'s unit', () => {
    expect(givenUnitQuestion(null, { units: si, diameters: [15.5, 12.625] })).toMatch(/too small for impellers in millimetres.*typed in inches/);
    expect(givenUnitQuestion(null, { units: us, diameters: [390, 346] })).toMatch(/too large for impellers in inches.*typed in millimetres/);
    expect(givenUnitQuestion(null, { units: us, diameters: [15.5, 12.625] })).toBeNull();
  });

  it('says nothing when they agree, when no label unit was read, or when nothing was given', () => {
    expect(givenUnitQuestion('in', { units: us, diameters: [15.5] })).toBeNull();
    expect(givenUnitQuestion(null, { units: si, diameters: [250, 230] })).toBeNull();
    expect(givenUnitQuestion('rpm', { units: us, diameters: [15.5] })).toBeNull();
    expect(givenUnitQuestion('in', { units: si })).toBeNull();
  });

  it('on a US scan of the random bed taken off with SI units and the inch values typed, the detector asks', { timeout: 180_000 }, async () => {
    const { plan, found } = await detectBedScan(24, { units: si });
    expect(plan.family.units).toBe('us');
    // Either question names the slip: the inch labels read, or (no label unit read) values too small for millimetres.
    expect(found.questions.some((q) => /labels its curves in inches|too small for impellers in millimetres.*typed in inches/.test(q))).toBe(true);
  });
});
