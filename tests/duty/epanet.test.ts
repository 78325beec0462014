/**
 * Operating points checked against EPANET (epanet-js 0.9.0, OWA-EPANET engine), an outside
 * network solver. Network: reservoir R1 – pump PU1 – junction J1 – pipe P1 – reservoir R2.
 *
 * The system curve of that network is H = (h_R2 − h_R1) + k·Q^1.852, with the Hazen-Williams
 * resistance EPANET uses, k = 4.727·C^−1.852·d^−4.871·L in US units (ft, cfs)
 * (EPANET 2 Users Manual, Table 3.1, published), converted here to SI.
 *
 * EPANET reads a 3-point head curve starting at Q = 0 as H = A − B·Q^C through the three
 * points, and a longer table as straight lines between the points. The invented pump curves
 * are chosen accordingly (see each test).
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { Project, Workspace, LinkProperty, NodeProperty, InitHydOption, PumpType } from 'epanet-js';
import { operatingPoint } from '../../src/duty/operatingPoint.ts';
import { pumpCurveOfMember, type PumpCurve } from '../../src/duty/pumpCurve.ts';
import type { SystemCurve } from '../../src/duty/systemCurve.ts';
import type { Member } from '../../src/model/curveset.ts';
import { FOOT } from '../../src/units/constants.ts';

const HW_EXPONENT = 1.852;
const pipe = { length_m: 800, diameter_m: 0.2, roughnessC: 120 };
const levels = { r1_m: 10, r2_m: 35 };

/** Hazen-Williams k [m per (m³/s)^1.852] from EPANET's US-unit coefficient 4.727. */
function hazenWilliamsK(length_m: number, diameter_m: number, c: number): number {
  const kUs = (4.727 * (length_m / FOOT)) / (c ** HW_EXPONENT * (diameter_m / FOOT) ** 4.871); // ft per cfs^1.852
  return kUs * FOOT * (1 / FOOT ** 3) ** HW_EXPONENT;
}

const system: SystemCurve = {
  static_head_m: levels.r2_m - levels.r1_m,
  k: hazenWilliamsK(pipe.length_m, pipe.diameter_m, pipe.roughnessC),
  exponent: HW_EXPONENT,
  basis: 'Hazen-Williams pipe of the test network',
};

let ws: Workspace;
beforeAll(async () => {
  ws = new Workspace();
  await ws.loadModule();
});

/** Builds the network with a pump curve given as (Q [L/s], H [m]) points and solves it. */
function solveNetwork(curve: Array<[number, number]>) {
  const inp = [
    '[TITLE]',
    'Invented test network: reservoir, pump, pipe, reservoir',
    '[JUNCTIONS]',
    'J1 0 0',
    '[RESERVOIRS]',
    `R1 ${levels.r1_m}`,
    `R2 ${levels.r2_m}`,
    '[PIPES]',
    `P1 J1 R2 ${pipe.length_m} ${pipe.diameter_m * 1000} ${pipe.roughnessC} 0 Open`,
    '[PUMPS]',
    'PU1 R1 J1 HEAD C1',
    '[CURVES]',
    ...curve.map(([q, h]) => `C1 ${q} ${h}`),
    '[OPTIONS]',
    'Units LPS',
    'Headloss H-W',
    'Accuracy 0.0000001',
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
  const pump = model.getLinkIndex('PU1');
  const result = {
    flow_m3s: model.getLinkValue(pump, LinkProperty.Flow) / 1000,
    pumpType: model.getPumpType(pump),
    junctionHead_m: model.getNodeValue(model.getNodeIndex('J1'), NodeProperty.Head),
  };
  model.closeH();
  model.close();
  return result;
}

describe('operating point against EPANET', () => {
  it('the network’s pipe loses k·Q^1.852 with the k used for the system curve (EPANET head at J1, within 0.01 %)', () => {
    const net = solveNetwork([[0, 60], [40, 50], [80, 25]]);
    const pipeLoss = net.junctionHead_m - levels.r2_m;
    expect(Math.abs(pipeLoss / (system.k * net.flow_m3s ** HW_EXPONENT) - 1)).toBeLessThan(1e-4);
  });

  it('a 3-point curve (EPANET’s H = A − B·Q^C) gives the same flow as the engine within 0.5 %', () => {
    // invented pump: H = 60 − 10·(Q / 0.04 m³/s)^2.2 through (0, 60), (40 L/s, 50), (80 L/s, 60 − 10·2^2.2)
    const c = 2.2;
    const head = (q: number) => 60 - 10 * (q / 0.04) ** c;
    const points: Array<[number, number]> = [[0, 60], [40, head(0.04)], [80, head(0.08)]];
    const net = solveNetwork(points);
    expect(net.pumpType).toBe(PumpType.PowerFunc);
    const curve: PumpCurve = { label: 'invented 3-point', speed_rpm: 1450, domain: [0, 0.08], head };
    const ours = operatingPoint(curve, system);
    expect(ours.status).toBe('ok');
    if (ours.status !== 'ok') return;
    const relative = Math.abs(ours.point.flow_m3s / net.flow_m3s - 1);
    expect(relative).toBeLessThan(0.005);
  });

  it('a multi-point curve (EPANET’s straight lines between points) gives the same flow as the engine on the same table within 0.5 %', () => {
    // invented pump table, 9 points
    const table: Array<[number, number]> = [[0, 58], [10, 57.6], [20, 56.5], [30, 54.6], [40, 51.8], [50, 48], [60, 43.1], [70, 37], [80, 29.5]];
    const net = solveNetwork(table);
    expect(net.pumpType).toBe(PumpType.Custom);
    const lin = (q: number) => {
      const x = q * 1000;
      for (let i = 1; i < table.length; i++) {
        const [x0, y0] = table[i - 1] as [number, number];
        const [x1, y1] = table[i] as [number, number];
        if (x <= x1 || i === table.length - 1) return y0 + ((y1 - y0) * (x - x0)) / (x1 - x0);
      }
      return Number.NaN;
    };
    const curve: PumpCurve = { label: 'invented table', speed_rpm: 1450, domain: [0, 0.08], head: lin };
    const ours = operatingPoint(curve, system);
    expect(ours.status === 'ok' && Math.abs(ours.point.flow_m3s / net.flow_m3s - 1)).toBeLessThan(0.005);
  });

  it('a fitted member’s polynomial, sampled at 17 points for EPANET, meets the same system within 0.5 %', () => {
    // invented member: cubic head fit H = 58 − 2·t − 14·t² − 14.5·t³ (falling throughout, as EPANET requires), t = Q / 0.08 m³/s
    const member: Member = {
      diameter_m: 0.26,
      speed_rpm: 1450,
      curves: {
        head: {
          points: [],
          fit: { kind: 'polynomial', flow_scale: 0.08, coefficients: [58, -2, -14, -14.5], domain: [0, 0.08], degree: 3, through_origin: false, rms: 0, max_residual: 0, condition: 1, reason: 'invented' },
        },
      },
      derived: {},
    };
    const curve = pumpCurveOfMember(member, 998.2);
    const table = Array.from({ length: 17 }, (_, i) => [i * 5, curve.head((i * 5) / 1000)] as [number, number]);
    const net = solveNetwork(table);
    const ours = operatingPoint(curve, system);
    expect(ours.status).toBe('ok');
    if (ours.status !== 'ok') return;
    expect(Math.abs(ours.point.flow_m3s / net.flow_m3s - 1)).toBeLessThan(0.005);
  });
});
