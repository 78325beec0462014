/**
 * The EPANET fragment, opened by the EPANET engine itself (epanet-js 0.9.0, OWA-EPANET 2.3):
 * the fragment is pasted into a small invented network (reservoir R1 – pump – junction J1 –
 * pipe P1 – reservoir R2), solved, and the pump's flow is compared with our duty solver
 * (src/duty/operatingPoint.ts) on the same curve set and the same pipe.
 *
 * The pipe loses h = 4.727·C^−1.852·d^−4.871·L·Q^1.852 (ft, ft³/s; Hazen-Williams as EPANET
 * applies it, EPANET 2 Users Manual, Table 3.1, published); the same law gives our system curve.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { InitHydOption, LinkProperty, Project, Workspace } from 'epanet-js';
import { curveSetToEpanet, headCurveStart } from '../../src/export/epanet.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { memberAtDiameter, membersByDiameter } from '../../src/fit/affinity.ts';
import { operatingPoint } from '../../src/duty/operatingPoint.ts';
import { pumpCurveOfMember } from '../../src/duty/pumpCurve.ts';
import type { SystemCurve } from '../../src/duty/systemCurve.ts';
import type { CurveSet, Member } from '../../src/model/curveset.ts';
import { FOOT, INCH, US_GALLON } from '../../src/units/constants.ts';

const set = parseCurveSetJson(readFileSync('samples/demo/invented-es4-us.curveset.json', 'utf8'));
const HW = 1.852;
const pipe = { length_ft: 3000, diameter_in: 10, c: 120 };
const GPM = US_GALLON / 60;

function systemFor(static_ft: number): SystemCurve {
  const kUs = (4.727 * pipe.length_ft) / (pipe.c ** HW * (pipe.diameter_in / 12) ** 4.871); // ft per (ft³/s)^1.852
  return { static_head_m: static_ft * FOOT, k: kUs * FOOT * (1 / FOOT ** 3) ** HW, exponent: HW, basis: 'Hazen-Williams pipe of the test network' };
}

let ws: Workspace;
beforeAll(async () => {
  ws = new Workspace();
  await ws.loadModule();
});

/** Pastes the fragment into the network (GPM, ft) and returns the active pump's flow in m³/s. */
function solve(fragment: string, static_ft: number): number {
  const inp = [
    '[TITLE]',
    'Invented test network',
    '[JUNCTIONS]',
    'J1 0 0',
    '[RESERVOIRS]',
    'R1 0',
    `R2 ${static_ft}`,
    '[PIPES]',
    `P1 J1 R2 ${pipe.length_ft} ${pipe.diameter_in} ${pipe.c} 0 Open`,
    fragment,
    '[OPTIONS]',
    'Units GPM',
    'Headloss H-W',
    'Accuracy 0.00000001',
    'Trials 500',
    '[TIMES]',
    'Duration 0',
    '[END]',
  ].join('\n');
  ws.writeFile('net.inp', inp);
  const model = new Project(ws);
  model.open('net.inp', 'net.rpt', 'net.bin');
  model.openH();
  model.initH(InitHydOption.NoSave);
  model.runH();
  let pumpIndex = -1;
  for (let i = 1; i <= model.getCount(2 /* links */); i++) if (model.getLinkType(i) === 2 /* pump */) pumpIndex = i;
  const flow = model.getLinkValue(pumpIndex, LinkProperty.Flow) * GPM;
  model.closeH();
  model.close();
  return flow;
}

function ours(member: Member, static_ft: number): number {
  const r = operatingPoint(pumpCurveOfMember(member, set.fluid.density_kg_m3), systemFor(static_ft));
  if (r.status !== 'ok') throw new Error(`no operating point: ${r.status}`);
  return r.point.flow_m3s;
}

describe('export --format epanet, solved by the EPANET engine', () => {
  it('every diameter gets a head and an efficiency curve, in GPM and ft (the set’s own units)', () => {
    const out = curveSetToEpanet(set);
    expect(out.flowUnits).toBe('GPM');
    expect(out.curves).toHaveLength(4);
    expect(out.text).toMatch(/\[CURVES\][\s\S]*\[PUMPS\][\s\S]*\[ENERGY\]/);
    expect(out.curves[0]!.head).toMatch(/_H_13in$/);
    expect(out.text.split('\n').filter((l) => l.startsWith(`${out.curves[0]!.head}\t`))).toHaveLength(21);
    expect(out.findings).toHaveLength(0);
  });

  it('the largest impeller: EPANET’s operating flow agrees with our duty solver within 0.1 %', () => {
    const fragment = curveSetToEpanet(set, { fromNode: 'R1', toNode: 'J1' }).text;
    const largest = membersByDiameter(set)[0]!;
    const epanet = solve(fragment, 100);
    const mine = ours(largest, 100);
    expect(mine).toBeGreaterThan(largest.curves.head!.fit!.domain[1] * 0.3);
    process.stdout.write(`largest impeller: EPANET ${epanet} m³/s, duty solver ${mine} m³/s, ratio − 1 = ${(epanet / mine - 1).toExponential(2)}\n`);
    expect(Math.abs(epanet / mine - 1)).toBeLessThan(0.001);
  });

  it('a chosen trim between two impellers, in LPS with head in m converted back: within 0.1 %', () => {
    const d = 12.4 * INCH;
    const out = curveSetToEpanet(set, { diameter_m: d, fromNode: 'R1', toNode: 'J1', flowUnits: 'GPM' });
    expect(out.curves).toHaveLength(1);
    const epanet = solve(out.text, 90);
    const mine = ours(memberAtDiameter(set, d), 90);
    expect(Math.abs(epanet / mine - 1)).toBeLessThan(0.001);
    const lps = curveSetToEpanet(set, { diameter_m: d, flowUnits: 'LPS' });
    const first = lps.text.split('\n').find((l) => l.startsWith(out.curves[0]!.head))!.split('\t');
    expect(Number(first[2])).toBeCloseTo(memberAtDiameter(set, d).curves.head!.fit!.coefficients[0]!, 2); // shutoff head in m
  });

  it('a drooping curve is written from its peak, with a comment and a finding, and EPANET solves it', () => {
    const member = membersByDiameter(set)[0]!;
    // invented drooping curve: H = 50 + 10·x − 40·x² m, x = Q / 0.1 m³/s; peak at x = 0.125
    const fit = { ...member.curves.head!.fit!, flow_scale: 0.1, coefficients: [50, 10, -40], degree: 2, domain: [0, 0.1] as [number, number] };
    const drooping: CurveSet = { ...set, members: [{ ...member, curves: { head: { points: [], fit } } }] };
    const start = headCurveStart(fit);
    expect(start.drooping).toBe(true);
    expect(start.from).toBeCloseTo(0.0125, 6);
    const out = curveSetToEpanet(drooping, { fromNode: 'R1', toNode: 'J1' });
    expect(out.findings.map((f) => f.code)).toEqual(['export.epanet-drooping']);
    expect(out.text).toMatch(/drooping curve: written from its peak/);
    const epanet = solve(out.text, 120);
    const mine = ours(drooping.members[0]!, 120);
    expect(Math.abs(epanet / mine - 1)).toBeLessThan(0.001);
  });

  it('three points are refused (EPANET would read them as a formula)', () => {
    expect(() => curveSetToEpanet(set, { points: 3 })).toThrow(/from 4 to 200/);
    expect(() => curveSetToEpanet(set, { flowUnits: 'XYZ' })).toThrow(/Unknown EPANET flow units/);
  });
});
