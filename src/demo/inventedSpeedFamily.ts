/**
 * INVENTED demo speed family — one impeller drawn at several speeds, not any real product.
 * Used by tests: sample it with reading noise, build a curve set, and compare the result with
 * the exact curves.
 *
 * The family is defined at its fastest speed n0 in SI and obeys the speed affinity law exactly
 * at the other speeds (Q ∝ n, H ∝ n², η constant along Q/n, P ∝ n³, NPSH3 ∝ n² along Q/n), so a
 * correct reading must pass every consistency check.
 */
import type { Quantity } from '../model/curveset.ts';
import { STANDARD_GRAVITY } from '../units/index.ts';
import { seededRandom } from './random.ts';

export interface InventedSpeedFamily {
  name: string;
  /** Drawn speeds, fastest first [rpm]. */
  speeds_rpm: number[];
  /** Impeller diameter of every curve [m]. */
  diameter_m: number;
  density_kg_m3: number;
  /** Largest flow at the fastest speed [m³/s]; slower curves end at Q·n/n0. */
  endFlow_m3s: number;
  /** Minimum continuous flow at the fastest speed [m³/s] (invented; scales with n). */
  minFlow_m3s: number;
  head(q: number, n: number): number;
  efficiency(q: number, n: number): number;
  power(q: number, n: number): number;
  npshr(q: number, n: number): number;
}

/** Invented circulator-type family VS-4 at 1450, 1300, 1150 and 1000 rpm, one 200 mm impeller (not a real product). */
export function inventedSpeedFamily(): InventedSpeedFamily {
  const n0 = 1450;
  const h0 = 24; // shutoff head at n0 [m]
  const h1 = -8; // [m/(m³/s)]
  const h2 = -9000; // [m/(m³/s)²]
  const qBep = 0.03; // [m³/s]
  const etaMax = 0.76;
  const density = 998.2;
  const head = (q: number, n: number) => {
    const r = n / n0;
    const q0 = q / r;
    return r * r * (h0 + h1 * q0 + h2 * q0 * q0);
  };
  const efficiency = (q: number, n: number) => {
    const x = q / (n / n0) / qBep;
    return etaMax * x * (2 - x);
  };
  const power = (q: number, n: number) => {
    const r = n / n0;
    const q0 = q / r;
    const x = q0 / qBep;
    const h = h0 + h1 * q0 + h2 * q0 * q0;
    // ρgQH/η with η = η_max·x·(2 − x): the x cancels, so power is finite at zero flow.
    return r ** 3 * ((density * STANDARD_GRAVITY * qBep * h) / (etaMax * (2 - x)));
  };
  const npshr = (q: number, n: number) => {
    const r = n / n0;
    const x = q / r / qBep;
    return r * r * (1.2 + 2.0 * x * x);
  };
  return {
    name: 'Invented demo pump VS-4 (not a real product)',
    speeds_rpm: [1450, 1300, 1150, 1000],
    diameter_m: 0.2,
    density_kg_m3: density,
    endFlow_m3s: 0.045,
    minFlow_m3s: 0.006,
    head,
    efficiency,
    power,
    npshr,
  };
}

export interface SpeedSampleOptions {
  seed?: number;
  /** Reading noise as a fraction of each quantity's largest value (uniform, ±). Default 0.002. */
  noise?: number;
  pointsPerCurve?: number;
  /** Speed labels to write instead of the true ones, keyed by index (for mislabel tests). */
  relabel?: Record<number, number>;
}

/**
 * The family read as a long SI points table (`quantity,speed,flow,value`: flow m3/h, head and
 * NPSH m, power kW, efficiency %), with a header block naming it invented.
 */
export function speedFamilyPointsText(fam: InventedSpeedFamily, o: SpeedSampleOptions = {}): string {
  const random = seededRandom(o.seed ?? 1);
  const noise = o.noise ?? 0.002;
  const n = o.pointsPerCurve ?? 15;
  const lines = [`# pump: ${fam.name}`, '# note: invented data for tests, not a real product', 'quantity,speed,flow [m3/h],value'];
  const round = (v: number) => Number(v.toPrecision(6));
  fam.speeds_rpm.forEach((speed, index) => {
    const end = fam.endFlow_m3s * (speed / (fam.speeds_rpm[0] as number));
    const label = o.relabel?.[index] ?? speed;
    const add = (quantity: Quantity, start: number, f: (q: number) => number, scale: number, span: number) => {
      for (let i = 0; i < n; i++) {
        const q = end * (start + ((1 - start) * i) / (n - 1));
        const v = f(q) + (2 * random() - 1) * noise * span;
        lines.push(`${quantity},${label},${round(q * 3600)},${round(v * scale)}`);
      }
    };
    add('head', 0, (q) => fam.head(q, speed), 1, fam.head(0, fam.speeds_rpm[0] as number));
    add('efficiency', 0.1, (q) => fam.efficiency(q, speed), 100, 1);
    add('power', 0, (q) => fam.power(q, speed), 1e-3, fam.power(fam.endFlow_m3s, fam.speeds_rpm[0] as number));
    add('npshr', 0.2, (q) => fam.npshr(q, speed), 1, fam.npshr(fam.endFlow_m3s, fam.speeds_rpm[0] as number));
  });
  return `${lines.join('\n')}\n`;
}
