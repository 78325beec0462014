/** Plausibility findings on small invented curves (not real products). */
import { describe, expect, it } from 'vitest';
import { buildCurveSet } from '../../src/fit/build.ts';
import type { CurvePoint } from '../../src/model/curveset.ts';
import { linspace } from '../../src/fit/polynomial.ts';

const base = {
  pump: { name: 'Invented test pump' },
  speed_rpm: 2900,
  fluid: { name: 'water', density_kg_m3: 998.2, specific_gravity: 1 },
  display_units: { flow: 'm3/h', head: 'm', npsh: 'm', power: 'kW', diameter: 'mm' },
};
const flows = linspace(0, 0.1, 15);
const pts = (f: (q: number) => number, qs = flows) => qs.map((q) => [q, f(q)] as CurvePoint);
const head = (q: number) => 60 - 2000 * q * q;
const eff = (q: number) => 0.8 * (q / 0.06) * (2 - q / 0.06);
const codes = (points: Record<string, CurvePoint[]>) => buildCurveSet({ ...base, members: [{ diameter_m: 0.25, points }] }).findings.map((f) => `${f.severity}:${f.code}`);

describe('plausibility findings', () => {
  it('a clean invented curve set has no warn or fail', () => {
    expect(codes({ head: pts(head), efficiency: pts(eff, flows.slice(1)) }).filter((c) => !c.startsWith('note'))).toEqual([]);
  });
  it('head rising toward shutoff warns (drooping curve)', () => {
    expect(codes({ head: pts((q) => 55 + 200 * q - 4000 * q * q) })).toContain('warn:head.rising');
  });
  it('efficiency above 95 % fails', () => {
    expect(codes({ head: pts(head), efficiency: pts((q) => eff(q) * 1.25, flows.slice(1)) })).toContain('fail:efficiency.too-high');
  });
  it('efficiency with an offset at low flow warns that it does not fall to zero', () => {
    expect(codes({ head: pts(head), efficiency: pts((q) => 0.3 + 0.6 * eff(q), flows.slice(1)) })).toContain('warn:efficiency.not-zero-at-shutoff');
  });
  it('a BEP beyond the captured range warns', () => {
    expect(codes({ head: pts(head), efficiency: pts(eff, linspace(0.005, 0.045, 10)) })).toContain('warn:bep.outside-range');
  });
  it('a BEP beyond the end of the captured head curve warns that the head at BEP is extrapolated', () => {
    // Efficiency peaks at 0.06 m³/s; the head curve stops at 0.045 m³/s (a head trace that stopped short).
    const found = buildCurveSet({ ...base, members: [{ diameter_m: 0.25, points: { head: pts(head, linspace(0, 0.045, 12)), efficiency: pts(eff, flows.slice(1)) } }] }).findings;
    const f = found.find((x) => x.code === 'bep.beyond-head');
    expect(f?.severity).toBe('warn');
    expect(f?.message).toMatch(/BEP \(216 m³\/h\) lies beyond the end of its head curve \(162 m³\/h\)/);
    // Head captured to the end: no such finding.
    expect(codes({ head: pts(head), efficiency: pts(eff, flows.slice(1)) })).not.toContain('warn:bep.beyond-head');
  });
  it('non-positive NPSHr fails and falling NPSHr at high flow warns', () => {
    expect(codes({ head: pts(head), npshr: pts((q) => -1 + 300 * q * q, flows.slice(2)) })).toContain('fail:npshr.non-positive');
    expect(codes({ head: pts(head), npshr: pts((q) => 2 + 100 * q - 900 * q * q, flows.slice(2)) })).toContain('warn:npshr.falling');
  });
  it('a head curve that starts well above zero flow notes that shutoff is extrapolated', () => {
    expect(codes({ head: pts(head, linspace(0.03, 0.1, 8)) })).toContain('note:head.shutoff-extrapolated');
  });
});
