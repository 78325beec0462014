/**
 * Panels on scans: the page's turn, frames from rules, words from ink blots, and the whole
 * reading of an INVENTED scan of the independent random bed with tesseract.js (offline): every
 * panel found with its quantity and calibrated within 0.5 % of span (the scan
 * tolerance), and a misread tick label turned into a question, never into a silent error.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { inkMap, levelInk, levelOf, pageAngle } from '../../src/digitize/detect/ink.ts';
import { findRasterFrames, framesTurn, gridLines, horizontalRules, transpose, type Rule } from '../../src/digitize/detect/rasterFrames.ts';
import { findRasterPanels, flowUnitOfTitle, knownFlowUnit, RASTER_ANCHOR_BIAS } from '../../src/digitize/detect/rasterPanels.ts';
import { calibratePanels } from '../../src/digitize/calibration.ts';
import { wordsOf, type TextReader } from '../../src/digitize/detect/rasterText.ts';
import { decode } from '../../scripts/randomSheets/camera.ts';
import { calibrationError, sheetGeometry } from '../../scripts/randomSheets/randomSheet.ts';
import { scanFor } from '../../scripts/detectSheets/scanBed.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';
import { detectTakeoff } from '../../src/digitize/detect/detect.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { parseTakeoffToDetect } from '../../src/model/takeoff.ts';
import { detectSample } from './sampleDetect.ts';

afterAll(() => closeTextReaderNode());

/** White page with dark straight lines at `deg` degrees (y down), 2 px thick. */
function ruled(width: number, height: number, deg: number, rows: number[]): RasterImage {
  const data = new Uint8ClampedArray(width * height * 4).fill(250);
  const t = Math.tan((deg * Math.PI) / 180);
  for (const y0 of rows) {
    for (let x = 50; x < width - 50; x++) {
      const yc = y0 + (x - width / 2) * t;
      for (let y = Math.floor(yc - 2); y <= Math.ceil(yc + 2); y++) {
        const cover = Math.max(0, Math.min(1, 1.5 - Math.abs(y + 0.5 - yc)));
        const o = (y * width + x) * 4;
        for (let c = 0; c < 3; c++) data[o + c] = Math.min(data[o + c] as number, 250 - 230 * cover);
      }
    }
  }
  return { width, height, data, scale: 1 };
}

describe('the page turn', () => {
  it.each([-1.7, -0.3, 0, 0.45, 1.9])('reads a page turned %f° within 0.01°', (deg) => {
    const image = ruled(1200, 900, deg, [150, 300, 420, 600, 750]);
    const map = inkMap(image);
    expect(Math.abs((pageAngle(map, 100) * 180) / Math.PI - deg)).toBeLessThanOrEqual(0.01);
  });

  it.each([0.12, -0.04, 0.08])('reads the turn a level page still has (%f°) from its frame\'s rules within 0.003°', (deg) => {
    // A frame's top and bottom drawn turned by a small angle, as a page the pile-up of ink read
    // level (its lines' staircases on the pixel grid pull that toward 0°) still leans.
    const map = inkMap(ruled(1200, 900, deg, [300, 600]));
    const left = framesTurn(map, [[100, 300, 1100, 600]]);
    expect(left).toBeDefined();
    expect(Math.abs(((left as number) * 180) / Math.PI - deg)).toBeLessThanOrEqual(0.003);
    // Nothing to read where no rule lies: no turn is made up.
    expect(framesTurn(map, [[100, 100, 1100, 200]])).toBeUndefined();
  });

  it('turning level puts the rules on rows, and the level map maps back to the image', () => {
    const image = ruled(1200, 900, 1.2, [300, 600]);
    const map = inkMap(image);
    const level = levelOf(pageAngle(map, 100), map.width, map.height);
    const rules = horizontalRules(levelInk(map, level), 100, 600);
    expect(rules).toHaveLength(2);
    for (const r of rules) {
      // The rule's middle maps back onto the drawn line at the image's centre column (within 0.3 px).
      const [x, y] = level.toImage(600, r.at);
      const drawn = [300, 600].map((y0) => y0 + (x - 600) * Math.tan((1.2 * Math.PI) / 180));
      expect(Math.min(...drawn.map((d) => Math.abs(d - y)))).toBeLessThanOrEqual(0.3);
    }
  });
});

