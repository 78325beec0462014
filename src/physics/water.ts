/**
 * Properties of liquid water needed for NPSH: saturation (vapour) pressure and density.
 * Pure functions, SI in and out (temperature K, pressure Pa, density kg/m³).
 */
import { PhysicsInputError } from './errors.ts';

/** Coefficients n1…n10 of the IAPWS-IF97 region-4 (saturation line) equations. */
const N = [
  1167.0521452767, -724213.16703206, -17.073846940092, 12020.82470247, -3232555.0322333, 14.91510861353,
  -4823.2657361591, 405113.40542057, -0.23855557567849, 650.17534844798,
] as const;
const [n1, n2, n3, n4, n5, n6, n7, n8, n9, n10] = N;

/** Triple-point temperature [K]; the IF97 saturation line starts here. */
export const WATER_TRIPLE_POINT_K = 273.16;
/** Critical temperature [K]; the saturation line ends here. */
export const WATER_CRITICAL_K = 647.096;
/** Saturation pressure at the triple point by IF97 [Pa] (lowest pressure of the saturation line). */
export const WATER_TRIPLE_POINT_PA = 611.213;
/** Critical pressure [Pa]. */
export const WATER_CRITICAL_PA = 22.064e6;

/**
 * Saturation (vapour) pressure of water, IAPWS-IF97 region 4, basic equation (eq. 30):
 *
 *   θ = T + n9 / (T − n10)
 *   A = θ² + n1 θ + n2,  B = n3 θ² + n4 θ + n5,  C = n6 θ² + n7 θ + n8
 *   p_s = 1 MPa · [ 2C / (−B + √(B² − 4AC)) ]⁴
 *
 * @param temperature_K  temperature T [K]; valid 273.15 K ≤ T ≤ 647.096 K (IF97 states the
 *                       equation from 273.15 K; the triple point is 273.16 K).
 * @returns saturation pressure [Pa]
 * Source: IAPWS, Revised Release on the IAPWS Industrial Formulation 1997 for the Thermodynamic
 * Properties of Water and Steam (IAPWS-IF97), section 8.1. Check values: 300 K → 3536.59 Pa,
 * 500 K → 2.638898 MPa.
 * Throws PhysicsInputError outside the valid range.
 */
export function saturationPressureIF97(temperature_K: number): number {
  if (!Number.isFinite(temperature_K) || temperature_K < 273.15 || temperature_K > WATER_CRITICAL_K) {
    throw new PhysicsInputError(
      `Water temperature ${fmt(temperature_K - 273.15)} °C is outside the vapour-pressure range 0…373.946 °C; enter a liquid temperature inside it.`,
    );
  }
  const t = temperature_K;
  const theta = t + n9 / (t - n10);
  const a = theta * theta + n1 * theta + n2;
  const b = n3 * theta * theta + n4 * theta + n5;
  const c = n6 * theta * theta + n7 * theta + n8;
  const ratio = (2 * c) / (-b + Math.sqrt(b * b - 4 * a * c));
  return 1e6 * ratio ** 4;
}

/**
 * Saturation temperature of water at a pressure, IAPWS-IF97 region 4, backward equation (eq. 31),
 * the exact algebraic inverse of `saturationPressureIF97`:
 *
 *   β = (p / 1 MPa)^¼
 *   E = β² + n3 β + n6,  F = n1 β² + n4 β + n7,  G = n2 β² + n5 β + n8
 *   D = 2G / (−F − √(F² − 4EG))
 *   T_s = 1 K · [ n10 + D − √((n10 + D)² − 4(n9 + n10 D)) ] / 2
 *
 * @param pressure_Pa  pressure p [Pa]; valid 611.213 Pa ≤ p ≤ 22.064 MPa.
 * @returns saturation temperature [K]
 * Source: IAPWS-IF97, section 8.2.
 * Throws PhysicsInputError outside the valid range.
 */
export function saturationTemperatureIF97(pressure_Pa: number): number {
  if (!Number.isFinite(pressure_Pa) || pressure_Pa < WATER_TRIPLE_POINT_PA * (1 - 1e-6) || pressure_Pa > WATER_CRITICAL_PA) {
    throw new PhysicsInputError(
      `Pressure ${fmt(pressure_Pa)} Pa is outside the saturation range 611.213 Pa…22.064 MPa; enter an absolute pressure inside it.`,
    );
  }
  const beta = (pressure_Pa / 1e6) ** 0.25;
  const e = beta * beta + n3 * beta + n6;
  const f = n1 * beta * beta + n4 * beta + n7;
  const g = n2 * beta * beta + n5 * beta + n8;
  const d = (2 * g) / (-f - Math.sqrt(f * f - 4 * e * g));
  return (n10 + d - Math.sqrt((n10 + d) ** 2 - 4 * (n9 + n10 * d))) / 2;
}

/**
 * Density of air-free liquid water at one standard atmosphere, Kell's equation:
 *
 *   ρ = (999.83952 + 16.945176 t − 7.9870401e-3 t² − 46.170461e-6 t³ + 105.56302e-9 t⁴
 *        − 280.54253e-12 t⁵) / (1 + 16.879850e-3 t)      [kg/m³], t in °C
 *
 * @param temperature_K  temperature [K]; valid 0…150 °C (273.15…423.15 K). Above 100 °C the
 *                       liquid must be under pressure; the pressure effect on density is small
 *                       (about 0.05 % per MPa) and ignored.
 * @returns density [kg/m³]
 * Source: G. S. Kell, J. Chem. Eng. Data 20(1), 1975; as quoted in NIST J. Res. 97(3), 1992.
 * Check values: 4 °C → 999.97, 20 °C → 998.20, 30 °C → 995.65, 60 °C → 983.20 kg/m³.
 * Throws PhysicsInputError outside the valid range.
 */
export function waterDensityKell(temperature_K: number): number {
  const t = temperature_K - 273.15;
  if (!Number.isFinite(t) || t < 0 || t > 150) {
    throw new PhysicsInputError(`Water temperature ${fmt(t)} °C is outside the density range 0…150 °C; enter a liquid temperature inside it.`);
  }
  const num = 999.83952 + 16.945176 * t - 7.9870401e-3 * t ** 2 - 46.170461e-6 * t ** 3 + 105.56302e-9 * t ** 4 - 280.54253e-12 * t ** 5;
  return num / (1 + 16.87985e-3 * t);
}

function fmt(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : String(v);
}
