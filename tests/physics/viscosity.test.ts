import { describe, expect, it } from 'vitest';
import { waterKinematicViscosity, waterViscosityIAPWS2008 } from '../../src/physics/viscosity.ts';
import { waterDensityKell } from '../../src/physics/water.ts';

describe('water viscosity, IAPWS 2008', () => {
  it('reproduces the check values of the release (Table 4) to 1e-6 relative', () => {
    // IAPWS, Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary Water Substance, Table 4
    // (recalled check values; matched here to all printed digits): 298.15 K, 998 kg/m³ → 889.735100 µPa·s;
    // 373.15 K, 1000 kg/m³ → 307.883622 µPa·s.
    expect(Math.abs(waterViscosityIAPWS2008(298.15, 998) / 889.7351e-6 - 1)).toBeLessThan(1e-6);
    expect(Math.abs(waterViscosityIAPWS2008(373.15, 1000) / 307.883622e-6 - 1)).toBeLessThan(1e-6);
  });

  it('gives the handbook viscosities at 0.1 MPa within 0.1 % (20 °C) and 0.2 % (30, 60 °C)', () => {
    // Values at 0.1 MPa from the IAPWS 2008 formulation (from memory; tables in the release's
    // companion paper, Huber et al. 2009): 20 °C 1001.6, 30 °C 797.2, 60 °C 466.5 µPa·s.
    const at = (c: number) => waterViscosityIAPWS2008(c + 273.15, waterDensityKell(c + 273.15)) * 1e6;
    expect(Math.abs(at(20) / 1001.6 - 1)).toBeLessThan(0.001);
    expect(Math.abs(at(30) / 797.2 - 1)).toBeLessThan(0.002);
    expect(Math.abs(at(60) / 466.5 - 1)).toBeLessThan(0.002);
    expect(Math.abs(waterKinematicViscosity(293.15) / 1.0034e-6 - 1)).toBeLessThan(0.001);
  });

  it('refuses a temperature outside 0…150 °C with a sentence', () => {
    expect(() => waterViscosityIAPWS2008(500, 900)).toThrow(/outside the viscosity range/);
  });
});
