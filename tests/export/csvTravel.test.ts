/**
 * CSV that travels: shared round flow grid, header block, delimiter and decimal mark, empty
 * cells outside a curve's fitted range, and the round trip export → build.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { curveSetToCsv, curveSetToCurveTable, flowGrid, roundStep } from '../../src/export/csvTable.ts';
import { readPointsTable } from '../../src/model/pointsTable.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { membersByDiameter } from '../../src/fit/affinity.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import { parseUnit } from '../../src/units/index.ts';

const setPath = join('samples', 'demo', 'invented-es4-us.curveset.json');
const set = parseCurveSetJson(readFileSync(setPath, 'utf8'));
const bin = join(process.cwd(), 'bin', 'pumpscribe.mjs');
const run = (args: string[], input?: string) => spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8', ...(input !== undefined ? { input } : {}) });

describe('the shared flow grid', () => {
  it('round steps', () => {
    expect(roundStep(1599, 20)).toBe(80);
    expect(roundStep(1599, 5)).toBe(400);
    expect(roundStep(0.101, 10)).toBe(0.015);
  });

  it('every diameter gets the same flows, starting at zero, in round steps', () => {
    const grid = flowGrid(set, parseUnit('flow', 'gpm'), { points: 21 });
    expect(grid[0]).toBe(0);
    for (let i = 1; i < grid.length; i++) expect(grid[i]! - grid[i - 1]!).toBeCloseTo(grid[1]!, 9);
    const text = curveSetToCsv(set, { meta: false });
    const rows = text.trim().split('\n').slice(1).map((l) => l.split(','));
    const byDiameter = new Map<string, string[]>();
    for (const r of rows) byDiameter.set(r[0]!, [...(byDiameter.get(r[0]!) ?? []), r[1]!]);
    const flows = [...byDiameter.values()];
    expect(flows).toHaveLength(4);
    for (const f of flows) expect(f).toEqual(flows[0]);
    expect(flows[0]!.every((f) => !/\.\d{3,}/.test(f))).toBe(true); // no odd flows like 25.0017
  });

  it('--flow-step gives that step', () => {
    const grid = flowGrid(set, parseUnit('flow', 'gpm'), { flowStep: 250 });
    expect(grid.slice(0, 3)).toEqual([0, 250, 500]);
  });
});

describe('cells and header block', () => {
  it('the header block names pump, speed, density, source and why a cell is empty; a blank line separates it', () => {
    const text = curveSetToCsv(set, { delimiter: ';', decimal: ',' });
    const [block, table] = text.split('\n\n');
    expect(block).toMatch(/# pump: Invented demo pump ES-4/);
    expect(block).toMatch(/# speed \[rpm\]: 1780/);
    expect(block).toMatch(/# density \[kg\/m3\]: 999,014/);
    expect(block).toMatch(/# source: /);
    expect(block).toMatch(/never extrapolated/);
    expect(table!.split('\n')[0]).toBe('diameter [in];flow [gpm];head [ft];efficiency [%];power [hp];npshr [ft]');
    expect(table).toMatch(/^13;\d+;\d+,\d+;/m);
  });

  it('a flow outside a curve’s fitted range is an empty cell, never an extrapolated number', () => {
    const text = curveSetToCsv(set, { meta: false, flowStep: 100 });
    const gpm = parseUnit('flow', 'gpm');
    for (const line of text.trim().split('\n').slice(1)) {
      const [d, q, h] = line.split(',');
      const member = membersByDiameter(set).find((m) => Math.abs(m.diameter_m! / 0.0254 - Number(d)) < 1e-9)!;
      const [lo, hi] = member.curves.head!.fit!.domain;
      const flow = Number(q) * gpm.factor;
      if (flow < lo * (1 - 1e-9) || flow > hi * (1 + 1e-9)) expect(h).toBe('');
      else expect(h).not.toBe('');
    }
  });

  it('the curve table has one column per quantity and diameter', () => {
    const text = curveSetToCurveTable(set, { meta: false, delimiter: '\t' });
    const header = text.split('\n')[0]!.split('\t');
    expect(header[0]).toBe('flow [gpm]');
    expect(header).toContain('head 13 in [ft]');
    expect(header).toContain('efficiency 10 in [%]');
  });

  it('a delimiter equal to the decimal mark is refused with a sentence', () => {
    expect(() => curveSetToCsv(set, { delimiter: ',', decimal: ',' })).toThrow(/use --delimiter ";"/);
  });
});

describe('the points-table reader accepts what export writes', () => {
  it('units in the header, ";" and a decimal comma, the header block kept as meta', () => {
    const t = readPointsTable(curveSetToCsv(set, { delimiter: ';', decimal: ',' }));
    expect(t.layout).toBe('wide');
    expect(t.delimiter).toBe(';');
    expect(t.units).toMatchObject({ diameter: 'in', flow: 'gpm', head: 'ft', efficiency: '%', power: 'hp', npshr: 'ft' });
    expect(t.meta['speed [rpm]']).toBe('1780');
    expect(t.rows.find((r) => r.quantity === 'head' && r.diameter === 13 && r.flow > 0)!.value).toBeGreaterThan(100);
  });

  it('tab-delimited rows whose empty cells are at the end', () => {
    const t = readPointsTable('diameter [mm]\tflow [m3/h]\thead [m]\tefficiency [%]\n250\t0\t50\t\n250\t10\t49,5\t40\n');
    expect(t.rows).toHaveLength(3);
    expect(t.rows[1]!.value).toBe(49.5);
  });

  it('export --delimiter ";" --decimal "," reads back with build into the same curve set, within the fit tolerance', () => {
    const exported = run(['export', setPath, '--format', 'csv', '--delimiter', ';', '--decimal', ',', '--flow-step', '50']);
    expect(exported.status).toBe(0);
    const built = run(['build', '-', '-o', '-'], exported.stdout);
    expect(built.stderr).not.toMatch(/pumpscribe:/);
    expect(built.status).toBe(0);
    const back = parseCurveSetJson(built.stdout);
    expect(back.speed_rpm).toBe(set.speed_rpm);
    expect(back.pump.name).toBe(set.pump.name);
    expect(back.display_units).toEqual(set.display_units);
    const a = membersByDiameter(set);
    const b = membersByDiameter(back);
    expect(b.map((m) => m.diameter_m)).toEqual(a.map((m) => m.diameter_m));
    for (let i = 0; i < a.length; i++) {
      for (const q of ['head', 'efficiency', 'power', 'npshr'] as const) {
        const fa = a[i]!.curves[q]!.fit!;
        const fb = b[i]!.curves[q]!.fit!;
        // Tolerance: the original fit's own largest residual, plus the 6 significant digits of the CSV.
        const tolerance = fa.max_residual + 1e-5 * Math.abs(evaluateUnchecked(fa, fa.domain[0]) || 1);
        const [lo, hi] = fb.domain;
        for (let k = 0; k <= 20; k++) {
          const flow = lo + ((hi - lo) * k) / 20;
          expect(Math.abs(evaluateUnchecked(fb, flow) - evaluateUnchecked(fa, flow))).toBeLessThanOrEqual(tolerance);
        }
      }
    }
  });
});
