/** Findings never show NaN, Infinity or the "—" placeholder; a fit that overflows is named. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runChecks } from '../../src/fit/checks/index.ts';
import { makeFinding, withoutPlaceholders } from '../../src/fit/checks/finding.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';

const demo = () => parseCurveSetJson(readFileSync(join(import.meta.dirname, '..', '..', 'samples', 'demo', 'invented-si3-si.curveset.json'), 'utf8'));

describe('withoutPlaceholders', () => {
  it('leaves a clean message alone', () => {
    expect(withoutPlaceholders('The 240 mm head curve is +3.1 % off.')).toBe('The 240 mm head curve is +3.1 % off.');
  });
  it('says "not computable" in place of NaN, Infinity and "—", and why', () => {
    const out = withoutPlaceholders('flow −NaN % along the parabola, head — m, power Infinity kW.');
    expect(out).not.toMatch(/NaN|Infinity|—/);
    expect(out).toMatch(/^flow \(not computable\) % along the parabola, head \(not computable\) m, power \(not computable\) kW\. A figure marked "not computable"/);
  });
  it('is applied by makeFinding', () => {
    expect(makeFinding({ code: 'x', severity: 'note', message: 'at NaN m', method: 'm' }).message).not.toMatch(/NaN/);
  });
});

describe('checks on a set whose fits overflow', () => {
  it('name the overflowing fit and print no NaN, Infinity or placeholder', () => {
    const set = demo();
    const m = set.members[1]!;
    m.curves.head!.fit!.coefficients = m.curves.head!.fit!.coefficients.map((c, i, all) => (i === all.length - 1 ? 1e308 : c));
    m.curves.npshr!.fit!.coefficients = m.curves.npshr!.fit!.coefficients.map((c) => c * 1e300);
    const { findings } = runChecks(set);
    for (const f of findings) expect(f.message, f.id).not.toMatch(/NaN|Infinity|—/);
    expect(findings.filter((f) => f.code === 'points.fit-disagrees' && f.severity === 'fail').map((f) => f.subject.quantity).sort()).toEqual(['head', 'npshr']);
  });
});
