import { describe, expect, it } from 'vitest';
import { curveUnits, PRESETS, QUANTITY_KIND, resolveUnits, tokenOfQuantity, unitOfQuantity, UnitError, type CurveQuantity } from '../../src/units/index.ts';

describe('the one quantity → unit map', () => {
  const us = curveUnits({ flow: 'gpm', head: 'ft', npsh: 'm', power: 'hp', diameter: 'in' });
  it('NPSHr takes the NPSH unit, head the head unit, power the power unit and efficiency %', () => {
    expect(unitOfQuantity(us, 'npshr').token).toBe('m');
    expect(unitOfQuantity(us, 'head').token).toBe('ft');
    expect(unitOfQuantity(us, 'power').token).toBe('hp');
    expect(unitOfQuantity(us, 'efficiency').token).toBe('%');
  });
  it('every quantity has a unit of its own kind, and tokens follow the same map', () => {
    const tokens = { head: 'ft', npsh: 'm', power: 'hp' };
    for (const q of ['head', 'efficiency', 'power', 'npshr'] as CurveQuantity[]) {
      expect(unitOfQuantity(us, q).kind).toBe(QUANTITY_KIND[q]);
      expect(tokenOfQuantity(tokens, q)).toBe(unitOfQuantity(us, q).token);
    }
  });
  it('a system resolves to the same curve units plus the site units', () => {
    const r = resolveUnits(PRESETS.si);
    expect(r.flow.token).toBe('m3/h');
    expect(r.efficiency.token).toBe('%');
    expect(r.pressure.token).toBe('kPa');
    expect(curveUnits(PRESETS.si).npsh).toBe(r.npsh);
  });
  it('a token of the wrong kind is refused naming it', () => {
    expect(() => curveUnits({ flow: 'gpm', head: 'gpm', npsh: 'm', power: 'hp', diameter: 'in' })).toThrow(UnitError);
    expect(() => curveUnits({ flow: 'gpm', head: 'gpm', npsh: 'm', power: 'hp', diameter: 'in' })).toThrow(/Unknown head unit "gpm"/);
  });
});
