/**
 * Reading an invented family the way an engineer would: points along each curve with a
 * little reading noise, written as a points table. Deterministic for a given seed.
 */
import type { Quantity } from '../model/curveset.ts';
import { fromSI, parseUnit, presetNamed } from '../units/index.ts';
import type { InventedFamily } from './inventedFamily.ts';
import { seededRandom } from './random.ts';

export interface SampleOptions {
  system: 'us' | 'si';
  seed?: number;
  /** Reading noise as a fraction of each axis span (uniform, ±). Default 0.003. */
  noise?: number;
  pointsPerCurve?: number;
  /** Diameter labels to write instead of the true ones, keyed by index (for mislabel tests). */
  relabel?: Record<number, number>;
  /** Multiply the power of one diameter (index) by a factor (for inconsistency tests). */
  powerFactor?: { index: number; factor: number };
}

export interface SampleRow {
  quantity: Quantity;
  diameter: number;
  flow: number;
  value: number;
}

export function samplePoints(fam: InventedFamily, o: SampleOptions): SampleRow[] {
  const random = seededRandom(o.seed ?? 1);
  const noise = o.noise ?? 0.003;
  const n = o.pointsPerCurve ?? 15;
  const units = presetNamed(o.system);
  const flowU = parseUnit('flow', units.flow);
  const headU = parseUnit('head', units.head);
  const npshU = parseUnit('head', units.npsh);
  const powerU = parseUnit('power', units.power);
  const diaU = parseUnit('diameter', units.diameter);
  const jitter = (span: number) => (2 * random() - 1) * noise * span;
  const rows: SampleRow[] = [];
  fam.diameters_m.forEach((d, index) => {
    const end = fam.endFlow_m3s * (d / (fam.diameters_m[0] as number));
    const label = o.relabel?.[index] ?? Number(fromSI(d, diaU).toPrecision(6));
    const pf = o.powerFactor?.index === index ? o.powerFactor.factor : 1;
    const add = (quantity: Quantity, start: number, f: (q: number) => number, toDisplay: (v: number) => number, span: number) => {
      for (let i = 0; i < n; i++) {
        const q = end * (start + ((1 - start) * i) / (n - 1));
        const qRead = Math.max(0, q + jitter(fam.spans.flow));
        rows.push({ quantity, diameter: label, flow: round(fromSI(qRead, flowU)), value: round(toDisplay(f(q) + jitter(span))) });
      }
    };
    add('head', 0, (q) => fam.head(q, d), (v) => fromSI(v, headU), fam.spans.head);
    add('efficiency', 0.1, (q) => fam.efficiency(q, d), (v) => v * 100, 1);
    add('power', 0, (q) => fam.power(q, d) * pf, (v) => fromSI(v, powerU), fam.spans.power);
    add('npshr', 0.2, (q) => fam.npshr(q, d), (v) => fromSI(v, npshU), fam.spans.npshr);
  });
  return rows;
}

const round = (v: number) => Number(v.toPrecision(6));

export function pointsTableText(rows: SampleRow[], comment?: string): string {
  const lines = comment ? comment.split('\n').map((l) => `# ${l}`) : [];
  lines.push('quantity,diameter,flow,value');
  for (const r of rows) lines.push(`${r.quantity},${r.diameter},${r.flow},${r.value}`);
  return `${lines.join('\n')}\n`;
}
