/**
 * `pumpscribe duty`, run as a user runs it, on invented families (not real products): curve sets
 * built from noisy readings of the demo families, and the exact invented set of inventedFamily.ts.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { inventedSiFamily, inventedUsFamily, type InventedFamily } from '../../src/demo/inventedFamily.ts';
import { pointsTableText, samplePoints } from '../../src/demo/sampling.ts';
import { FOOT, INCH, US_GALLON } from '../../src/units/constants.ts';
import { inventedCurveSet, A, D_FULL, H0 } from './inventedFamily.ts';

const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-duty-'));
const tsx = join('node_modules', 'tsx', 'dist', 'cli.mjs');
const GPM = US_GALLON / 60;

function run(...args: string[]) {
  const r = spawnSync(process.execPath, [tsx, 'src/cli/main.ts', ...args], { encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
}
function file(name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

/** Exact diameter of an invented demo family meeting (q, h): bisection on head(q, d) = h. */
function exactDiameter(fam: InventedFamily, q: number, h: number): number {
  let lo = 0.5 * (fam.diameters_m[0] as number);
  let hi = fam.diameters_m[0] as number;
  for (let i = 0; i < 100; i++) {
    const mid = 0.5 * (lo + hi);
    if (fam.head(q, mid) > h) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

const usSet = join(dir, 'us.curveset.json');
const siSet = join(dir, 'si.curveset.json');
const exactSet = file('exact.curveset.json', JSON.stringify(inventedCurveSet()));

beforeAll(() => {
  const us = file('us.csv', pointsTableText(samplePoints(inventedUsFamily(), { system: 'us', seed: 5 })));
  const si = file('si.csv', pointsTableText(samplePoints(inventedSiFamily(), { system: 'si', seed: 7 })));
  expect(run('build', us, '-o', usSet, '--units', 'us', '--speed', '1780', '--name', 'Invented demo pump', '-q').code).toBe(0);
  expect(run('build', si, '-o', siSet, '--units', 'si', '--speed', '2900', '--name', 'Invented demo pump SI', '-q').code).toBe(0);
});

describe('pumpscribe duty on invented families', () => {
  it('US family built from noisy readings: the trim is within 1 % of the exact diameter, and the JSON has one operating point per diameter', () => {
    const r = run('duty', usSet, '--flow', '1000', '--head', '115', '--static', '60', '--units', 'us', '--json');
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const v = JSON.parse(r.out);
    const exact = exactDiameter(inventedUsFamily(), 1000 * GPM, 115 * FOOT) / INCH;
    expect(Math.abs(v.trim.diameter / exact - 1)).toBeLessThan(0.01);
    expect(v.operating_points).toHaveLength(4);
    for (const op of v.operating_points) {
      for (const key of ['diameter', 'flow', 'head', 'efficiency', 'power', 'npshr']) expect(typeof op[key]).toBe('number');
      expect(op.efficiency).toBeGreaterThan(40); // in %, not a fraction
    }
    expect(v.units.flow).toBe('gpm');
    expect(v.system_curve.static_head).toBe(60);
  });

  it('SI family built from noisy readings: the trim is within 1 % of the exact diameter', () => {
    const r = run('duty', siSet, '--flow', '200', '--head', '60', '--static', '20', '--json');
    expect(r.code).toBe(0);
    const v = JSON.parse(r.out);
    const exact = exactDiameter(inventedSiFamily(), 200 / 3600, 60) * 1000;
    expect(Math.abs(v.trim.diameter / exact - 1)).toBeLessThan(0.01);
  });

  it('exact invented set: the trim is within 0.01 % of 250·√((H + 12000 Q²)/50) mm', () => {
    const r = run('duty', exactSet, '--flow', '108', '--head', '33', '--static', '15', '--json');
    const v = JSON.parse(r.out);
    const q = 108 / 3600;
    const exact = 1000 * D_FULL * Math.sqrt((33 + A * q * q) / H0);
    expect(Math.abs(v.trim.diameter / exact - 1)).toBeLessThan(1e-4);
  });

  it('prints a readable report with units and cautions beside NPSH and motor results', () => {
    const r = run('duty', siSet, '--flow', '200', '--head', '60', '--static', '20', '--elevation', '300', '--temperature', '25', '--suction-static', '2', '--suction-loss', '0.5', '--hours', '4000', '--tariff', '0.12', '--motor-efficiency', '94');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/Trim meeting the duty:[\s\S]*diameter [0-9.]+ mm of 260 mm/);
    expect(r.out).toMatch(/NPSH available:[\s\S]*NPSHa [0-9.]+ m, NPSH3 [0-9.]+ m[\s\S]*Caution: NPSH3 is the point/);
    expect(r.out).toMatch(/Motor \(IEC ratings\):[\s\S]*next standard size: [0-9.]+ kW[\s\S]*Caution: Motor size is preliminary/);
    expect(r.out).toMatch(/kWh per year over 4000 h/);
  });

  it('adds the governing-code caution for a fire duty', () => {
    const r = run('duty', siSet, '--flow', '200', '--head', '60', '--service', 'fire');
    expect(r.out).toMatch(/Caution: Fire-protection duty: follow the governing fire code/);
  });

  it('exits 1 when no trim meets the duty (duty above the full-diameter curve)', () => {
    const r = run('duty', siSet, '--flow', '200', '--head', '150', '--static', '20', '--json');
    expect(r.code).toBe(1);
    expect(JSON.parse(r.out).trim.status).toBe('above-range');
  });

  it('exits 1 when NPSHa is below NPSH3', () => {
    const r = run('duty', siSet, '--flow', '200', '--head', '60', '--static', '20', '--suction-static', '-8', '--suction-loss', '2', '--temperature', '60', '--json');
    expect(r.code).toBe(1);
    expect(JSON.parse(r.out).npsh.points[0].verdict).toBe('cavitation-expected');
  });
});

describe('pumpscribe duty refuses unusable input with exit 2 and one sentence', () => {
  const expectOneSentence = (r: ReturnType<typeof run>, pattern: RegExp) => {
    expect(r.code).toBe(2);
    const lines = r.err.trim().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^pumpscribe: .*[.]$/);
    expect(lines[0]).toMatch(pattern);
  };
  it('a JSON file that is not a curve set', () => {
    expectOneSentence(run('duty', file('other.json', '{"hello": 1}'), '--flow', '100', '--head', '30'), /not valid|curve set/i);
  });
  it('a malformed JSON file', () => {
    expectOneSentence(run('duty', file('broken.json', '{"format": '), '--flow', '100', '--head', '30'), /not valid JSON/);
  });
  it('a flow that is not a number', () => {
    expectOneSentence(run('duty', siSet, '--flow', 'lots', '--head', '30'), /--flow must be a decimal number/);
  });
  it('a static head above the duty head', () => {
    expectOneSentence(run('duty', siSet, '--flow', '100', '--head', '30', '--static', '40'), /below the static head/);
  });
  it('energy without a motor efficiency', () => {
    expectOneSentence(run('duty', siSet, '--flow', '100', '--head', '30', '--hours', '4000'), /--motor-efficiency/);
  });
  it('a liquid temperature beyond the boiling point at the site', () => {
    expectOneSentence(run('duty', siSet, '--flow', '100', '--head', '30', '--temperature', '120'), /boil/);
  });
});
