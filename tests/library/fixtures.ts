/**
 * Invented pump families for the library and server tests. Nothing here describes a real pump:
 * names, makers and numbers are made up, and every set says so in its notes.
 *
 * Each family obeys the trim affinity law exactly, so that the right answer of a duty search is
 * known in closed form. For a member trimmed to r = D / D_full:
 *   H_r(Q) = r²·H0 − a·Q²                         (a = (H0 − H_bep)/Q_bep²)
 *   η_r(Q) = E·x·(2 − x),  x = Q / (r·Q_bep)        (peak E at the member's BEP r·Q_bep)
 *   NPSH3_r(Q) = r²·n0 + n2·Q²
 *   P_r(Q) = ρ·g·Q·H_r(Q) / η_r(Q)                  (fitted by a cubic; consistent within its rms)
 * so the curve of any trim r meets (Q, H) when r² = (H + a·Q²) / H0.
 */
import { CURVESET_VERSION, type CurveSet, type Member, type PolynomialFit } from '../../src/model/curveset.ts';
import { fitPolynomial } from '../../src/fit/polyfit.ts';
import { STANDARD_GRAVITY } from '../../src/units/constants.ts';

export interface InventedFamily {
  name: string;
  maker?: string;
  model?: string;
  speedRpm?: number;
  /** Full (largest) impeller diameter, m. */
  fullDiameterM: number;
  /** Member diameters as fractions of the full one (1 must be among them). */
  ratios?: number[];
  /** Shutoff head of the full impeller, m. */
  shutoffHeadM: number;
  /** BEP flow of the full impeller, m³/s. */
  bepFlowM3s: number;
  /** BEP head as a fraction of shutoff head. */
  bepHeadRatio?: number;
  /** Peak efficiency, fraction. */
  peakEfficiency: number;
  /** NPSH3 at zero flow and at BEP of the full impeller, m. */
  npsh0M?: number;
  npshBepM?: number;
}

export const WATER_DENSITY = 998.2;
const SG_REFERENCE = 999.014;

export interface FamilyLaw {
  a: number;
  h0: number;
  qBep: number;
  e: number;
  n0: number;
  n2: number;
  dFull: number;
}

export function lawOf(f: InventedFamily): FamilyLaw {
  const hb = (f.bepHeadRatio ?? 0.8) * f.shutoffHeadM;
  const n0 = f.npsh0M ?? 1.5;
  const nb = f.npshBepM ?? 3;
  return {
    a: (f.shutoffHeadM - hb) / f.bepFlowM3s ** 2,
    h0: f.shutoffHeadM,
    qBep: f.bepFlowM3s,
    e: f.peakEfficiency,
    n0,
    n2: (nb - n0) / f.bepFlowM3s ** 2,
    dFull: f.fullDiameterM,
  };
}

/** The exact diameter whose curve passes through (Q, H), m; from the family law. */
export function exactTrimDiameter(f: InventedFamily, flowM3s: number, headM: number): number {
  const law = lawOf(f);
  return law.dFull * Math.sqrt((headM + law.a * flowM3s ** 2) / law.h0);
}

/** Efficiency of the exact trim at the duty (fraction). */
export function exactEfficiencyAt(f: InventedFamily, flowM3s: number, headM: number): number {
  const law = lawOf(f);
  const r = exactTrimDiameter(f, flowM3s, headM) / law.dFull;
  const x = flowM3s / (r * law.qBep);
  return law.e * x * (2 - x);
}

function fit(coefficients: number[], scale: number, domain: [number, number], throughOrigin: boolean, reason: string): PolynomialFit {
  return {
    kind: 'polynomial',
    flow_scale: scale,
    coefficients,
    domain,
    degree: coefficients.length - 1,
    through_origin: throughOrigin,
    rms: 0,
    max_residual: 0,
    condition: 1,
    reason,
  };
}

function samples(lo: number, hi: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => lo + ((hi - lo) * i) / (n - 1));
}

