/**
 * The pump's speed as a sheet prints it: read from text ("1450 rpm", "2 950 r/min",
 * "1450 1/min"), and read by the character reader from the title of INVENTED scans of the
 * independent random bed; a speed given that disagrees is said, never kept silently.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { findRasterPanels } from '../../src/digitize/detect/rasterPanels.ts';
import { readSheetSpeed, speedDisagrees, speedInText, speedMismatchSentence, speedsInText } from '../../src/digitize/detect/sheetSpeed.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { decode } from '../../scripts/randomSheets/camera.ts';
import { sheetGeometry } from '../../scripts/randomSheets/randomSheet.ts';
import { scanFor } from '../../scripts/detectSheets/scanBed.ts';
import { readHints } from '../../src/ui/geometry/hints.ts';

afterAll(() => closeTextReaderNode());

describe('a speed in a line of text', () => {
  it('reads the usual ways a sheet prints a shaft speed', () => {
    expect(speedsInText('INVENTED test family (not a real product) - 3500 rpm')).toEqual([3500]);
    expect(speedsInText('n = 2 950 r/min')).toEqual([2950]);
    expect(speedsInText('Speed 1450 1/min, impeller 250 mm')).toEqual([1450]);
    expect(speedsInText('1480 min-1')).toEqual([1480]);
    expect(speedsInText('1750RPM')).toEqual([1750]);
    expect(speedsInText('n = 1480 min⁻¹')).toEqual([1480]);
    expect(speedsInText('1480 min⁻¹, 250 mm')).toEqual([1480]);
    expect(speedsInText('1450 rpms')).toEqual([]); // not a unit this rule knows
  });

  it('takes no model number, year or diameter for a speed, and no speed from two that differ', () => {
    expect(speedsInText('Model 2024, 330 mm, 80 m3/h')).toEqual([]);
    expect(speedsInText('50 rpm')).toEqual([]); // below any pump's shaft speed
    expect(speedInText('1450 rpm pump, motor 1480 rpm')).toBeUndefined();
    expect(speedInText('1450 rpm ... 1450 rpm')).toBe(1450);
  });

  it('the vector sheet hints use the same rule', () => {
    const item = (text: string) => ({ text, at: [0, 0] as const, size: 10, width: 100, angle: 0 });
    expect(readHints([item('Invented pump · 1480 rpm · clear water')]).speed_rpm).toBe(1480);
    expect(readHints([item('1450 rpm'), item('motor 1480 rpm')]).speed_rpm).toBeUndefined();
  });

  it('a speed given that differs by more than rounding is said in one sentence', () => {
    expect(speedDisagrees(3500, 3500)).toBe(false);
    expect(speedDisagrees(1450, 1455)).toBe(false); // 0.3 %: rounding on the sheet
    expect(speedDisagrees(3500, 2900)).toBe(true);
    expect(speedMismatchSentence({ rpm: 3500, text: 'x - 3500 rpm' }, 2900)).toMatch(/^The sheet prints 3500 rpm \("x - 3500 rpm"\), but the speed given is 2900 rpm; check/);
  });
});

describe('the speed printed on a scan', () => {
  // Seeds 16 and 20 are 300-dpi scans of the bed; 1 is 240 dpi.
  it.each([1, 16, 20])('reads the title of random-bed scan %i', async (seed) => {
    const { plan } = sheetGeometry(seed, 'scan');
    const { jpeg } = await scanFor(seed);
    const d = await decode(Buffer.from(jpeg));
    const reader = textReaderNode();
    const found = await findRasterPanels({ width: d.width, height: d.height, data: d.data, scale: 1 }, reader);
    const read = await readSheetSpeed(found, reader);
    expect(read?.rpm).toBe(plan.family.speed);
    expect(read?.text).toMatch(/rpm/);
  }, 120_000);
});
