import { describe, expect, it } from 'vitest';
import { unit as mathUnit, evaluate } from 'mathjs';
import {
  convert, headFromPressure, headFromSI, headToSI, labelOf, METRIC_HORSEPOWER, parseHeadUnit, parseUnit, presetNamed, siOf, STANDARD_GRAVITY, UnitError, UNITS, type QuantityKind,
} from '../../src/units/index.ts';

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('the trade units (#16)', () => {
  it('MGD: 1 US million gallons per day = 1e6 × 3.785411784e-3 m³ / 86400 s (mathjs gal/day; tolerance 1e-9 relative)', () => {
    // Reference: mathjs unit "gal" (US liquid gallon), scaled by 1e6 per day.
    expect(rel(siOf('flow', 1, 'MGD'), mathUnit(1e6, 'gal/day').toNumber('m^3/s'))).toBeLessThan(1e-9);
    // NIST SP 811 Appendix B: gallon (U.S.) = 3.785412 E−03 m³, so 1 MGD = 0.0438126 m³/s.
    expect(siOf('flow', 1, 'MGD')).toBeCloseTo(0.0438126364, 9);
  });
  it('ft³/s: 1 cubic foot per second = 2.831685 E−02 m³/s (NIST SP 811 Appendix B.8; mathjs ft^3/s to 1e-9)', () => {
    expect(siOf('flow', 1, 'ft3/s')).toBeCloseTo(2.831685e-2, 8);
    expect(rel(siOf('flow', 1, 'cfs'), mathUnit(1, 'ft^3/s').toNumber('m^3/s'))).toBeLessThan(1e-9);
  });
  it('L/min and m³/min agree with mathjs (tolerance 1e-12 relative)', () => {
    expect(rel(siOf('flow', 1, 'L/min'), mathUnit(1, 'L/min').toNumber('m^3/s'))).toBeLessThan(1e-12);
    expect(rel(siOf('flow', 1, 'm3/min'), mathUnit(1, 'm^3/min').toNumber('m^3/s'))).toBeLessThan(1e-12);
  });
  it('bbl/d: the petroleum barrel is 42 US gallons = 1.589873 E−01 m³ (NIST SP 811 Appendix B.8; mathjs "obl" to 1e-9)', () => {
    expect(siOf('flow', 1, 'bbl/d') * 86400).toBeCloseTo(0.1589873, 7);
    expect(rel(siOf('flow', 1, 'bbl/d'), mathUnit(1, 'obl/day').toNumber('m^3/s'))).toBeLessThan(1e-9);
  });
  it('PS (metric horsepower) = 735.49875 W exactly (75 kgf·m/s; NIST SP 811 Appendix B.8 gives 7.354 988 E+02 W)', () => {
    expect(METRIC_HORSEPOWER).toBeCloseTo(735.49875, 10);
    expect(siOf('power', 1, 'PS')).toBe(METRIC_HORSEPOWER);
    expect(siOf('power', 1, 'metric hp')).toBe(METRIC_HORSEPOWER);
    expect(convert(1, parseUnit('power', 'PS'), parseUnit('power', 'kW'))).toBeCloseTo(0.73549875, 12);
  });
});

describe('head given as a pressure at a stated density', () => {
  it('1 bar of water at 1000 kg/m³ is 10.19716 m (mathjs: 1 bar / (1000 kg/m^3 · 9.80665 m/s^2); tolerance 1e-9 relative)', () => {
    const reference = evaluate('1 bar / (1000 kg/m^3 * 9.80665 m/s^2)').toNumber('m');
    expect(rel(headToSI(1, 'bar', 1000), reference)).toBeLessThan(1e-9);
    expect(headToSI(1, 'bar', 1000)).toBeCloseTo(10.19716, 5);
  });
  it('1 psi of water at SG 1 (999.014 kg/m³, 60 °F) is 2.31 ft (common practice; psi from NIST SP 811)', () => {
    expect(headToSI(1, 'psi', 999.014) / 0.3048).toBeCloseTo(2.31, 2);
  });
  it('kPa at the density of a light oil (850 kg/m³): H = p/(ρ g_n), and back', () => {
    expect(headToSI(100, 'kPa', 850)).toBeCloseTo(100e3 / (850 * STANDARD_GRAVITY), 12);
    expect(headFromSI(headToSI(37.5, 'kPa', 850), 'kPa', 850)).toBeCloseTo(37.5, 12);
    expect(headFromPressure(9806.65, 1000)).toBeCloseTo(1, 15);
  });
  it('head units need no density; pressure units refuse to work without one', () => {
    expect(headToSI(10, 'ft')).toBeCloseTo(3.048, 15);
    expect(() => headToSI(10, 'psi')).toThrow(UnitError);
    expect(() => headToSI(10, 'psi')).toThrow(/state the liquid's density/);
    expect(() => headToSI(10, 'bar', 0)).toThrow(/positive number of kg\/m³/);
    expect(() => headToSI(10, 'bar', Number.NaN)).toThrow(UnitError);
    expect(() => parseHeadUnit('gpm')).toThrow(/Unknown head unit "gpm"\. Use one of: m, ft, Pa, kPa, bar, psi/);
  });
});

describe('unit names match case-insensitively', () => {
  it('GPM, M3/H, Ft, KW, MGD, mgd, Cfs, BBL/D, ps, L/MIN and "m3 / h" all resolve', () => {
    expect(parseUnit('flow', 'GPM').token).toBe('gpm');
    expect(parseUnit('flow', 'M3/H').token).toBe('m3/h');
    expect(parseUnit('flow', 'M³/H').token).toBe('m3/h');
    expect(parseUnit('flow', 'm3 / h').token).toBe('m3/h');
    expect(parseUnit('flow', 'm^3/h').token).toBe('m3/h');
    expect(parseUnit('head', 'Ft').token).toBe('ft');
    expect(parseUnit('head', 'FEET').token).toBe('ft');
    expect(parseUnit('power', 'KW').token).toBe('kW');
    expect(parseUnit('flow', 'mgd').token).toBe('MGD');
    expect(parseUnit('flow', 'Cfs').token).toBe('ft3/s');
    expect(parseUnit('flow', 'BBL/D').token).toBe('bbl/d');
    expect(parseUnit('power', 'ps').token).toBe('PS');
    expect(parseUnit('flow', 'L/MIN').token).toBe('L/min');
    expect(parseUnit('temperature', 'degf').token).toBe('F');
    expect(parseHeadUnit('KPA').token).toBe('kPa');
    expect(presetNamed('US').flow).toBe('gpm');
    expect(labelOf('M3/H')).toBe('m³/h');
  });
  it('no two units of one kind share a spelling when case is ignored', () => {
    const kinds = [...new Set(UNITS.map((u) => u.kind))] as QuantityKind[];
    for (const kind of kinds) {
      const seen = new Map<string, string>();
      for (const u of UNITS.filter((x) => x.kind === kind)) {
        for (const spelling of [u.token, ...u.aliases]) {
          const key = spelling.toLowerCase();
          expect(seen.get(key) ?? u.token, `${kind} "${spelling}"`).toBe(u.token);
          seen.set(key, u.token);
        }
      }
    }
  });
  it('every token and alias of every unit, upper-cased, resolves to its unit', () => {
    for (const u of UNITS) for (const spelling of [u.token, ...u.aliases]) expect(parseUnit(u.kind, spelling.toUpperCase())).toBe(u);
  });
});
