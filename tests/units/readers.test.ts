import { describe, expect, it } from 'vitest';
import {
  checkPlausible, ImplausibleValueError, isDecimalText, NumberTextError, PLAUSIBLE_RANGES, plausibleRange, readDecimal, readPlausible, WATER_TEMPERATURE,
} from '../../src/units/index.ts';
import { UserError as ModelUserError } from '../../src/model/errors.ts';

describe('readDecimal reads decimal numbers only', () => {
  it('reads integers, decimals, signs, a leading dot and exponents', () => {
    expect(readDecimal('12', 'x')).toBe(12);
    expect(readDecimal(' -3.5 ', 'x')).toBe(-3.5);
    expect(readDecimal('+.5', 'x')).toBe(0.5);
    expect(readDecimal('1e3', 'x')).toBe(1000);
    expect(readDecimal('2.5E-4', 'x')).toBe(2.5e-4);
    expect(readDecimal('7.', 'x')).toBe(7);
    expect(Object.is(readDecimal('-0', 'x'), 0)).toBe(true);
  });
  it('refuses "0x10", "1e", "12abc", "", blanks, Infinity, NaN, "1_000", "0b1" and "1 000" with a sentence naming the field', () => {
    for (const bad of ['0x10', '1e', '12abc', '', '   ', 'Infinity', '-Infinity', 'NaN', '1_000', '0b1', '0o7', '1 000', '--5', '1e3.5', 'e3', '.']) {
      expect(() => readDecimal(bad, '--speed'), bad).toThrow(NumberTextError);
      expect(() => readDecimal(bad, '--speed'), bad).toThrow(/^--speed /);
      expect(isDecimalText(bad), bad).toBe(false);
    }
    expect(() => readDecimal('0x10', '--speed')).toThrow('--speed must be a decimal number such as 12.5 or 1e3, not "0x10".');
    expect(() => readDecimal('', 'Flow')).toThrow('Flow needs a number; it was left empty.');
  });
  it('says to write a dot for a decimal comma', () => {
    expect(() => readDecimal('1,5', '--head')).toThrow('(write the decimal mark as a dot: 1.5)');
  });
  it('refuses a number too large for a double', () => {
    expect(() => readDecimal('1e400', '--flow')).toThrow(/too large/);
  });
  it('checks the sign when asked', () => {
    expect(() => readDecimal('0', '--speed', { sign: 'positive' })).toThrow('--speed must be greater than zero, not 0.');
    expect(() => readDecimal('-1', '--hours', { sign: 'non-negative' })).toThrow('--hours must be zero or more, not -1.');
    expect(readDecimal('0', '--hours', { sign: 'non-negative' })).toBe(0);
  });
  it('its errors are user errors with a stable code', () => {
    const error = (() => {
      try {
        readDecimal('abc', '--sg');
      } catch (e) {
        return e;
      }
      return null;
    })();
    expect(error).toBeInstanceOf(ModelUserError);
    expect((error as ModelUserError).code).toBe('not-a-number');
  });
});

