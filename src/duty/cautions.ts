/**
 * Safety wording that goes beside duty-check results. Pump selection can hurt people —
 * cavitation, motor overload, fire and potable-water duties — so every figure is preliminary.
 */

export const SERVICES = ['general', 'fire', 'potable', 'hazardous'] as const;
export type Service = (typeof SERVICES)[number];

export const PRELIMINARY =
  'Preliminary results from digitised curves: verify against the manufacturer’s certified data and local codes with a licensed professional before selecting equipment.';

export const NPSH_CAUTION =
  'NPSH3 is the point where head has already dropped 3 %: the pump cavitates there. Keep the margin the guidance asks for across the whole operating range, allow for low barometer, warmer liquid and fouled strainers, and confirm NPSH3 with the manufacturer’s certified test data.';

export const MOTOR_CAUTION =
  'Motor size is preliminary: check the power at the largest flow the system can reach (one pump alone, open valves, low static head), the liquid’s density and viscosity, the drive and the starting method, and the manufacturer’s certified power curve.';

export const EXTRAPOLATION_CAUTION =
  'Some figures were read outside the flow range where the curve was captured (extrapolated); treat them as rough and ask the manufacturer for data there.';

/** Code-governed duties: the governing code and the certified data decide, not this check. */
export function serviceCaution(service: Service): string | undefined {
  switch (service) {
    case 'fire':
      return 'Fire-protection duty: follow the governing fire code and listing requirements (e.g. rated and overload points, shutoff limits) and the manufacturer’s certified curves; this check does not replace them.';
    case 'potable':
      return 'Potable-water duty: follow the governing drinking-water code and material approvals, and the manufacturer’s certified data; this check does not replace them.';
    case 'hazardous':
      return 'Hazardous-liquid duty: follow the governing codes and standards for the liquid (sealing, materials, area classification) and the manufacturer’s certified data; this check does not replace them.';
    case 'general':
      return undefined;
  }
}
