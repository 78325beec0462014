/**
 * Invented curve sets and random duties for comparing meetDuty against its frozen copy (not real
 * products): the library's invented families (three or four diameters, one with a power curve
 * only, one with head curves only), the duty tests' invented family in several variants (one
 * diameter, a power curve, head fits of different degrees, NPSH3 on one diameter, members
 * without a head curve), the committed demo curve sets (read with reading noise), and the
 * invented variable-speed family.
 */
import { readFileSync } from 'node:fs';
import { inventedSpeedFamily, speedFamilyPointsText } from '../../../src/demo/inventedSpeedFamily.ts';
import { seededRandom } from '../../../src/demo/random.ts';
import type { CurveSet, PolynomialFit } from '../../../src/model/curveset.ts';
import type { DutyRequest } from '../../../src/duty/meetDuty.ts';
import { inventedCurveSet as libraryCurveSet, type InventedFamily } from '../../library/fixtures.ts';
import { inventedCurveSet as dutyCurveSet, inventedMember } from '../inventedFamily.ts';
import { buildSpeedSetFromText } from '../../speed/buildSpeedSet.ts';

/** A library bench family (log-uniform size), as bench/library.bench.ts draws it. */
function randomLibraryFamily(random: () => number, i: number): InventedFamily {
  const speeds = [1450, 1780, 2900, 3550];
  const bepFlowM3h = 10 * 100 ** random();
  const shutoff = 15 * 10 ** random();
  const speed = speeds[Math.floor(random() * speeds.length)] as number;
  const tipSpeed = Math.sqrt(2 * 9.80665 * shutoff);
  return {
    name: `Invented bench pump ${i}`,
    speedRpm: speed,
    fullDiameterM: (60 * tipSpeed) / (Math.PI * speed),
    ratios: random() < 0.5 ? [1, 0.92, 0.84] : [1, 0.94, 0.88, 0.82],
    shutoffHeadM: shutoff,
    bepFlowM3s: bepFlowM3h / 3600,
    bepHeadRatio: 0.75 + 0.1 * random(),
    peakEfficiency: 0.6 + 0.28 * random(),
  };
}

export interface Case {
  name: string;
  set: CurveSet;
  /** A typical duty scale: flow [m³/s] and head [m] near the set's BEP. */
  flow_m3s: number;
  head_m: number;
}

function bepOf(set: CurveSet): { flow_m3s: number; head_m: number } {
  const m = [...set.members].sort((a, b) => (b.diameter_m ?? 0) - (a.diameter_m ?? 0) || b.speed_rpm - a.speed_rpm)[0];
  const bep = m?.derived.bep;
  if (bep) return { flow_m3s: bep.flow_m3s, head_m: bep.head_m };
  const fit = m?.curves.head?.fit;
  const q = fit ? 0.6 * fit.domain[1] : 0.01;
  return { flow_m3s: q, head_m: 0.8 * (m?.derived.shutoff_head_m ?? 20) };
}

const ROOT = new URL('../../../', import.meta.url);

export function curveSetCases(libraryCount = 8): Case[] {
  const sets: Array<[string, CurveSet]> = [];
  const random = seededRandom(13);
  for (let i = 0; i < libraryCount; i++) sets.push([`library family ${i}`, libraryCurveSet(randomLibraryFamily(random, i))]);
  const powerOnly = libraryCurveSet(randomLibraryFamily(random, 99));
  for (const m of powerOnly.members) delete m.curves.efficiency;
  sets.push(['library family, power curve and no efficiency curve', powerOnly]);
  const headOnly = libraryCurveSet(randomLibraryFamily(random, 98));
  for (const m of headOnly.members) {
    delete m.curves.efficiency;
    delete m.curves.power;
    delete m.curves.npshr;
  }
  sets.push(['library family, head curves only', headOnly]);
  // Head fits of different degrees on neighbouring diameters (a small invented cubic and quartic term).
  const mixed = dutyCurveSet([0.25, 0.24, 0.23, 0.21]);
  const extend = (i: number, extra: number[]) => {
    const fit = mixed.members[i]?.curves.head?.fit as PolynomialFit;
    fit.coefficients = [...fit.coefficients, ...extra];
    fit.degree = fit.coefficients.length - 1;
  };
  extend(1, [-0.8]);
  extend(2, [0.5, -0.3]);
  sets.push(['invented duty-test family, head fits of degree 2, 3, 4 and 2', mixed]);
  sets.push(['invented duty-test family', dutyCurveSet()]);
  sets.push(['invented duty-test family, one diameter', dutyCurveSet([0.25])]);
  const withPower = dutyCurveSet();
  withPower.members = [0.25, 0.23, 0.21].map((d) => inventedMember(d, true));
  sets.push(['invented duty-test family with a power curve', withPower]);
  const oneNpsh = dutyCurveSet();
  for (const m of oneNpsh.members.slice(0, 2)) delete m.curves.npshr;
  sets.push(['invented duty-test family, NPSH3 drawn for the smallest diameter only', oneNpsh]);
  for (const file of ['samples/demo/invented-es4-us.curveset.json', 'samples/demo/invented-si3-si.curveset.json']) {
    sets.push([file, JSON.parse(readFileSync(new URL(file, ROOT), 'utf8')) as CurveSet]);
  }
  sets.push(['invented speed family VS-4', buildSpeedSetFromText(speedFamilyPointsText(inventedSpeedFamily(), { seed: 7 }))]);
  const noMiddleHead = dutyCurveSet();
  delete (noMiddleHead.members[1] as CurveSet['members'][number]).curves.head;
  sets.push(['invented duty-test family, middle member without a head curve', noMiddleHead]);
  const noFullHead = dutyCurveSet();
  delete (noFullHead.members[0] as CurveSet['members'][number]).curves.head;
  sets.push(['invented duty-test family, full diameter without a head curve', noFullHead]);
  return sets.map(([name, set]) => ({ name, set, ...bepOf(set) }));
}

/** Random duties around a case's BEP: flows 0.05–1.6 × BEP, heads 0.3–1.5 × BEP head; some with a static head or another density. */
export function randomDuties(c: Case, count: number, seed: number): DutyRequest[] {
  const random = seededRandom(seed);
  const out: DutyRequest[] = [];
  for (let i = 0; i < count; i++) {
    const duty: DutyRequest = { flow_m3s: c.flow_m3s * (0.05 + 1.55 * random()), head_m: c.head_m * (0.3 + 1.2 * random()) };
    const extra = random();
    if (extra < 0.25) duty.static_head_m = duty.head_m * 0.6 * random();
    else if (extra < 0.35) duty.density_kg_m3 = 700 + 600 * random();
    out.push(duty);
  }
  return out;
}
