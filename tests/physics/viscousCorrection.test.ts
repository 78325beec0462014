import { describe, expect, it } from 'vitest';
import { viscousFactors, viscousParameterB } from '../../src/physics/viscousCorrection.ts';

describe('ANSI/HI 9.6.7 viscosity correction (from memory; self-consistency values, not from the standard)', () => {
  it('B = 10 gives C_Q = 0.8483 and C_η = 0.5396', () => {
    const f = viscousFactors(10);
    expect(Math.abs(f.c_q - 0.8483)).toBeLessThan(5e-5);
    expect(Math.abs(f.c_eta - 0.5396)).toBeLessThan(1e-4);
    // C_H = 1 − (1 − C_Q)·(Q/Q_BEP)^0.75: equals C_Q at BEP and 1 at shutoff
    expect(Math.abs(f.c_h(1) - f.c_q)).toBeLessThan(1e-12);
    expect(f.c_h(0)).toBe(1);
  });
  it('B ≤ 1 leaves water performance unchanged', () => {
    const f = viscousFactors(0.8);
    expect([f.c_q, f.c_eta, f.c_h(1.2)]).toEqual([1, 1, 1]);
  });
  it('B from its definition: 16.5·ν^0.5·H^0.0625/(Q^0.375·N^0.25)', () => {
    expect(Math.abs(viscousParameterB(100, 100, 50, 1450) - (16.5 * 10 * 50 ** 0.0625) / (100 ** 0.375 * 1450 ** 0.25))).toBeLessThan(1e-12);
  });
  it('refuses B ≥ 40 with a sentence', () => {
    expect(() => viscousFactors(45)).toThrow(/outside the ANSI\/HI 9.6.7 method/);
  });
});
