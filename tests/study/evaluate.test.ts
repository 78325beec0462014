import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { parseStudy } from '../../src/model/study.ts';
import { runStudy } from '../../src/study/runStudy.ts';
import { waterDensityKell } from '../../src/physics/water.ts';
import { ISSUE_STUDY } from './issueStudy.ts';

const set = parseCurveSetJson(readFileSync('samples/demo/invented-si3-si.curveset.json', 'utf8'), 'demo'); // invented demo family
const one = (extra: Record<string, unknown>) =>
  runStudy(parseStudy({ ...ISSUE_STUDY, discharge: { static_head: [40, 44], pipes: ISSUE_STUDY.discharge.pipes }, options: [{ name: 'full', curveset: 'x', impeller: 'drawn' }], ...extra }), () => set).ranked[0]!;

describe('a study option', () => {
  it('power follows the density at the pumping temperature (Kell 1975): 80 °C against 20 °C at the same flow and head', () => {
    const cold = one({ liquid: { temperature: 20 } });
    const hot = one({ liquid: { temperature: 80 } });
    const ratio = waterDensityKell(353.15) / waterDensityKell(293.15);
    expect(Math.abs((hot.duty!.power_W as number) / (cold.duty!.power_W as number) / ratio - 1)).toBeLessThan(1e-9);
  });

  it('a viscous liquid is corrected by ANSI/HI 9.6.7: less head and efficiency at the same flow, noted as from memory', () => {
    const water = one({});
    const oil = one({ liquid: { temperature: 30, viscosity: 60, density: 880, vapour_pressure: 1 } });
    expect(oil.viscous?.b).toBeGreaterThan(1);
    expect(oil.duty!.per_pump.head_m).toBeLessThan(water.duty!.per_pump.head_m);
    expect(oil.duty!.efficiency as number).toBeLessThan(water.duty!.efficiency as number);
    expect(oil.findings.map((f) => f.message).join(' ')).toMatch(/ANSI\/HI 9\.6\.7 \(from memory/);
  });

  it('refuses a liquid too viscous for the method with one sentence', () => {
    expect(() => one({ liquid: { temperature: 30, viscosity: 20000, density: 950, vapour_pressure: 0.1 } })).toThrow(/outside the ANSI\/HI 9\.6\.7 method/);
  });

  it('refuses Hazen–Williams for a liquid other than water', () => {
    const pipes = [{ diameter: 202.7, length: 400, c: 120 }];
    expect(() => one({ friction: 'hazen-williams', liquid: { temperature: 30, viscosity: 5, density: 880, vapour_pressure: 1 }, discharge: { static_head: [40, 44], pipes }, suction: { surface_above_eye: 1, pipes: [] } })).toThrow(/Hazen–Williams holds for water only/);
  });
});
