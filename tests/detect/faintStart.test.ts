/**
 * A head curve whose first stretch the line finder missed (drawn pale, faded by the scan) starts
 * off the flow axis; it is still a head curve, not an iso-line (src/digitize/detect/rasterCurves.ts,
 * `startsFaint`). Tracks drawn from formulas (level pixels, rows grow downwards), and bed scan 43,
 * whose pale 290 mm head curve is found from 62 px into a 1174 px frame.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { startsFaint } from '../../src/digitize/detect/rasterCurves.ts';
import { closeTextReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { detectBedScan } from '../../scripts/detectSheets/scanBed.ts';
import { rowsTrack } from './trackOf.ts';

afterAll(() => closeTextReaderNode());

// A frame from column 100 to 1100 (1000 px wide) and 600 px high.
const LEFT = 100;
const WIDTH = 1000;
const HEIGHT = 600;
// A head curve: flat at shutoff, falling faster with flow (rows grow downwards).
const head = (u: number) => 200 + 2e-4 * (u - LEFT) ** 2;

describe('startsFaint', () => {
  it('takes a falling line over most of the frame that starts a little off the axis', () => {
    expect(startsFaint(rowsTrack(160, 950, head), LEFT, WIDTH, HEIGHT)).toBe(true);
  });
  it('refuses a line that starts too far in (a piece of a head curve cut at a label)', () => {
    expect(startsFaint(rowsTrack(250, 1000, head), LEFT, WIDTH, HEIGHT)).toBe(false);
  });
  it('refuses an iso-line branch, which rises with flow, and a short line', () => {
    expect(startsFaint(rowsTrack(160, 900, (u) => 500 - 0.3 * (u - 160)), LEFT, WIDTH, HEIGHT)).toBe(false);
    expect(startsFaint(rowsTrack(160, 500, head), LEFT, WIDTH, HEIGHT)).toBe(false);
  });
  it('refuses a level line (a grid line or a stray straight line does not fall)', () => {
    expect(startsFaint(rowsTrack(160, 950, () => 300), LEFT, WIDTH, HEIGHT)).toBe(false);
  });
  it('on bed scan 43, the pale 290 head curve is found, and its power curve named by its end', async () => {
    const { found } = await detectBedScan(43);
    const heads = found.takeoff.traces.filter((t) => t.quantity === 'head').map((t) => t.diameter);
    expect(heads).toContain(290);
    expect(found.takeoff.traces.filter((t) => t.quantity === 'power').map((t) => t.diameter)).toContain(290);
  }, 60_000);
});
