import { describe, expect, it } from 'vitest';
import psychrolib from 'psychrolib';
import { saturationPressureIF97, saturationTemperatureIF97, waterDensityKell } from '../../src/physics/water.ts';
import { PhysicsInputError } from '../../src/physics/errors.ts';

const K = (celsius: number) => celsius + 273.15;

describe('saturationPressureIF97', () => {
  it('matches the IAPWS-IF97 check value at 300 K (3536.59 Pa) within 0.01 Pa', () => {
    // Source: IAPWS-IF97 release, table 35 (region 4 verification values).
    expect(Math.abs(saturationPressureIF97(300) - 3536.59)).toBeLessThan(0.01);
  });

  it('matches the IAPWS-IF97 check value at 500 K (2.638898 MPa) within 1 Pa', () => {
    // Source: IAPWS-IF97 release, table 35.
    expect(Math.abs(saturationPressureIF97(500) - 2.638898e6)).toBeLessThan(1);
  });

  it.each([
    [20, 2339.2],
    [30, 4246.7],
    [60, 19945.8],
    [100, 101418],
  ])('gives the IF97 value at %s °C (%s Pa) within 0.01 %%', (celsius, pascal) => {
    // Source: values computed from the IAPWS-IF97 region-4 equation (REFERENCES.md, published).
    expect(Math.abs(saturationPressureIF97(K(celsius)) / pascal - 1)).toBeLessThan(1e-4);
  });

  it('agrees with the ASHRAE (Hyland–Wexler) saturation pressure of psychrolib within 0.05 % from 5 to 60 °C', () => {
    // Source: psychrolib 1.1.1, GetSatVapPres in SI (ASHRAE Handbook Fundamentals 2017, ch. 1 eq. 6).
    psychrolib.SetUnitSystem(psychrolib.SI);
    let worst = 0;
    for (let celsius = 5; celsius <= 60; celsius += 0.5) {
      const ours = saturationPressureIF97(K(celsius));
      const ashrae = psychrolib.GetSatVapPres(celsius);
      worst = Math.max(worst, Math.abs(ours / ashrae - 1));
    }
    expect(worst).toBeLessThan(5e-4);
  });

  it('refuses temperatures below 0 °C or above the critical point with a PhysicsInputError', () => {
    expect(() => saturationPressureIF97(K(-5))).toThrow(PhysicsInputError);
    expect(() => saturationPressureIF97(700)).toThrow(/outside the vapour-pressure range/);
    expect(() => saturationPressureIF97(Number.NaN)).toThrow(PhysicsInputError);
  });
});

describe('saturationTemperatureIF97', () => {
  it('inverts saturationPressureIF97 to within 1 mK from 1 °C to 370 °C', () => {
    for (let celsius = 1; celsius <= 370; celsius += 3) {
      const p = saturationPressureIF97(K(celsius));
      expect(Math.abs(saturationTemperatureIF97(p) - K(celsius))).toBeLessThan(1e-3);
    }
  });

  it('matches the IAPWS-IF97 backward check value 0.1 MPa → 372.755919 K within 1 µK', () => {
    // Source: IAPWS-IF97 release, table 36.
    expect(Math.abs(saturationTemperatureIF97(0.1e6) - 372.755919)).toBeLessThan(1e-6);
  });

  it('refuses pressures below the triple point', () => {
    expect(() => saturationTemperatureIF97(100)).toThrow(PhysicsInputError);
  });
});

describe('waterDensityKell', () => {
  it.each([
    [4, 999.97],
    [20, 998.2],
    [30, 995.65],
    [60, 983.2],
  ])('gives the Kell density at %s °C (%s kg/m³) within 0.01 kg/m³', (celsius, rho) => {
    // Source: Kell 1975 as quoted in NIST J. Res. 97(3) (REFERENCES.md, published), values rounded to 0.01.
    expect(Math.abs(waterDensityKell(K(celsius)) - rho)).toBeLessThanOrEqual(0.0051);
  });

  it('refuses temperatures outside 0…150 °C', () => {
    expect(() => waterDensityKell(K(-1))).toThrow(PhysicsInputError);
    expect(() => waterDensityKell(K(151))).toThrow(/outside the density range/);
  });
});
