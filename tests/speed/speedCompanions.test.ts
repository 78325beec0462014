/**
 * INVENTED four-speed families scanned (scripts/randomSheets/speedSheet.ts), efficiency lines
 * clicked where the speed bench's hurried guides click them. Seed 6: the 1400 rpm efficiency line (purple) is clicked once near its peak,
 * where the four efficiency curves run together. The sample there is a grey blend; the purple of
 * the 1400 rpm head curve is found at the guide only as a 1.3 px stroke (the line is 2.3 px,
 * about 3 px in the scan), and a model that thin loses the line a few widths from the guide, 9.4
 * points off. The width of the head curve's line where it stands alone follows it down to low flow.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { applyH, decode } from '../../scripts/randomSheets/camera.ts';
import { benchOptions } from '../../scripts/randomSheets/speedDump.ts';
import { makeSpeedSheet, type SpeedSheet } from '../../scripts/randomSheets/speedSheet.ts';
import { companionGuides } from '../../src/digitize/companions.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { traceRaster, type RasterTraceResult } from '../../src/digitize/rasterTrace.ts';
import { siblingGuides } from '../../src/digitize/vectorChoice.ts';
import { hasChromium } from '../digitize/fixtures/browserSheet.ts';
import { distanceToLine } from '../digitize/fixtures/bedTrace.ts';

/** The bench's hurried trace `id` of scanned speed sheet `seed`, with its head curve as companion or without, and its drawn line. */
function speedTrace(seed: number, id: string) {
  let s: SpeedSheet;
  let trace: (companions: boolean) => RasterTraceResult;
  beforeAll(async () => {
    s = await makeSpeedSheet(seed, benchOptions(seed, 'scan'));
    const d = await decode(Buffer.from(s.bytes));
    const image = { width: d.width, height: d.height, data: d.data, scale: 1 };
    const traces = s.takeoff.traces;
    const index = traces.findIndex((t) => t.id === id);
    const t = traces[index]!;
    const frame = s.takeoff.panels.find((p) => p.id === t.panel)?.frame;
    trace = (companions) =>
      traceRaster(image, (t.guides ?? []).map(([x, y]) => sheetPoint(x, y)), {
        siblings: siblingGuides(traces).filter((_, k) => k !== index),
        ...(companions ? { companions: companionGuides(traces)[index] } : {}),
        ...(frame ? { frame } : {}),
      });
  }, 120_000);
  const drawn = () => s.plan.lines.find((l) => l.id === id)!.points.map((p) => applyH(s.shot.h, p));
  return {
    trace: (companions: boolean) => trace(companions),
    drawn,
    /** Share of the trace's points farther than 3 px from the drawn line. */
    off: (got: RasterTraceResult) => got.points.filter((p) => distanceToLine(drawn(), p) > 3).length / Math.max(1, got.points.length),
    /** Share of the drawn line's middle 80 % that the trace runs along, within 3 px. */
    covered: (got: RasterTraceResult) => {
      const line = drawn();
      const middle = line.slice(Math.floor(line.length * 0.1), Math.ceil(line.length * 0.9));
      return got.points.length < 2 ? 0 : middle.filter((p) => distanceToLine(got.points, p) <= 3).length / middle.length;
    },
  };
}

/**
 * The cases, each as the speed bench's hurried guides click it: the trace with the head curve's
 * colour (`off` share of points off the drawn line under, `covered` share of the line over, and
 * what else it must show) and without it (`without`: covered under, the case the rule is for).
 */
interface Case {
  seed: number;
  id: string;
  title: string;
  follows: string;
  off: number;
  covered: number;
  /** The model's width over this (the head line's width taken). */
  widthOver?: number;
  dashed?: boolean;
  /** Every trace that starts in a bunch keeps its doubt. */
  inBunch?: boolean;
  without: number;
  withoutSays: string;
}

const CASES: Case[] = [
  // Seed 6: described at the top of this file.
  { seed: 6, id: 'efficiency-1400', title: 'a speed family efficiency line clicked once where the curves run together (seed 6)', follows: "follows the line from the guide near its peak down to low flow with its head curve's colour and width", off: 0.05, covered: 0.8, widthOver: 2.5, inBunch: true, without: 0.3, withoutSays: 'without the head curve the trace runs a fifth of the line (the case the rule is for)' },
  // Seed 22: the 1600 rpm efficiency line (orange) is clicked once near the origin, where all four
  // efficiency curves start together; the sample there reads as a dark grey blend. The trace without
  // the head curve's colour follows the black 1750 rpm line (1071 px), the one with it the orange
  // line (769 px, 3.8 points off before). A grey sample's trace follows a line of no hue, whose
  // length says little: the head curve's trace is kept at 60 % of it.
  { seed: 22, id: 'efficiency-1600', title: 'a speed family efficiency line clicked once at the origin, where the curves start together (seed 22)', follows: "follows the orange line with its head curve's colour, though the grey sample's trace runs farther on the black line", off: 0.1, covered: 0.65, inBunch: true, without: 0.2, withoutSays: 'without the head curve the trace follows another line (the case the rule is for)' },
  // Seed 10: the 1450 rpm efficiency line (blue) is clicked three times near its peak, where the
  // purple and black lines run close; every guide samples a purple blend as wide as the blue head
  // curve's line (7.6 points off). A sample of another hue than the head curve's tries its colour,
  // kept where it sees at least as much of the line.
  { seed: 10, id: 'efficiency-1450', title: 'a speed family efficiency line clicked near its peak, sampled in another hue (seed 10)', follows: "follows the blue line with its head curve's colour", off: 0.05, covered: 0.9, without: 0.2, withoutSays: 'without the head curve the trace follows the purple blend (the case the rule is for)' },
  // Seed 40: the 1575 rpm NPSHr line (red, dashed) is clicked once at low flow, where four dashed
  // NPSHr lines run 5–6 px apart. Its own sample reads as solid (the neighbours' dashes fill its
  // gaps) and loses the line at once (25 % of span short). The head curve's colour reads its dash
  // pattern there, and a dashed model from the head curve's colour is tried as a solid one is.
  { seed: 40, id: 'npshr-1575', title: 'a dashed speed family NPSHr line clicked once among the others (seed 40)', follows: "follows the dashed line with its head curve's colour", off: 0.1, covered: 0.9, dashed: true, inBunch: true, without: 0.1, withoutSays: 'without the head curve the trace stops at once (the case the rule is for)' },
];

for (const c of CASES) {
  describe.skipIf(!hasChromium)(c.title, () => {
    const { trace, off, covered } = speedTrace(c.seed, c.id);
    it(c.follows, () => {
      const got = trace(true);
      if (c.dashed) expect(got.line.dashed).toBe(true);
      expect(off(got)).toBeLessThan(c.off);
      expect(covered(got)).toBeGreaterThan(c.covered);
      if (c.widthOver !== undefined) expect(got.line.widthPx).toBeGreaterThan(c.widthOver);
      if (c.inBunch) expect(got.doubts.map((d) => d.code)).toContain('takeoff.guide-in-bunch');
    });
    it(c.withoutSays, () => {
      expect(covered(trace(false))).toBeLessThan(c.without);
    });
  });
}
