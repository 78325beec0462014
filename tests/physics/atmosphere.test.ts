import { describe, expect, it } from 'vitest';
import psychrolib from 'psychrolib';
import { geopotentialAltitude, standardAtmospherePressure } from '../../src/physics/atmosphere.ts';
import { PhysicsInputError } from '../../src/physics/errors.ts';

describe('standardAtmospherePressure', () => {
  it('gives 101325 Pa at sea level exactly', () => {
    expect(standardAtmospherePressure(0)).toBe(101325);
  });

  it.each([
    [1000, 89875],
    [2000, 79495],
    [1500, 84556],
  ])('gives %s m → %s Pa within 1 Pa', (altitude, pascal) => {
    // Source: U.S. Standard Atmosphere 1976, troposphere pressure law (REFERENCES.md, published).
    expect(Math.abs(standardAtmospherePressure(altitude) - pascal)).toBeLessThan(1);
  });

  it('agrees with the ASHRAE standard-atmosphere pressure of psychrolib within 0.05 % from 0 to 4000 m', () => {
    // Source: psychrolib 1.1.1 GetStandardAtmPressure (ASHRAE Handbook Fundamentals 2017, ch. 1 eq. 3),
    // an independent rounding of the same standard atmosphere.
    psychrolib.SetUnitSystem(psychrolib.SI);
    for (let z = 0; z <= 4000; z += 250) {
      expect(Math.abs(standardAtmospherePressure(z) / psychrolib.GetStandardAtmPressure(z) - 1)).toBeLessThan(5e-4);
    }
  });

  it('refuses elevations above the troposphere with a PhysicsInputError', () => {
    expect(() => standardAtmospherePressure(12000)).toThrow(PhysicsInputError);
    expect(() => standardAtmospherePressure(Number.NaN)).toThrow(/standard-atmosphere range/);
  });
});

describe('geopotentialAltitude', () => {
  it('shortens 1000 m geometric by about 0.157 m (r0 = 6356766 m), changing the pressure by under 2 Pa', () => {
    const h = geopotentialAltitude(1000);
    expect(Math.abs(1000 - h - 0.1573)).toBeLessThan(1e-3);
    expect(Math.abs(standardAtmospherePressure(h) - standardAtmospherePressure(1000))).toBeLessThan(2);
  });
});