function memberOf(f: InventedFamily, ratio: number): Member {
  const law = lawOf(f);
  const r = ratio;
  const qb = r * law.qBep;
  const qEnd = 1.3 * qb;
  const s = qEnd;
  const domain: [number, number] = [0, qEnd];
  const head = (q: number) => r * r * law.h0 - law.a * q * q;
  const c1 = (2 * law.e) / qb;
  const c2 = -law.e / (qb * qb);
  const eff = (q: number) => c1 * q + c2 * q * q;
  const npsh = (q: number) => r * r * law.n0 + law.n2 * q * q;
  // Q/η → 1/c1 as Q → 0, so shutoff power is finite.
  const power = (q: number) => (WATER_DENSITY * STANDARD_GRAVITY * head(q)) / (c1 + c2 * q);
  const qs = samples(0, qEnd, 9);
  const pq = samples(0, qEnd, 25);
  const pFit = fitPolynomial(pq, pq.map(power), 3);
  const powerFit: PolynomialFit = {
    kind: 'polynomial',
    flow_scale: pFit.flow_scale,
    coefficients: pFit.coefficients,
    domain: pFit.domain,
    degree: pFit.degree,
    through_origin: pFit.through_origin,
    rms: pFit.rms,
    max_residual: pFit.max_residual,
    condition: pFit.condition,
    reason: 'invented test data: cubic through the exact power',
  };
  const diameter = law.dFull * r;
  return {
    diameter_m: diameter,
    speed_rpm: f.speedRpm ?? 1450,
    label: `${(diameter * 1000).toFixed(0)} mm`,
    curves: {
      head: { points: qs.map((q) => [q, head(q)]), fit: fit([r * r * law.h0, 0, -law.a * s * s], s, domain, false, 'invented: exact quadratic') },
      efficiency: { points: qs.map((q) => [q, eff(q)]), fit: fit([0, c1 * s, c2 * s * s], s, domain, true, 'invented: exact quadratic') },
      power: { points: qs.map((q) => [q, power(q)]), fit: powerFit },
      npshr: { points: qs.map((q) => [q, npsh(q)]), fit: fit([r * r * law.n0, 0, law.n2 * s * s], s, domain, false, 'invented: exact quadratic') },
    },
    derived: {
      shutoff_head_m: head(0),
      bep: { flow_m3s: qb, head_m: head(qb), efficiency: law.e },
      end_of_curve_m3s: qEnd,
      por: { min_m3s: 0.7 * qb, max_m3s: 1.2 * qb, basis: 'ANSI/HI 9.6.3: 70–120 % of BEP flow' },
      aor: { min_m3s: 0.4 * qb, max_m3s: qEnd, basis: 'invented test data' },
    },
  };
}

/** A complete, schema-valid curve set for an invented family. */
export function inventedCurveSet(f: InventedFamily): CurveSet {
  const ratios = [...(f.ratios ?? [1, 0.92, 0.84])].sort((x, y) => y - x);
  return {
    format: 'pumpscribe.curveset',
    version: CURVESET_VERSION,
    pump: {
      name: f.name,
      maker: f.maker ?? 'Invented Test Works',
      model: f.model ?? f.name,
      size: '100-250 (invented)',
      type: 'end suction (invented)',
      stages: 1,
      suction: 'single',
    },
    speed_rpm: f.speedRpm ?? 1450,
    family: 'diameter',
    fluid: { name: 'water at 20 °C', density_kg_m3: WATER_DENSITY, specific_gravity: WATER_DENSITY / SG_REFERENCE, temperature_K: 293.15 },
    provenance: {
      tool: { name: 'pumpscribe', version: '0.1.0' },
      created: '2025-01-01T00:00:00.000Z',
      notes: ['Invented test family; not a real pump.'],
    },
    display_units: { flow: 'm3/h', head: 'm', npsh: 'm', power: 'kW', diameter: 'mm' },
    members: ratios.map((r) => memberOf(f, r)),
    findings: [],
  };
}

/** Three invented families of different sizes; only `mid` reaches 120 m³/h at 40 m. */
export const FAMILIES = {
  small: { name: 'Invented Small 50-160', fullDiameterM: 0.17, shutoffHeadM: 32, bepFlowM3s: 30 / 3600, peakEfficiency: 0.68 },
  mid: { name: 'Invented Mid 80-250', fullDiameterM: 0.26, shutoffHeadM: 58, bepFlowM3s: 140 / 3600, peakEfficiency: 0.79 },
  large: { name: 'Invented Large 150-400', fullDiameterM: 0.41, shutoffHeadM: 95, bepFlowM3s: 520 / 3600, peakEfficiency: 0.84 },
} satisfies Record<string, InventedFamily>;
