import { describe, expect, it } from 'vitest';
import { hydraulicPowerW, shaftPowerW } from '../../src/fit/checks/hydraulicPower.ts';
import { HORSEPOWER, SG_REFERENCE_DENSITY, siOf } from '../../src/units/index.ts';
import { specificSpeedSI, specificSpeedUS, suctionSpecificSpeedUS } from '../../src/fit/specificSpeed.ts';

describe('hydraulic power P = ρ·g·Q·H', () => {
  it('reproduces the water-horsepower constant 3960 within 0.1 % (common practice: WHP = Q[gpm]·H[ft]·SG/3960)', () => {
    const q = siOf('flow', 1, 'gpm');
    const h = siOf('head', 1, 'ft');
    const constant = HORSEPOWER / hydraulicPowerW(SG_REFERENCE_DENSITY, q, h);
    expect(Math.abs(constant / 3960 - 1)).toBeLessThan(1e-3);
  });
  it('reproduces the SI constant 367.1 within 0.15 % (common practice: P[kW] = Q[m³/h]·H[m]·SG/367.1; 367.1 assumes 1000 kg/m³)', () => {
    const constant = 1000 / hydraulicPowerW(SG_REFERENCE_DENSITY, siOf('flow', 1, 'm3/h'), 1);
    expect(Math.abs(constant / 367.1 - 1)).toBeLessThan(1.5e-3);
    expect(1000 / hydraulicPowerW(1000, siOf('flow', 1, 'm3/h'), 1)).toBeCloseTo(367.1, 1);
  });
  it('shaft power divides by efficiency and refuses η ≤ 0', () => {
    expect(shaftPowerW(1000, 0.1, 10, 0.5)).toBeCloseTo(2 * 1000 * 9.80665, 9);
    expect(shaftPowerW(1000, 0.1, 10, 0)).toBeNaN();
  });
});

describe('specific speed', () => {
  it('Ns(US) = 51.65 · nq(SI) (REFERENCES.md, computed from the unit definitions; tolerance 0.01 %)', () => {
    const ratio = specificSpeedUS(1780, 0.07, 36) / specificSpeedSI(1780, 0.07, 36);
    expect(ratio).toBeCloseTo(51.65, 1);
    expect(Math.abs(ratio / 51.65 - 1)).toBeLessThan(1e-4);
  });
  it('Ns(US) = 0.8608 · n on the m³/h basis (REFERENCES.md; tolerance 0.01 %)', () => {
    const nM3h = (1780 * Math.sqrt(0.07 * 3600)) / 36 ** 0.75;
    expect(Math.abs(specificSpeedUS(1780, 0.07, 36) / nM3h / 0.8608 - 1)).toBeLessThan(1e-4);
  });
  it('a double-suction impeller halves the flow per eye for Nss', () => {
    const single = suctionSpecificSpeedUS(1780, 0.2, 6, 1);
    expect(suctionSpecificSpeedUS(1780, 0.2, 6, 2)).toBeCloseTo(single / Math.SQRT2, 6);
  });
  it('returns NaN for zero flow or head', () => {
    expect(specificSpeedUS(1780, 0, 10)).toBeNaN();
  });
});
