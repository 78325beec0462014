/**
 * Annual energy and cost of running a pump:
 *   P_in = P_shaft / (η_motor · η_drive),  E = P_in · hours,  cost = E · tariff.
 * Units: power W, hours h/year, energy kWh/year, tariff currency per kWh.
 */
import { DutyError } from './errors.ts';

export interface EnergyInput {
  /** Shaft power at the duty [W]. */
  shaft_power_W: number;
  /** Running hours per year. */
  hours_per_year: number;
  /** Motor efficiency, fraction 0…1. */
  motor_efficiency: number;
  /** Variable-speed drive efficiency, fraction 0…1 (1 when there is none). */
  drive_efficiency?: number;
  /** Price of electricity per kWh (any currency); cost is omitted without it. */
  tariff_per_kWh?: number;
}

export interface EnergyResult {
  /** Electrical input power [W]. */
  input_power_W: number;
  /** Energy per year [kWh]. */
  energy_kWh: number;
  /** Cost per year, in the tariff's currency. */
  cost?: number;
}

export function annualEnergy(input: EnergyInput): EnergyResult {
  const drive = input.drive_efficiency ?? 1;
  if (!(input.shaft_power_W >= 0)) throw new DutyError('The shaft power for the energy estimate must be zero or more.');
  if (!(input.hours_per_year >= 0 && input.hours_per_year <= 8784)) throw new DutyError('Running hours must lie between 0 and 8784 per year.');
  if (!(input.motor_efficiency > 0 && input.motor_efficiency <= 1)) throw new DutyError('Motor efficiency must be a fraction above 0 and at most 1 (or a percentage up to 100).');
  if (!(drive > 0 && drive <= 1)) throw new DutyError('Drive efficiency must be a fraction above 0 and at most 1.');
  if (input.tariff_per_kWh !== undefined && !(input.tariff_per_kWh >= 0)) throw new DutyError('The tariff must be zero or more per kWh.');
  const inputPower = input.shaft_power_W / (input.motor_efficiency * drive);
  const energy = (inputPower * input.hours_per_year) / 1000;
  const out: EnergyResult = { input_power_W: inputPower, energy_kWh: energy };
  if (input.tariff_per_kWh !== undefined) out.cost = energy * input.tariff_per_kWh;
  return out;
}
