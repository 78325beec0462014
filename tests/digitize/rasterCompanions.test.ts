/**
 * A raster trace whose guides all sit where lines of several colours run together: the colour of
 * the same impeller's line on another panel (its companion, clicked where it stands alone) is
 * tried at the guides (`companions` in `traceRaster`, `companionGuides` in companions.ts).
 * Synthetic pictures, and an invented sheet of the random bed where it was found.
 */
import { describe, expect, it } from 'vitest';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { companionGuides, companionGuidesOf, tracesLeaningOn } from '../../src/digitize/companions.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';
import { bedLineTrace, distanceToLine } from './fixtures/bedTrace.ts';
import { makeRandomSheet, sheetGeometry } from '../../scripts/randomSheets/randomSheet.ts';
import { applyH } from '../../scripts/randomSheets/camera.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { loadImageRasterNode } from '../../src/digitize/loaders/imageNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';

const W = 520;
const H = 320;
const PAPER = 248;

type Rgb = readonly [number, number, number];
const PINK: Rgb = [214, 60, 165];
const BLUE: Rgb = [31, 119, 180];
const OLIVE: Rgb = [150, 150, 20];

/** Lines of ink over paper, anti-aliased by 4 × 4 sub-samples; where lines overlap their inks multiply, as printed ink does. */
function picture(lines: readonly { ink: Rgb; at: (x: number, y: number) => boolean }[]): RasterImage {
  const data = new Uint8ClampedArray(W * H * 4);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = (y * W + x) * 4;
      const rgb = [PAPER, PAPER, PAPER];
      for (const line of lines) {
        let cover = 0;
        for (let sy = 0; sy < 4; sy++) for (let sx = 0; sx < 4; sx++) if (line.at(x + (sx + 0.5) / 4, y + (sy + 0.5) / 4)) cover++;
        const a = cover / 16;
        for (let k = 0; k < 3; k++) rgb[k] = rgb[k]! * (1 - a + (a * line.ink[k]!) / 255);
      }
      for (let k = 0; k < 3; k++) data[i + k] = Math.round(rgb[k]!);
      data[i + 3] = 255;
    }
  }
  return { width: W, height: H, data: blurred(data), scale: 1 };
}

/** A scanner's blur: each channel averaged with weights 1-2-1 across and along. */
function blurred(data: Uint8ClampedArray): Uint8ClampedArray {
  const out = new Uint8ClampedArray(data.length);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = (y * W + x) * 4;
      for (let k = 0; k < 3; k++) {
        let sum = 0;
        let weight = 0;
        for (let dy = -1; dy <= 1; dy++) {
          for (let dx = -1; dx <= 1; dx++) {
            const xx = Math.min(W - 1, Math.max(0, x + dx));
            const yy = Math.min(H - 1, Math.max(0, y + dy));
            const w = (2 - Math.abs(dx)) * (2 - Math.abs(dy));
            sum += w * data[(yy * W + xx) * 4 + k]!;
            weight += w;
          }
        }
        out[i + k] = Math.round(sum / weight);
      }
      out[i + 3] = 255;
    }
  }
  return out;
}

const WIDTH = 2.2;
/** Three curves drawn 1.3 line widths apart (run together once blurred) from x = 20 to 380, fanning out beyond; `k` = −1, 0, 1. */
const bunchY = (k: number, x: number) => 200 - 0.25 * x + k * (1.3 * WIDTH + Math.max(0, x - 380) * 0.25);
const onBunch = (k: number) => (x: number, y: number) => x >= 20 && x <= 500 && Math.abs(y - bunchY(k, x)) <= WIDTH / 2;
/** The pink line's companion: the same impeller's curve on another panel, a level line standing alone. */
const onCompanion = (x: number, y: number) => x >= 40 && x <= 480 && Math.abs(y - 290) <= WIDTH / 2;

const image = picture([
  { ink: BLUE, at: onBunch(-1) },
  { ink: PINK, at: onBunch(0) },
  { ink: OLIVE, at: onBunch(1) },
  { ink: PINK, at: onCompanion },
]);
const pinkLine = Array.from({ length: 49 }, (_, j) => [20 + 10 * j, bunchY(0, 20 + 10 * j)] as const);
/** Guides on the pink line inside the bunch, where a hurried or careful click alike lands among the others. */
const guides = [100, 200, 300].map((x) => sheetPoint(x, bunchY(0, x)));
const companions = [[sheetPoint(150, 290), sheetPoint(350, 290)]];

