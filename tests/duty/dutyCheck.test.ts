import { describe, expect, it } from 'vitest';
import { dutyCheck } from '../../src/duty/dutyCheck.ts';
import { dutyReportView } from '../../src/duty/reportView.ts';
import { dutyReportText } from '../../src/duty/reportText.ts';
import { PRESETS } from '../../src/units/presets.ts';
import { A, D_FULL, H0, inventedCurveSet } from './inventedFamily.ts';

const set = inventedCurveSet(); // invented: 250, 230, 210 mm, H = 50 r² − 12000 Q²
const K = (c: number) => c + 273.15;

describe('dutyCheck on the invented curve set', () => {
  it('gives one operating point per captured diameter on the system through the duty, 50 r² − 12000 Q² = 15 + 20000 Q²', () => {
    const r = dutyCheck(set, { flow_m3s: 0.03, head_m: 33, static_head_m: 15 });
    expect(r.operating_points.map((p) => p.diameter_m)).toEqual([0.25, 0.23, 0.21]);
    for (const p of r.operating_points) {
      const ratio = (p.diameter_m as number) / D_FULL;
      const q = Math.sqrt((H0 * ratio * ratio - 15) / (A + 20000));
      expect(p.result.status === 'ok' && Math.abs(p.result.point.flow_m3s - q)).toBeLessThan(1e-9);
    }
    expect(r.problems).toEqual([]);
    expect(r.trim.status).toBe('meets');
    expect(r.trim_operating_point?.status === 'ok' && Math.abs(r.trim_operating_point.point.flow_m3s - 0.03)).toBeLessThan(1e-9);
  });

  it('adds operating points for requested trims between and below the captured diameters', () => {
    const r = dutyCheck(set, { flow_m3s: 0.03, head_m: 33, static_head_m: 15, extra_diameters_m: [0.24, 0.2] });
    const trims = r.operating_points.filter((p) => p.kind === 'trim');
    expect(trims).toHaveLength(2);
    const q = Math.sqrt((H0 * (0.24 / D_FULL) ** 2 - 15) / (A + 20000));
    expect(trims[0]?.result.status === 'ok' && Math.abs(trims[0].result.point.flow_m3s - q)).toBeLessThan(1e-9);
  });

  it('two pumps in parallel: the trim is found for half the flow, each pump carries half, one pump alone is reported', () => {
    const r = dutyCheck(set, { flow_m3s: 0.06, head_m: 33, static_head_m: 15, parallel_count: 2 });
    expect(r.trim.status).toBe('meets');
    expect(Math.abs((r.trim.diameter_m ?? 0) / (D_FULL * Math.sqrt((33 + A * 0.0009) / H0)) - 1)).toBeLessThan(1e-6);
    expect(r.parallel?.combined.status === 'ok' && Math.abs(r.parallel.combined.point.flow_m3s - 0.06)).toBeLessThan(1e-9);
    expect(Math.abs((r.parallel?.per_pump?.flow_m3s ?? 0) - 0.03)).toBeLessThan(1e-9);
    expect(r.parallel?.single.status).toBe('ok');
  });

  it('judges NPSH at the duty and at every operating point, and fails the check when NPSHa is below NPSH3', () => {
    const ok = dutyCheck(set, { flow_m3s: 0.03, head_m: 33, static_head_m: 15, site: { temperature_K: K(20), suction_static_m: 1, suction_loss_m: 0.5 } });
    expect(ok.npsh?.points).toHaveLength(4);
    expect(ok.npsh?.points[0]?.judgement?.verdict).toBe('meets-guidance');
    expect(ok.npsh?.caution).toMatch(/NPSH3/);
    const bad = dutyCheck(set, { flow_m3s: 0.03, head_m: 33, static_head_m: 15, site: { temperature_K: K(60), suction_static_m: -6, suction_loss_m: 2 } });
    expect(bad.npsh?.points[0]?.judgement?.verdict).toBe('cavitation-expected');
    expect(bad.problems.join(' ')).toMatch(/NPSH at the duty/);
  });

  it('scales the suction loss with flow from the duty flow to each operating point', () => {
    const r = dutyCheck(set, { flow_m3s: 0.03, head_m: 33, static_head_m: 15, site: { temperature_K: K(20), suction_static_m: 0, suction_loss_m: 1 } });
    const at250 = r.npsh?.points.find((p) => p.where.includes('250'));
    expect(Math.abs((at250?.available.suction_loss_m ?? 0) - ((at250?.flow_m3s ?? 0) / 0.03) ** 2)).toBeLessThan(1e-12);
  });

  it('sizes the motor on the non-overloading power of the trimmed curve and adds energy for the given hours', () => {
    const r = dutyCheck(set, { flow_m3s: 0.03, head_m: 33, static_head_m: 15, motor_standard: 'iec', energy: { hours_per_year: 4000, motor_efficiency: 0.93, tariff_per_kWh: 0.15 } });
    const sel = r.motor?.selection;
    expect(sel?.rating?.rated_W).toBeGreaterThanOrEqual(sel?.sizing_power_W ?? Infinity);
    expect(sel?.sizing_power_W).toBeGreaterThanOrEqual(sel?.duty_power_W ?? Infinity);
    expect(r.energy?.energy_kWh).toBeCloseTo(((r.trim.point?.power_W ?? 0) / 0.93) * 4, 6);
    expect(r.motor?.caution).toMatch(/preliminary/);
  });

  it('adds the governing-code caution for potable-water and hydrocarbon duties', () => {
    expect(dutyCheck(set, { flow_m3s: 0.03, head_m: 33, service: 'potable' }).cautions.join(' ')).toMatch(/drinking-water code/);
    expect(dutyCheck(set, { flow_m3s: 0.03, head_m: 33, application: 'hydrocarbon' }).cautions.join(' ')).toMatch(/Hazardous-liquid/);
  });

  it('fails the check when the duty is above the full-diameter curve', () => {
    const r = dutyCheck(set, { flow_m3s: 0.03, head_m: 45, static_head_m: 15 });
    expect(r.trim.status).toBe('above-range');
    expect(r.problems).toHaveLength(1);
  });

  it('reports the view in US units with efficiency in % and a text with units beside every figure', () => {
    const r = dutyCheck(set, { flow_m3s: 0.03, head_m: 33, static_head_m: 15, site: { elevation_m: 0, temperature_K: K(20), suction_static_m: 0, suction_loss_m: 0 } });
    const v = dutyReportView(r, PRESETS.us, { file: 'invented.curveset.json', pump: 'invented' });
    expect(Math.abs((v.trim.flow ?? 0) - 475.51)).toBeLessThan(0.01); // 0.03 m³/s in gpm (NIST SP 811 gallon)
    expect(Math.abs((v.trim.head ?? 0) - 33 / 0.3048)).toBeLessThan(1e-9);
    expect((v.trim.efficiency ?? 0) > 1).toBe(true);
    expect(Math.abs((v.npsh?.site.surface_pressure ?? 0) - 101325 / 6894.757)).toBeLessThan(1e-3);
    const text = dutyReportText(v);
    expect(text).toMatch(/475\.5 gpm at 108\.3 ft/);
    expect(text).toMatch(/Caution: NPSH3/);
    expect(text).toMatch(/Caution: Motor size is preliminary/);
  });
});
