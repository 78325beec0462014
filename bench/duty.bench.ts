/**
 * Duty engine figures on invented families (not real products):
 * 1. trim accuracy — curve sets built from noisy readings of the demo families (several seeds);
 *    for a grid of duty points, the trim returned by meetDuty against the exact diameter of the
 *    invented family (bisection on its exact head);
 * 2. speed — meetDuty calls per second (what the library's duty search pays per curve set);
 * 3. the engine's operating point against EPANET (epanet-js) on the same network, and the time
 *    of each;
 * 4. a whole study of twelve options (2 pipe sizes × 3 impellers × 1–2 pumps, tests/study/
 *    studyCases.ts) after start-up, median of 7 (target: under 1 s).
 */
import { Project, Workspace, LinkProperty, InitHydOption } from 'epanet-js';
import { buildCurveSet, type MemberInput } from '../src/fit/build.ts';
import { inventedSiFamily, inventedUsFamily, type InventedFamily } from '../src/demo/inventedFamily.ts';
import { seededRandom } from '../src/demo/random.ts';
import { meetDuty } from '../src/duty/meetDuty.ts';
import { operatingPoint } from '../src/duty/operatingPoint.ts';
import { pumpCurveOfMember } from '../src/duty/pumpCurve.ts';
import type { CurveSet, CurvePoint } from '../src/model/curveset.ts';
import { runStudy } from '../src/study/runStudy.ts';
import { siSet, twelveOptionStudy } from '../tests/study/studyCases.ts';

function noisySet(fam: InventedFamily, seed: number, noise = 0.003): CurveSet {
  const random = seededRandom(seed);
  const jitter = (span: number) => (2 * random() - 1) * noise * span;
  const d0 = fam.diameters_m[0] as number;
  const members: MemberInput[] = fam.diameters_m.map((d) => {
    const end = fam.endFlow_m3s * (d / d0);
    const along = (start: number, f: (q: number) => number, span: number): CurvePoint[] =>
      Array.from({ length: 15 }, (_, i) => {
        const q = end * (start + ((1 - start) * i) / 14);
        return [Math.max(0, q + jitter(fam.spans.flow)), f(q) + jitter(span)] as CurvePoint;
      });
    return {
      diameter_m: d,
      points: {
        head: along(0, (q) => fam.head(q, d), fam.spans.head),
        efficiency: along(0.1, (q) => fam.efficiency(q, d), 1),
        power: along(0, (q) => fam.power(q, d), fam.spans.power),
        npshr: along(0.2, (q) => fam.npshr(q, d), fam.spans.npshr),
      },
    };
  });
  return buildCurveSet({
    pump: { name: `${fam.name} (invented)` },
    speed_rpm: fam.speed_rpm,
    family: 'diameter',
    fluid: { name: 'water', density_kg_m3: fam.density_kg_m3, specific_gravity: 1 },
    display_units: { flow: 'm3/h', head: 'm', npsh: 'm', power: 'kW', diameter: 'mm' },
    members,
  });
}