describe('frames from rules', () => {
  const h = (at: number, from: number, to: number): Rule => ({ at, from, to });
  it('a side broken by a label box still closes the frame; two frames stacked stay two', () => {
    const horizontal = [h(100, 50, 850), h(400, 50, 850), h(480, 50, 850), h(700, 50, 850)];
    const vertical = [h(50, 100, 400), h(850, 100, 250), h(850, 310, 400), h(50, 480, 700), h(850, 480, 700)];
    const frames = findRasterFrames(horizontal, vertical, 100, 6);
    expect(frames).toEqual([
      [50, 100, 850, 400],
      [50, 480, 850, 700],
    ]);
  });

  it('grid lines are found where the median contrast along them stands out, not where a curve crosses', () => {
    const image = ruled(800, 600, 0, [100, 200, 300, 400, 500]);
    // A curve-like dark stroke along row 250 over a tenth of the width.
    for (let x = 300; x < 380; x++) for (let y = 249; y <= 251; y++) image.data.fill(20, (y * 800 + x) * 4, (y * 800 + x) * 4 + 3);
    const lines = gridLines(inkMap(image), [50, 60, 750, 540], 'y');
    expect(lines.map(Math.round)).toEqual([100, 200, 300, 400, 500]);
  });
});

describe('words from blots', () => {
  it('a decimal point joins its digits; an upright title beside a label does not swallow it', () => {
    const digits = [
      { l: 100, t: 50, r: 110, b: 64 },
      { l: 112, t: 50, r: 122, b: 64 },
      { l: 124, t: 61, r: 127, b: 64 },
      { l: 129, t: 50, r: 139, b: 64 },
    ];
    const title = { l: 40, t: 20, r: 56, b: 120 };
    const label = { l: 70, t: 60, r: 90, b: 74 };
    const glyphs = Array.from({ length: 12 }, (_, i) => ({ l: 300 + 12 * i, t: 200, r: 310 + 12 * i, b: 214 }));
    const words = wordsOf([...digits, title, label, ...glyphs]);
    expect(words).toContainEqual({ l: 100, t: 50, r: 139, b: 64 });
    expect(words).toContainEqual(title);
    expect(words).toContainEqual(label);
  });
});

describe('an INVENTED scan of the random bed', () => {
  const seed = 3;
  async function load(): Promise<RasterImage> {
    const { jpeg } = await scanFor(seed);
    const d = await decode(Buffer.from(jpeg));
    return { width: d.width, height: d.height, data: d.data, scale: 1 };
  }

  it('finds every panel with its quantity, calibrated within 0.5 % of span, asking nothing', { timeout: 120_000 }, async () => {
    const { plan, shot } = sheetGeometry(seed, 'scan');
    const found = await findRasterPanels(await load(), textReaderNode());
    expect(found.questions).toEqual([]);
    expect(found.panels.map((p) => p.quantity).sort()).toEqual(plan.panels.map((p) => p.quantity).sort());
    expect(Math.abs(found.turnDeg - shot.rotationDeg)).toBeLessThan(0.05);
    for (const p of found.panels) {
      const drawn = plan.panels.find((k) => k.quantity === p.quantity)!;
      // The real error over a 9 × 9 grid of the panel, against the values the plan drew there.
      expect(calibrationError(plan, shot, drawn.id, (q) => p.proposal.calibration.toData(q as never) as unknown as readonly [number, number])).toBeLessThan(0.5);
    }
  });

  it('reads a small turn to a hundredth of a degree, so the crossings far from the page\'s middle sit on the grid (bed scan 32)', { timeout: 120_000 }, async () => {
    // INVENTED bed scan 32, 150 dpi, turned 0.12°: the pile-up of ink read 0.045°, and the power
    // panel's grid crossings came out up to 1.5 px off at its far side, 0.38 % of span.
    const { plan, shot } = sheetGeometry(32, 'scan');
    const { jpeg } = await scanFor(32);
    const d = await decode(Buffer.from(jpeg));
    const found = await findRasterPanels({ width: d.width, height: d.height, data: d.data, scale: 1 }, textReaderNode());
    expect(Math.abs(found.turnDeg - shot.rotationDeg)).toBeLessThan(0.01);
    for (const p of found.panels) {
      const drawn = plan.panels.find((k) => k.quantity === p.quantity)!;
      expect(calibrationError(plan, shot, drawn.id, (q) => p.proposal.calibration.toData(q as never) as unknown as readonly [number, number])).toBeLessThan(0.1);
    }
  });

  it('a tick label misread once is read again; the two readings disagree, so the panel asks one question naming both, and is calibrated right', { timeout: 120_000 }, async () => {
    const { plan, shot } = sheetGeometry(seed, 'scan');
    const real = textReaderNode();
    let spoiled = '';
    const reader: TextReader = {
      async read(image, what) {
        const words = await real.read(image, what);
        if (what !== 'digits' || spoiled !== '') return words; // the first reading only: a second, larger one reads it right
        // The third label read becomes another number (as a smudge might make it).
        const w = words[2]!;
        spoiled = `${w.text}7`;
        return words.map((k) => (k === w ? { ...k, text: spoiled } : k));
      },
    };
    const found = await findRasterPanels(await load(), reader);
    expect(spoiled).not.toBe('');
    expect(found.questions).toHaveLength(1);
    expect(found.questions[0]).toMatch(new RegExp(`read two ways \\("${spoiled.replace('.', '\\.')}" then "`));
    expect(found.panels.map((p) => p.quantity).sort()).toEqual(plan.panels.map((p) => p.quantity).sort());
    for (const p of found.panels) {
      const drawn = plan.panels.find((k) => k.quantity === p.quantity)!;
      expect(calibrationError(plan, shot, drawn.id, (q) => p.proposal.calibration.toData(q as never) as unknown as readonly [number, number])).toBeLessThan(0.5);
    }
  });
});

