import { describe, expect, it } from 'vitest';
import { formatChange, formatFixed, formatPrecision, showFixed, formatNumber, formatPercent, formatSI, formatValue, NotFiniteError, parseUnit, roundSignificant, showChange, showNumber, showPercent, showSI, showValue } from '../../src/units/index.ts';

describe('formatNumber(v, digits) writes v to significant figures', () => {
  it('rounds to the significant figures asked for, without trailing zeros', () => {
    expect(formatNumber(1234.5678)).toBe('1235');
    expect(formatNumber(0.012345, 3)).toBe('0.0123');
    expect(formatNumber(45.2)).toBe('45.2');
    expect(formatNumber(12)).toBe('12');
    expect(formatNumber(-3.14159, 3)).toBe('-3.14');
    expect(formatNumber(123456789, 4)).toBe('123500000');
  });
  it('rounds half away from zero on the decimal value (2.5 → 3, 0.125 → 0.13)', () => {
    expect(formatNumber(2.5, 1)).toBe('3');
    expect(formatNumber(0.125, 2)).toBe('0.13');
  });
  it('writes zero and negative zero as "0"', () => {
    expect(formatNumber(0)).toBe('0');
    expect(formatNumber(-0)).toBe('0');
    expect(formatNumber(-1e-30, 2)).toBe('-1e-30');
  });
  it('uses an exponent only for very small or very large magnitudes', () => {
    expect(formatNumber(1.23456e-7, 3)).toBe('1.23e-7');
    expect(formatNumber(0.000012345, 3)).toBe('0.0000123');
    expect(formatNumber(2e21, 3)).toBe('2e+21');
  });
  it('throws a programmer error for NaN and ±Infinity, never writing them', () => {
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) {
      expect(() => formatNumber(bad)).toThrow(NotFiniteError);
      expect(() => formatSI(bad, parseUnit('head', 'm'))).toThrow(NotFiniteError);
      expect(() => formatPercent(bad)).toThrow(NotFiniteError);
      expect(() => formatChange(bad)).toThrow(NotFiniteError);
    }
  });
  it('refuses a number of significant figures outside 1…17', () => {
    expect(() => formatNumber(1, 0)).toThrow(RangeError);
    expect(() => formatNumber(1, 2.5)).toThrow(RangeError);
  });
  it('roundSignificant keeps the number type and passes non-finite values through for the caller to check', () => {
    expect(roundSignificant(0.30000000000000004, 4)).toBe(0.3);
    expect(roundSignificant(Number.NaN)).toBeNaN();
  });
});

describe('the unit stands beside every number', () => {
  it('formatSI converts from SI and writes the unit label', () => {
    expect(formatSI(12 * 0.0254, parseUnit('diameter', 'in'))).toBe('12 in');
    expect(formatSI(0.05, parseUnit('flow', 'm3/h'))).toBe('180 m³/h');
    expect(formatSI(293.15, parseUnit('temperature', 'F'))).toBe('68 °F');
    expect(formatSI(0.5 / 60, parseUnit('flow', 'gpm'), 3)).toBe('132 gpm');
  });
  it('formatValue writes a display value with its label; an empty label writes the number alone', () => {
    expect(formatValue(1480, 'rpm')).toBe('1480 rpm');
    expect(formatValue(0.78, '')).toBe('0.78');
  });
  it('formatPercent and formatChange write fractions as percentages', () => {
    expect(formatPercent(0.7843)).toBe('78.4 %');
    expect(formatChange(0.0912)).toBe('+9.1 %');
    expect(formatChange(-0.05, 2)).toBe('−5.00 %');
    expect(formatChange(0)).toBe('+0.0 %');
  });
});

describe('show… says "not available" through a typed result', () => {
  it('gives ok and the text for a finite figure', () => {
    expect(showNumber(3.14159, 3)).toEqual({ ok: true, text: '3.14' });
    expect(showSI(1, parseUnit('head', 'ft'), 4)).toEqual({ ok: true, text: '3.281 ft' });
    expect(showValue(5, 'kW')).toEqual({ ok: true, text: '5 kW' });
  });
  it('gives not ok and "not available" for null, undefined, NaN and ±Infinity', () => {
    for (const missing of [null, undefined, Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) {
      expect(showNumber(missing)).toEqual({ ok: false, text: 'not available' });
      expect(showSI(missing, parseUnit('flow', 'm3/h'))).toEqual({ ok: false, text: 'not available' });
      expect(showValue(missing, 'm')).toEqual({ ok: false, text: 'not available' });
    }
  });
});

describe('showPercent and showChange', () => {
  it('write percentages, or "not available"', () => {
    expect(showPercent(0.784)).toEqual({ ok: true, text: '78.4 %' });
    expect(showChange(-0.05)).toEqual({ ok: true, text: '−5.0 %' });
    expect(showPercent(Number.NaN)).toEqual({ ok: false, text: 'not available' });
    expect(showChange(Number.POSITIVE_INFINITY)).toEqual({ ok: false, text: 'not available' });
  });
});

describe('formatPrecision and formatFixed keep the digits that show the precision', () => {
  it('keeps trailing zeros to the significant figures asked for', () => {
    expect(formatPrecision(0.3)).toBe('0.30');
    expect(formatPrecision(2)).toBe('2.0');
    expect(formatPrecision(48.2)).toBe('48');
    expect(formatPrecision(0)).toBe('0');
  });
  it('rounds a value with more whole digits than that to a whole number, never an exponent', () => {
    expect(formatPrecision(148.4)).toBe('148');
    expect(formatPrecision(99.7)).toBe('100');
    expect(formatPrecision(-1234.6, 3)).toBe('-1235');
  });
  it('writes fixed decimals, with "-0.0" as "0.0", and refuses what it cannot write', () => {
    expect(formatFixed(0.8412, 2)).toBe('0.84');
    expect(formatFixed(12, 1)).toBe('12.0');
    expect(formatFixed(-0.01, 1)).toBe('0.0');
    expect(() => formatFixed(Number.NaN)).toThrow(NotFiniteError);
    expect(() => formatPrecision(Number.POSITIVE_INFINITY)).toThrow(NotFiniteError);
  });
  it('showFixed gives "not available" for a missing figure and the label beside a present one', () => {
    expect(showFixed(78.44, 1, '%')).toEqual({ ok: true, text: '78.4 %' });
    expect(showFixed(null, 1, '%')).toEqual({ ok: false, text: 'not available' });
  });
});
