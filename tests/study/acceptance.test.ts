/**
 * Acceptance of the duty study on the invented demo families (src/demo, samples/demo; not real
 * products). Each expected value is worked out here by hand from first principles, independently
 * of the study engine, with its source named beside it.
 */
import { describe, expect, it } from 'vitest';
import psychrolib from 'psychrolib';
import { siSet, study, twelveOptionStudy } from './studyCases.ts';
import type { CurveSet, Member } from '../../src/model/curveset.ts';
import { runStudy } from '../../src/study/runStudy.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import { npshMarginRule } from '../../src/duty/npshMargin.ts';
import { familyFigures } from '../../src/fit/checks/speedFigures.ts';

const G = 9.80665; // standard gravity (CGPM), exact

/** Water at 30 °C by hand: Kell (1975) density written out; ASHRAE saturation pressure from psychrolib; viscosity 797.2 µPa·s (IAPWS 2008 at 0.1 MPa, from memory). */
function water30() {
  const t = 30;
  const rho = (999.83952 + 16.945176 * t - 7.9870401e-3 * t ** 2 - 46.170461e-6 * t ** 3 + 105.56302e-9 * t ** 4 - 280.54253e-12 * t ** 5) / (1 + 16.87985e-3 * t);
  psychrolib.SetUnitSystem(psychrolib.SI);
  const pv = psychrolib.GetSatVapPres(t); // ASHRAE Handbook Fundamentals (Hyland–Wexler), 4246.0 Pa
  return { rho, pv, nu: 797.2e-6 / rho };
}

/** Darcy–Weisbach loss by hand: Colebrook–White by plain fixed-point iteration (Colebrook 1939). */
function handLoss(q: number, d: number, l: number, eps: number, k: number, nu: number): number {
  const v = (4 * q) / (Math.PI * d * d);
  const re = (v * d) / nu;
  let x = 8;
  for (let i = 0; i < 200; i++) x = -2 * Math.log10(eps / d / 3.7 + (2.51 * x) / re);
  const f = 1 / (x * x);
  return (f * (l / d) + k) * (v * v) / (2 * G);
}

describe('the worked suction case: 96 kPa abs, water 30 °C, surface 1 m above the eye, 20 m of 8 in sch 40 steel, K = 1.0, about 2 m/s', () => {
  const w = water30();
  const q = 230 / 3600; // 1.98 m/s in 202.7 mm (ASME B36.10M sch 40 inside diameter)
  const hand = (96000 - w.pv) / (w.rho * G) + 1.0 - handLoss(q, 0.2027, 20, 0.045e-3, 1.0, w.nu);
  const result = runStudy(study({ options: [{ name: 'worked case', impeller: 'drawn' }] }), () => siSet);
  const r = result.ranked[0]!;

  it('velocity is about 2 m/s', () => {
    expect(Math.abs((4 * q) / (Math.PI * 0.2027 ** 2) - 2)).toBeLessThan(0.05);
  });

  it(`NPSHa at the duty matches the hand value ${hand.toFixed(3)} m within 0.02 m`, () => {
    expect(Math.abs((r.npsh?.duty?.npsha_m ?? NaN) - hand)).toBeLessThan(0.02);
  });

  it('the allowable eye elevation matches the hand scan over minimum flow to run-out within 0.05 m', () => {
    const range = r.npsh!.range!.range_m3s;
    const member = [...siSet.members].sort((a, b) => (b.diameter_m ?? 0) - (a.diameter_m ?? 0))[0] as Member;
    const rule = npshMarginRule('general', familyFigures(siSet).nss_us);
    let z = Infinity;
    for (let i = 0; i <= 400; i++) {
      const qq = range[0] + ((range[1] - range[0]) * i) / 400;
      const n3 = evaluateUnchecked(member.curves.npshr!.fit!, qq);
      const required = Math.max(rule.ratio * n3, n3 + rule.min_margin_m); // ANSI/HI 9.6.1 summary
      z = Math.min(z, (96000 - w.pv) / (w.rho * G) - handLoss(qq, 0.2027, 20, 0.045e-3, 1.0, w.nu) - required);
    }
    expect(Math.abs((r.npsh?.max_eye_elevation_m ?? NaN) - z)).toBeLessThan(0.05);
  });

  it('the report reconciles the velocity-head convention with the hand method in one line', () => {
    expect(r.npsh?.velocity_head).toMatch(/hand method from the flange/);
  });
});

