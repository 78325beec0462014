import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { EMPTY_DUTY, nextOption, studyOfForm } from '../../src/ui/views/studyForm.ts';
import { runDuty } from '../../src/ui/views/dutyPanel.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { systemHead } from '../../src/duty/systemCurve.ts';

const set = parseCurveSetJson(readFileSync('samples/demo/invented-si3-si.curveset.json', 'utf8'), 'demo'); // invented demo family

describe('the workbench study form', () => {
  it('is blank until a duty flow is typed', () => {
    expect(studyOfForm(EMPTY_DUTY, 'si')).toBeNull();
  });

  it('a quick duty (flow, head, static) gives a system curve through the duty point (equivalent K, exact at the duty)', () => {
    const outcome = runDuty(set, { ...EMPTY_DUTY, flow: '200', head: '60', staticHead: '45' }, 'si');
    expect(outcome && 'result' in outcome).toBe(true);
    if (!outcome || !('result' in outcome)) return;
    const best = outcome.result.ranked[0]!;
    expect(Math.abs(systemHead(best.systems.high, 200 / 3600) - 60)).toBeLessThan(1e-9);
    expect(outcome.overlay.system.length).toBeGreaterThan(10);
  });

  it('each click adds another alternative, and a bad number is refused with a sentence', () => {
    const options = [EMPTY_DUTY.options[0]!, nextOption(EMPTY_DUTY.options)];
    expect(options[1]!.name).toBe('Option 2');
    const outcome = runDuty(set, { ...EMPTY_DUTY, flow: '200', head: '60', staticHead: '45', options }, 'si');
    expect(outcome && 'result' in outcome && outcome.result.ranked.length).toBe(2);
    expect(runDuty(set, { ...EMPTY_DUTY, flow: 'abc' }, 'si')).toEqual({ error: 'Duty flow must be a decimal number such as 12.5 or 1e3, not "abc".' });
    expect(runDuty(set, { ...EMPTY_DUTY, flow: '200', head: '30', staticHead: '45' }, 'si')).toEqual({ error: 'The duty head lies below the static head; the duty head must include the static head, so check both values.' });
  });
});