/** Share of the pink line (x from 40 to 480) that the trace runs along, within a line width, and the trace's farthest point off the pink line. */
function onPink(points: readonly (readonly [number, number])[]): { covered: number; worst: number } {
  const inside = pinkLine.filter((p) => p[0] >= 40 && p[0] <= 480);
  const covered = points.length < 2 ? 0 : inside.filter((p) => distanceToLine(points, p) <= WIDTH).length / inside.length;
  return { covered, worst: Math.max(...points.map((p) => distanceToLine(pinkLine, p))) };
}

describe('traceRaster: companions, where every guide sits in a bunch', () => {
  // Blue, pink and olive lines run together; the sample under each guide is the blend where two
  // colours meet, a thin model that no line follows along its length.
  it('without companions the trace loses the pink line (the case the rule is for)', () => {
    const got = traceRaster(image, guides);
    expect(onPink(got.points).covered).toBeLessThan(0.5);
  });

  it("takes the colour of the pink head curve and follows the pink line through the bunch and on past the fan", () => {
    const got = traceRaster(image, guides, { companions });
    expect(got.line.widthPx).toBeGreaterThan(1.5);
    const { covered, worst } = onPink(got.points);
    expect(covered).toBeGreaterThan(0.95);
    expect(worst).toBeLessThan(1);
  });
});

describe('traceRaster: companions leave a clean sample alone', () => {
  it('changes nothing where the line taken is about as wide as the companion line alone', () => {
    // The pink line alone (no neighbours), its companion of another colour.
    const alone = picture([{ ink: PINK, at: onBunch(0) }, { ink: BLUE, at: onCompanion }]);
    const plain = traceRaster(alone, guides);
    const withBlue = traceRaster(alone, guides, { companions });
    expect(onPink(plain.points).covered).toBeGreaterThan(0.95);
    expect(withBlue.points).toEqual(plain.points);
    expect(withBlue.line.colour).toEqual(plain.line.colour);
  });

  it('changes nothing in a bunch where the companion is of the same hue as a neighbour (its colour measures as wide as the mix)', () => {
    const crimson = picture([
      { ink: [170, 20, 90], at: onBunch(-1) },
      { ink: PINK, at: onBunch(0) },
      { ink: OLIVE, at: onBunch(1) },
      { ink: PINK, at: onCompanion },
    ]);
    const plain = traceRaster(crimson, guides);
    const got = traceRaster(crimson, guides, { companions });
    expect(got.points).toEqual(plain.points);
  });
});

describe('companionGuides', () => {
  const traces = [
    { quantity: 'head', diameter: 300, guides: [[1, 2]] as [number, number][] },
    { quantity: 'efficiency', diameter: 300, guides: [[3, 4]] as [number, number][] },
    { quantity: 'efficiency', diameter: 280, guides: [[5, 6]] as [number, number][] },
    { quantity: 'power', diameter: 300, guides: [[7, 8]] as [number, number][] },
    { quantity: 'efficiency', iso: 70, guides: [[9, 9]] as [number, number][] },
    { quantity: 'head', diameter: 280, points: [[1, 1]], guides: [[2, 2]] as [number, number][] },
    { quantity: 'npshr', speed: 1450, guides: [[4, 4]] as [number, number][] },
    { quantity: 'head', speed: 1450, guides: [[6, 6]] as [number, number][] },
  ];
  it("gives each efficiency, power or NPSHr trace the guides of the same impeller's (or speed's) head trace", () => {
    expect(companionGuidesOf(traces, 1)).toEqual([[[1, 2]]]);
    expect(companionGuidesOf(traces, 3)).toEqual([[[1, 2]]]);
    expect(companionGuidesOf(traces, 6)).toEqual([[[6, 6]]]);
  });
  it('gives a curve about to be traced (no guides yet, as the workbench asks) its head trace\'s guides', () => {
    expect(companionGuidesOf([...traces, { quantity: 'power', diameter: 300 }], traces.length)).toEqual([[[1, 2]]]);
  });
  it('gives none to a head trace, an iso-trace, or where the head trace is given by points', () => {
    expect(companionGuidesOf(traces, 0)).toEqual([]);
    expect(companionGuidesOf(traces, 4)).toEqual([]);
    expect(companionGuidesOf(traces, 2)).toEqual([]);
    expect(companionGuides(traces)).toHaveLength(traces.length);
  });
  it('names the traces that lean on a head trace: the same impeller\'s (or speed\'s) other traces, none for other traces', () => {
    expect(tracesLeaningOn(traces, 0)).toEqual([1, 3]);
    expect(tracesLeaningOn(traces, 7)).toEqual([6]);
    // A head trace given by points lends nothing; an efficiency trace has none leaning on it.
    expect(tracesLeaningOn(traces, 5)).toEqual([]);
    expect(tracesLeaningOn(traces, 1)).toEqual([]);
    // Each trace leaning on a head trace has that head trace among its companions.
    for (const k of tracesLeaningOn(traces, 0)) expect(companionGuidesOf(traces, k)).toContainEqual([[1, 2]]);
  });
});