describe('a sheet with one NPSHr curve in a study', () => {
  it('every trimmed option gets an NPSH3 at the duty, never below the drawn curve at that flow', () => {
    const set: CurveSet = structuredClone(siSet);
    const full = [...set.members].sort((a, b) => (b.diameter_m ?? 0) - (a.diameter_m ?? 0))[0] as Member;
    for (const m of set.members) if (m !== full) delete m.curves.npshr;
    const flows = [150, 180, 210, 240];
    const s = study({ options: flows.map((f) => ({ name: `trim for ${f}`, impeller: 'trim' as const, duty: { flow: f } })), discharge: { static_head: [30, 34], pipes: [{ diameter: 202.7, length: 400, roughness: 0.045, k: 6.5 }] } });
    const result = runStudy(s, () => set);
    for (const r of result.ranked) {
      const at = r.npsh?.duty;
      expect(at, r.name).toBeDefined();
      expect(at!.npsh3_m).toBeGreaterThanOrEqual(evaluateUnchecked(full.curves.npshr!.fit!, at!.flow_m3s) - 1e-12);
    }
  });
});

describe('a study of 2 pipe sizes × 3 impellers × 1–2 pumps', () => {
  const s = twelveOptionStudy();

  it('gives all twelve options a result (its time is measured by `npm run bench -- duty`)', () => {
    expect(runStudy(s, () => siSet).ranked).toHaveLength(12);
  });

  it('ranks the options as a hand spreadsheet of the same inputs does', () => {
    const result = runStudy(s, () => siSet);
    const w = water30();
    const annuity = (1 - 1.05 ** -20) / 0.05; // HI/Europump LCC guide: present value of a uniform series
    const hand = s.options.map((o) => {
      const member = siSet.members.find((m) => Math.abs((m.diameter_m ?? 0) * 1000 - (o.diameter as number)) < 0.5) as Member;
      const Q = 200 / 3600;
      const q = Q / (o.pumps as number);
      const d = (o.discharge!.pipes![0]!.diameter as number) / 1000;
      const systemHigh = 36 + handLoss(Q, d, 400, 0.045e-3, 6.5, w.nu) + handLoss(q, 0.2027, 20, 0.045e-3, 1.0, w.nu);
      const pumpHead = evaluateUnchecked(member.curves.head!.fit!, q);
      // Sheet power curve at the sheet's density, scaled to the density at 30 °C (power ∝ ρ).
      const power = (o.pumps as number) * evaluateUnchecked(member.curves.power!.fit!, q) * (w.rho / siSet.fluid.density_kg_m3);
      const annualCost = (power / 0.94) * 6000 / 1000 * 0.15;
      return { name: o.name, feasible: pumpHead >= systemHigh, lcc: (o.capital_cost as number) + annualCost * annuity };
    });
    const handOrder = [...hand].sort((a, b) => Number(!a.feasible) - Number(!b.feasible) || a.lcc - b.lcc).map((h) => h.name);
    const feasible = hand.filter((h) => h.feasible).length;
    expect(feasible).toBeGreaterThan(3);
    expect(feasible).toBeLessThan(12);
    expect(result.ranked.slice(0, feasible).map((r) => r.name)).toEqual(handOrder.slice(0, feasible));
    expect(new Set(result.ranked.slice(feasible).map((r) => r.name))).toEqual(new Set(handOrder.slice(feasible)));
    // and the LCC figures agree within 0.5 % (hand friction by fixed-point Colebrook, handbook viscosity)
    for (const r of result.ranked.slice(0, feasible)) {
      const h = hand.find((x) => x.name === r.name)!;
      expect(Math.abs((r.lcc?.total ?? 0) / h.lcc - 1)).toBeLessThan(0.005);
    }
    expect(result.why).toMatch(new RegExp(`^"${handOrder[0]}" wins`));
  });
});
