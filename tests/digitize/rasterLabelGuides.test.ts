/**
 * A guide clicked on a label printed over its line ("194 mm" on a patch of paper that cuts the
 * line) stands for the two places where the line leaves the label: the letters are not the line.
 * Synthetic pictures for the rule itself, and an invented sheet of the random bed
 * (scripts/randomSheets) on which a lone guide on the label followed the letters and nothing else.
 */
import { describe, expect, it } from 'vitest';
import { guidesOffLabels, labelExits } from '../../src/digitize/rasterLabels.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';
import { bedLineTrace, distanceToLine } from './fixtures/bedTrace.ts';
import { captureTrace } from '../../src/digitize/capture.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { loadImageRasterNode } from '../../src/digitize/loaders/imageNode.ts';
import { makeRandomSheet } from '../../scripts/randomSheets/randomSheet.ts';

const W = 420;
const H = 300;

/** A white picture with ink painted where `inkAt` says, anti-aliased by 4 × 4 sub-samples. */
function picture(inkAt: (x: number, y: number) => boolean, ink: [number, number, number] = [30, 30, 30]): RasterImage {
  const data = new Uint8ClampedArray(W * H * 4);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      let cover = 0;
      for (let sy = 0; sy < 4; sy++) for (let sx = 0; sx < 4; sx++) if (inkAt(x + (sx + 0.5) / 4, y + (sy + 0.5) / 4)) cover++;
      const a = cover / 16;
      const i = (y * W + x) * 4;
      for (let k = 0; k < 3; k++) data[i + k] = Math.round(250 * (1 - a) + ink[k]! * a);
      data[i + 3] = 255;
    }
  }
  return { width: W, height: H, data, scale: 1 };
}

/** The line y = 150 + 0.2 (x − 210), `width` px wide. */
const lineY = (x: number) => 150 + 0.2 * (x - 210);
const onLine = (x: number, y: number, width = 2) => Math.abs(y - lineY(x)) * Math.cos(Math.atan(0.2)) <= width / 2;

/** Four ring-shaped "letters" 20 px high, 12 wide, 16 apart, centred on (210, 150). */
const letters = [-24, -8, 8, 24].map((dx) => [210 + dx, 150] as const);
const onLetter = (x: number, y: number) => letters.some(([cx, cy]) => {
  const r = Math.hypot((x - cx) / 6, (y - cy) / 10);
  return r <= 1 && r >= 0.7;
});
/** The paper patch the letters are printed on: their box and a few pixels more. */
const onPatch = (x: number, y: number) => x >= 178 && x <= 242 && y >= 136 && y <= 164;