describe('a tick label the first reading leaves blank', () => {
  it('and the larger reading reads, fitting the axis of the others, is read once: no question, the panel calibrated right', { timeout: 120_000 }, async () => {
    const seed = 3;
    const { plan, shot } = sheetGeometry(seed, 'scan');
    const { jpeg } = await scanFor(seed);
    const d = await decode(Buffer.from(jpeg));
    const real = textReaderNode();
    let blanked = '';
    const reader: TextReader = {
      async read(image, what) {
        const words = await real.read(image, what);
        if (what !== 'digits' || blanked !== '') return words; // the first reading only
        // The third label is not read at all (too faint at the first size).
        const w = words[2]!;
        blanked = w.text;
        return words.filter((k) => k !== w);
      },
    };
    const found = await findRasterPanels({ width: d.width, height: d.height, data: d.data, scale: 1 }, reader);
    expect(blanked).not.toBe('');
    expect(found.questions).toEqual([]);
    expect(found.panels.map((p) => p.quantity).sort()).toEqual(plan.panels.map((p) => p.quantity).sort());
    for (const p of found.panels) {
      const drawn = plan.panels.find((k) => k.quantity === p.quantity)!;
      expect(calibrationError(plan, shot, drawn.id, (q) => p.proposal.calibration.toData(q as never) as unknown as readonly [number, number])).toBeLessThan(0.5);
    }
    // Read once at the larger size, it counts among the panel's labels.
    expect(found.panels.some((p) => [...p.proposal.x.labels, ...p.proposal.y.labels].some((k) => k.text === blanked))).toBe(true);
  });
});

