/**
 * Viscosity of liquid water by the IAPWS 2008 formulation (industrial use: the critical
 * enhancement μ2 is taken as 1, which IAPWS allows away from the critical point).
 *
 *   μ = μ* · μ0(T̄) · μ1(T̄, ρ̄),   T̄ = T/647.096 K,  ρ̄ = ρ/322 kg/m³,  μ* = 1 µPa·s
 *   μ0 = 100 √T̄ / Σ_{i=0..3} H_i / T̄^i
 *   μ1 = exp[ ρ̄ Σ_{i=0..5} (1/T̄ − 1)^i Σ_{j=0..6} H_ij (ρ̄ − 1)^j ]
 *
 * Source: IAPWS, Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary Water
 * Substance (2008), eqs. (10), (11), (12) and Tables 1–2; M. L. Huber et al., J. Phys. Chem.
 * Ref. Data 38(2), 2009. Check values (the release's Table 4): T = 298.15 K, ρ = 998 kg/m³ →
 * 889.735100 µPa·s; T = 373.15 K, ρ = 1000 kg/m³ → 307.883622 µPa·s.
 */
import { PhysicsInputError } from './errors.ts';
import { waterDensityKell } from './water.ts';

const T_STAR = 647.096;
const RHO_STAR = 322;
const H0 = [1.67752, 2.20462, 0.6366564, -0.241605] as const;
/** H_ij, row i = 0…5, column j = 0…6 (IAPWS 2008, Table 2). */
const H1: ReadonlyArray<readonly number[]> = [
  [5.20094e-1, 2.22531e-1, -2.81378e-1, 1.61913e-1, -3.25372e-2, 0, 0],
  [8.50895e-2, 9.99115e-1, -9.06851e-1, 2.57399e-1, 0, 0, 0],
  [-1.08374, 1.88797, -7.72479e-1, 0, 0, 0, 0],
  [-2.89555e-1, 1.26613, -4.89837e-1, 0, 6.98452e-2, 0, -4.35673e-3],
  [0, 0, -2.5704e-1, 0, 0, 8.72102e-3, 0],
  [0, 1.20573e-1, 0, 0, 0, 0, -5.93264e-4],
];

/**
 * Dynamic viscosity of water [Pa·s] at temperature T [K] and density ρ [kg/m³] (IAPWS 2008, μ2 = 1).
 * Valid for the liquid from 273.15 K (the formulation covers the stable fluid to 1173.15 K; the
 * pump duties here stay in the liquid, 0…150 °C). Throws PhysicsInputError outside 273.15…423.15 K.
 */
export function waterViscosityIAPWS2008(temperature_K: number, density_kg_m3: number): number {
  if (!Number.isFinite(temperature_K) || temperature_K < 273.15 || temperature_K > 423.15) {
    throw new PhysicsInputError(`Water temperature ${Number((temperature_K - 273.15).toPrecision(6))} °C is outside the viscosity range 0…150 °C used here; give the liquid's viscosity instead.`);
  }
  if (!(density_kg_m3 > 0)) throw new PhysicsInputError('The water density for the viscosity must be a positive number of kg/m³.');
  const t = temperature_K / T_STAR;
  const d = density_kg_m3 / RHO_STAR;
  const mu0 = (100 * Math.sqrt(t)) / H0.reduce((s, h, i) => s + h / t ** i, 0);
  let sum = 0;
  for (let i = 0; i < 6; i++) {
    let inner = 0;
    const row = H1[i] as readonly number[];
    for (let j = 0; j < 7; j++) inner += (row[j] as number) * (d - 1) ** j;
    sum += (1 / t - 1) ** i * inner;
  }
  return 1e-6 * mu0 * Math.exp(d * sum);
}

/**
 * Kinematic viscosity of liquid water at about one atmosphere [m²/s]: ν = μ(T, ρ_Kell(T)) / ρ_Kell(T),
 * with the density from Kell (1975) (see water.ts). Valid 0…150 °C.
 * Check (IAPWS 2008 with Kell density, from memory of handbook tables): 20 °C → 1.0034e-6 m²/s.
 */
export function waterKinematicViscosity(temperature_K: number): number {
  const rho = waterDensityKell(temperature_K);
  return waterViscosityIAPWS2008(temperature_K, rho) / rho;
}