describe('plausibility: a unit slip is refused with a sentence that names the field and the likely unit', () => {
  const density = (text: string) => () => readPlausible('density', text, { field: '--density', unit: 'kg/m3', sgField: '--sg' });
  it('density 1, 0.998 and 0.85 kg/m³ look like specific gravities (issue #18)', () => {
    expect(density('1')).toThrow('--density 1: 1 kg/m³ looks like a specific gravity; did you mean 1000 kg/m³ (or --sg 1)?');
    expect(density('0.998')).toThrow('--density 0.998: 0.998 kg/m³ looks like a specific gravity; did you mean 998 kg/m³ (or --sg 0.998)?');
    expect(density('0.85')).toThrow('did you mean 850 kg/m³ (or --sg 0.85)?');
    expect(density('1')).toThrow(ImplausibleValueError);
  });
  it('density 62.4 kg/m³ looks like lb/ft³ (62.43 lb/ft³ = 1000 kg/m³, from the pound and foot of NIST SP 811)', () => {
    expect(density('62.4')).toThrow('did you mean 999.6 kg/m³?');
  });
  it('water and light oil densities pass; a density beyond any liquid is refused with the range', () => {
    expect(readPlausible('density', '998.2', { field: '--density', unit: 'kg/m3' })).toBe(998.2);
    expect(readPlausible('density', '53', { field: '--density', unit: 'lb/ft3' })).toBeCloseTo(53 * 16.018463, 4);
    expect(density('5000')).toThrow('--density 5000: 5000 kg/m³ is outside the range of pumped liquids, 350 … 3000 kg/m³; check the number and its unit.');
  });
  it('a specific gravity of 998 looks like a density', () => {
    expect(() => readPlausible('specific-gravity', '998', { field: '--sg', sgField: '--sg', densityField: '--density' })).toThrow('did you mean --sg 0.998 (or --density 998)?');
    expect(readPlausible('specific-gravity', '0.85', { field: '--sg' })).toBe(0.85);
  });
  it('300 °C water suggests °F or K; 20 °C and 68 °F water pass', () => {
    const t = (text: string, unit: string) => readPlausible('temperature', text, { field: '--temperature', unit, liquid: 'water' });
    expect(() => t('300', 'C')).toThrow('--temperature 300: 300 °C is outside the range of water as a pumped liquid (0 … 250 °C); did you mean 300 °F (148.9 °C) or 300 K (26.85 °C)?');
    expect(t('20', 'C')).toBeCloseTo(293.15, 12);
    expect(t('68', 'F')).toBeCloseTo(293.15, 12);
    // Other liquids may be hotter or colder: hot oil at 300 °C and LNG at −162 °C pass.
    expect(readPlausible('temperature', '300', { field: '--temperature', unit: 'C' })).toBeCloseTo(573.15, 12);
    expect(readPlausible('temperature', '-162', { field: '--temperature', unit: 'C' })).toBeCloseTo(111.15, 12);
    expect(plausibleRange('temperature', { liquid: 'water' })).toBe(WATER_TEMPERATURE);
  });
  it('speeds below 100 rpm: 50 and 60 look like Hz, others like rev/s', () => {
    const s = (text: string) => () => readPlausible('speed', text, { field: '--speed' });
    expect(s('50')).toThrow('--speed 50: 50 rpm looks like the mains frequency in Hz');
    expect(s('60')).toThrow('a 2-pole motor runs near 3500 rpm');
    expect(s('24.5')).toThrow('--speed 24.5: 24.5 rpm looks like revolutions per second; did you mean 1470 rpm?');
    expect(s('0x10')).toThrow(NumberTextError);
    expect(readPlausible('speed', '1480', { field: '--speed' })).toBe(1480);
    expect(s('90000')).toThrow('outside the range of pump speeds, 100 … 30000 rpm');
  });
  it('viscosity typed as cSt into an m²/s field, and the other way round', () => {
    expect(() => readPlausible('viscosity', '1', { field: '--viscosity', unit: 'm2/s' })).toThrow('1 m²/s looks like centistokes; did you mean 1 cSt (0.000001 m²/s)?');
    expect(() => readPlausible('viscosity', '1e-6', { field: '--viscosity', unit: 'cSt' })).toThrow('looks like m²/s; did you mean 1 cSt?');
    expect(readPlausible('viscosity', '32', { field: '--viscosity', unit: 'cSt' })).toBeCloseTo(32e-6, 18);
  });
  it('a pressure in Pa typed as kPa', () => {
    expect(() => readPlausible('pressure', '101325', { field: '--site-pressure', unit: 'kPa' })).toThrow('--site-pressure 101325: 101325 kPa is more than any pressure in a pumping system; did you mean 101325 Pa?');
    expect(readPlausible('pressure', '101.325', { field: '--site-pressure', unit: 'kPa' })).toBeCloseTo(101325, 9);
  });
  it('a flow in m³/h typed as m³/s; zero flow passes (a system-curve point)', () => {
    expect(() => readPlausible('flow', '500', { field: '--flow', unit: 'm3/s' })).toThrow('did you mean 500 m³/h?');
    expect(readPlausible('flow', '0', { field: 'system point', unit: 'gpm' })).toBe(0);
    expect(() => readPlausible('flow', '-5', { field: '--flow', unit: 'gpm' })).toThrow('is outside the range of pump flows');
  });
  it('heads: a suction lift passes, 9000 m is refused', () => {
    expect(readPlausible('head', '-4', { field: '--suction-static', unit: 'm' })).toBe(-4);
    expect(() => readPlausible('head', '9000', { field: '--head', unit: 'm' })).toThrow('--head 9000: 9000 m is outside the range of heads in pumping systems');
  });
  it('an efficiency of 0.9 % looks like a fraction', () => {
    expect(() => readPlausible('efficiency', '0.9', { field: '--motor-efficiency', unit: '%' })).toThrow('0.9 % looks like a fraction; did you mean 90 %?');
    expect(readPlausible('efficiency', '94', { field: '--motor-efficiency', unit: '%' })).toBeCloseTo(0.94, 12);
    expect(() => readPlausible('efficiency', '110', { field: '--motor-efficiency', unit: '%' })).toThrow(ImplausibleValueError);
  });
  it('checkPlausible refuses NaN and Infinity with a sentence, and a narrower range when the caller gives one', () => {
    expect(() => checkPlausible('density', Number.NaN, { field: 'density' })).toThrow('density NaN: that is not a finite number.');
    const site = { min: 30e3, max: 2e6, what: 'site pressures' };
    expect(() => checkPlausible('pressure', 5e6, { field: '--site-pressure', unit: 'kPa', range: site })).toThrow('5000 kPa is outside the range of site pressures, 30 … 2000 kPa');
  });
  it('every range is ordered and finite', () => {
    for (const r of Object.values(PLAUSIBLE_RANGES)) expect(r.max > r.min && Number.isFinite(r.max) && Number.isFinite(r.min)).toBe(true);
  });
});
