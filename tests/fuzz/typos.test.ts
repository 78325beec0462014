/**
 * The plausible slips of issue 18, run through the command line in-process: each gives a
 * `fail` (exit 1) or a refusal (exit 2) that names the row, the diameter or the field.
 * The invented demo families are consistent and must stay free of new findings.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { inventedSiFamily, inventedUsFamily } from '../../src/demo/inventedFamily.ts';
import { pointsTableText, samplePoints, type SampleRow } from '../../src/demo/sampling.ts';
import { runCli } from './cliInProcess.ts';

const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-typos-'));
const file = (name: string, text: string) => {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
};
const us = (seed = 11) => samplePoints(inventedUsFamily(), { system: 'us', seed });
const si = (seed = 7) => samplePoints(inventedSiFamily(), { system: 'si', seed });
/** Line number of row i in pointsTableText (header on line 1). */
const lineOf = (i: number) => i + 2;

async function build(name: string, rows: SampleRow[], system: 'us' | 'si' = 'us') {
  const out = join(dir, `${name}.curveset.json`);
  const r = await runCli(['build', file(`${name}.csv`, pointsTableText(rows)), '-o', out, '--units', system, '--speed', system === 'us' ? '1780' : '2900']);
  return { ...r, path: out };
}

describe('typos in a points table', () => {
  it('the consistent families build with no fail and no warn', async () => {
    for (const [rows, system] of [[us(11), 'us'], [us(5), 'us'], [si(7), 'si']] as const) {
      const r = await build(`good-${system}`, [...rows], system);
      expect(r.err).toBe('');
      expect(r.code).toBe(0);
      expect(r.out).not.toMatch(/FAIL|WARN/);
    }
  });

  it('one head row with flow and head swapped fails and names its line', async () => {
    const rows = us().map((r) => ({ ...r }));
    const i = rows.findIndex((r, k) => r.quantity === 'head' && r.diameter === 12 && rows.slice(0, k).filter((x) => x.quantity === 'head' && x.diameter === 12).length === 7);
    const row = rows[i] as SampleRow;
    [row.flow, row.value] = [row.value, row.flow];
    const r = await build('swapped', rows);
    expect(r.code).toBe(1);
    expect(r.out).toMatch(new RegExp(`FAIL {2}The 12 in head curve through the other points misses line ${lineOf(i)} \\(`));
  });

  it('the same swap in an SI table fails and names its line', async () => {
    const rows = si().map((r) => ({ ...r }));
    const i = rows.findIndex((r) => r.quantity === 'head' && r.diameter === 240 && r.flow > 150);
    const row = rows[i] as SampleRow;
    [row.flow, row.value] = [row.value, row.flow];
    const r = await build('swapped-si', rows, 'si');
    expect(r.code).toBe(1);
    expect(r.out).toMatch(new RegExp(`misses line ${lineOf(i)} \\(`));
  });

  it('a power curve typed with diameter 112 instead of 12 fails on the stray diameter and warns that 12 has no power', async () => {
    const rows = us().map((r) => (r.quantity === 'power' && r.diameter === 12 ? { ...r, diameter: 112 } : r));
    const r = await build('stray', rows);
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/FAIL {2}The 112 in diameter has only a power curve and no head curve/);
    expect(r.out).toMatch(/WARN {2}The 12 in diameter has no power curve, while all 3 other diameters have one/);
  });

  it('a single power row with diameter 112 is refused, naming the 112 in power curve', async () => {
    const rows = us().map((r) => ({ ...r }));
    const i = rows.findIndex((r) => r.quantity === 'power' && r.diameter === 12);
    (rows[i] as SampleRow).diameter = 112;
    const r = await build('stray-one', rows);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^pumpscribe: The 112 in power curve has 1 distinct flow/);
  });

  it('a table with only efficiency rows fails: no head curve', async () => {
    const r = await build('efficiency-only', us().filter((r) => r.quantity === 'efficiency'));
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/FAIL {2}The curve set has no head curve, only efficiency/);
  });
});

describe('check against the stored points', () => {
  it('NPSHr fits halved by hand fail 6 times out of 6, and the untouched sets pass', async () => {
    const cases = [
      ['us', us(11)],
      ['us', us(5)],
      ['us', us(3)],
      ['si', si(7)],
      ['si', si(2)],
      ['si', si(9)],
    ] as const;
    let failed = 0;
    for (const [k, [system, rows]] of cases.entries()) {
      const built = await build(`halve-${k}`, [...rows], system);
      expect(built.code).toBe(0);
      expect((await runCli(['check', built.path])).code).toBe(0);
      const set = JSON.parse(readFileSync(built.path, 'utf8'));
      for (const m of set.members) m.curves.npshr.fit.coefficients = m.curves.npshr.fit.coefficients.map((c: number) => c / 2);
      const halved = file(`halved-${k}.curveset.json`, JSON.stringify(set));
      const r = await runCli(['check', halved]);
      if (r.code === 1 && /FAIL {2}The [0-9.]+ (in|mm) NPSHr fit does not describe its own \d+ points/.test(r.out)) failed++;
    }
    expect(failed).toBe(6);
  });
});

describe('a stray point in a take-off', () => {
  it('a captured point moved off its line fails and names its trace', async () => {
    // Capture once and save the points, then move one point of the 290 mm head trace well
    // off its line (as a guide that caught a label would) and replay from the saved points.
    const ROOT = join(import.meta.dirname, '..', '..');
    const t = JSON.parse(readFileSync(join(ROOT, 'samples', 'sheets', 'si-panels-black.takeoff.json'), 'utf8'));
    t.sheet = join(ROOT, 'samples', 'sheets', t.sheet);
    const takeoff = file('stray.takeoff.json', JSON.stringify(t));
    const clean = await runCli(['takeoff', takeoff, '-o', join(dir, 'stray-clean.curveset.json'), '--save-points']);
    expect(clean.code).toBe(0);
    expect(clean.out).not.toMatch(/FAIL|WARN/);
    const saved = JSON.parse(readFileSync(takeoff, 'utf8'));
    const trace = saved.traces.find((x: { id: string }) => x.id === 'head-290');
    const k = Math.floor(trace.captured.length / 2);
    trace.captured[k][1] -= 25; // 25 sheet units up: about 8 m of head on this panel
    writeFileSync(takeoff, JSON.stringify(saved));
    const r = await runCli(['takeoff', takeoff, '-o', join(dir, 'stray.curveset.json'), '--use-captured']);
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/FAIL {2}The 290 mm head curve through the other points misses trace head-290 \(/);
    const set = JSON.parse(readFileSync(join(dir, 'stray.curveset.json'), 'utf8'));
    expect(set.findings.find((f: { code: string }) => f.code === 'fit.point-off').subject.trace).toBe('head-290');
  });
});
