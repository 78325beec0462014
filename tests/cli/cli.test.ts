/** The command line, run as a user runs it. Each bad input: exit 2 and one sentence on stderr. */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { inventedUsFamily } from '../../src/demo/inventedFamily.ts';
import { pointsTableText, samplePoints } from '../../src/demo/sampling.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';

const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-cli-'));
const tsx = join('node_modules', 'tsx', 'dist', 'cli.mjs');

function run(...args: string[]) {
  const r = spawnSync(process.execPath, [tsx, 'src/cli/main.ts', ...args], { encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
}
function file(name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}
function expectOneSentence(r: ReturnType<typeof run>, pattern: RegExp) {
  expect(r.code).toBe(2);
  const lines = r.err.trim().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(/^pumpscribe: [A-Z"].*[.]$/);
  expect(lines[0]).toMatch(pattern);
  expect(r.err).not.toMatch(/\n\s+at /);
}

const good = file('good.csv', pointsTableText(samplePoints(inventedUsFamily(), { system: 'us', seed: 11 })));
const goodSet = join(dir, 'good.curveset.json');

describe('pumpscribe build, check, export, scale', () => {
  beforeAll(() => {
    const r = run('build', good, '-o', goodSet, '--units', 'us', '--speed', '1780', '--name', 'Invented demo pump', '-q');
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
  });

  it('build writes a valid curve set with four diameters in US display units', () => {
    const set = parseCurveSetJson(readFileSync(goodSet, 'utf8'));
    expect(set.members).toHaveLength(4);
    expect(set.display_units.diameter).toBe('in');
  });

  it('check passes the consistent family (exit 0) and prints JSON on request', () => {
    const r = run('check', goodSet, '--json');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out).passed).toBe(true);
  });

  it('check exits 1 and names 11.6 in for a mislabelled diameter', () => {
    const bad = file('mislabel.csv', pointsTableText(samplePoints(inventedUsFamily(), { system: 'us', seed: 11, relabel: { 2: 11.6 } })));
    const out = join(dir, 'mislabel.curveset.json');
    expect(run('build', bad, '-o', out, '--units', 'us', '--speed', '1780', '-q').code).toBe(1);
    const r = run('check', out);
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/FAIL {2}The 11\.6 in head curve/);
  });

  it('export csv writes the header in the chosen units and one row per flow per diameter', () => {
    const us = run('export', goodSet, '--format', 'csv', '--points', '5', '--no-meta');
    expect(us.code).toBe(0);
    const lines = us.out.trim().split('\n');
    expect(lines[0]).toBe('diameter [in],flow [gpm],head [ft],efficiency [%],power [hp],npshr [ft]');
    expect((lines.length - 1) % 4).toBe(0); // the same flow grid for each of the 4 diameters
    expect(lines.length - 1).toBeLessThanOrEqual(4 * 5);
    const si = run('export', goodSet, '--format', 'csv', '--units', 'si', '--points', '3', '--no-meta');
    expect(si.out.split('\n')[0]).toBe('diameter [mm],flow [m3/h],head [m],efficiency [%],power [kW],npshr [m]');
    expect(si.out.split('\n')[1]).toMatch(/^330\.2,0,[0-9.]*,/);
  });

  it('export json converts the set to the chosen units', () => {
    const out = join(dir, 'view.json');
    expect(run('export', goodSet, '--format', 'json', '--units', 'si', '-o', out).code).toBe(0);
    const view = JSON.parse(readFileSync(out, 'utf8'));
    expect(view.units.flow).toBe('m3/h');
    expect(view.members[0].diameter).toBeCloseTo(330.2, 6);
  });

  it('scale converts the set to 1480 rpm by the affinity laws', () => {
    const out = join(dir, 'scaled.curveset.json');
    expect(run('scale', goodSet, '--speed', '1480', '-o', out, '-q').code).toBe(0);
    const a = parseCurveSetJson(readFileSync(goodSet, 'utf8'));
    const b = parseCurveSetJson(readFileSync(out, 'utf8'));
    const r = 1480 / 1780;
    // Speed affinity law (Karassik, Pump Handbook): BEP flow ∝ n, head ∝ n²; tolerance 1e-9 relative.
    expect(b.members[0]!.derived.bep!.flow_m3s / a.members[0]!.derived.bep!.flow_m3s).toBeCloseTo(r, 9);
    expect(b.members[0]!.derived.bep!.head_m / a.members[0]!.derived.bep!.head_m).toBeCloseTo(r * r, 9);
  });
});

describe('unusable input: exit 2 and one clear sentence', () => {
  const out = join(dir, 'never.curveset.json');
  it('a missing file', () => expectOneSentence(run('build', join(dir, 'nope.csv'), '-o', out, '--speed', '1780'), /does not exist/));
  it('an empty file', () => expectOneSentence(run('build', file('empty.csv', ''), '-o', out, '--speed', '1780'), /is empty/));
  it('a wrong header', () => expectOneSentence(run('build', file('header.csv', 'q,d,x,y\nhead,13,0,100\n'), '-o', out, '--speed', '1780'), /expected "quantity,diameter,flow,value"/));
  it('a non-numeric cell', () => expectOneSentence(run('build', file('nan.csv', 'quantity,diameter,flow,value\nhead,13,abc,100\n'), '-o', out, '--speed', '1780'), /Line 2: the flow "abc" is not a number/));
  it('a negative flow', () => expectOneSentence(run('build', file('neg.csv', 'quantity,diameter,flow,value\nhead,13,-5,100\n'), '-o', out, '--speed', '1780'), /negative/));
  it('a curve with too few points', () =>
    expectOneSentence(run('build', file('few.csv', 'quantity,diameter,flow,value\nhead,13,0,100\nhead,13,500,90\n'), '-o', out, '--units', 'us', '--speed', '1780'), /13 in head curve has 2 distinct flows; at least 3/));
  it('unknown units', () => expectOneSentence(run('build', good, '-o', out, '--units', 'us', '--speed', '1780', '--flow', 'furlong/s'), /Unknown flow unit "furlong\/s"/));
  it('no units in the header and no --units', () => expectOneSentence(run('build', good, '-o', out, '--speed', '1780'), /gives no unit for flow, diameter, head/));
  it('an unknown unit system', () => expectOneSentence(run('export', goodSet, '--format', 'csv', '--units', 'imperial'), /Unknown unit system "imperial"/));
  it('JSON that is not a curve set', () => expectOneSentence(run('check', file('other.json', '{"name": "x"}')), /is not a curve set/));
  it('JSON that does not parse', () => expectOneSentence(run('check', file('broken.json', '{"format": ')), /not valid JSON/));
  it('a non-positive speed', () => expectOneSentence(run('scale', goodSet, '--speed', '-3', '-o', out), /--speed must be a positive number/));
});
