/** `pumpscribe study` and `pumpscribe duty` run as a user runs them, on the invented demo families (not real products). */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ISSUE_STUDY } from './issueStudy.ts';

const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-study-'));
const run = (...args: string[]) => {
  const r = spawnSync(process.execPath, [join('node_modules', 'tsx', 'dist', 'cli.mjs'), 'src/cli/main.ts', ...args], { encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
};
copyFileSync('samples/demo/invented-si3-si.curveset.json', join(dir, 'pump-a.curveset.json'));

describe('pumpscribe study', () => {
  it('the issue-shaped study prints JSON with every per-option field, units named once at the top', () => {
    const file = join(dir, 'issue.study.json');
    writeFileSync(file, JSON.stringify(ISSUE_STUDY));
    const r = run('study', file, '--json');
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const v = JSON.parse(r.out);
    expect(v.units.flow).toBe('m3/h');
    for (const o of v.options) {
      for (const key of ['name', 'flow', 'head', 'efficiency', 'power', 'motor_rating', 'npsha', 'npsh3', 'npsh_margin_ratio', 'max_eye_elevation', 'annual_energy_kwh', 'annual_cost', 'life_cycle_cost', 'findings']) expect(o, key).toHaveProperty(key);
      expect(typeof o.npsha).toBe('number');
    }
    expect(v.why).toMatch(/wins/);
  });

  it('exits 1 and names the failing finding when the curve set carries a fail', () => {
    const set = JSON.parse(readFileSync('samples/demo/invented-si3-si.curveset.json', 'utf8'));
    set.findings.push({ id: 'power.consistency:260mm', code: 'power.consistency', severity: 'fail', subject: {}, message: 'invented fail for the test', method: 'test', figures: {} });
    writeFileSync(join(dir, 'failing.curveset.json'), JSON.stringify(set));
    const file = join(dir, 'failing.study.json');
    writeFileSync(file, JSON.stringify({ ...ISSUE_STUDY, options: [{ name: 'failing set', curveset: 'failing.curveset.json', impeller: 'trim' }] }));
    const r = run('study', file);
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/failing findings \(power.consistency:260mm\)/);
    expect(r.out).toMatch(/^Result: .*Curve sets with failing findings: "failing.curveset.json": power.consistency:260mm\./m);
  });

  it('exits 2 with one sentence for a study naming a curve set that does not exist', () => {
    const file = join(dir, 'missing.study.json');
    writeFileSync(file, JSON.stringify({ ...ISSUE_STUDY, options: [{ name: 'x', curveset: 'nowhere.curveset.json' }] }));
    const r = run('study', file);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^pumpscribe: .*nowhere\.curveset\.json.*\n$/);
  });
});

describe('pumpscribe duty on a US curve set without --units', () => {
  it('reads and reports gpm and ft, the set’s own units', () => {
    const r = run('duty', 'samples/demo/invented-es4-us.curveset.json', '--flow', '1000', '--head', '115', '--static', '60', '--json');
    expect(r.err).toBe('');
    const v = JSON.parse(r.out);
    expect(v.units.flow).toBe('gpm');
    expect(v.units.head).toBe('ft');
    expect(Math.abs(v.duty.flow - 1000)).toBeLessThan(1e-9);
  });
});