function exactDiameter(fam: InventedFamily, q: number, h: number): number {
  let lo = 0.3 * (fam.diameters_m[0] as number);
  let hi = fam.diameters_m[0] as number;
  for (let i = 0; i < 100; i++) {
    const mid = 0.5 * (lo + hi);
    if (fam.head(q, mid) > h) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

function trimAccuracy(): void {
  console.log('1. Trim accuracy on curve sets built from noisy readings (±0.3 % of span)');
  for (const fam of [inventedUsFamily(), inventedSiFamily()]) {
    const d0 = fam.diameters_m[0] as number;
    const dMin = fam.diameters_m[fam.diameters_m.length - 1] as number;
    const errors: number[] = [];
    for (let seed = 1; seed <= 5; seed++) {
      const set = noisySet(fam, seed);
      // duty points on exact trims between the smallest and the full diameter, 60–110 % of BEP-ish flows
      for (let k = 0; k <= 8; k++) {
        const d = dMin + ((d0 - dMin) * k) / 8;
        for (const f of [0.4, 0.55, 0.7]) {
          const q = fam.endFlow_m3s * (d / d0) * f;
          const h = fam.head(q, d);
          const m = meetDuty(set, { flow_m3s: q, head_m: h });
          if (m.status === 'meets') errors.push(Math.abs((m.diameter_m as number) / exactDiameter(fam, q, h) - 1));
        }
      }
    }
    errors.sort((a, b) => a - b);
    const pct = (v: number) => `${(v * 100).toFixed(3)} %`;
    console.log(`   ${fam.name}: ${errors.length} duties, median ${pct(errors[Math.floor(errors.length / 2)] ?? NaN)}, 95th ${pct(errors[Math.floor(errors.length * 0.95)] ?? NaN)}, worst ${pct(errors[errors.length - 1] ?? NaN)} (target < 1 %)`);
  }
}

function speed(): void {
  const fam = inventedUsFamily();
  const set = noisySet(fam, 1);
  const n = 300;
  const t0 = performance.now();
  for (let i = 0; i < n; i++) meetDuty(set, { flow_m3s: 0.05 + 0.0001 * (i % 50), head_m: 30 });
  const ms = (performance.now() - t0) / n;
  console.log(`2. meetDuty: ${ms.toFixed(2)} ms per call, ${Math.round(1000 / ms)} curve sets per second`);
}

async function againstEpanet(): Promise<void> {
  const fam = inventedSiFamily();
  const set = noisySet(fam, 3);
  const curve = pumpCurveOfMember(set.members[0] as CurveSet['members'][number], 998.2);
  const table = Array.from({ length: 19 }, (_, i) => [(curve.domain[1] * i) / 18, curve.head((curve.domain[1] * i) / 18)] as const);
  // Hazen-Williams pipe: EPANET's k = 4.727 C^-1.852 d^-4.871 L (ft, cfs), EPANET 2 Users Manual Table 3.1
  const L = 600, D = 0.15, C = 130, FT = 0.3048;
  const k = ((4.727 * (L / FT)) / (C ** 1.852 * (D / FT) ** 4.871)) * FT * (1 / FT ** 3) ** 1.852;
  const inp = ['[JUNCTIONS]', 'J1 0 0', '[RESERVOIRS]', 'R1 5', 'R2 25', '[PIPES]', `P1 J1 R2 ${L} ${D * 1000} ${C} 0 Open`, '[PUMPS]', 'PU1 R1 J1 HEAD C1', '[CURVES]', ...table.map(([q, h]) => `C1 ${q * 1000} ${h}`), '[OPTIONS]', 'Units LPS', 'Headloss H-W', 'Accuracy 0.0000001', '[TIMES]', 'Duration 0', '[END]'].join('\n');
  const ws = new Workspace();
  await ws.loadModule();
  const runs = 50;
  let epanetFlow = 0;
  const t0 = performance.now();
  for (let i = 0; i < runs; i++) {
    ws.writeFile('net.inp', inp);
    const model = new Project(ws);
    model.open('net.inp', 'net.rpt', 'net.bin');
    model.openH();
    model.initH(InitHydOption.NoSave);
    model.runH();
    epanetFlow = model.getLinkValue(model.getLinkIndex('PU1'), LinkProperty.Flow) / 1000;
    model.closeH();
    model.close();
  }
  const tEpanet = (performance.now() - t0) / runs;
  const system = { static_head_m: 20, k, exponent: 1.852, basis: 'bench' };
  let ours = 0;
  const t1 = performance.now();
  for (let i = 0; i < runs; i++) {
    const r = operatingPoint(curve, system);
    if (r.status === 'ok') ours = r.point.flow_m3s;
  }
  const tOurs = (performance.now() - t1) / runs;
  console.log(`3. Operating point, 260 mm invented curve on a Hazen-Williams pipe: engine ${(ours * 3600).toFixed(2)} m³/h, EPANET ${(epanetFlow * 3600).toFixed(2)} m³/h (19-point table), difference ${((ours / epanetFlow - 1) * 100).toFixed(4)} %`);
  console.log(`   time per solve: engine ${tOurs.toFixed(3)} ms, EPANET ${tEpanet.toFixed(3)} ms (open+solve+close), ratio ${(tEpanet / tOurs).toFixed(1)}`);
}

function studyTime(): void {
  const s = twelveOptionStudy();
  runStudy(s, () => siSet); // start-up: module loading and JIT
  const times: number[] = [];
  for (let i = 0; i < 7; i++) {
    const t0 = performance.now();
    runStudy(s, () => siSet);
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const med = times[3] as number;
  console.log(`4. Study of twelve options: median ${med.toFixed(1)} ms of 7 (${(times[0] as number).toFixed(1)}–${(times[6] as number).toFixed(1)} ms), ${med < 1000 ? 'under 1 s ok' : 'OVER 1 s'}`);
}

export default async function (): Promise<void> {
  trimAccuracy();
  speed();
  await againstEpanet();
  studyTime();
}
