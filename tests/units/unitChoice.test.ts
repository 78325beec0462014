/** Which units a screen or export shows: the curve set's own by default, or a preset. */
import { describe, expect, it } from 'vitest';
import { choiceOf, chosenUnits, defaultPowerToken, parseUnit, presetCurveTokens, unitChoiceNamed, UnitError } from '../../src/units/index.ts';

const litres = { flow: 'L/s', head: 'm', npsh: 'm', power: 'kW', diameter: 'mm' };

describe('unit choice', () => {
  it('"own" (the default) gives the set\'s own units: an L/s sheet stays in L/s', () => {
    expect(chosenUnits(litres).flow.token).toBe('L/s');
    expect(chosenUnits(litres, 'own').flow.label).toBe('L/s');
    expect(chosenUnits(litres, 'si').flow.token).toBe('m3/h');
    expect(chosenUnits(litres, 'us').head.token).toBe('ft');
  });
  it('a preset whose curve units are exactly the set\'s own is named; any other mix is "own"', () => {
    expect(choiceOf(presetCurveTokens('si'))).toBe('si');
    expect(choiceOf({ flow: 'GPM', head: 'feet', npsh: 'ft', power: 'HP', diameter: 'inch' })).toBe('us');
    expect(choiceOf(litres)).toBe('own');
    expect(choiceOf({ ...presetCurveTokens('us'), power: 'kW' })).toBe('own');
    expect(choiceOf({ ...litres, flow: 'furlongs' })).toBe('own');
  });
  it('reads a choice in any case, and refuses another word with a sentence', () => {
    expect(unitChoiceNamed('US')).toBe('us');
    expect(unitChoiceNamed(' Own ')).toBe('own');
    expect(unitChoiceNamed(undefined)).toBeUndefined();
    expect(unitChoiceNamed('')).toBeUndefined();
    expect(() => unitChoiceNamed('metric')).toThrow(UnitError);
  });
  it('the power unit shown when a sheet names none: hp for gpm (in any spelling), kW otherwise', () => {
    expect(defaultPowerToken('gpm')).toBe('hp');
    expect(defaultPowerToken('GPM')).toBe('hp');
    expect(defaultPowerToken('usgpm')).toBe('hp');
    expect(defaultPowerToken('L/s')).toBe('kW');
    expect(defaultPowerToken('not a unit')).toBe('kW');
  });
  it('unit names match without regard to case everywhere the one table is read', () => {
    for (const [kind, token, canonical] of [['flow', 'M3/H', 'm3/h'], ['flow', 'l/S', 'L/s'], ['head', 'FT', 'ft'], ['power', 'KW', 'kW'], ['power', 'Hp', 'hp'], ['diameter', 'MM', 'mm'], ['diameter', 'IN', 'in'], ['temperature', 'DEGF', 'F']] as const) {
      expect(parseUnit(kind, token).token, token).toBe(canonical);
    }
  });
});
