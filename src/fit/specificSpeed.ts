/**
 * Specific speed and suction specific speed, taken at the BEP of the full (largest)
 * diameter, per stage.
 *
 *   Ns (US)  = n · √Q[gpm] / H[ft]^0.75
 *   nq (SI)  = n · √Q[m³/s] / H[m]^0.75           Ns(US) = 51.65 · nq
 *   Nss (US) = n · √(Q[gpm]/eyes) / NPSH3[ft]^0.75   (eyes = 2 for a double-suction impeller)
 *   nss (SI) = n · √(Q[m³/s]/eyes) / NPSH3[m]^0.75
 *
 * n in rpm. Valid for any positive flow and head; returns NaN otherwise. Nss above about
 * 11 000 (US) is a traditional warning sign of suction recirculation at part load.
 * Source: Hydraulic Institute (ANSI/HI 9.6.1 and 1.1–1.2) definitions; the 51.65 factor
 * follows from the unit definitions (NIST SP 811).
 */
import { FOOT, US_GALLON } from '../units/index.ts';

const GPM = US_GALLON / 60;

export function specificSpeedSI(speed_rpm: number, flow_m3s: number, head_m: number): number {
  if (!(flow_m3s > 0) || !(head_m > 0)) return NaN;
  return (speed_rpm * Math.sqrt(flow_m3s)) / head_m ** 0.75;
}

export function specificSpeedUS(speed_rpm: number, flow_m3s: number, head_m: number): number {
  if (!(flow_m3s > 0) || !(head_m > 0)) return NaN;
  return (speed_rpm * Math.sqrt(flow_m3s / GPM)) / (head_m / FOOT) ** 0.75;
}

export function suctionSpecificSpeedSI(speed_rpm: number, flow_m3s: number, npsh3_m: number, eyes: 1 | 2 = 1): number {
  return specificSpeedSI(speed_rpm, flow_m3s / eyes, npsh3_m);
}

export function suctionSpecificSpeedUS(speed_rpm: number, flow_m3s: number, npsh3_m: number, eyes: 1 | 2 = 1): number {
  return specificSpeedUS(speed_rpm, flow_m3s / eyes, npsh3_m);
}

/** Nss (US) above which suction recirculation is a traditional concern. */
export const NSS_US_CAUTION = 11000;