describe('the flow title of a scan', () => {
  it('whose unit is not read as a known flow unit is read again larger, and the second reading counts when it names one', { timeout: 120_000 }, async () => {
    const { jpeg } = await scanFor(3);
    const d = await decode(Buffer.from(jpeg));
    const real = textReaderNode();
    const spoiled: string[] = [];
    let wordsCalls = 0;
    const reader: TextReader = {
      async read(image, what) {
        const words = await real.read(image, what);
        if (what !== 'words' || ++wordsCalls !== 1) return words;
        // The first reading of the titles loses the unit's end, as a small superscript or slash is lost on a scan.
        return words.map((k) => {
          const cut = k.text.replace(/^\((m3\/h|gpm|L\/s)\)$/, (_, u: string) => `(${u.slice(0, 2)})`);
          if (cut !== k.text) spoiled.push(cut);
          return { ...k, text: cut };
        });
      },
    };
    const found = await findRasterPanels({ width: d.width, height: d.height, data: d.data, scale: 1 }, reader);
    expect(spoiled.length).toBeGreaterThan(0);
    expect(wordsCalls).toBeGreaterThanOrEqual(2);
    expect(found.questions).toEqual([]);
    for (const p of found.panels) expect(knownFlowUnit(p.flowTitle ?? '')).toBe(true);
    expect(knownFlowUnit('Flow Q (m3)')).toBe(false);
    expect(knownFlowUnit('Flow Q (m3/h)')).toBe(true);
    expect(knownFlowUnit('Flow Q')).toBe(false);
  });

  it('a flow title whose "m³/h" lost its superscript or slash to the reader still names m³/h; nothing else is taken for it', () => {
    // The committed INVENTED sample scan's "Flow (m³/h)" reads "Flow (mh)".
    for (const t of ['Flow (mh)', 'Flow Q (m3h)', 'Flow (m/h)', 'Flow (mah)', 'Flow (m³/h)', 'Flow (m3/hr)']) expect(flowUnitOfTitle(t)).toBe('m3/h');
    expect(flowUnitOfTitle('Flow (gpm)')).toBe('gpm');
    expect(flowUnitOfTitle('Flow (m3/min)')).toBe('m3/min');
    expect(flowUnitOfTitle('Flow (mm)')).toBe('mm');
    expect(knownFlowUnit('Flow (mm)')).toBe(false);
    expect(knownFlowUnit('Flow (mh)')).toBe(true);
    expect(flowUnitOfTitle('Flow')).toBeNull();
  });
});

describe('the committed INVENTED sample scan with its axis titles above the frames', () => {
  it('finds all four panels, the low NPSHr strip too, names each from the title over its corner, and takes no value title for a flow title', { timeout: 120_000 }, async () => {
    const root = join(import.meta.dirname, '..', '..', 'samples', 'sheets');
    const d = await decode(readFileSync(join(root, 'si-panels-colour-scan.jpg')));
    const found = await findRasterPanels({ width: d.width, height: d.height, data: d.data, scale: 1 }, textReaderNode());
    // "Head (m)", "Efficiency (%)", "Shaft power (kW)" and "NPSHr (m)" stand level over each frame's top left corner.
    expect(found.panels.map((p) => p.quantity)).toEqual(['head', 'efficiency', 'power', 'npshr']);
    expect(found.panels.map((p) => p.yUnit)).toEqual(['m', '%', 'kW', 'm']);
    // Under the flow labels of the upper panels stands the next panel's title, which names no flow
    // unit: they take the flow title printed under the lowest panel ("Flow (m³/h)", read "Flow (mh)").
    const lowest = found.panels[3]!.flowTitle;
    expect(lowest).not.toBeNull();
    expect(knownFlowUnit(lowest ?? '')).toBe(true);
    for (const p of found.panels.slice(0, 3)) expect(p.flowTitle).toBe(lowest);
    // Each panel against the hand-placed anchors of the committed take-off: within 0.5 % of span.
    const takeoff = JSON.parse(readFileSync(join(root, 'si-panels-colour-scan.takeoff.json'), 'utf8')) as { panels: { anchors: { at: [number, number]; x?: number; y?: number }[] }[] };
    found.panels.forEach((p, i) => {
      const anchors = takeoff.panels[i]!.anchors;
      const xs = anchors.filter((a) => a.x !== undefined).map((a) => a.x as number);
      const ys = anchors.filter((a) => a.y !== undefined).map((a) => a.y as number);
      const [xSpan, ySpan] = [Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys)];
      for (const a of anchors) {
        const [x, y] = p.proposal.calibration.toData(a.at as never) as unknown as [number, number];
        if (a.x !== undefined) expect((100 * Math.abs(x - a.x)) / xSpan, `${p.id} x at ${a.at}`).toBeLessThan(0.5);
        if (a.y !== undefined) expect((100 * Math.abs(y - a.y)) / ySpan, `${p.id} y at ${a.at}`).toBeLessThan(0.5);
      }
    });
  });

  it('names its head curves from their labels and reads its flow unit, asking neither', { timeout: 120_000 }, async () => {
    // "330 mm" stands past the top curve's end with its digits blurred into one blot (dropped as
    // a word, its "mm" naming nothing), and "Flow (m³/h)" reads "Flow (mh)": the sheet had asked
    // for the four diameters and for the flow unit.
    const found = await detectSample('si-panels-colour-scan');
    expect(found.questions.filter((q) => /diameters|flow unit|flow title/.test(q))).toEqual([]);
    const heads = found.takeoff.traces.filter((t) => t.quantity === 'head').map((t) => t.diameter);
    expect(heads.sort((a, b) => (b ?? 0) - (a ?? 0))).toEqual([330, 310, 290, 270]);
    for (const p of found.takeoff.panels) expect(p.units?.x).toBe('m3/h');
  });
});

