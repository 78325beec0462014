/**
 * The automatic take-off on vector sheets of the independent random bed (committed fixtures
 * printed by Chromium from scripts/randomSheets): from sheet, page, speed and units alone it
 * finds every panel, every curve with its diameter and every iso level the plan drew, asks
 * nothing, and every detected curve lies within 0.1 % of its axis span of the exact family at
 * 15–95 % of the curve's flow range.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { detectTakeoff } from '../../src/digitize/detect/detect.ts';
import { calibrate } from '../../src/digitize/calibration.ts';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import { parseTakeoffToDetect } from '../../src/model/takeoff.ts';
import { Dice } from '../../scripts/randomSheets/dice.ts';
import { planSheet } from '../../scripts/randomSheets/plan.ts';
import { drawnRange, exact } from '../../scripts/randomSheets/pumpFamily.ts';
import { minimalTakeoff } from '../../scripts/detectSheets/vectorSheet.ts';

const FIXTURES = join(import.meta.dirname, 'fixtures');

// Seed 108 prints no diameters (they are given, as the engineer answers the detector's question);
// its five dashed efficiency curves, each drawn as one path of filled dashes, bunch at low flow,
// where dashes of neighbouring curves lie on one another's course: each curve keeps its own.
// Seed 133 draws its NPSHr curves as filled dashes, one of them turning at a join inside a dash,
// whose outline's first side edge is shorter than its cap: the centre line must start at the
// cap's middle (it started at its corner, a point 0.43 % of span off).
// Seed 140 puts the 11.25" label of a head curve's end over the 12" efficiency curve on the same
// frame (right-hand axis): the efficiency curve ends at the 12" head curve's flow, and is named so.
describe.each([2, 9, 19, 24, 108, 133, 140])('random vector sheet %i', (seed) => {
  it('is read whole: every panel, curve, diameter and iso level, each curve within 0.1 % of span', { timeout: 180_000 }, async () => {
    const plan = planSheet(new Dice(seed));
    const sheet = await loadPdfSheetNode(new Uint8Array(readFileSync(join(FIXTURES, `random-${seed}.pdf`))), { name: `random-${seed}.pdf` });
    try {
      const raw = { ...minimalTakeoff(plan, `random-${seed}.pdf`), ...(seed === 108 ? { diameters: plan.family.diameters } : {}) };
      const found = await detectTakeoff(parseTakeoffToDetect(raw), raw, sheet);
      expect(found.questions).toEqual([]);
      expect(found.detection.panels.map((p) => p.quantity).sort()).toEqual(plan.panels.map((p) => p.quantity).sort());
      const want = plan.lines.map((l) => (l.iso !== undefined ? `iso ${l.iso}` : `${l.quantity} ${l.diameter}`)).sort();
      const got = found.takeoff.traces.map((t) => (t.iso !== undefined ? `iso ${t.iso}` : `${t.quantity} ${t.diameter}`)).sort();
      expect(got).toEqual(want);
      for (const t of found.takeoff.traces) {
        if (t.diameter === undefined) continue;
        const panel = found.takeoff.panels.find((p) => p.id === t.panel)!;
        const drawn = plan.panels.find((p) => p.quantity === t.quantity)!;
        const cal = calibrate(panel.anchors, { xScale: panel.x_scale, yScale: panel.y_scale });
        const [a, b] = drawnRange(plan.family, t.quantity, t.diameter);
        let worst = 0;
        let inRange = 0;
        for (const p of t.captured ?? []) {
          const [q, v] = cal.toData(p as never);
          if (q < a + 0.15 * (b - a) || q > a + 0.95 * (b - a)) continue;
          inRange++;
          worst = Math.max(worst, (100 * Math.abs(v - exact(plan.family, t.quantity, t.diameter, q))) / (drawn.y.max - drawn.y.min));
        }
        expect(inRange, `${t.id} points in range`).toBeGreaterThan(20);
        expect(worst, `${t.id}: worst ${worst.toFixed(4)} % of span`).toBeLessThan(0.1);
      }
    } finally {
      await sheet.close();
    }
  });
});

/**
 * Detects the fixture of bed seed `seed` with the iso levels the plan drew given (as the engineer
 * answers the detector's question), and hands the detection and the levels drawn (sorted) to `check`.
 */
async function withLevelsGiven(seed: number, check: (found: Awaited<ReturnType<typeof detectTakeoff>>, drawn: number[]) => void): Promise<void> {
  const plan = planSheet(new Dice(seed));
  const sheet = await loadPdfSheetNode(new Uint8Array(readFileSync(join(FIXTURES, `random-${seed}.pdf`))), { name: `random-${seed}.pdf` });
  try {
    const drawn = plan.lines.flatMap((l) => (l.iso === undefined ? [] : [l.iso])).sort();
    const raw = { ...minimalTakeoff(plan, `random-${seed}.pdf`), iso_levels: [...new Set(drawn)] };
    check(await detectTakeoff(parseTakeoffToDetect(raw), raw, sheet), drawn);
  } finally {
    await sheet.close();
  }
}

const isoLevelsOf = (found: Awaited<ReturnType<typeof detectTakeoff>>) => found.takeoff.traces.flatMap((t) => (t.iso === undefined ? [] : [t.iso])).sort();

// Seeds 60 and 205 end an iso-line's right branch in a stub of a few points clipping the lowest
// head curve's end, under its own "%" label (at 60 beside another line's label): too short to be
// read as a curve, the stub carries its label and is read as that level's line.
describe.each([60, 205])('random vector sheet %i, an iso-line stub under its label', (seed) => {
  it('reads the stub as its label\'s level, with every other line, and asks nothing', { timeout: 180_000 }, async () => {
    await withLevelsGiven(seed, (found, drawn) => {
      expect(found.questions).toEqual([]);
      expect(isoLevelsOf(found)).toEqual(drawn);
      expect(drawn).toEqual(seed === 60 ? [63, 66, 69, 69, 72, 72, 75, 75] : [52, 52, 56, 56]);
    });
  });
});

describe('random vector sheet 244, an iso-line stub with no label', () => {
  // The right branch of the 60 % iso-line ends in a stub clipping the lowest head curve's end,
  // with no label on it. With the levels drawn given, the stub takes the place in the order of
  // the iso-lines that no other line's level moves for (the right branch of 60 %), and nothing is asked.
  it('reads the stub by the order of the lines and the levels given, and asks nothing', { timeout: 180_000 }, async () => {
    await withLevelsGiven(244, (found, drawn) => {
      expect(found.questions).toEqual([]);
      expect(isoLevelsOf(found)).toEqual(drawn);
      expect(drawn).toEqual([54, 57, 60, 60, 63, 63]);
    });
  });
});
