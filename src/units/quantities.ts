/**
 * Branded SI quantities. A plain `number` read off a screen or a file must pass
 * through a unit conversion (see `convert.ts`) before it can become one of these,
 * so that a m³/h value can never be handed to code that expects m³/s.
 */
declare const brand: unique symbol;
type Brand<T, B extends string> = T & { readonly [brand]: B };

/** Volume flow in m³/s. */
export type FlowM3s = Brand<number, 'FlowM3s'>;
/** Head (or NPSH) in metres of the pumped liquid. */
export type HeadM = Brand<number, 'HeadM'>;
/** Power in watts. */
export type PowerW = Brand<number, 'PowerW'>;
/** Length (impeller diameter) in metres. */
export type LengthM = Brand<number, 'LengthM'>;
/** Pressure in pascals. */
export type PressurePa = Brand<number, 'PressurePa'>;
/** Thermodynamic temperature in kelvin. */
export type TemperatureK = Brand<number, 'TemperatureK'>;
/** Rotational speed in revolutions per minute (the trade's unit; kept as is). */
export type SpeedRpm = Brand<number, 'SpeedRpm'>;
/** Efficiency as a fraction, 0…1. */
export type Fraction = Brand<number, 'Fraction'>;

export const flowM3s = (v: number) => v as FlowM3s;
export const headM = (v: number) => v as HeadM;
export const powerW = (v: number) => v as PowerW;
export const lengthM = (v: number) => v as LengthM;
export const pressurePa = (v: number) => v as PressurePa;
export const temperatureK = (v: number) => v as TemperatureK;
export const speedRpm = (v: number) => v as SpeedRpm;
export const fraction = (v: number) => v as Fraction;
