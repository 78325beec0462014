import { describe, expect, it } from 'vitest';
import { curveLabel, isFlowTitle, isoLabel, minFlowLabel, quantityOfTitle, speedShareLabel, unitOfTitle } from '../../src/digitize/detect/words.ts';
import { valueAxisTitle } from '../../src/digitize/detect/rasterPanels.ts';

describe('sheet words', () => {
  it('quantityOfTitle names what an axis title plots, and nothing for the flow axis', () => {
    expect(quantityOfTitle('Head (ft)')).toBe('head');
    expect(quantityOfTitle('Total head H [m]')).toBe('head');
    expect(quantityOfTitle('Efficiency (%)')).toBe('efficiency');
    expect(quantityOfTitle('Shaft power (kW)')).toBe('power');
    expect(quantityOfTitle('NPSHr (m)')).toBe('npshr');
    expect(quantityOfTitle('Flow Q (m3/h)')).toBeNull();
    expect(quantityOfTitle('Flow (gpm)')).toBeNull();
  });

  it('quantityOfTitle reads "Efficiency" with a letter or two misread, as a 150-dpi scan prints its "ffi"', () => {
    // Read so from random-bed detection scan 70 (an INVENTED sheet): the panel went unnamed.
    expect(quantityOfTitle('Efciency (W)')).toBe('efficiency');
    expect(quantityOfTitle('Eficiency (%)')).toBe('efficiency');
    // The abbreviation many sheets print is read; a short word is not stretched to a title word,
    // nor is the flow title.
    expect(quantityOfTitle('Eff. (%)')).toBe('efficiency');
    expect(quantityOfTitle('Effort (N)')).toBeNull();
    expect(quantityOfTitle('Frequency (Hz)')).toBeNull();
    expect(quantityOfTitle('Flow Q (m3/h)')).toBeNull();
  });

  it('isFlowTitle tells the flow axis title from value titles', () => {
    expect(isFlowTitle('Flow Q (m3/h)')).toBe(true);
    expect(isFlowTitle('Capacity [gpm]')).toBe(true);
    expect(isFlowTitle('Q (L/s)')).toBe(true);
    expect(isFlowTitle('Head (m)')).toBe(false);
  });

  it('unitOfTitle reads the unit in brackets', () => {
    expect(unitOfTitle('Head (ft)')).toBe('ft');
    expect(unitOfTitle('Flow Q [m³/h]')).toBe('m³/h');
    expect(unitOfTitle('Head')).toBeNull();
  });

  it('curveLabel reads diameters in mm or inches and speeds, and refuses other text', () => {
    expect(curveLabel('330 mm')).toEqual({ kind: 'diameter', value: 330, unit: 'mm' });
    expect(curveLabel('Ø 250mm')).toEqual({ kind: 'diameter', value: 250, unit: 'mm' });
    expect(curveLabel('13 in')).toEqual({ kind: 'diameter', value: 13, unit: 'in' });
    expect(curveLabel('12.25"')).toEqual({ kind: 'diameter', value: 12.25, unit: 'in' });
    expect(curveLabel('1,450 rpm')).toEqual({ kind: 'speed', value: 1450, unit: 'rpm' });
    expect(curveLabel('75%')).toBeNull();
    expect(curveLabel('Head (m)')).toBeNull();
  });

  it('isoLabel reads an efficiency level, and refuses diameters and plain numbers', () => {
    expect(isoLabel('75%')).toBe(75);
    expect(isoLabel('82.5 %')).toBe(82.5);
    expect(isoLabel('330 mm')).toBeNull();
    expect(isoLabel('75')).toBeNull();
  });
  it('speedShareLabel reads a share of rated speed, and leaves diameters, speeds and odd shares alone', () => {
    expect(speedShareLabel('100 %')).toBe(100);
    expect(speedShareLabel('90%')).toBe(90);
    expect(speedShareLabel('n = 80 %')).toBe(80);
    expect(speedShareLabel('72.5 %')).toBe(72.5);
    expect(speedShareLabel('1450 rpm')).toBeNull();
    expect(speedShareLabel('330 mm')).toBeNull();
    expect(speedShareLabel('5 %')).toBeNull();
    expect(speedShareLabel('150 %')).toBeNull();
  });

  it('minFlowLabel reads the names of a minimum-flow line, and nothing else', () => {
    for (const t of ['min. flow', 'Min flow', 'minimum flow', 'Min. continuous flow', 'Qmin', 'MCF']) expect(minFlowLabel(t), t).toBe(true);
    for (const t of ['Flow Q (m3/h)', 'min', '75 %', 'max. flow']) expect(minFlowLabel(t), t).toBe(false);
  });

  it('valueAxisTitle tells a value axis title read under a flow axis from a flow title', () => {
    expect(valueAxisTitle('NPSHr (m)')).toBe(true);
    expect(valueAxisTitle('(m)')).toBe(true);
    expect(valueAxisTitle('(kW)')).toBe(true);
    expect(valueAxisTitle('Flow (m3/h)')).toBe(false);
    expect(valueAxisTitle('Flow (mh)')).toBe(false);
    expect(valueAxisTitle('')).toBe(false);
  });
});
