/**
 * `check` re-runs the checks of a curve set, but a take-off's findings (an untrusted trace,
 * an iso-line meeting a head curve too often) cannot be recomputed without the sheet: they are
 * kept, so that a set read from an untrusted trace still fails `check` (exit 1).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { recheck } from '../../src/cli/commands/check.ts';
import { makeFinding } from '../../src/fit/checks/finding.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';

const demo = join(import.meta.dirname, '..', '..', 'samples', 'demo', 'invented-es4-us.curveset.json');

describe('check keeps the take-off findings of a curve set', () => {
  it('an untrusted trace stays a fail after the checks are run again', () => {
    const set = parseCurveSetJson(readFileSync(demo, 'utf8'));
    expect(recheck(set).findings.some((f) => f.severity === 'fail')).toBe(false);
    const untrusted = makeFinding({ code: 'takeoff.trace-untrusted', severity: 'fail', message: 'Trace 3 (head at diameter 11 on panel "head") cannot be trusted: 40 % of its length was not seen and was bridged. Add a guide where this line stands alone.', method: 'Take-off replay', trace: '3' });
    const again = recheck({ ...set, findings: [...set.findings, untrusted] });
    expect(again.findings.filter((f) => f.severity === 'fail').map((f) => f.code)).toEqual(['takeoff.trace-untrusted']);
  });
});
