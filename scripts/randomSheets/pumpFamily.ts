/**
 * An INVENTED pump family for the random sheet bed, with exact values at any flow and
 * diameter. Nothing here describes a real product.
 *
 * With s = d / d_max and x = Q / (s · Q_best) (affinity: flow scales with s, head with s²):
 *   head        H(d, Q) = s² · H0 · (1 + a·x − b·x²)
 *   efficiency  η(d, Q) = η_best(s) · x · (2 − x) · (1 + c·x·(x − 1)),  η_best(s) = η_top · (1 − 0.4 (1 − s))
 *   power       P(d, Q) = ρ g Q H / η, written with Q/η = s·Q_best / (η_best · (2 − x)(1 + c·x·(x−1))) so that P(0) is finite
 *   NPSHr       N(d, Q) = N0 · (0.92 + 0.08 s) · (1 + k·x²)
 * Each diameter's curve is drawn from Q = 0 (NPSHr from 0.2 of its end) to Q_end = s · x_end · Q_best.
 */
import type { Dice } from './dice.ts';

export type UnitSystem = 'si' | 'us';
export type Quantity = 'head' | 'efficiency' | 'power' | 'npshr';

/** Exact conversion factors to SI (NIST SP 811, appendix B): US gallon 3.785411784 L, foot 0.3048 m, hp 745.69987158227 W, inch 0.0254 m. */
const TO_SI = {
  si: { flow: 1 / 3600, head: 1, power: 1000, diameter: 0.001 },
  us: { flow: 3.785411784e-3 / 60, head: 0.3048, power: 745.69987158227, diameter: 0.0254 },
} as const;

export const UNIT_NAMES = {
  si: { flow: 'm3/h', head: 'm', power: 'kW', npsh: 'm', diameter: 'mm' },
  us: { flow: 'gpm', head: 'ft', power: 'hp', npsh: 'ft', diameter: 'in' },
} as const;

/** Standard gravity (CGPM 1901) and the density of water used for the family's power, kg/m³. */
const G = 9.80665;
const RHO = 998.2;

export interface PumpFamily {
  units: UnitSystem;
  speed: number;
  /** Diameters in the family's diameter unit, largest first. */
  diameters: number[];
  dMax: number;
  h0: number;
  a: number;
  b: number;
  qBest: number;
  xEnd: number;
  etaTop: number;
  c: number;
  n0: number;
  k: number;
}

export function inventFamily(dice: Dice): PumpFamily {
  const units: UnitSystem = dice.chance(0.5) ? 'si' : 'us';
  const count = dice.whole(2, 5);
  const dMax = units === 'si' ? 10 * dice.whole(18, 45) : dice.whole(8, 16) + dice.pick([0, 0.5]);
  const smallest = dMax * dice.between(0.72, 0.82);
  const diameters: number[] = [];
  for (let i = 0; i < count; i++) {
    const d = dMax - ((dMax - smallest) * i) / Math.max(1, count - 1);
    diameters.push(units === 'si' ? Math.round(d) : Math.round(d * 8) / 8);
  }
  const xEnd = dice.between(1.2, 1.45);
  const a = dice.between(0, 0.15);
  const endRatio = dice.between(0.5, 0.72);
  const b = (1 + a * xEnd - endRatio) / (xEnd * xEnd);
  const h0 = units === 'si' ? dice.between(15, 110) : dice.between(50, 360);
  const qBest = units === 'si' ? dice.between(40, 600) : dice.between(180, 2600);
  return {
    units,
    speed: dice.pick([1450, 1480, 1750, 2900, 2950, 3500]),
    diameters: [...new Set(diameters)].sort((p, q) => q - p),
    dMax,
    h0,
    a,
    b,
    qBest,
    xEnd,
    etaTop: dice.between(0.62, 0.86),
    c: dice.between(-0.15, 0.15),
    n0: (units === 'si' ? 1 : 3.28) * dice.between(1.2, 4),
    k: dice.between(0.8, 2.5),
  };
}

const ratio = (f: PumpFamily, d: number) => d / f.dMax;

export function endFlow(f: PumpFamily, d: number): number {
  return ratio(f, d) * f.xEnd * f.qBest;
}

/** The drawn flow range of a curve, in the family's flow unit. */
export function drawnRange(f: PumpFamily, quantity: Quantity, d: number): [number, number] {
  const end = endFlow(f, d);
  return quantity === 'npshr' ? [0.2 * end, end] : [0, end];
}

function shape(f: PumpFamily, x: number): number {
  return x * (2 - x) * (1 + f.c * x * (x - 1));
}

export function etaBest(f: PumpFamily, d: number): number {
  return f.etaTop * (1 - 0.4 * (1 - ratio(f, d)));
}

/** Exact value: head and NPSHr in the head unit, power in the power unit, efficiency in %. */
export function exact(f: PumpFamily, quantity: Quantity, d: number, q: number): number {
  const s = ratio(f, d);
  const x = q / (s * f.qBest);
  const head = s * s * f.h0 * (1 + f.a * x - f.b * x * x);
  switch (quantity) {
    case 'head':
      return head;
    case 'efficiency':
      return 100 * etaBest(f, d) * shape(f, x);
    case 'npshr':
      return f.n0 * (0.92 + 0.08 * s) * (1 + f.k * x * x);
    case 'power': {
      const u = TO_SI[f.units];
      const qOverEta = (s * f.qBest) / (etaBest(f, d) * (2 - x) * (1 + f.c * x * (x - 1)));
      return (RHO * G * qOverEta * u.flow * head * u.head) / u.power;
    }
  }
}

/** Flows on a diameter's head curve where efficiency equals `level` (%), within the drawn range. */
export function isoFlows(f: PumpFamily, d: number, level: number): number[] {
  const s = ratio(f, d);
  const target = level / 100 / etaBest(f, d);
  const out: number[] = [];
  const n = 400;
  let prev = shape(f, 0) - target;
  for (let i = 1; i <= n; i++) {
    const x = (f.xEnd * i) / n;
    const now = shape(f, x) - target;
    if (prev < 0 !== now < 0) {
      // Bisection to machine precision.
      let lo = (f.xEnd * (i - 1)) / n;
      let hi = x;
      for (let k = 0; k < 60; k++) {
        const mid = (lo + hi) / 2;
        if (shape(f, mid) - target < 0 === prev < 0) lo = mid;
        else hi = mid;
      }
      out.push(((lo + hi) / 2) * s * f.qBest);
    }
    prev = now;
  }
  return out;
}

/** The smallest diameter's best efficiency (%): every head curve reaches levels below it. */
export function lowestPeak(f: PumpFamily): number {
  let peak = 0;
  for (let i = 0; i <= 400; i++) peak = Math.max(peak, shape(f, (f.xEnd * i) / 400));
  return 100 * etaBest(f, Math.min(...f.diameters)) * peak;
}

export function siFactor(f: PumpFamily): (typeof TO_SI)[UnitSystem] {
  return TO_SI[f.units];
}
