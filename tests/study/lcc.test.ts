import { describe, expect, it } from 'vitest';
import { annuityFactor, lifeCycleCost } from '../../src/study/lcc.ts';

describe('life-cycle cost (HI/Europump, Pump Life Cycle Costs, 2001)', () => {
  it('annuity factor (1 − (1 + i)^−n)/i: 20 years at 5 % → 12.4622 (standard present-value table, published)', () => {
    expect(Math.abs(annuityFactor(20, 0.05) - 12.4622)).toBeLessThan(1e-4);
  });
  it('a zero effective rate gives n; escalation uses (i − p)/(1 + p)', () => {
    expect(annuityFactor(10, 0.03, 0.03)).toBe(10);
    const i = (0.08 - 0.02) / 1.02;
    expect(Math.abs(annuityFactor(15, 0.08, 0.02) - (1 - (1 + i) ** -15) / i)).toBeLessThan(1e-12);
  });
  it('LCC = capital + energy·PV + maintenance·PV', () => {
    const l = lifeCycleCost({ capital: 50000, annual_energy_cost: 10000, annual_maintenance: 1000, years: 20, rate: 0.05 });
    expect(Math.abs(l.total - (50000 + 11000 * 12.46221))).toBeLessThan(1);
  });
  it('refuses a life of zero years', () => {
    expect(() => annuityFactor(0, 0.05)).toThrow(/positive number of years/);
  });
});
