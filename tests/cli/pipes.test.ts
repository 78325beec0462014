/**
 * The command line as scripts use it, through bin/pumpscribe.mjs (the prebuilt bundle when it is
 * current, the sources otherwise): "-" for standard input and output, --json, exit codes.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { inventedUsFamily } from '../../src/demo/inventedFamily.ts';
import { pointsTableText, samplePoints } from '../../src/demo/sampling.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';

const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-pipes-'));
const bin = join(process.cwd(), 'bin', 'pumpscribe.mjs');
const demo = join(process.cwd(), 'samples', 'demo', 'invented-es4-us.curveset.json');

function run(args: string[], input?: string, cwd = process.cwd()) {
  const r = spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8', cwd, ...(input !== undefined ? { input } : {}), env: { ...process.env, CI: '1' } });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

const table = join(dir, 'points.csv');
beforeAll(() => writeFileSync(table, pointsTableText(samplePoints(inventedUsFamily(), { system: 'us', seed: 5 }))));

describe('standard input and output', () => {
  it('--version prints the version alone', () => {
    const r = run(['--version']);
    expect(r.code).toBe(0);
    expect(r.out.trim()).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it('cat set.json | pumpscribe check - reads the curve set from standard input', () => {
    const r = run(['check', '-', '--json'], readFileSync(demo, 'utf8'));
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out).passed).toBe(true);
  });

  it('build … -o - writes only the curve set on standard output; the report goes to standard error', () => {
    const built = run(['build', table, '-o', '-', '--units', 'us', '--speed', '1780']);
    expect(built.code).toBe(0);
    const set = parseCurveSetJson(built.out);
    expect(set.members).toHaveLength(4);
    expect(built.err).toMatch(/Findings/);
    const checked = run(['check', '-', '--json'], built.out);
    expect(checked.code).toBe(0);
    expect(JSON.parse(checked.out).findings.length).toBeGreaterThan(0);
  });

  it('a points table from standard input, and --json reports of build and scale', () => {
    const built = run(['build', '-', '-o', join(dir, 'a.curveset.json'), '--units', 'us', '--speed', '1780', '--json'], readFileSync(table, 'utf8'));
    expect(built.code).toBe(0);
    const report = JSON.parse(built.out);
    expect(report.passed).toBe(true);
    expect(report.members).toHaveLength(4);
    const scaled = run(['scale', join(dir, 'a.curveset.json'), '--speed', '1480', '-o', '-', '--json']);
    expect(scaled.code).toBe(0);
    expect(parseCurveSetJson(scaled.out).speed_rpm).toBe(1480);
    expect(JSON.parse(scaled.err).speed_rpm).toBe(1480);
  });

  it('"-" with nothing usable on standard input is unusable input: exit 2 and one sentence', () => {
    const r = run(['check', '-'], '');
    expect(r.code).toBe(2);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).toMatch(/standard input is empty/);
  });

  it('relative paths are read from the folder the command was typed in', () => {
    const r = run(['check', 'invented-es4-us.curveset.json', '--json'], undefined, join(process.cwd(), 'samples', 'demo'));
    expect(r.code).toBe(0);
  });

  it('export --format epanet writes an INP fragment on standard output; --json reports on standard error', () => {
    const r = run(['export', demo, '--format', 'epanet', '--inp-units', 'LPS', '--json']);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^\[CURVES\]$/m);
    expect(r.out).toMatch(/the model's \[OPTIONS\] must say "Units LPS"/);
    expect(JSON.parse(r.err)).toMatchObject({ format: 'epanet', output: 'standard output', findings: [] });
  });

  it('takeoff -o - writes the curve set on standard output', () => {
    const takeoff = join(process.cwd(), 'samples', 'sheets', 'si-panels-black.takeoff.json');
    const r = run(['takeoff', takeoff, '-o', '-', '--json']);
    expect(r.code).toBe(0);
    expect(parseCurveSetJson(r.out).members.length).toBeGreaterThan(1);
    expect(JSON.parse(r.err).traces.length).toBeGreaterThan(1);
  });

  it('help names every exit code', () => {
    const r = run(['--help']);
    expect(r.code).toBe(0);
    for (const code of ['0 ok', '1 the checks found a fail', '2 unusable input', '3 internal error']) expect(r.out).toContain(code);
  });
});
