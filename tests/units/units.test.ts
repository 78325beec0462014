import { describe, expect, it } from 'vitest';
import { unit as mathUnit } from 'mathjs';
import { convert, parseUnit, PRESETS, resolveUnits, siOf, displayOf, toSI, fromSI, UnitError, UNITS, HORSEPOWER, PSI, formatSI } from '../../src/units/index.ts';

describe('unit factors against NIST SP 811 Appendix B (exact definitions)', () => {
  // Source: NIST Special Publication 811, Appendix B — all of these are exact by definition.
  it('1 ft is 0.3048 m and 1 in is 0.0254 m exactly', () => {
    expect(siOf('head', 1, 'ft')).toBe(0.3048);
    expect(siOf('diameter', 1, 'in')).toBe(0.0254);
  });
  it('1 US gpm is 6.30901964e-5 m³/s and 0.2271247 m³/h (NIST SP 811; tolerance 1e-12 relative)', () => {
    expect(siOf('flow', 1, 'gpm')).toBeCloseTo(6.30901964e-5, 17);
    expect(convert(1, parseUnit('flow', 'gpm'), parseUnit('flow', 'm3/h'))).toBeCloseTo(0.2271247, 7);
  });
  it('1 hp (550 ft·lbf/s) is 745.69987158227022 W (NIST SP 811; tolerance 1e-12 relative)', () => {
    expect(Math.abs(HORSEPOWER / 745.69987158227022 - 1)).toBeLessThan(1e-12);
    expect(siOf('power', 1, 'hp')).toBe(HORSEPOWER);
  });
  it('1 psi is 6894.757 Pa (NIST SP 811, to the 7 digits given)', () => {
    expect(PSI).toBeCloseTo(6894.757, 3);
  });
  it('temperatures: 68 °F is 20 °C is 293.15 K (exact)', () => {
    expect(siOf('temperature', 20, 'C')).toBeCloseTo(293.15, 12);
    expect(siOf('temperature', 68, 'F')).toBeCloseTo(293.15, 12);
    expect(displayOf('temperature', 273.15, 'F')).toBeCloseTo(32, 12);
  });
});

describe('unit factors against mathjs (a second opinion)', () => {
  // Reference library: mathjs unit conversion; tolerance 1e-9 relative.
  const cases: [string, string, string, string][] = [
    ['flow', 'm3/h', 'm^3/h', 'm^3/s'],
    ['flow', 'L/s', 'L/s', 'm^3/s'],
    ['flow', 'L/min', 'L/min', 'm^3/s'],
    ['flow', 'gpm', 'gal/min', 'm^3/s'],
    ['head', 'ft', 'ft', 'm'],
    ['power', 'kW', 'kW', 'W'],
    ['power', 'hp', 'hp', 'W'],
    ['diameter', 'mm', 'mm', 'm'],
    ['diameter', 'in', 'inch', 'm'],
    ['pressure', 'kPa', 'kPa', 'Pa'],
    ['pressure', 'bar', 'bar', 'Pa'],
    ['pressure', 'psi', 'psi', 'Pa'],
  ];
  for (const [kind, ours, theirs, base] of cases) {
    it(`${ours} agrees with mathjs "${theirs}"`, () => {
      const reference = mathUnit(1, theirs).toNumber(base);
      expect(Math.abs(siOf(kind as never, 1, ours) / reference - 1)).toBeLessThan(1e-9);
    });
  }
  it('°F and °C agree with mathjs degF/degC at 100 °F', () => {
    expect(siOf('temperature', 100, 'F')).toBeCloseTo(mathUnit(100, 'degF').toNumber('K'), 9);
    expect(siOf('temperature', 37, 'C')).toBeCloseTo(mathUnit(37, 'degC').toNumber('K'), 9);
  });
});

describe('parsing and presets', () => {
  it('parseUnit accepts canonical tokens and common spellings', () => {
    expect(parseUnit('flow', 'm³/h').token).toBe('m3/h');
    expect(parseUnit('flow', 'l/s').token).toBe('L/s');
    expect(parseUnit('power', 'KW').token).toBe('kW');
    expect(parseUnit('temperature', '°F').token).toBe('F');
  });
  it('parseUnit rejects an unknown token with the list of accepted ones', () => {
    expect(() => parseUnit('flow', 'furlongs/fortnight')).toThrow(UnitError);
    expect(() => parseUnit('flow', 'bbl/h')).toThrow(/Use one of: m3\/s, m3\/h, L\/s, L\/min, m3\/min, gpm/);
  });
  it('a head unit is not accepted as a flow unit', () => {
    expect(() => parseUnit('flow', 'ft')).toThrow(/Unknown flow unit "ft"/);
  });
  it('si and us presets resolve to real units', () => {
    expect(resolveUnits(PRESETS.si).flow.token).toBe('m3/h');
    expect(resolveUnits(PRESETS.us).diameter.token).toBe('in');
  });
  it('toSI and fromSI are inverses for every unit (tolerance 1e-12 relative)', () => {
    for (const u of UNITS) {
      for (const v of [-40, 0.5, 1, 123.456]) expect(fromSI(toSI(v, u), u)).toBeCloseTo(v, 10);
    }
  });
  it('formatSI writes the unit beside the number', () => {
    expect(formatSI(12 * 0.0254, parseUnit('diameter', 'in'))).toBe('12 in');
    expect(formatSI(0.05, parseUnit('flow', 'm3/h'))).toBe('180 m³/h');
  });
});
