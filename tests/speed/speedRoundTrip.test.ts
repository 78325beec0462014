/**
 * A speed family travels: built from points, exported as the CSV table (a `speed [rpm]` column),
 * built again from that CSV by the build command, and stored in and read back from a real SQLite
 * library file.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { inventedSpeedFamily, speedFamilyPointsText } from '../../src/demo/inventedSpeedFamily.ts';
import { curveSetToCsv } from '../../src/export/csvTable.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import { LibraryStore } from '../../src/library/store.ts';
import type { CurveSet } from '../../src/model/curveset.ts';

const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-speed-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const tsx = join('node_modules', 'tsx', 'dist', 'cli.mjs');
function run(...args: string[]) {
  const r = spawnSync(process.execPath, [tsx, 'src/cli/main.ts', ...args], { encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

function buildFrom(name: string, text: string, ...flags: string[]): CurveSet {
  const input = join(dir, `${name}.csv`);
  const output = join(dir, `${name}.curveset.json`);
  writeFileSync(input, text);
  const r = run('build', input, '-o', output, '-q', ...flags);
  expect(r.err).toBe('');
  expect(r.code).toBe(0);
  return parseCurveSetJson(readFileSync(output, 'utf8'));
}

/** Largest relative difference of the head curves of two sets, speed by speed, at 20…90 % of each domain. */
function worstHeadDifference(a: CurveSet, b: CurveSet): number {
  let worst = 0;
  for (const m of a.members) {
    const other = b.members.find((o) => o.speed_rpm === m.speed_rpm);
    const fa = m.curves.head?.fit;
    const fb = other?.curves.head?.fit;
    if (!fa || !fb) return Infinity;
    for (let f = 0.2; f <= 0.9; f += 0.1) {
      const q = fa.domain[0] + f * (fa.domain[1] - fa.domain[0]);
      worst = Math.max(worst, Math.abs(evaluateUnchecked(fb, q) / evaluateUnchecked(fa, q) - 1));
    }
  }
  return worst;
}

describe('a speed family round-trips', () => {
  const first = buildFrom('points', speedFamilyPointsText(inventedSpeedFamily(), { seed: 9 }), '--units', 'si');

  it('builds from the points table as a speed family rated at its fastest speed', () => {
    expect(first.family).toBe('speed');
    expect(first.speed_rpm).toBe(1450);
    expect(first.members.map((m) => m.speed_rpm)).toEqual([1450, 1300, 1150, 1000]);
    expect(first.members.every((m) => m.diameter_m === undefined)).toBe(true);
  });

  it('through the CSV table: export writes a speed [rpm] column, build reads it back to the same curves', () => {
    const csv = curveSetToCsv(first);
    expect(csv).toMatch(/^speed \[rpm\],flow \[m3\/h\],head \[m\]/m);
    const again = buildFrom('exported', csv);
    expect(again.family).toBe('speed');
    expect(again.members.map((m) => m.speed_rpm)).toEqual([1450, 1300, 1150, 1000]);
    // The CSV rounds its cells: heads agree within 0.2 % at matching flows.
    expect(worstHeadDifference(first, again)).toBeLessThan(0.002);
    expect(again.findings.filter((f) => f.severity === 'fail')).toEqual([]);
  });

  it('carries a stated minimum continuous flow through the CSV table', () => {
    const limited: CurveSet = { ...first, limits: { min_flow: { flow_m3s: 0.006, basis: 'minimum continuous flow stated with the sheet' } } };
    const csv = curveSetToCsv(limited);
    expect(csv).toMatch(/^# minimum flow \[m3\/h\]: 21\.6$/m);
    const again = buildFrom('limited', csv);
    // 21.6 m³/h = 0.006 m³/s, exact to rounding.
    expect(Math.abs((again.limits?.min_flow?.flow_m3s ?? 0) / 0.006 - 1)).toBeLessThan(1e-9);
  });

  it('through the library (a real SQLite file): stored and read back unchanged', () => {
    const file = join(dir, 'library.sqlite');
    const store = LibraryStore.open(file);
    const saved = store.create(first);
    store.close();
    const reopened = LibraryStore.open(file);
    const back = parseCurveSetJson(reopened.get(saved.id).body);
    reopened.close();
    expect(back).toEqual(first);
    expect(back.family).toBe('speed');
  });
});
