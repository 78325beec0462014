/**
 * Life-cycle cost by the Hydraulic Institute / Europump method (Pump Life Cycle Costs: A Guide
 * to LCC Analysis for Pumping Systems, 2001): LCC = C_ic + C_in + C_e + C_o + C_m + C_s + C_env + C_d.
 * Here: initial and installation cost as one capital cost (optional), energy and maintenance as
 * yearly costs brought to present value; the other terms are left to the engineer.
 *
 *   PV = C · (1 − (1 + i')^−n) / i',   i' = (i − p)/(1 + p)   (annuity factor, energy escalation p)
 *   i' = 0 gives PV = C·n.
 */
import { DutyError } from '../duty/errors.ts';

/**
 * Present-value (annuity) factor for n years at discount rate i with yearly escalation p.
 * @param years n > 0; @param rate i (fraction, > −1); @param escalation p (fraction, > −1)
 * Source: HI/Europump LCC guide (2001), present value of a uniform series (published).
 */
export function annuityFactor(years: number, rate: number, escalation = 0): number {
  if (!(years > 0) || !(rate > -1) || !(escalation > -1)) throw new DutyError('The life-cycle cost needs a positive number of years and rates above −100 %.');
  const i = (rate - escalation) / (1 + escalation);
  if (Math.abs(i) < 1e-12) return years;
  return (1 - (1 + i) ** -years) / i;
}

export interface LifeCycleCost {
  capital: number;
  energy_pv: number;
  maintenance_pv: number;
  total: number;
  factor: number;
}

export function lifeCycleCost(input: { capital?: number; annual_energy_cost: number; annual_maintenance?: number; years: number; rate: number; escalation?: number }): LifeCycleCost {
  const factor = annuityFactor(input.years, input.rate, input.escalation ?? 0);
  // Escalation applies to energy; maintenance is discounted at the plain rate.
  const mFactor = annuityFactor(input.years, input.rate, 0);
  const capital = input.capital ?? 0;
  const energy_pv = input.annual_energy_cost * factor;
  const maintenance_pv = (input.annual_maintenance ?? 0) * mFactor;
  return { capital, energy_pv, maintenance_pv, total: capital + energy_pv + maintenance_pv, factor };
}
