/**
 * INVENTED pump families with exact analytic curves, in the display units of their sheet —
 * not any real product. The sample sheets are drawn from these, so every drawn line has an
 * exact truth.
 *
 * At the largest diameter Dm (x = Q / q_end):
 *   head        H(Q)  = h0 · (1 − α·x − β·x²)
 *   efficiency  η(Q)  = η_peak · u·(2 − u),   u = Q / q_bep       (through the origin, one maximum)
 *   NPSHr       N(Q)  = n0 + n2 · (Q / q_bep)²
 * At a trimmed diameter D (r = D / Dm), by the affinity laws (Q ∝ D, H ∝ D²), with a small
 * loss of efficiency for the trim (common practice: trimmed impellers lose a little):
 *   H_D(Q) = r² · H(Q / r),   η_D(Q) = (1 − λ·(1 − r)) · η(Q / r)
 * Power is what the head and efficiency imply: P = ρ·g·Q·H/η with ρ = SG × 999.014 kg/m³.
 */
import { fromSI, parseUnit, SG_REFERENCE_DENSITY, STANDARD_GRAVITY, toSI } from '../../src/units/index.ts';

export type UnitSystemName = 'us' | 'si';

export interface SheetUnits {
  flow: string;
  head: string;
  power: string;
  npsh: string;
  diameter: string;
}

export interface Family {
  system: UnitSystemName;
  name: string;
  speed_rpm: number;
  specific_gravity: number;
  units: SheetUnits;
  /** Drawn diameters, largest first, in units.diameter. */
  diameters: number[];
  head: { h0: number; alpha: number; beta: number; q_end: number };
  efficiency: { peak: number; q_bep: number; trim_loss: number };
  npsh: { n0: number; n2: number };
}

export const US_FAMILY: Family = {
  system: 'us',
  name: 'Invented end-suction pump IX-6 (not a real product)',
  speed_rpm: 1780,
  specific_gravity: 1,
  units: { flow: 'gpm', head: 'ft', power: 'hp', npsh: 'ft', diameter: 'in' },
  diameters: [13, 12, 11, 10],
  head: { h0: 200, alpha: 0.05, beta: 0.3, q_end: 1650 },
  efficiency: { peak: 0.84, q_bep: 1150, trim_loss: 0.18 },
  npsh: { n0: 8, n2: 10 },
};

export const SI_FAMILY: Family = {
  system: 'si',
  name: 'Invented end-suction pump IX-150 (not a real product)',
  speed_rpm: 1480,
  specific_gravity: 1,
  units: { flow: 'm3/h', head: 'm', power: 'kW', npsh: 'm', diameter: 'mm' },
  diameters: [330, 310, 290, 270],
  head: { h0: 60, alpha: 0.05, beta: 0.3, q_end: 370 },
  efficiency: { peak: 0.83, q_bep: 260, trim_loss: 0.18 },
  npsh: { n0: 2.5, n2: 3 },
};

export function familyOf(system: UnitSystemName): Family {
  return system === 'us' ? US_FAMILY : SI_FAMILY;
}

const largest = (f: Family) => f.diameters[0] as number;

/** Flow range of the head and power curves at diameter d: [0, q_end·r]. */
export function endFlow(f: Family, d: number): number {
  return f.head.q_end * (d / largest(f));
}

export function head(f: Family, d: number, q: number): number {
  const r = d / largest(f);
  const x = q / r / f.head.q_end;
  return r * r * f.head.h0 * (1 - f.head.alpha * x - f.head.beta * x * x);
}

/** Efficiency factor of the trim, 1 at the largest diameter. */
function trimFactor(f: Family, d: number): number {
  return 1 - f.efficiency.trim_loss * (1 - d / largest(f));
}

/** Efficiency in % at diameter d and flow q. */
export function efficiency(f: Family, d: number, q: number): number {
  const u = q / (d / largest(f)) / f.efficiency.q_bep;
  return 100 * trimFactor(f, d) * f.efficiency.peak * u * (2 - u);
}

/** Peak efficiency in % at diameter d. */
export function peakEfficiency(f: Family, d: number): number {
  return 100 * trimFactor(f, d) * f.efficiency.peak;
}

export function npshr(f: Family, d: number, q: number): number {
  const r = d / largest(f);
  const u = q / r / f.efficiency.q_bep;
  return r * r * (f.npsh.n0 + f.npsh.n2 * u * u);
}

/**
 * Shaft power in units.power: P = ρ·g·Q·H/η (any pump handbook). Q/η is written out so that
 * the value at zero flow is the finite limit rather than 0/0.
 */
export function power(f: Family, d: number, q: number): number {
  const r = d / largest(f);
  const qb = f.efficiency.q_bep;
  const u = q / r / qb;
  // Q/η = r·q_bep / (η_peak·trim·(2 − u)), in display flow units per unit efficiency.
  const qOverEta = (r * qb) / (trimFactor(f, d) * f.efficiency.peak * (2 - u));
  const rho = f.specific_gravity * SG_REFERENCE_DENSITY;
  const qSI = toSI(qOverEta, parseUnit('flow', f.units.flow));
  const hSI = toSI(head(f, d, q), parseUnit('head', f.units.head));
  return fromSI(rho * STANDARD_GRAVITY * qSI * hSI, parseUnit('power', f.units.power));
}

/** Flows (0, 1 or 2, ascending) at which the efficiency at diameter d equals eta (%). */
export function isoFlows(f: Family, d: number, eta: number): number[] {
  const k = eta / peakEfficiency(f, d);
  if (k > 1) return [];
  const root = Math.sqrt(1 - k);
  const scale = (d / largest(f)) * f.efficiency.q_bep;
  return k === 1 ? [scale] : [(1 - root) * scale, (1 + root) * scale];
}

/** The diameter at which the peak efficiency equals eta, where an iso-efficiency loop closes. */
export function closingDiameter(f: Family, eta: number): number {
  // peak(d) = 100·η_peak·(1 − λ(1 − d/Dm))  ⇒  d = Dm·(1 − (1 − eta/(100 η_peak))/λ)
  return largest(f) * (1 - (1 - eta / (100 * f.efficiency.peak)) / f.efficiency.trim_loss);
}
