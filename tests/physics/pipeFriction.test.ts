import { describe, expect, it, beforeAll } from 'vitest';
import { Project, Workspace, LinkProperty, NodeProperty, InitHydOption } from 'epanet-js';
import { colebrookWhite, darcyFrictionFactor, darcyWeisbachLoss, hazenWilliamsLoss, swameeJain } from '../../src/physics/pipeFriction.ts';
import { FOOT } from '../../src/units/constants.ts';

/** Colebrook–White solved independently: plain fixed-point iteration x ← −2 log10(a + b x) to 1e-14. */
function colebrookFixedPoint(re: number, rr: number): number {
  let x = 8;
  for (let i = 0; i < 500; i++) {
    const next = -2 * Math.log10(rr / 3.7 + (2.51 * x) / re);
    if (Math.abs(next - x) < 1e-14) return 1 / (next * next);
    x = next;
  }
  return 1 / (x * x);
}

describe('friction factor', () => {
  it('Colebrook–White solver agrees with an independent fixed-point solution within 0.5 % over Re 4e3–1e7', () => {
    // Colebrook, J. Inst. Civil Eng. 11 (1939): the equation itself is the reference.
    for (const rr of [0, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2]) {
      for (let e = Math.log10(4e3); e <= 7 + 1e-9; e += 0.1) {
        const re = 10 ** e;
        expect(Math.abs(colebrookWhite(re, rr) / colebrookFixedPoint(re, rr) - 1)).toBeLessThan(0.005);
      }
    }
  });

  it('reproduces the check values of the equation (REFERENCES: computed from Colebrook–White)', () => {
    for (const [re, rr, f] of [[1e4, 0, 0.03088], [1e5, 0, 0.01799], [1e5, 1e-4, 0.01851], [1e6, 1e-4, 0.01344], [1e7, 1e-3, 0.01967]] as const) {
      expect(Math.abs(colebrookWhite(re, rr) / f - 1)).toBeLessThan(5e-4);
    }
  });

  it('Swamee–Jain (Swamee & Jain 1976), a second opinion, agrees within 1.5 % for ε/D ≤ 1e-4 and 3 % at ε/D 1e-2, Re 5e3–1e7', () => {
    // The published "about 1 %" is loosest for rough pipe at low Re (measured here: 2.8 % at ε/D 1e-2, Re 5e3).
    for (const re of [5e3, 1e4, 1e5, 1e6, 1e7]) {
      for (const rr of [1e-6, 1e-4]) expect(Math.abs(swameeJain(re, rr) / colebrookWhite(re, rr) - 1)).toBeLessThan(0.015);
      expect(Math.abs(swameeJain(re, 1e-2) / colebrookWhite(re, 1e-2) - 1)).toBeLessThan(0.03);
    }
  });

  it('laminar flow gives 64/Re, and the transition is flagged', () => {
    expect(darcyFrictionFactor(1000, 1e-4)).toEqual({ f: 0.064, regime: 'laminar' });
    expect(darcyFrictionFactor(3000, 1e-4).regime).toBe('transitional');
    expect(darcyFrictionFactor(5000, 1e-4).regime).toBe('turbulent');
  });

  it('Hazen–Williams follows its SI form 10.67·L·Q^1.852/(C^1.852·D^4.8704)', () => {
    expect(Math.abs(hazenWilliamsLoss(0.05, 0.2, 100, 120) - (10.67 * 100 * 0.05 ** 1.852) / (120 ** 1.852 * 0.2 ** 4.8704))).toBeLessThan(1e-12);
  });
});

describe('pipe-run friction loss against the EPANET engine (epanet-js 0.9.0, Darcy–Weisbach)', () => {
  let ws: Workspace;
  beforeAll(async () => {
    ws = new Workspace();
    await ws.loadModule();
  });
  // EPANET's water viscosity at relative viscosity 1: 1.1e-5 ft²/s (EPANET 2 Users Manual, Options).
  const nu = 1.1e-5 * FOOT * FOOT;

  /** Tiny network: reservoir at 100 m, one pipe, a junction drawing `q` L/s. Returns the pipe's head loss [m]. */
  function epanetLoss(lengthM: number, diameterMm: number, roughnessMm: number, minorK: number, qLps: number, headloss = 'D-W'): number {
    const inp = ['[TITLE]', 'Invented test network: reservoir, pipe, demand', '[JUNCTIONS]', `J1 0 ${qLps}`, '[RESERVOIRS]', 'R1 100', '[PIPES]',
      `P1 R1 J1 ${lengthM} ${diameterMm} ${roughnessMm} ${minorK} Open`, '[OPTIONS]', 'Units LPS', `Headloss ${headloss}`, 'Accuracy 0.00000001', 'Trials 500', '[TIMES]', 'Duration 0', '[END]'].join('\n');
    ws.writeFile('pipe.inp', inp);
    const model = new Project(ws);
    model.open('pipe.inp', 'pipe.rpt', 'pipe.bin');
    model.openH();
    model.initH(InitHydOption.NoSave);
    model.runH();
    const head = model.getNodeValue(model.getNodeIndex('J1'), NodeProperty.Head);
    const flow = model.getLinkValue(model.getLinkIndex('P1'), LinkProperty.Flow);
    model.closeH();
    model.close();
    expect(Math.abs(flow - qLps)).toBeLessThan(1e-6);
    return 100 - head;
  }

  it.each([
    [400, 202.7, 0.045, 0, 64], // 8 in sch 40 steel at about 2 m/s
    [400, 154.1, 0.045, 6.5, 64], // 6 in sch 40 with fittings
    [20, 202.7, 0.045, 1.0, 64],
    [1000, 100, 0.26, 0, 10], // cast iron
    [250, 303.2, 0.0015, 2, 150], // smooth pipe
  ])('L %s m, D %s mm, ε %s mm, K %s, %s L/s: within 1 % of EPANET', (l, d, e, k, q) => {
    const ours = darcyWeisbachLoss(q / 1000, d / 1000, l, e / 1000, nu, k).loss_m;
    const theirs = epanetLoss(l, d, e, k, q);
    expect(Math.abs(ours / theirs - 1)).toBeLessThan(0.01);
  });

  it('Hazen–Williams loss within 1 % of the EPANET engine (H-W, C = 120, 800 m of 200 mm at 50 L/s)', () => {
    expect(Math.abs(hazenWilliamsLoss(0.05, 0.2, 800, 120) / epanetLoss(800, 200, 120, 0, 50, 'H-W') - 1)).toBeLessThan(0.01);
  });
});
