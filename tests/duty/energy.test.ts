import { describe, expect, it } from 'vitest';
import { annualEnergy } from '../../src/duty/energy.ts';
import { DutyError } from '../../src/duty/errors.ts';

describe('annualEnergy', () => {
  it('18.6 kW shaft at 93 % motor efficiency for 4000 h at 0.15 per kWh: 80 000 kWh and 12 000', () => {
    const e = annualEnergy({ shaft_power_W: 18600, hours_per_year: 4000, motor_efficiency: 0.93, tariff_per_kWh: 0.15 });
    expect(e.input_power_W).toBeCloseTo(20000, 9);
    expect(e.energy_kWh).toBeCloseTo(80000, 6);
    expect(e.cost).toBeCloseTo(12000, 6);
  });
  it('divides by the drive efficiency too', () => {
    expect(annualEnergy({ shaft_power_W: 9000, hours_per_year: 1000, motor_efficiency: 0.9, drive_efficiency: 0.5 }).energy_kWh).toBeCloseTo(20000, 9);
  });
  it('refuses an efficiency given as a percentage above 1 and more hours than a year holds', () => {
    expect(() => annualEnergy({ shaft_power_W: 1, hours_per_year: 10, motor_efficiency: 93 })).toThrow(DutyError);
    expect(() => annualEnergy({ shaft_power_W: 1, hours_per_year: 9000, motor_efficiency: 0.9 })).toThrow(/8784/);
  });
});
