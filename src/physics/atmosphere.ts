/**
 * Barometric pressure of the US Standard Atmosphere 1976, lowest layer (troposphere).
 * Used to estimate the pressure on an open suction surface from the site elevation.
 */
import { PhysicsInputError } from './errors.ts';
import { STANDARD_ATMOSPHERE } from '../units/constants.ts';

/** Sea-level standard temperature [K]. */
export const SEA_LEVEL_TEMPERATURE_K = 288.15;
/** Temperature lapse rate of the lowest layer [K/m]. */
export const LAPSE_RATE_K_PER_M = 0.0065;
/** Exponent g0·M0 / (R*·L) of the pressure law in the lowest layer (dimensionless). */
export const PRESSURE_EXPONENT = 5.255876;
/** Effective Earth radius used to turn geometric into geopotential altitude [m]. */
export const EARTH_RADIUS_M = 6356766;
/** Lowest and highest geopotential altitudes this layer formula covers [m]. */
export const ATMOSPHERE_MIN_M = -5000;
export const ATMOSPHERE_MAX_M = 11000;

/**
 * Standard barometric pressure at a geopotential altitude, troposphere of the 1976 standard:
 *
 *   p = 101325 Pa · (1 − L·H / T0)^(g0·M0/(R*·L)),  L = 0.0065 K/m, T0 = 288.15 K, exponent 5.255876
 *
 * A site elevation may be passed as is: the geometric-to-geopotential correction
 * (see `geopotentialAltitude`) changes the pressure by under 2 Pa below 2 km, far less than the
 * day-to-day weather swing of about ±3 %.
 *
 * @param altitude_m  geopotential altitude H [m]; valid −5000…11000 m.
 * @returns pressure [Pa]
 * Source: U.S. Standard Atmosphere, 1976 (NOAA/NASA/USAF), eq. 33a.
 * Check values: 1000 m → 89875 Pa, 2000 m → 79495 Pa.
 * Throws PhysicsInputError outside the valid range.
 */
export function standardAtmospherePressure(altitude_m: number): number {
  if (!Number.isFinite(altitude_m) || altitude_m < ATMOSPHERE_MIN_M || altitude_m > ATMOSPHERE_MAX_M) {
    throw new PhysicsInputError(
      `Elevation ${altitude_m} m is outside the standard-atmosphere range −5000…11000 m; enter the site elevation in metres above sea level, or give the site pressure directly.`,
    );
  }
  return STANDARD_ATMOSPHERE * (1 - (LAPSE_RATE_K_PER_M * altitude_m) / SEA_LEVEL_TEMPERATURE_K) ** PRESSURE_EXPONENT;
}

/**
 * Geopotential altitude of a geometric altitude: H = r0·z / (r0 + z), r0 = 6 356 766 m.
 * @param geometric_m  geometric altitude z [m]
 * @returns geopotential altitude H [m]
 * Source: U.S. Standard Atmosphere, 1976, eq. 18.
 */
export function geopotentialAltitude(geometric_m: number): number {
  return (EARTH_RADIUS_M * geometric_m) / (EARTH_RADIUS_M + geometric_m);
}
