/**
 * A faint coloured line keeps little of its chroma on a scan (JPEG halves the chroma resolution;
 * a dot or a thin line blurs into the paper): a line colour with chroma over 12 % of its luma and
 * at least 8 is held to its hue, so the grey grid and black lines of about its darkness are not
 * taken for it. Read with `weakHue` false (the grid-line test of a guide) it stays grey. Grey ink,
 * with a few units of chroma from JPEG noise, is never held to a hue. INVENTED colours.
 */
import { describe, expect, it } from 'vitest';
import { inkModel, membership, type Rgb } from '../../src/digitize/colour.ts';

const paper: Rgb = [246, 244, 240];
// A faint blue: luma 70 below the paper, chroma 10.8 (15 % of the luma): under a quarter.
const faintBlue: Rgb = [172, 174, 180];
// A grey of about the same darkness, with a trace of JPEG chroma.
const grey: Rgb = [175, 173, 171];

describe('a line colour with a weak hue', () => {
  it('is held to its hue, and read as grey only when asked to', () => {
    expect(inkModel(faintBlue, paper).mode).toBe('chromatic');
    expect(inkModel(faintBlue, paper, false).mode).toBe('achromatic');
  });

  it('does not take grey ink of its darkness for the line, where the grey model would', () => {
    const held = inkModel(faintBlue, paper);
    const asGrey = inkModel(faintBlue, paper, false);
    expect(membership(held, ...faintBlue)).toBeGreaterThan(0.8);
    expect(membership(held, ...grey)).toBeLessThan(0.2);
    expect(membership(asGrey, ...grey)).toBeGreaterThan(0.8);
  });

  it('leaves grey ink grey, whatever chroma noise it carries', () => {
    expect(inkModel(grey, paper).mode).toBe('achromatic');
    expect(inkModel([120, 118, 121], paper).mode).toBe('achromatic');
  });
});
