import { describe, expect, it } from 'vitest';
import { readDutyInput, DutyInputError } from '../../src/duty/dutyInput.ts';
import { presetNamed } from '../../src/units/index.ts';

const si = presetNamed('si');
const us = presetNamed('us');
const names = { flow: '--flow', head: '--head', density: '--density', temperature: '--temperature', site_pressure: '--site-pressure' } as const;

function refusal(fields: Parameters<typeof readDutyInput>[0], system = si): DutyInputError {
  try {
    readDutyInput(fields, system, names);
  } catch (error) {
    expect(error).toBeInstanceOf(DutyInputError);
    return error as DutyInputError;
  }
  throw new Error('expected a refusal');
}

describe('the duty-input reader refuses plausible slips with a sentence naming the field', () => {
  it('a specific gravity typed as a density (1, 0.998, 0.85) names the density it suggests', () => {
    for (const d of ['1', '0.998', '0.85']) {
      const e = refusal({ flow: '230', head: '30', density: d });
      expect(e.field).toBe('density');
      expect(e.message).toMatch(/^--density .*looks like a specific gravity; did you mean \d+(\.\d+)? kg\/m³/);
    }
  });
  it('a plausible density is taken as kg/m³', () => {
    expect(readDutyInput({ flow: '230', head: '30', density: '998' }, si, names).input.density_kg_m3).toBe(998);
  });
  it('hexadecimal and trailing letters are not numbers', () => {
    expect(refusal({ flow: '0x10', head: '30' }).field).toBe('flow');
    expect(refusal({ flow: '230', head: '30abc' }).field).toBe('head');
  });
  it('a flow beyond any pump is refused', () => {
    expect(refusal({ flow: '1e9', head: '30' }).message).toMatch(/--flow/);
  });
  it('a water temperature above its range is refused (400 °C)', () => {
    expect(refusal({ flow: '230', head: '30', temperature: '400' }).field).toBe('temperature');
  });
  it('US numbers are read in gpm and ft', () => {
    const { input } = readDutyInput({ flow: '1000', head: '100' }, us, names);
    // 1 gpm = 6.30901964e-5 m³/s; 1 ft = 0.3048 m (NIST SP 811, exact by definition)
    expect(input.flow_m3s).toBeCloseTo(1000 * 6.30901964e-5, 12);
    expect(input.head_m).toBeCloseTo(30.48, 12);
  });
});
