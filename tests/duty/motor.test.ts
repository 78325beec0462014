import { describe, expect, it } from 'vitest';
import { nextMotorSize, nonOverloadingPower, selectMotor } from '../../src/duty/motor.ts';
import type { PumpCurve } from '../../src/duty/pumpCurve.ts';
import { HORSEPOWER } from '../../src/units/constants.ts';
import { D_FULL, inventedCurveAt } from './inventedFamily.ts';

describe('nextMotorSize', () => {
  it('picks the next IEC rating above the power: 10.5 kW → 11 kW, 11 kW → 11 kW, 11.01 kW → 15 kW', () => {
    // IEC 60072-1 list (from memory, REFERENCES.md).
    expect(nextMotorSize(10500, 'iec')?.label).toBe('11 kW');
    expect(nextMotorSize(11000, 'iec')?.label).toBe('11 kW');
    expect(nextMotorSize(11010, 'iec')?.label).toBe('15 kW');
  });
  it('picks the next NEMA rating above the power: 14.2 hp → 15 hp, 61 hp → 75 hp', () => {
    // NEMA MG 1 list (published, REFERENCES.md).
    expect(nextMotorSize(14.2 * HORSEPOWER, 'nema')?.label).toBe('15 hp');
    expect(nextMotorSize(61 * HORSEPOWER, 'nema')?.label).toBe('75 hp');
  });
  it('returns undefined above the largest rating', () => {
    expect(nextMotorSize(600 * HORSEPOWER, 'nema')).toBeUndefined();
    expect(nextMotorSize(500e3, 'iec')).toBeUndefined();
  });
});

describe('nonOverloadingPower', () => {
  it('finds the peak of an invented power curve that rises and falls: P = 20 kW + 4e5·Q − 5e6·Q² peaks at Q = 0.04 with 28 kW', () => {
    const curve: PumpCurve = { label: 'invented', speed_rpm: 1450, domain: [0, 0.06], head: () => 10, power: (q) => 20000 + 4e5 * q - 5e6 * q * q };
    const p = nonOverloadingPower(curve);
    expect(Math.abs((p?.power_W ?? 0) - 28000)).toBeLessThan(1e-6);
    expect(Math.abs((p?.flow_m3s ?? 0) - 0.04)).toBeLessThan(1e-6);
  });
  it('takes the end of curve for a power curve that keeps rising', () => {
    const pump = inventedCurveAt(D_FULL);
    const p = nonOverloadingPower(pump);
    expect(p?.flow_m3s).toBeGreaterThan(0.03);
    for (let q = 0; q <= 0.06; q += 0.001) expect(pump.power?.(q) ?? 0).toBeLessThanOrEqual((p?.power_W ?? 0) * (1 + 1e-9));
  });
});

describe('selectMotor', () => {
  it('sizes on the non-overloading power, not the duty power, and picks the next standard size above it', () => {
    const pump = inventedCurveAt(D_FULL);
    const peak = nonOverloadingPower(pump);
    const duty = pump.power?.(0.025) ?? 0;
    const m = selectMotor(peak?.power_W ?? 0, 'iec', duty);
    expect(m.rating?.rated_W).toBeGreaterThanOrEqual(peak?.power_W ?? Infinity);
    // and it is the smallest such rating
    expect(nextMotorSize((m.rating?.rated_W ?? 0) * 0.999, 'iec')?.rated_W).toBeLessThanOrEqual(m.rating?.rated_W ?? 0);
    expect(m.load_at_duty).toBeLessThan(m.load_at_sizing ?? 0);
  });
  it('notes the 1.15 service factor for NEMA motors', () => {
    const m = selectMotor(20 * HORSEPOWER, 'nema');
    expect(m.service_factor).toBe(1.15);
    expect(m.notes.join(' ')).toMatch(/service factor of 1\.15/);
  });
  it('says when the power is beyond the list', () => {
    expect(selectMotor(1e6, 'iec').notes[0]).toMatch(/exceeds the largest rating/);
  });
});
