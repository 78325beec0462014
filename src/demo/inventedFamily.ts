/**
 * INVENTED demo pump families with exactly known curves — not any real product.
 * Used for samples, tests and benchmarks: sample them with reading noise, build a curve
 * set, and compare the result with the exact curves.
 *
 * Each family is defined at its largest diameter D0 in SI and obeys the affinity laws
 * exactly for the other diameters (Q ∝ D, H ∝ D², η constant along Q/D, P = ρgQH/η,
 * NPSHr ∝ D² along Q/D), so a correct reading must pass every consistency check.
 */
import { FOOT, INCH, US_GALLON, STANDARD_GRAVITY } from '../units/index.ts';

const GPM = US_GALLON / 60;

export interface InventedFamily {
  name: string;
  speed_rpm: number;
  density_kg_m3: number;
  /** Diameters, largest first [m]. */
  diameters_m: number[];
  /** Largest flow of the largest diameter [m³/s]; smaller diameters end at Q·D/D0. */
  endFlow_m3s: number;
  head(q: number, d: number): number;
  efficiency(q: number, d: number): number;
  power(q: number, d: number): number;
  npshr(q: number, d: number): number;
  /** Nominal axis spans used for "% of span" accuracy figures. */
  spans: { flow: number; head: number; power: number; npshr: number };
}

interface Shape {
  name: string;
  speed_rpm: number;
  density_kg_m3: number;
  diameters_m: number[];
  /** Shutoff head at D0 [m], head coefficients at D0: H = h0 + h1 q + h2 q² (q in m³/s). */
  h0: number;
  h1: number;
  h2: number;
  /** BEP flow and peak efficiency at D0. */
  qBep: number;
  etaMax: number;
  /** NPSHr at D0: n0 + n2 (q/qBep)² [m]. */
  n0: number;
  n2: number;
  endFlow_m3s: number;
}

function family(s: Shape): InventedFamily {
  const d0 = s.diameters_m[0] as number;
  // Bring a point (q, d) back to D0 along its affinity parabola: q0 = q·D0/d.
  const head = (q: number, d: number) => {
    const r = d / d0;
    const q0 = q / r;
    return r * r * (s.h0 + s.h1 * q0 + s.h2 * q0 * q0);
  };
  const efficiency = (q: number, d: number) => {
    const x = q / (d / d0) / s.qBep;
    return s.etaMax * x * (2 - x);
  };
  const power = (q: number, d: number) => {
    const r = d / d0;
    const q0 = q / r;
    const x = q0 / s.qBep;
    // ρgQH/η with η = η_max·x·(2 − x): the x cancels, so power is finite at zero flow.
    const h0 = s.h0 + s.h1 * q0 + s.h2 * q0 * q0;
    return r ** 3 * ((s.density_kg_m3 * STANDARD_GRAVITY * s.qBep * h0) / (s.etaMax * (2 - x)));
  };
  const npshr = (q: number, d: number) => {
    const r = d / d0;
    const x = q / r / s.qBep;
    return r * r * (s.n0 + s.n2 * x * x);
  };
  const maxPower = Math.max(...Array.from({ length: 41 }, (_, i) => power((s.endFlow_m3s * i) / 40, d0)));
  return {
    name: s.name,
    speed_rpm: s.speed_rpm,
    density_kg_m3: s.density_kg_m3,
    diameters_m: s.diameters_m,
    endFlow_m3s: s.endFlow_m3s,
    head,
    efficiency,
    power,
    npshr,
    spans: { flow: s.endFlow_m3s * 1.1, head: s.h0 * 1.15, power: maxPower * 1.2, npshr: npshr(s.endFlow_m3s, d0) * 1.3 },
  };
}

/** Invented 4-diameter end-suction family, US sheet (13, 12, 11, 10 in at 1780 rpm). */
export function inventedUsFamily(): InventedFamily {
  return family({
    name: 'Invented demo pump ES-4 (not a real product)',
    speed_rpm: 1780,
    density_kg_m3: 999.014,
    diameters_m: [13, 12, 11, 10].map((d) => d * INCH),
    h0: 160 * FOOT,
    h1: -0.002 * FOOT / GPM,
    h2: -3.0e-5 * FOOT / (GPM * GPM),
    qBep: 1100 * GPM,
    etaMax: 0.82,
    n0: 6 * FOOT,
    n2: 8 * FOOT,
    endFlow_m3s: 1600 * GPM,
  });
}

/** Invented 3-diameter SI family (260, 240, 220 mm at 2900 rpm). */
export function inventedSiFamily(): InventedFamily {
  return family({
    name: 'Invented demo pump SI-3 (not a real product)',
    speed_rpm: 2900,
    density_kg_m3: 998.2,
    diameters_m: [0.26, 0.24, 0.22],
    h0: 92,
    h1: -20,
    h2: -5200,
    qBep: 0.06,
    etaMax: 0.78,
    n0: 2.2,
    n2: 3.1,
    endFlow_m3s: 0.09,
  });
}
