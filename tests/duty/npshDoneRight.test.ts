/**
 * NPSH done right, on the invented test family of inventedFamily.ts (not a real pump):
 * H = 50 r² − 12000 Q², η = 0.78 (2x − x²), NPSH3 = 1.5 r² + 1500 Q² as drawn.
 * Hand values are worked from those equations in each test.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { dutyCheck } from '../../src/duty/dutyCheck.ts';
import { memberAtDiameter, npsh3ForDiameter } from '../../src/fit/affinity.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import { STANDARD_GRAVITY } from '../../src/units/constants.ts';
import type { CurveSet } from '../../src/model/curveset.ts';
import { ETA_B, Q_B, RHO, SPEED, inventedCurveSet } from './inventedFamily.ts';

/** A sheet that draws one NPSHr curve only, for the full 250 mm impeller. */
function oneNpshCurveSet(): CurveSet {
  const set = inventedCurveSet();
  for (const m of set.members) if (m.diameter_m !== 0.25) delete m.curves.npshr;
  return set;
}
const drawn = (q: number) => 1.5 + 1500 * q * q; // the full-diameter NPSH3 curve as drawn

describe('NPSH3 of a trim comes from the drawn curve of the nearest equal or larger diameter', () => {
  it('a sheet with one NPSHr curve: every trim from 200 to 250 mm gets an NPSH3, never below the drawn curve at the same flow', () => {
    const set = oneNpshCurveSet();
    for (let d = 0.2; d <= 0.25 + 1e-12; d += 0.0025) {
      const fit = memberAtDiameter(set, d).curves.npshr?.fit;
      expect(fit, `NPSH3 at ${d} m`).toBeDefined();
      for (const q of [0.01, 0.02, 0.03, 0.04]) {
        // never below the drawn curve (tolerance 1e-12 m, round-off only)
        expect(evaluateUnchecked(fit!, q)).toBeGreaterThanOrEqual(drawn(q) - 1e-12);
      }
    }
  });

  it('with three drawn curves a trim takes the next larger one unscaled (230 mm curve for a 220 mm trim)', () => {
    const source = npsh3ForDiameter(inventedCurveSet(), 0.22);
    expect(source?.from_diameter_m).toBe(0.23);
    const r = 0.23 / 0.25;
    expect(Math.abs(evaluateUnchecked(source!.fit, 0.03) - (1.5 * r * r + 1500 * 0.0009))).toBeLessThan(1e-12);
  });

  it('the duty check gives every captured diameter and the trim an NPSH margin on a one-curve sheet', () => {
    const r = dutyCheck(oneNpshCurveSet(), { flow_m3s: 0.03, head_m: 33, static_head_m: 15, site: { temperature_K: 293.15, suction_static_m: 2, suction_loss_m: 0.5 } });
    for (const p of r.npsh!.points) expect(p.judgement, p.where).toBeDefined();
    expect(Math.abs(r.npsh!.points[0]!.judgement!.npsh3_m - drawn(0.03))).toBeLessThan(1e-9);
    expect(r.npsh!.npsh3_basis).toMatch(/common practice/);
  });
});

