import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { ZodError } from 'zod';
import { parseStudy, studyJsonSchema } from '../../src/model/study.ts';
import { schemaText } from '../../src/model/jsonSchema.ts';
import { resolveOption } from '../../src/study/resolve.ts';

import { ISSUE_STUDY } from './issueStudy.ts';

describe('the study file', () => {
  it('accepts the shape shown in the issue, with format and version filled in', () => {
    const s = parseStudy(ISSUE_STUDY);
    expect(s.format).toBe('pumpscribe.study');
    expect(s.version).toBe(1);
    expect(s.options).toHaveLength(2);
  });

  it('an option overrides the part of the base it names: the 6 in option keeps the base static head and suction', () => {
    const s = parseStudy(ISSUE_STUDY);
    const six = resolveOption(s, s.options[1]!);
    expect(six.discharge.pipes[0]!.diameter_m).toBeCloseTo(0.1541, 12);
    expect([six.discharge.static_low_m, six.discharge.static_high_m]).toEqual([18, 22]);
    expect(six.suction.pipes[0]!.diameter_m).toBeCloseTo(0.2027, 12);
    expect(six.duty.flow_m3s).toBeCloseTo(230 / 3600, 15);
    expect(six.site.pressure_Pa).toBeCloseTo(96000, 9);
    expect(six.liquid.temperature_K).toBeCloseTo(303.15, 12);
  });

  it('reads US units: gpm, ft, in, psi, °F', () => {
    const s = parseStudy({ ...ISSUE_STUDY, units: 'us', liquid: { temperature: 86 }, site: { pressure: 14 }, duty: { flow: 1000 } });
    const o = resolveOption(s, s.options[0]!);
    expect(o.duty.flow_m3s).toBeCloseTo((1000 * 3.785411784e-3) / 60, 12);
    expect(o.suction.pipes[0]!.diameter_m).toBeCloseTo(202.7 * 0.0254, 12);
    expect(o.discharge.static_high_m).toBeCloseTo(22 * 0.3048, 12);
    expect(o.site.pressure_Pa).toBeCloseTo(14 * 6894.757293168, 3);
    expect(o.liquid.temperature_K).toBeCloseTo(303.15, 9);
    expect(o.motor_standard).toBe('nema');
  });

  it('refuses unusable files with a sentence: duplicate names, no hours, unknown fields', () => {
    expect(() => parseStudy({ ...ISSUE_STUDY, options: [ISSUE_STUDY.options[0], ISSUE_STUDY.options[0]] })).toThrow(/Two options share the name "8 in pipe"/);
    const s = parseStudy({ ...ISSUE_STUDY, operation: { tariff: 0.1 } });
    expect(() => resolveOption(s, s.options[0]!)).toThrow(/needs "hours_per_year" or a "profile"/);
    expect(() => parseStudy({ ...ISSUE_STUDY, colour: 'red' })).toThrow(ZodError);
    expect(() => parseStudy({ ...ISSUE_STUDY, version: 9 })).toThrow(/newer than this tool reads/);
  });

  it('schemas/study.schema.json matches the zod model (run `npm run schemas` after changing it)', () => {
    expect(readFileSync('schemas/study.schema.json', 'utf8')).toBe(schemaText(studyJsonSchema()));
  });
});
