/**
 * Invented study cases shared by the study acceptance tests and the duty bench (the demo family
 * samples/demo/invented-si3-si.curveset.json; not a real product).
 */
import { readFileSync } from 'node:fs';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { parseStudy, type StudyInput } from '../../src/model/study.ts';

export const siSet = parseCurveSetJson(readFileSync('samples/demo/invented-si3-si.curveset.json', 'utf8'), 'demo');

/** A study on the SI demo family: water at 30 °C, 96 kPa site, 8 in suction and discharge runs; `extra` overrides. */
export function study(extra: Partial<StudyInput> & { options: StudyInput['options'] }) {
  const base: StudyInput = {
    units: 'si',
    liquid: { temperature: 30 },
    site: { pressure: 96 },
    duty: { flow: 230 },
    suction: { surface_above_eye: [1.0, 1.0], pipes: [{ diameter: 202.7, length: 20, roughness: 0.045, k: 1.0 }] },
    discharge: { static_head: [40, 46], pipes: [{ diameter: 202.7, length: 400, roughness: 0.045, k: 6.5 }] },
    curveset: 'si.curveset.json',
    operation: { hours_per_year: 6000, tariff: 0.15, motor_efficiency: 94, years: 20, discount_rate: 5 },
    ...extra,
  };
  return parseStudy(base);
}

/** 2 pipe sizes × 3 impellers × 1–2 pumps: twelve options on the SI demo family. */
export function twelveOptionStudy() {
  const pipes = { '8 in': 202.7, '6 in': 154.1 } as const;
  const impellers = [260, 240, 220];
  const options: StudyInput['options'] = [];
  for (const [pipe, d] of Object.entries(pipes)) for (const imp of impellers) for (const pumps of [1, 2]) {
    options.push({
      name: `${pipe}, ${imp} mm, ${pumps} pump${pumps > 1 ? 's' : ''}`,
      impeller: 'drawn', diameter: imp, pumps,
      capital_cost: (pipe === '8 in' ? 30000 : 18000) + pumps * (12000 + imp * 20),
      discharge: { pipes: [{ diameter: d, length: 400, roughness: 0.045, k: 6.5 }] },
    });
  }
  return study({ options, duty: { flow: 200 }, suction: { surface_above_eye: [4, 5], pipes: [{ diameter: 202.7, length: 20, roughness: 0.045, k: 1.0 }] }, discharge: { static_head: [30, 36], pipes: [] } });
}
