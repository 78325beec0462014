/**
 * Invented pump families for the duty tests. Nothing here describes a real pump: the numbers
 * are chosen so that the answers can be worked out by hand.
 *
 * Full impeller 250 mm at 2900 rpm, water:
 *   H(Q) = 50 − 12000·Q²                            [m, Q in m³/s], captured 0…0.06 m³/s
 *   η(Q) = η_b·(2x − x²), x = Q/Q_b, η_b = 0.78, Q_b = 0.035 m³/s
 *   NPSH3(Q) = 1.5 + 1500·Q²                         [m], captured 0.01…0.06 m³/s
 * Trims obey the affinity law exactly: H_D(Q) = r²·H(Q/r), η_D(Q) = η(Q/r), r = D/D_full,
 * so H_D(Q) = 50·r² − 12000·Q².
 */
import { CURVESET_VERSION, type CurveSet, type Member, type PolynomialFit } from '../../src/model/curveset.ts';
import type { PumpCurve } from '../../src/duty/pumpCurve.ts';
import { STANDARD_GRAVITY } from '../../src/units/constants.ts';

export const H0 = 50;
export const A = 12000;
export const ETA_B = 0.78;
export const Q_B = 0.035;
export const Q_END = 0.06;
export const D_FULL = 0.25;
export const SPEED = 2900;
export const RHO = 998.2;

/** The invented family as plain functions, trimmed to diameter d [m]. */
export function inventedCurveAt(d: number): PumpCurve {
  const r = d / D_FULL;
  const head = (q: number) => H0 * r * r - A * q * q;
  const efficiency = (q: number) => {
    const x = q / (r * Q_B);
    return ETA_B * (2 * x - x * x);
  };
  return {
    label: `invented ${(d * 1000).toFixed(1)} mm`,
    diameter_m: d,
    speed_rpm: SPEED,
    domain: [0, Q_END * r],
    head,
    efficiency,
    power: (q) => (q === 0 ? (RHO * STANDARD_GRAVITY * head(0) * r * Q_B) / (2 * ETA_B) : (RHO * STANDARD_GRAVITY * q * head(q)) / efficiency(q)),
    npshr: (q) => 1.5 * r * r + 1500 * q * q,
    validity: { efficiency: [0, Q_END * r], power: [0, Q_END * r], npshr: [0.01 * r, Q_END * r] },
    por: { min_m3s: 0.7 * Q_B * r, max_m3s: 1.2 * Q_B * r, basis: 'ANSI/HI 9.6.3: 70–120 % of BEP flow' },
    bep_flow_m3s: Q_B * r,
    power_basis: 'head-efficiency',
  };
}

function fit(coefficients: number[], flow_scale: number, domain: [number, number], through_origin = false): PolynomialFit {
  return {
    kind: 'polynomial',
    flow_scale,
    coefficients,
    domain,
    degree: coefficients.length - 1,
    through_origin,
    rms: 0,
    max_residual: 0,
    condition: 1,
    reason: 'invented test curve',
  };
}

/** The invented family as a curve-set member at diameter d [m], with polynomial fits. */
export function inventedMember(d: number, withPowerCurve = false): Member {
  const r = d / D_FULL;
  const s = Q_END; // flow scale
  const qb = Q_B * r;
  const member: Member = {
    diameter_m: d,
    speed_rpm: SPEED,
    label: `${Math.round(d * 1000)} mm`,
    curves: {
      head: { points: [], fit: fit([H0 * r * r, 0, -A * s * s], s, [0, Q_END * r]) },
      efficiency: { points: [], fit: fit([0, (2 * ETA_B * s) / qb, (-ETA_B * s * s) / (qb * qb)], s, [0, Q_END * r], true) },
      npshr: { points: [], fit: fit([1.5 * r * r, 0, 1500 * s * s], s, [0.01 * r, Q_END * r]) },
    },
    derived: {
      shutoff_head_m: H0 * r * r,
      bep: { flow_m3s: qb, head_m: H0 * r * r - A * qb * qb, efficiency: ETA_B },
      end_of_curve_m3s: Q_END * r,
      por: { min_m3s: 0.7 * qb, max_m3s: 1.2 * qb, basis: 'ANSI/HI 9.6.3: 70–120 % of BEP flow' },
    },
  };
  if (withPowerCurve) {
    // An invented captured power curve, P = 10 kW + 200 kW per m³/s of flow, for tests that need
    // a power curve rather than ρ·g·Q·H/η.
    member.curves.power = { points: [], fit: fit([10000, 200000], 1, [0, Q_END * r]) };
  }
  return member;
}

/** An invented curve set with captured diameters 250, 230 and 210 mm. */
export function inventedCurveSet(diameters = [0.25, 0.23, 0.21]): CurveSet {
  return {
    format: 'pumpscribe.curveset',
    version: CURVESET_VERSION,
    pump: { name: 'Invented end-suction pump (test data)', suction: 'single' },
    speed_rpm: SPEED,
    family: 'diameter',
    fluid: { name: 'water', density_kg_m3: RHO, specific_gravity: 0.9992, temperature_K: 293.15 },
    provenance: { tool: { name: 'pumpscribe', version: 'test' }, created: '2026-01-01T00:00:00Z', notes: ['invented'] },
    display_units: { flow: 'm3/h', head: 'm', npsh: 'm', power: 'kW', diameter: 'mm' },
    members: diameters.map((d) => inventedMember(d)),
    findings: [],
  };
}