describe('labelExits: a guide on a label printed over its line', () => {
  it('gives the two places where the line leaves the label, on the line either side of it', () => {
    const image = picture((x, y) => onLetter(x, y) || (!onPatch(x, y) && onLine(x, y)));
    const got = labelExits(image, [211, 143]);
    expect(got).toBeDefined();
    const [a, b] = got!.exits;
    for (const p of [a, b]) expect(Math.abs(p[1] - lineY(p[0]))).toBeLessThan(2);
    expect(Math.min(a[0], b[0])).toBeLessThan(178);
    expect(Math.max(a[0], b[0])).toBeGreaterThan(242);
  });

  it('leaves a guide alone where the line runs through the letters with no patch (the letters join the line)', () => {
    const image = picture((x, y) => onLetter(x, y) || onLine(x, y));
    expect(labelExits(image, [211, 143])).toBeUndefined();
  });

  it('leaves a guide alone where another line runs along the letters uncut (no patch of paper: not a label printed over a line)', () => {
    // A level line 3 px under the letters' feet, from just before them to just past them (it meets no other line).
    const image = picture((x, y) => onLetter(x, y) || (x > 170 && x < 250 && Math.abs(y - 163.5) <= 1) || (!onPatch(x, y) && onLine(x, y)));
    expect(labelExits(image, [211, 143])).toBeUndefined();
  });

  it('leaves a guide alone on a label at the end of its line (one line leaves it: nothing says where the line runs on)', () => {
    const image = picture((x, y) => onLetter(x, y) || (x < 178 && onLine(x, y)));
    expect(labelExits(image, [211, 143])).toBeUndefined();
  });

  it('leaves a guide alone on a dotted line (a row of dots running on past the window is no label)', () => {
    const image = picture((x, y) => Math.abs(((x % 14) + 14) % 14 - 7) < 5 && onLine(x, y, 9));
    expect(labelExits(image, [210, 150])).toBeUndefined();
  });

  it('leaves a guide alone on a plain line', () => {
    const image = picture((x, y) => onLine(x, y));
    expect(labelExits(image, [210, 150])).toBeUndefined();
  });

  it('where two lines cross under one label, takes the one in line with the trace\'s course, and neither without a course', () => {
    const other = (x: number) => 150 - 0.6 * (x - 210);
    const image = picture((x, y) => onLetter(x, y) || (!onPatch(x, y) && (onLine(x, y) || Math.abs(y - other(x)) <= 1)));
    // The guide on a letter, where both lines would pass under it (they cross at the label's middle).
    const guide: [number, number] = [212, 150];
    expect(labelExits(image, guide)).toBeUndefined();
    const course: [number, number] = [1 / Math.hypot(1, 0.2), 0.2 / Math.hypot(1, 0.2)];
    const got = labelExits(image, guide, course);
    expect(got).toBeDefined();
    for (const p of got!.exits) expect(Math.abs(p[1] - lineY(p[0]))).toBeLessThan(2);
    // A course between the two lines' ways tells nothing.
    expect(labelExits(image, guide, [1 / Math.hypot(1, 0.2), -0.2 / Math.hypot(1, 0.2)])).toBeUndefined();
  });

  it('takes the trace\'s course from a guide some way off, not from a second click a few pixels from the first', () => {
    const other = (x: number) => 150 - 0.6 * (x - 210);
    const image = picture((x, y) => onLetter(x, y) || (!onPatch(x, y) && (onLine(x, y) || Math.abs(y - other(x)) <= 1)));
    // On the label, a hurried second click 2 px off along the other line's way, and a guide far out on the line.
    const guides = [sheetPoint(212, 150), sheetPoint(213.1, 148.1), sheetPoint(320, lineY(320))];
    const got = guidesOffLabels(image, guides);
    // Both clicks sit on the label; each stands for the places where the traced line leaves it.
    expect(got.offLabels.map((m) => m.guide)).toEqual([1, 2]);
    for (const m of got.offLabels) for (const p of m.at) expect(Math.abs(p[1] - lineY(p[0]))).toBeLessThan(2);
  });

  it('leaves a guide alone where lines run together into the label (their ink beside it is no one stroke)', () => {
    // Two more lines fanning out from the patch's left edge, one either side of the line.
    const fan = (x: number, y: number) => x < 178 && [1, -1].some((s) => Math.abs(y - lineY(x) - s * 0.15 * (178 - x)) <= 1);
    const image = picture((x, y) => onLetter(x, y) || (!onPatch(x, y) && (onLine(x, y) || fan(x, y))));
    expect(labelExits(image, [211, 143])).toBeUndefined();
  });
});

describe('a trace whose only guide sits on its label', () => {
  // Scan 27, hurried guides: the one guide of the 194 mm head curve on its label "194 mm"; the
  // trace followed the letters (3 points, 1 % of the line) and the fit was 178 % of span off.
  it('follows the line from end to end (random bed scan 27, head-194)', async () => {
    const { got, line, width } = await bedLineTrace(27, 'head-194');
    expect(got.offLabels?.map((m) => m.guide)).toEqual([1]);
    expect(got.points.filter((p) => distanceToLine(line, p) > Math.max(2, width))).toEqual([]);
    const xs = got.points.map((p) => p[0]);
    const span = line[line.length - 1]![0] - line[0]![0];
    expect(Math.min(...xs) - line[0]![0]).toBeLessThan(0.03 * span);
    expect(line[line.length - 1]![0] - Math.max(...xs)).toBeLessThan(0.03 * span);
  });

  it.each([
    // Scan 6, careful guides: the first guide of a dotted NPSHr line where it runs beside another
    // dotted line over a dense grid; dots joined in twos and threes looked like a row of letters.
    { seed: 6, id: 'npshr-10', careful: true },
    // Photo 131, hurried guides: a dotted power line crossing a grid line; the grid line's piece left
    // at the crossing and the dots beside it.
    { seed: 131, id: 'power-7.875', careful: false, kind: 'photo' as const },
  ])('takes no dotted line for a label (random bed $seed, $id)', async ({ seed, id, careful, kind }) => {
    const { got } = await bedLineTrace(seed, id, { careful, ...(kind ? { kind } : {}) });
    expect(got.offLabels).toBeUndefined();
  });

  it('says which guide was read where the line leaves its label, and nothing was lost', async () => {
    const sheet = await makeRandomSheet(27, 'scan');
    const image = await loadImageRasterNode(sheet.jpeg);
    const trace = sheet.takeoff.traces.find((t) => t.id === 'head-194')!;
    const frame = sheet.takeoff.panels.find((p) => p.id === trace.panel)?.frame;
    const got = await captureTrace({ guides: (trace.guides ?? []).map(([x, y]) => sheetPoint(x, y)), frame }, { kind: 'image', lines: async () => [], raster: async () => image });
    expect(got.moved).toEqual([expect.stringMatching(/^Guide 1 sat on a label printed over the line; the line was taken up where it leaves the label, near \(\d+\.\d, \d+\.\d\) and/)]);
    expect(got.lost).toEqual([]);
  });
});