describe('companions on the random bed', () => {
  const offShare = (got: { points: readonly (readonly [number, number])[] }, line: readonly (readonly [number, number])[], width: number) => got.points.filter((p) => distanceToLine(line, p) > Math.max(2, width)).length / Math.max(1, got.points.length);
  /** Share of the drawn line (its middle 80 %) that the trace runs along, within two line widths. */
  const covered = (got: { points: readonly (readonly [number, number])[] }, line: readonly (readonly [number, number])[], width: number) => {
    const middle = line.slice(Math.floor(line.length * 0.1), Math.ceil(line.length * 0.9));
    return got.points.length < 2 ? 0 : middle.filter((p) => distanceToLine(got.points, p) <= Math.max(3, 2 * width)).length / middle.length;
  };
  /** The trace with its head curve as companion and without, with the off and covered shares of each. */
  const both = async (seed: number, id: string, options: { kind?: 'scan' | 'photo'; careful?: boolean } = {}) => {
    const measure = (t: Awaited<ReturnType<typeof bedLineTrace>>) => ({ ...t, off: offShare(t.got, t.line, t.width), covered: covered(t.got, t.line, t.width) });
    return { withHead: measure(await bedLineTrace(seed, id, options)), without: measure(await bedLineTrace(seed, id, { ...options, companions: false })) };
  };
  /** The trace by the head curve's colour lies on the drawn line (under 5 % of its points off) over at least `share` of it. */
  const followsLine = (t: { off: number; covered: number }, share: number) => {
    expect(t.off).toBeLessThan(0.05);
    expect(t.covered).toBeGreaterThan(share);
  };
  /** The headless replay of a bed sheet with its hurried guides. */
  const replayBed = async (seed: number, kind: 'scan' | 'photo') => {
    const s = await makeRandomSheet(seed, kind);
    const raster = await loadImageRasterNode(s.jpeg);
    return replayTakeoff(parseTakeoff(s.takeoff), imageSheet(raster, '0'.repeat(64), () => raster));
  };
  // Scan 66, careful guides: a pink efficiency curve runs between blue and olive ones over its whole
  // length, and every guide samples them run together (a 4.7 px mix). The pink head curve of the
  // same impeller, clicked where it stands alone, gives the colour.
  it('follows a pink efficiency curve bunched with blue and olive ones (scan 66, careful guides, efficiency-303)', async () => {
    const { got, line, width } = await bedLineTrace(66, 'efficiency-303', { careful: true });
    expect(offShare(got, line, width)).toBeLessThan(0.1);
    expect(covered(got, line, width)).toBeGreaterThan(0.9);
    expect(got.line.widthPx).toBeLessThan(3);
  }, 60_000);

  it('without the head curve, the same trace follows the bunch (the case the rule is for)', async () => {
    const { got, line, width } = await bedLineTrace(66, 'efficiency-303', { careful: true, companions: false });
    expect(covered(got, line, width)).toBeLessThan(0.5);
  }, 60_000);

  // Photo 74, hurried guides: two guides where a pink efficiency curve runs among others at low
  // flow sample a grey blend of them; the pink head curve's colour follows the pink line on. Its
  // colour is found there as a 1.2 px stroke (the line is 1.95 px); with the head line's width the
  // trace runs 64 % of the line against 36 % (3 of its 23 points off the line where it ends in the
  // bunch; the fitted curve 0.27 points off against 0.48).
  it('takes the head curve\'s colour where the guides sample a grey blend of colours (photo 74, hurried guides, efficiency-180)', async () => {
    const { withHead, without } = await both(74, 'efficiency-180', { kind: 'photo' });
    expect(withHead.off).toBeLessThan(0.15);
    expect(withHead.covered).toBeGreaterThan(0.6);
    expect(withHead.covered).toBeGreaterThan(1.5 * without.covered);
  }, 60_000);

  // Photo 38, hurried guides: one guide in an olive efficiency curve's low-flow bunch; the head
  // curve's colour measures a thin stroke there whose trace runs a fifth as far. The trace without
  // it is kept.
  it("keeps the trace without the head curve's colour where that one runs shorter (photo 38, hurried guides, efficiency-145)", async () => {
    const { withHead, without } = await both(38, 'efficiency-145', { kind: 'photo' });
    expect(withHead.got.points).toEqual(without.got.points);
  }, 60_000);
  // Scan 105, careful guides, and scan 40, hurried guides: the head curve's colour is found at the
  // guide only as a thin stroke (the line half under its neighbours there), and a model that thin
  // loses the line where it leaves the bunch. The width of the head curve's line where it stands
  // alone follows it end to end (before that width was tried, both were wrong: 1.86 points and
  // 26.5 % of span off).
  it("takes the head line's width where its colour is sampled thin in a bunch (scan 105, careful, efficiency-12)", async () => {
    const { withHead, without } = await both(105, 'efficiency-12', { careful: true });
    followsLine(withHead, 0.95);
    expect(without.off).toBeGreaterThan(0.2);
  }, 60_000);

  it("takes the head line's width where its colour is sampled thin in a bunch (scan 40, hurried, npshr-15)", async () => {
    const { withHead, without } = await both(40, 'npshr-15');
    followsLine(withHead, 0.95);
    expect(without.covered).toBeLessThan(0.2);
  }, 60_000);
  // Photo 1205, hurried guides: an NPSHr line clicked once in its low-flow bunch, traced in the
  // replay by the head curve's colour and width, came out 1.003 % of span off with no doubt at all:
  // the wider model saw room beside the line at the guide. The guide sampled lines run together,
  // and the take-off says so.
  it('says the guide sits in a bunch when the model came from the head curve (photo 1205, hurried guides, npshr-310)', async () => {
    const replay = await replayBed(1205, 'photo');
    const codes = replay.curveSet.findings.filter((f) => f.subject.trace === 'npshr-310').map((f) => f.code);
    expect(codes).toContain('takeoff.guide-in-bunch');
  }, 60_000);
  // Scan 1192, hurried guides: a dashed purple NPSHr line whose guides sample a grey blend. The trace
  // by the head curve's colour saw 4 points and bridged the rest straight across the bunch (508 sheet
  // units of path, nearly all of it a chord); the trace without it followed the line over 791. A
  // bridged chord is no length seen, and the plain trace stands (it had come out 6.4 % of span off).
  it("keeps the trace that saw its line over a companion's trace that only bridged the bunch (scan 1192, hurried guides, npshr-290)", async () => {
    const replay = await replayBed(1192, 'scan');
    const got = replay.traces.find((t) => t.id === 'npshr-290')!;
    const { plan, shot } = sheetGeometry(1192, 'scan');
    const drawn = plan.lines.find((l) => l.id === 'npshr-290')!;
    const line = drawn.points.map((p) => applyH(shot.h, p));
    expect(got.points.length).toBeGreaterThan(30);
    expect(covered({ points: got.points }, line, drawn.style.width)).toBeGreaterThan(0.8);
    expect(offShare({ points: got.points }, line, drawn.style.width)).toBeLessThan(0.05);
  }, 60_000);
  // Another hue: the guides sample a colour as wide as the head curve's line, but not its colour
  // (a neighbour's, or a blend of several). Scan 880, hurried guides: an orange efficiency curve
  // clicked where a brown one runs beside it, sampled as a 4.7 px brown mix, followed the brown line
  // (58 % of its points off); photo 41: an NPSHr line sampled in another green ran a fifth of its
  // length. The head curve's colour follows both.
  it("tries the head curve's colour where the guides sample another hue (scan 880, hurried guides, efficiency-11)", async () => {
    const { withHead, without } = await both(880, 'efficiency-11');
    followsLine(withHead, 0.95);
    expect(without.off).toBeGreaterThan(0.3);
  }, 60_000);

  it("tries the head curve's colour where the guides sample another hue (photo 41, hurried guides, npshr-13.5)", async () => {
    const { withHead, without } = await both(41, 'npshr-13.5', { kind: 'photo' });
    followsLine(withHead, 0.9);
    expect(without.covered).toBeLessThan(0.3);
  }, 60_000);

  // Photo 179, careful guides: a clean sample of the line's own colour, which the scan printed
  // apart from its head curve's; the head curve's colour ran as far but saw half as much of the line
  // (it bridged across bunches). The trace by the sample stands, point for point.
  it("keeps a clean sample's trace where the head curve's colour sees less of the line (photo 179, careful guides, efficiency-294)", async () => {
    const { withHead, without } = await both(179, 'efficiency-294', { kind: 'photo', careful: true });
    expect(withHead.got.points).toEqual(without.got.points);
    expect(withHead.covered).toBeGreaterThan(0.95);
  }, 60_000);
  // Scan 87, hurried guides: a teal efficiency curve clicked once near the origin, where a blue line
  // runs over it. The guide samples the blue, and the teal is not found within the guide's reach; it
  // shows 12 px on along the same course, where the lines part. The head curve's colour found there
  // follows the teal line (it had come out 57 points off, a tenth of the line traced).
  it("looks for the head curve's colour along the guide's line where the bunch hides it at the guide (scan 87, hurried guides, efficiency-360)", async () => {
    const { withHead, without } = await both(87, 'efficiency-360');
    followsLine(withHead, 0.85);
    expect(without.covered).toBeLessThan(0.2);
  }, 60_000);
});
