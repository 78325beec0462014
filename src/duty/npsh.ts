/**
 * NPSH available at the impeller eye from site data.
 *
 *   NPSHa = (p_surface − p_vapour) / (ρ·g) + z_s − h_loss(Q)
 *
 * p_surface  absolute pressure on the suction liquid surface [Pa] (atmospheric for an open sump);
 * p_vapour   vapour pressure of the liquid at its temperature [Pa];
 * ρ          liquid density [kg/m³]; g = 9.80665 m/s²;
 * z_s        suction static head [m]: height of the liquid surface above the impeller eye
 *            (positive when the liquid is above the eye, negative for a suction lift);
 * h_loss     friction and fitting losses from the surface to the suction flange [m], entrance
 *            loss included, given at one reference flow and scaled with (Q/Q_ref)² at others
 *            (turbulent flow, common practice).
 *
 * Velocity-head convention: NPSH is total head (pressure + velocity) above vapour pressure.
 * Counting from a still liquid surface, the energy balance already holds the velocity head at the
 * suction flange inside the total, so it is neither added nor subtracted; the losses must include
 * the entrance loss. (A value worked from a suction gauge reading instead would add v²/2g at the
 * gauge; that form is not used here.) Source: common practice; Hydraulic Institute definitions.
 */
import { STANDARD_GRAVITY } from '../units/constants.ts';
import { DutyError } from './errors.ts';

export interface SuctionSite {
  /** Absolute pressure on the liquid surface [Pa]. */
  surface_pressure_Pa: number;
  /** Vapour pressure of the liquid at the pumping temperature [Pa]. */
  vapour_pressure_Pa: number;
  /** Liquid density [kg/m³]. */
  density_kg_m3: number;
  /** Liquid surface above the impeller eye [m] (negative when below). */
  suction_static_m: number;
  /** Suction losses at `loss_reference_flow_m3s` [m], ≥ 0. */
  suction_loss_m: number;
  /** Flow at which `suction_loss_m` applies [m³/s]; without it the loss is taken as constant. */
  loss_reference_flow_m3s?: number;
  /** Suction loss [m] at flow q [m³/s] per pump, from the suction pipe runs; replaces the q² scaling when given. */
  loss_at?: (q: number) => number;
  /** Velocity head v²/2g [m] in the suction pipe at the flange at flow q [m³/s], for the reconciliation line. */
  velocity_head_at?: (q: number) => number;
}

export interface NpshAvailable {
  flow_m3s?: number;
  npsha_m: number;
  /** p_surface/(ρg) [m]. */
  surface_head_m: number;
  /** p_vapour/(ρg) [m]. */
  vapour_head_m: number;
  /** (p_surface − p_vapour)/(ρg) [m]. */
  pressure_head_m: number;
  suction_static_m: number;
  suction_loss_m: number;
}

/** Checks a site description and throws DutyError naming the first unusable value. */
export function checkSuctionSite(site: SuctionSite): void {
  if (!(site.surface_pressure_Pa > 0)) throw new DutyError('The suction surface pressure must be an absolute pressure above zero.');
  if (!(site.vapour_pressure_Pa >= 0)) throw new DutyError('The vapour pressure must be zero or more.');
  if (site.vapour_pressure_Pa >= site.surface_pressure_Pa) {
    throw new DutyError('The liquid would boil: its vapour pressure is at or above the suction surface pressure; check the temperature and the site pressure.');
  }
  if (!(site.density_kg_m3 > 0)) throw new DutyError('The liquid density must be a positive number of kg/m³.');
  if (!Number.isFinite(site.suction_static_m)) throw new DutyError('The suction static head must be a finite number of metres.');
  if (!(site.suction_loss_m >= 0)) throw new DutyError('The suction loss must be zero or more metres.');
  if (site.loss_reference_flow_m3s !== undefined && !(site.loss_reference_flow_m3s > 0)) throw new DutyError('The flow for the suction loss must be positive.');
}

/**
 * One line reconciling this convention with the hand method, which works from the suction
 * flange: NPSHa = p_flange/(ρg) + v²/2g − p_v/(ρg). By the energy equation from the still
 * surface, p_flange/(ρg) = p_s/(ρg) + z_s − h_loss − v²/2g, so the v²/2g the hand method adds
 * back is exactly the one the flange pressure lost: both give the same NPSHa.
 * @param a  NPSHa at a flow, with its parts [m]; `velocity_head_m` the flange velocity head v²/2g [m]
 */
export function velocityHeadReconciliation(a: NpshAvailable, velocity_head_m: number, r: (m: number) => string = (m) => `${m.toFixed(3)} m`): string {
  const flangePressure = a.surface_head_m + a.suction_static_m - a.suction_loss_m - velocity_head_m;
  const hand = flangePressure + velocity_head_m - a.vapour_head_m;
  return `Velocity head: NPSHa is counted from the still surface (the v²/2g at the flange is inside it); the hand method from the flange, p/ρg ${r(flangePressure)} + v²/2g ${r(velocity_head_m)} − p_v/ρg ${r(a.vapour_head_m)} = ${r(hand)}, gives the same ${r(a.npsha_m)}.`;
}

/**
 * NPSHa [m] at flow q [m³/s] (see the file comment for the equation and convention).
 * Source: common practice (Hydraulic Institute definition of NPSH).
 */
export function npshAvailable(site: SuctionSite, flow_m3s?: number): NpshAvailable {
  checkSuctionSite(site);
  const rhoG = site.density_kg_m3 * STANDARD_GRAVITY;
  const surface = site.surface_pressure_Pa / rhoG;
  const vapour = site.vapour_pressure_Pa / rhoG;
  const ref = site.loss_reference_flow_m3s;
  const loss =
    site.loss_at && flow_m3s !== undefined
      ? site.loss_at(flow_m3s)
      : ref !== undefined && flow_m3s !== undefined
        ? site.suction_loss_m * (flow_m3s / ref) ** 2
        : site.suction_loss_m;
  const out: NpshAvailable = {
    npsha_m: surface - vapour + site.suction_static_m - loss,
    surface_head_m: surface,
    vapour_head_m: vapour,
    pressure_head_m: surface - vapour,
    suction_static_m: site.suction_static_m,
    suction_loss_m: loss,
  };
  if (flow_m3s !== undefined) out.flow_m3s = flow_m3s;
  return out;
}