describe('NPSH judged from minimum flow to run-out', () => {
  // Two pumps in parallel, duty 0.06 m³/s at 33 m, static 15 m: k = 18/0.06² = 5000 s²/m⁵,
  // trim 50 r² = 33 + 12000·0.03² = 43.8. One pump alone: 43.8 − 12000 q² = 15 + 5000 q².
  const qAlone = Math.sqrt(28.8 / 17000);
  // Closed tank chosen so NPSHa = 4.6 m at the duty (loss 1.0 m at 0.03 m³/s, scaled with q²).
  const pv = 2339;
  const site = { temperature_K: 293.15, site_pressure_Pa: 5.6 * RHO * STANDARD_GRAVITY + pv, vapour_pressure_Pa: pv, density_kg_m3: RHO, suction_static_m: 0, suction_loss_m: 1.0, loss_reference_flow_m3s: 0.03 };
  const input = { flow_m3s: 0.06, head_m: 33, static_head_m: 15, parallel_count: 2, site };

  it('one pump of a parallel pair left running alone cavitates: the check fails and says "cavitation"', () => {
    const r = dutyCheck(oneNpshCurveSet(), input);
    // hand: NPSHa at run-out = 5.6 − (qAlone/0.03)² ; NPSH3 = 1.5 + 1500 qAlone²
    const npsha = 5.6 - (qAlone / 0.03) ** 2;
    expect(npsha).toBeLessThan(drawn(qAlone));
    expect(r.npsh!.points[0]!.judgement!.verdict).toBe('meets-guidance'); // at the duty all is well
    expect(Math.abs(r.npsh!.range!.range_m3s[1] - qAlone)).toBeLessThan(1e-9);
    expect(r.problems.join(' ')).toMatch(/cavitation/);
    expect(r.headline).toMatch(/cavitation/);
    expect(r.headline).not.toMatch(/meets the duty/);
  });

  it('the allowable eye elevation equals the smallest slack over the range, worked by a dense scan', () => {
    const r = dutyCheck(oneNpshCurveSet(), { ...input, site: { ...site, site_pressure_Pa: 12 * RHO * STANDARD_GRAVITY + pv } });
    const [lo, hi] = r.npsh!.range!.range_m3s;
    let hand = Infinity;
    for (let i = 0; i <= 2000; i++) {
      const q = lo + ((hi - lo) * i) / 2000;
      const n3 = drawn(q);
      const required = Math.max(r.npsh!.rule.ratio * n3, n3 + r.npsh!.rule.min_margin_m);
      hand = Math.min(hand, 12 - (q / 0.03) ** 2 - required);
    }
    expect(Math.abs(r.npsh!.range!.max_eye_elevation_m - hand)).toBeLessThan(0.005);
    expect(r.problems).toEqual([]);
  });

  it('the command exits 1 and says CAVITATION for the run-out case', () => {
    const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-npsh-'));
    const file = join(dir, 'one-npsh.curveset.json');
    writeFileSync(file, JSON.stringify(oneNpshCurveSet()));
    const run = spawnSync(process.execPath, [join('node_modules', 'tsx', 'dist', 'cli.mjs'), 'src/cli/main.ts', 'duty', file,
      '--flow', String(0.06 * 3600), '--head', '33', '--static', '15', '--parallel', '2', '--units', 'si',
      '--site-pressure', String(site.site_pressure_Pa / 1000), '--vapour-pressure', String(pv / 1000), '--density', String(RHO), '--temperature', '20',
      '--suction-static', '0', '--suction-loss', '1.0'], { encoding: 'utf8' });
    expect(run.stderr).toBe('');
    expect(run.status).toBe(1);
    expect(run.stdout).toMatch(/Result: Does not pass: cavitation/);
  });
});

describe('parallel pumps on a variable-speed drive', () => {
  it('speed and power per pump agree with the hand solution within 0.5 % (system read at total flow)', () => {
    // Two pumps, duty 0.06 m³/s total at 35 m, static 20 m. Each pump carries 0.03 m³/s at the
    // system head 35 m: r²·50 − 12000·0.03² = 35 → r = √(45.8/50).
    const r = dutyCheck(inventedCurveSet(), { flow_m3s: 0.06, head_m: 35, static_head_m: 20, parallel_count: 2, variable_speed: true });
    const ratio = Math.sqrt(45.8 / 50);
    const x = 0.03 / ratio / Q_B;
    const power = (RHO * STANDARD_GRAVITY * 0.03 * 35) / (ETA_B * (2 * x - x * x));
    expect(r.speed?.status).toBe('ok');
    if (r.speed?.status !== 'ok') return;
    expect(Math.abs(r.speed.speed_rpm / (SPEED * ratio) - 1)).toBeLessThan(0.005);
    expect(Math.abs((r.speed.point.power_W ?? 0) / power - 1)).toBeLessThan(0.005);
    expect(Math.abs(r.speed.point.flow_m3s - 0.03)).toBeLessThan(1e-9);
  });
});

describe('a curve set with a fail finding', () => {
  it('fails the check and names the failing finding in the headline', () => {
    const set = inventedCurveSet();
    set.findings.push({ id: 'affinity.deviation:230mm', code: 'affinity.deviation', severity: 'fail', subject: { diameter_m: 0.23 }, message: 'invented fail', method: 'test', figures: {} });
    const r = dutyCheck(set, { flow_m3s: 0.03, head_m: 33, static_head_m: 15 });
    expect(r.problems[0]).toMatch(/failing findings \(affinity.deviation:230mm\)/);
    expect(r.headline).toMatch(/affinity.deviation:230mm/);
    expect(r.headline).not.toMatch(/meets the duty/);
  });
});
