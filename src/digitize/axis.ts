/**
 * Axis transforms: a linear axis reads values as they are, a log axis reads log10 of them.
 * Calibration works on the transformed value, where every axis is linear; the pair
 * forward/inverse are exact inverses on the valid domain.
 */
import { UserError } from '../model/errors.ts';
import type { AxisScaleType } from '../model/takeoff.ts';

/** Thrown when anchors cannot define a calibration; the message says what to fix. */
export class CalibrationError extends UserError {
  override name = 'CalibrationError';
}

export interface AxisTransform {
  readonly type: AxisScaleType;
  /** Value → position on the linear core (log10 for a log axis). */
  forward(value: number, what?: string): number;
  /** Position on the linear core → value. */
  inverse(t: number): number;
}

const linear: AxisTransform = {
  type: 'linear',
  forward(value, what = 'value') {
    if (!Number.isFinite(value)) throw new CalibrationError(`The ${what} ${value} is not a finite number.`);
    return value;
  },
  inverse: (t) => t,
};

const log: AxisTransform = {
  type: 'log',
  forward(value, what = 'value') {
    if (!(value > 0) || !Number.isFinite(value)) {
      throw new CalibrationError(`The ${what} ${value} cannot sit on a log axis, which holds only positive values; fix the value or make the axis linear.`);
    }
    return Math.log10(value);
  },
  inverse: (t) => 10 ** t,
};

export function axisTransform(type: AxisScaleType): AxisTransform {
  return type === 'log' ? log : linear;
}
