/**
 * Motor sizing for a pump: the largest power along the curve to its end (non-overloading,
 * common practice), then the next standard rating.
 *
 * NEMA MG 1 horsepower ratings (published list; check before relying).
 * IEC 60072-1 kilowatt ratings (from memory; confirm before relying).
 * Service factor: 1.15 is typical for NEMA general-purpose motors; it is a reserve for voltage,
 * ambient and short excursions, not capacity to size continuous duty on (common practice).
 */
import { HORSEPOWER } from '../units/constants.ts';
import type { PumpCurve } from './pumpCurve.ts';
import { maximumOn } from './solve.ts';
import { DutyError } from './errors.ts';

export const NEMA_HP = [1, 1.5, 2, 3, 5, 7.5, 10, 15, 20, 25, 30, 40, 50, 60, 75, 100, 125, 150, 200, 250, 300, 350, 400, 450, 500] as const;
export const IEC_KW = [0.75, 1.1, 1.5, 2.2, 3, 4, 5.5, 7.5, 11, 15, 18.5, 22, 30, 37, 45, 55, 75, 90, 110, 132, 160, 200, 250, 315, 355, 400] as const;
export const NEMA_SERVICE_FACTOR = 1.15;

export type MotorStandard = 'nema' | 'iec';

export interface MotorRating {
  standard: MotorStandard;
  /** Rated output [W]. */
  rated_W: number;
  /** The rating as the list writes it, e.g. "15 hp" or "11 kW". */
  label: string;
}

/** Ratings of a list in watts, ascending. */
export function motorRatings(standard: MotorStandard): MotorRating[] {
  if (standard === 'nema') return NEMA_HP.map((hp) => ({ standard, rated_W: hp * HORSEPOWER, label: `${hp} hp` }));
  if (standard === 'iec') return IEC_KW.map((kw) => ({ standard, rated_W: kw * 1000, label: `${kw} kW` }));
  throw new DutyError(`Unknown motor list "${String(standard)}"; use nema or iec.`);
}

/**
 * The smallest standard rating at or above `power_W` [W]; undefined when the power exceeds the
 * largest rating of the list. A relative slack of 1e-9 keeps a power equal to a rating on that rating.
 */
export function nextMotorSize(power_W: number, standard: MotorStandard): MotorRating | undefined {
  if (!(power_W >= 0) || !Number.isFinite(power_W)) throw new DutyError(`The power to size a motor for must be zero or more, not ${power_W} W.`);
  return motorRatings(standard).find((r) => r.rated_W >= power_W * (1 - 1e-9));
}

/**
 * Largest shaft power [W] along the pump curve from the start of its domain to its end, and the
 * flow where it occurs. Undefined when the curve has no power.
 */
export function nonOverloadingPower(curve: PumpCurve): { power_W: number; flow_m3s: number } | undefined {
  const power = curve.power;
  if (!power) return undefined;
  const best = maximumOn((q) => power.call(curve, q), curve.domain[0], curve.domain[1], 400);
  return best ? { power_W: best.value, flow_m3s: best.x } : undefined;
}

export interface MotorSelection {
  rating?: MotorRating;
  /** Power the motor is sized for [W] (the non-overloading power). */
  sizing_power_W: number;
  /** Shaft power at the duty [W]. */
  duty_power_W?: number;
  /** Duty power / rating. */
  load_at_duty?: number;
  /** Sizing power / rating. */
  load_at_sizing?: number;
  /** NEMA only: the service factor the note refers to. */
  service_factor?: number;
  notes: string[];
}

/** Picks the next standard rating above the sizing power and writes the notes that go with it. */
export function selectMotor(sizingPower_W: number, standard: MotorStandard, dutyPower_W?: number): MotorSelection {
  const rating = nextMotorSize(sizingPower_W, standard);
  const out: MotorSelection = { sizing_power_W: sizingPower_W, notes: [] };
  if (dutyPower_W !== undefined) out.duty_power_W = dutyPower_W;
  if (rating) {
    out.rating = rating;
    out.load_at_sizing = sizingPower_W / rating.rated_W;
    if (dutyPower_W !== undefined) out.load_at_duty = dutyPower_W / rating.rated_W;
  } else {
    const list = motorRatings(standard);
    out.notes.push(`The power exceeds the largest rating of the list (${list[list.length - 1]?.label}); size the motor with the manufacturer.`);
  }
  if (standard === 'nema') {
    out.service_factor = NEMA_SERVICE_FACTOR;
    out.notes.push(
      `NEMA general-purpose motors typically carry a service factor of ${NEMA_SERVICE_FACTOR}; keep it in reserve for voltage, ambient and short excursions rather than sizing continuous duty on it.`,
    );
  }
  out.notes.push('Sized for the largest power along the curve to its end (non-overloading), so that the motor survives a run-out when the system resistance drops.');
  return out;
}