describe('an INVENTED photo of the random bed, taken at an angle', () => {
  it('is squared from its own lines: every panel found, named and calibrated projectively within 0.5 % of span', { timeout: 120_000 }, async () => {
    const { jpeg } = await scanFor(5, 'photo');
    const { plan, shot } = sheetGeometry(5, 'photo');
    expect(shot.keystone).toBeGreaterThan(0.01);
    const d = await decode(Buffer.from(jpeg));
    const found = await findRasterPanels({ width: d.width, height: d.height, data: d.data, scale: 1 }, textReaderNode());
    expect(found.questions.filter((q) => /not square on the image/.test(q))).toEqual([]);
    expect(found.panels.map((p) => p.quantity).sort()).toEqual(plan.panels.map((p) => p.quantity).sort());
    for (const p of found.panels) {
      const truth = plan.panels.find((k) => k.quantity === p.quantity)!;
      expect(calibrationError(plan, shot, truth.id, (q) => p.proposal.calibration.toData(q as never) as unknown as readonly [number, number])).toBeLessThanOrEqual(0.5);
      expect(p.proposal.calibration.projection).toBe('projective');
    }
  });
});

describe('detectTakeoff on a scan', () => {
  it('completes a take-off that gives only the traces: found panels marked detected, the engineer\'s traces kept; a trace on a panel not found waits with a question', { timeout: 120_000 }, async () => {
    const { jpeg, takeoff } = await scanFor(3);
    const d = await decode(Buffer.from(jpeg));
    const image = { width: d.width, height: d.height, data: d.data, scale: 1 };
    const sheet = imageSheet(image, 'f'.repeat(64), () => image);
    const raw: Record<string, unknown> = { ...takeoff, sheet: '3.jpg', traces: [...takeoff.traces, { ...takeoff.traces[0]!, id: 'stray', panel: 'npshr' }] };
    delete raw.panels;
    const found = await detectTakeoff(parseTakeoffToDetect(raw), raw, sheet, { reader: textReaderNode() });
    expect(found.takeoff.panels.map((p) => [p.id, p.origin])).toEqual([
      ['head', 'detected'],
      ['power', 'detected'],
    ]);
    // Every curve is the engineer's already: none is added, the engineer's traces are kept.
    expect(found.takeoff.traces.map((t) => t.id)).toEqual(takeoff.traces.map((t) => t.id));
    expect(found.questions.filter((q) => /"npshr" of the trace "stray" was not found/.test(q))).toHaveLength(1);
    expect(found.document.detected).toMatchObject({ by: expect.stringMatching(/scans/) });
    // The anchors found on a scan share a placement error (RASTER_ANCHOR_BIAS, a quarter pixel
    // here at scale 1), which the saved panel carries so that every shell shows the same
    // residual; the residual shown then covers the real error within 3× (without it: under a third of it).
    const { plan, shot } = sheetGeometry(3, 'scan');
    const { calibrations } = calibratePanels(found.takeoff.panels);
    for (const p of found.takeoff.panels) {
      expect(p.anchor_bias).toBe(RASTER_ANCHOR_BIAS);
      const real = calibrationError(plan, shot, plan.panels.find((k) => k.quantity === p.quantity)!.id, (q) => calibrations.get(p.id)!.toData(q as never) as unknown as readonly [number, number]);
      const shown = calibrations.get(p.id)!.maxPercentOfSpan;
      expect(shown).toBeGreaterThan(real / 3);
      expect(shown).toBeLessThan(3 * Math.max(real, 0.01));
    }
  });
});
