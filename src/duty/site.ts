/**
 * Turns site data (elevation or pressure, liquid temperature, suction layout) into the inputs of
 * the NPSHa equation. Water properties come from IAPWS-IF97 (vapour pressure) and Kell (density)
 * unless the liquid's own values are given.
 */
import { standardAtmospherePressure } from '../physics/atmosphere.ts';
import { saturationPressureIF97, waterDensityKell } from '../physics/water.ts';
import { STANDARD_ATMOSPHERE } from '../units/constants.ts';
import { DutyError } from './errors.ts';
import type { SuctionSite } from './npsh.ts';

export interface SiteInput {
  /** Site elevation above sea level [m]; the pressure then comes from the 1976 standard atmosphere. */
  elevation_m?: number;
  /** Absolute pressure on the liquid surface [Pa], entered directly (closed or pressurised vessel, or a measured barometer). */
  site_pressure_Pa?: number;
  /** Liquid temperature [K]. */
  temperature_K: number;
  /** Vapour pressure of a liquid other than water [Pa]; water by IF97 when absent. */
  vapour_pressure_Pa?: number;
  /** Density of a liquid other than water [kg/m³]; water by Kell when absent. */
  density_kg_m3?: number;
  suction_static_m: number;
  suction_loss_m: number;
  loss_reference_flow_m3s?: number;
}

export interface ResolvedSite extends SuctionSite {
  temperature_K: number;
  /** Where the surface pressure comes from, in words. */
  pressure_basis: string;
  /** Where vapour pressure and density come from, in words. */
  liquid_basis: string;
}

/** Throws DutyError (or PhysicsInputError from the property functions) for unusable site data. */
export function resolveSite(input: SiteInput): ResolvedSite {
  if (input.elevation_m !== undefined && input.site_pressure_Pa !== undefined) {
    throw new DutyError('Give either the site elevation or the site pressure, not both.');
  }
  let surface: number;
  let pressureBasis: string;
  if (input.site_pressure_Pa !== undefined) {
    surface = input.site_pressure_Pa;
    pressureBasis = 'entered absolute pressure on the liquid surface';
  } else if (input.elevation_m !== undefined) {
    surface = standardAtmospherePressure(input.elevation_m);
    pressureBasis = `US Standard Atmosphere 1976 at ${input.elevation_m} m elevation (average weather; a low barometer gives some 3 % less)`;
  } else {
    surface = STANDARD_ATMOSPHERE;
    pressureBasis = 'standard atmosphere at sea level (no elevation or pressure given)';
  }
  const vapour = input.vapour_pressure_Pa ?? saturationPressureIF97(input.temperature_K);
  const density = input.density_kg_m3 ?? waterDensityKell(input.temperature_K);
  const parts = [
    input.vapour_pressure_Pa !== undefined ? 'entered vapour pressure' : 'water vapour pressure by IAPWS-IF97',
    input.density_kg_m3 !== undefined ? 'entered density' : 'water density by Kell (1975)',
  ];
  const site: ResolvedSite = {
    surface_pressure_Pa: surface,
    vapour_pressure_Pa: vapour,
    density_kg_m3: density,
    suction_static_m: input.suction_static_m,
    suction_loss_m: input.suction_loss_m,
    temperature_K: input.temperature_K,
    pressure_basis: pressureBasis,
    liquid_basis: parts.join(', '),
  };
  if (input.loss_reference_flow_m3s !== undefined) site.loss_reference_flow_m3s = input.loss_reference_flow_m3s;
  return site;
}
