/**
 * Hydraulic and shaft power.
 *
 *   P_hyd = ρ · g · Q · H          [W]  ρ [kg/m³], g = 9.80665 m/s², Q [m³/s], H [m]
 *   P_shaft = P_hyd / η            [W]  η as a fraction, 0 < η ≤ 1
 *
 * Valid for any single-phase liquid; η must be positive (at zero flow P_hyd is zero and
 * the shaft power is not given by this formula). Source: any pump handbook (common
 * practice); in US units it is the familiar water horsepower Q[gpm]·H[ft]·SG/3960.
 */
import { STANDARD_GRAVITY } from '../../units/index.ts';

export function hydraulicPowerW(density_kg_m3: number, flow_m3s: number, head_m: number): number {
  return density_kg_m3 * STANDARD_GRAVITY * flow_m3s * head_m;
}

/** Shaft power [W] from flow, head and efficiency; NaN when η ≤ 0. */
export function shaftPowerW(density_kg_m3: number, flow_m3s: number, head_m: number, efficiency: number): number {
  if (!(efficiency > 0)) return NaN;
  return hydraulicPowerW(density_kg_m3, flow_m3s, head_m) / efficiency;
}
