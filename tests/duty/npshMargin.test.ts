import { describe, expect, it } from 'vitest';
import { judgeNpshMargin, npshMarginRule } from '../../src/duty/npshMargin.ts';

describe('npshMarginRule (ANSI/HI 9.6.1 summary, REFERENCES.md)', () => {
  it('general water below Nss 7500: ratio 1.1 or 0.6 m; above: 1.2 or 1.0 m', () => {
    expect(npshMarginRule('general', 6000)).toMatchObject({ ratio: 1.1, min_margin_m: 0.6 });
    expect(npshMarginRule('general', 9000)).toMatchObject({ ratio: 1.2, min_margin_m: 1.0 });
  });
  it('hydrocarbon: ratio 1.1 or 1.0 m', () => {
    expect(npshMarginRule('hydrocarbon', 6000)).toMatchObject({ ratio: 1.1, min_margin_m: 1.0 });
  });
  it('building services: above 1.0 below Nss 7500; 1.1 or 0.6 m above', () => {
    expect(npshMarginRule('building-services', 6000)).toMatchObject({ ratio: 1.0, min_margin_m: 0 });
    expect(npshMarginRule('building-services', 8000)).toMatchObject({ ratio: 1.1, min_margin_m: 0.6 });
  });
  it('takes the stricter line when Nss is unknown, and says so', () => {
    const r = npshMarginRule('general');
    expect(r).toMatchObject({ ratio: 1.2, min_margin_m: 1.0, nss_assumed_high: true });
    expect(r.basis).toMatch(/unknown/);
  });
});

describe('judgeNpshMargin', () => {
  const rule = npshMarginRule('general', 6000); // 1.1 or 0.6 m
  it('asks for the larger of ratio and margin: NPSH3 = 3 m needs 3.6 m (margin governs)', () => {
    expect(judgeNpshMargin(5, 3, rule).required_npsha_m).toBeCloseTo(3.6, 12);
  });
  it('asks for the larger of ratio and margin: NPSH3 = 8 m needs 8.8 m (ratio governs)', () => {
    expect(judgeNpshMargin(9, 8, rule).required_npsha_m).toBeCloseTo(8.8, 12);
  });
  it('gives the three verdicts at their boundaries', () => {
    expect(judgeNpshMargin(3.6, 3, rule).verdict).toBe('meets-guidance');
    expect(judgeNpshMargin(3.5, 3, rule).verdict).toBe('below-guidance');
    expect(judgeNpshMargin(3, 3, rule).verdict).toBe('cavitation-expected');
  });
  it('reports ratio and margin', () => {
    const j = judgeNpshMargin(4.5, 3, rule);
    expect(j.ratio).toBeCloseTo(1.5, 12);
    expect(j.margin_m).toBeCloseTo(1.5, 12);
    expect(j.message).toMatch(/ratio 1\.50/);
  });
  it('building services below Nss 7500 accepts any NPSHa above NPSH3', () => {
    expect(judgeNpshMargin(3.01, 3, npshMarginRule('building-services', 5000)).verdict).toBe('meets-guidance');
  });
});
