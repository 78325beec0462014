import { describe, expect, it } from 'vitest';
import { MATERIAL_ROUGHNESS_M, runK, runLoss, runRoughness, systemFromPipes, type LiquidFlowProps } from '../../src/duty/pipeRun.ts';
import { FITTING_K } from '../../src/physics/fittings.ts';
import { darcyWeisbachLoss, hazenWilliamsLoss } from '../../src/physics/pipeFriction.ts';
import { systemHead } from '../../src/duty/systemCurve.ts';

const water: LiquidFlowProps = { density_kg_m3: 998.2, kinematic_viscosity_m2_s: 1.0034e-6, is_water: true };

describe('pipe runs', () => {
  it('sum the given K and the named fittings of the table (typical values, from memory)', () => {
    const k = runK({ diameter_m: 0.2, length_m: 10, k: 0.5, fittings: [{ name: 'elbow-90', count: 3 }, { name: 'gate-valve' }] });
    expect(k).toBeCloseTo(0.5 + 3 * FITTING_K['elbow-90']!.k + FITTING_K['gate-valve']!.k, 12);
    expect(() => runK({ diameter_m: 0.2, length_m: 10, fittings: [{ name: 'flux-capacitor' }] })).toThrow(/Unknown fitting "flux-capacitor"/);
  });

  it('take the roughness of the material when none is given, and refuse a run with neither', () => {
    expect(runRoughness({ diameter_m: 0.2, length_m: 1, material: 'cast-iron' })).toBe(MATERIAL_ROUGHNESS_M['cast-iron']);
    expect(() => runRoughness({ diameter_m: 0.2, length_m: 1 })).toThrow(/roughness or a material/);
  });

  it('a run loses f·L/D·v²/2g plus ΣK·v²/2g, and the system curve adds the static head to the runs', () => {
    const run = { diameter_m: 0.2027, length_m: 400, roughness_m: 0.045e-3, k: 6.5 };
    const q = 0.064;
    expect(runLoss(run, q, water).loss_m).toBeCloseTo(darcyWeisbachLoss(q, 0.2027, 400, 0.045e-3, water.kinematic_viscosity_m2_s, 6.5).loss_m, 12);
    const sys = systemFromPipes(20, [run], water, 'darcy-weisbach', q);
    expect(systemHead(sys, q)).toBeCloseTo(20 + runLoss(run, q, water).loss_m, 12);
    expect(sys.exponent).toBeGreaterThan(1.8);
    expect(sys.exponent).toBeLessThan(2);
  });

  it('Hazen–Williams runs need a C factor and water', () => {
    const run = { diameter_m: 0.2, length_m: 800, hazen_williams_c: 120 };
    expect(runLoss(run, 0.05, water, 'hazen-williams').loss_m).toBeCloseTo(hazenWilliamsLoss(0.05, 0.2, 800, 120), 12);
    expect(() => runLoss({ diameter_m: 0.2, length_m: 800 }, 0.05, water, 'hazen-williams')).toThrow(/C factor/);
    expect(() => runLoss(run, 0.05, { ...water, is_water: false }, 'hazen-williams')).toThrow(/water only/);
  });
});
