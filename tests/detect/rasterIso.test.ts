/**
 * Iso-efficiency lines on scans (src/digitize/detect/rasterIso.ts): a "%" label read two ways,
 * the label's word placed on its line, and, on a scan of the independent random bed, levels
 * taken from labels only, a level found on one branch only left unsure, and never a level that
 * the sheet does not draw.
 */
import { afterAll, describe, expect, it } from 'vitest';
import type { InkMap } from '../../src/digitize/detect/ink.ts';
import { crossingsOfWord, distanceToTrack, headPieces, isoLevelOf, isoPiecesAcross, isoLevelRead, isoLevelsOnScan, linesMeeting, splitAcross, steepLines, transposeBox, turnedInk, wordsOnIsoLines, type FrameWord } from '../../src/digitize/detect/rasterIso.ts';
import { inferIsoLevels, levelsFromList, sideBySide } from '../../src/digitize/detect/isoLevels.ts';
import { runTogetherWords } from '../../src/digitize/detect/rasterCurves.ts';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import type { TextReader } from '../../src/digitize/detect/rasterText.ts';
import { frameLines, type Track } from '../../src/digitize/detect/rasterLines.ts';
import { closeTextReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { detectBedScan } from '../../scripts/detectSheets/scanBed.ts';
import { inkPicture } from './inkPicture.ts';

afterAll(async () => closeTextReaderNode());

/** A straight track from (u0, v0) to (u1, v1), one point per column. */
function line(u0: number, v0: number, u1: number, v1: number): Track {
  const u: number[] = [];
  const v: number[] = [];
  for (let x = u0; x <= u1; x++) [u.push(x), v.push(v0 + ((v1 - v0) * (x - u0)) / (u1 - u0))];
  return { u, v, room: u.map(() => 20), len: u.map(() => 2), joins: [] } as unknown as Track;
}

const word = (l: number, t: number, r: number, b: number): FrameWord => ({ word: { l, t, r, b }, clean: { width: 1, height: 1, ink: new Uint8Array(1) }, at: [0, 0] });

describe('iso labels', () => {
  it('reads a level with its "%" and nothing else', () => {
    expect(isoLevelOf('64%')).toBe(64);
    expect(isoLevelOf(' 64 % ')).toBe(64);
    expect(isoLevelOf('72.5%')).toBe(72.5);
    expect(isoLevelOf('η=70%')).toBe(70);
    expect(isoLevelOf('64')).toBeNull(); // a bare number may be a diameter
    expect(isoLevelOf('330 mm')).toBeNull();
    expect(isoLevelOf('0%')).toBeNull();
    expect(isoLevelOf('164%')).toBeNull();
  });

  it('takes a level only when the digits reading agrees', () => {
    expect(isoLevelRead('64%', '64')).toBe(64);
    expect(isoLevelRead('64%', '645')).toBe(64); // the "%" read as a digit
    expect(isoLevelRead('64%', '')).toBe(64);
    expect(isoLevelRead('64%', '84')).toBeNull();
    expect(isoLevelRead('b4%', '64')).toBeNull();
  });

  it('measures the distance to a steep line, not along its column', () => {
    // A line falling 5 rows per column: at column 10 it is at row 50; the point (12, 50) lies
    // 2 columns off, under 2 px from the line itself.
    const steep = line(0, 0, 20, 100);
    expect(distanceToTrack(steep, 12, 50)).toBeLessThan(2);
    expect(distanceToTrack(line(0, 10, 100, 10), 50, 14)).toBeCloseTo(4, 6);
  });

  it('places a word on the iso-line through its middle, and refuses one beside it or between two', () => {
    const isoA = { track: line(100, 300, 200, 200), traced: [] };
    const isoB = { track: line(160, 300, 260, 200), traced: [] };
    const head = { track: line(0, 150, 400, 180) };
    // A runs through (150, 250) and (180, 220); B through (180, 280). Text 20 px high.
    const exact = word(135, 240, 165, 260); // middle (150, 250): on A
    const between = word(165, 240, 195, 260); // middle (180, 250): 21 px from A and from B
    const beside = word(135, 270, 165, 290); // middle (150, 280): 21 px below A, nothing nearer
    const found = wordsOnIsoLines([exact, between, beside], [isoA, isoB], [head]);
    expect(found.get(exact)).toBe(isoA);
    expect(found.has(between)).toBe(false);
    expect(found.has(beside)).toBe(false);
    // Nearer a head curve than the iso-line: a head curve's label.
    const onHead = word(135, 150, 165, 170); // middle (150, 160): on the head curve
    expect(wordsOnIsoLines([onHead], [isoA], [head]).size).toBe(0);
  });
});

describe('labels run together', () => {
  /** Two steep iso-lines through row 250: A at column 150, B at column 200 (text 20 px high). */
  const isoA = { track: line(100, 350, 200, 150), traced: [] };
  const isoB = { track: line(150, 350, 250, 150), traced: [] };
  const head = { track: line(0, 60, 400, 80) };

  it('cuts a word that two iso-lines cross halfway between them, a part per line', () => {
    const both = word(128, 240, 222, 260); // "40%44%" as one word: A at 150, B at 200
    expect(crossingsOfWord(both.word, [isoB, isoA], [head]).map((c) => [c.line, c.x])).toEqual([[isoA, 150], [isoB, 200]]);
    const found = wordsOnIsoLines([both], [isoA, isoB], [head]);
    expect(found.size).toBe(2);
    const parts = [...found].sort(([a], [b]) => a.word.l - b.word.l);
    // Cut at 175, each side kept 2 px clear of the cut (the reading's margin).
    expect(parts.map(([w, l]) => [w.word.l, w.word.r, l])).toEqual([[128, 173, isoA], [177, 222, isoB]]);
    expect(parts.every(([w]) => w.word.t === 240 && w.word.b === 260)).toBe(true);
    expect(parts.every(([w]) => w.confirm === true)).toBe(true); // weaker evidence: read twice
  });

  it('does not cut a word crossed once, nor one whose parts are narrower than the text is high', () => {
    expect(splitAcross(word(128, 240, 172, 260), [isoA, isoB], [head])).toBeNull(); // only A crosses it
    const close = { track: line(110, 350, 210, 150), traced: [] }; // crosses row 250 at column 160
    expect(crossingsOfWord(word(140, 240, 175, 260).word, [isoA, close], [head]).length).toBe(2);
    expect(splitAcross(word(140, 240, 175, 260), [isoA, close], [head])).toBeNull(); // parts of 15 and 20 px, text 20 px high
  });

  it('does not take a crossing where a head curve lies nearer than the iso-line', () => {
    const onHead = { track: line(0, 250, 400, 250) }; // a head curve along the word's middle row
    expect(crossingsOfWord(word(128, 240, 222, 260).word, [isoA, isoB], [onHead])).toEqual([]);
  });

  it('finds a word of glyphs run together, wider than two text heights, and not a thin line crossing the same box', () => {
    const width = 300;
    const height = 120;
    const ink = new Uint8Array(width * height);
    const fill = (l: number, t: number, r: number, b: number) => {
      for (let y = t; y < b; y++) for (let x = l; x < r; x++) ink[y * width + x] = 200;
    };
    // One blot 60 px wide, 20 px high (text height 20): glyph outlines joined by a bar.
    for (const x0 of [20, 35, 50, 65]) [fill(x0, 20, x0 + 3, 40), fill(x0 + 9, 20, x0 + 12, 40), fill(x0, 20, x0 + 12, 23), fill(x0, 37, x0 + 12, 40)];
    fill(20, 29, 80, 31);
    // A thin line across a box of the same size.
    for (let x = 150; x < 210; x++) fill(x, 70 + Math.round((x - 150) / 3), x + 1, 72 + Math.round((x - 150) / 3));
    // A word of glyphs standing apart (frameWords finds it; it is not looked at again).
    for (const x0 of [230, 246]) [fill(x0, 20, x0 + 3, 40), fill(x0 + 9, 20, x0 + 12, 40), fill(x0, 20, x0 + 12, 23)];
    const words = runTogetherWords({ width, height, ink }, 200, 20);
    expect(words).toEqual([{ l: 20, t: 20, r: 80, b: 40 }]);
  });
});

describe('iso levels by order on a scan', () => {
  /** Lines ordered by flow: each a short upright stroke at its column (its lower end at the column). */
  const lines = [100, 200, 300, 400, 500].map((x) => ({ points: [sheetPoint(x, 500), sheetPoint(x + 20, 100)] }));

  it('takes a labelled line next to a surely left one with a higher level as left too, only with `adjacent`', () => {
    const known = new Map([[lines[1]!, 40], [lines[2]!, 44]]);
    expect(inferIsoLevels(lines, known).size).toBe(0);
    const out = inferIsoLevels(lines, known, { adjacent: true });
    // Step 4 from the two neighbours; left of them the branch falls away from the peak; right of them it is unclear.
    expect([...out].map(([c, v]) => [lines.indexOf(c), v])).toEqual([[0, 36]]);
  });

  it('does not when an unlabelled line lies between the two (it may be the twin of the higher level)', () => {
    const known = new Map([[lines[1]!, 40], [lines[3]!, 44]]);
    expect(inferIsoLevels(lines, known, { adjacent: true }).size).toBe(0);
  });

  it('orders lines by where they stand side by side, not by a lower end that wandered off', () => {
    // Line 2 (44 %) wanders left at its lower end, past line 1's: by lower ends it would come first.
    const wandered = [...lines];
    wandered[2] = { points: [sheetPoint(150, 500), sheetPoint(300, 450), sheetPoint(320, 100)] };
    expect(sideBySide(wandered[1]!.points, wandered[2]!.points)).toBe(1);
    expect(sideBySide(wandered[2]!.points, wandered[1]!.points)).toBe(-1);
    expect(sideBySide(lines[0]!.points, [sheetPoint(0, 700), sheetPoint(10, 600)])).toBe(0); // no common height
    const known = new Map([[wandered[1]!, 40], [wandered[2]!, 44]]);
    const out = inferIsoLevels(wandered, known, { adjacent: true });
    expect([...out].map(([c, v]) => [wandered.indexOf(c), v])).toEqual([[0, 36]]);
  });

  it('takes the right branch the same way, falling away from the peak', () => {
    const known = new Map([[lines[2]!, 60], [lines[3]!, 56]]);
    // 60 then 56: 56 is surely right (a higher level left of it); 60 next to it, higher, is right too.
    const out = inferIsoLevels(lines, known, { adjacent: true });
    expect([...out].map(([c, v]) => [lines.indexOf(c), v])).toEqual([[4, 52]]);
  });
});

describe('iso levels from the list the engineer gives, on a scan', () => {
  /** Lines ordered by flow: each a short upright stroke at its column. */
  const lines = [100, 200, 300, 400, 500, 600].map((x) => ({ points: [sheetPoint(x, 500), sheetPoint(x + 20, 100)] }));

  it('names every line by order, and vouches for the order only when both branches of every level were found', () => {
    const full = levelsFromList(lines, [60, 70, 75], new Map([[lines[1]!, 70]]));
    expect(full?.full).toBe(true);
    expect(lines.map((c) => full?.levels.get(c))).toEqual([60, 70, 75, 75, 70, 60]);
    // Five lines for three levels: one may have been missed, and the order then shifts.
    const five = levelsFromList(lines.slice(0, 5), [60, 70, 75], new Map());
    expect(five?.full).toBe(false);
  });

  it('gives nothing when a label read disagrees with the order (a line was missed before it)', () => {
    // Drawn 60, 70, 75 left and 75, 70 right; the 70 left line missed: the 75 left line is second.
    const found = lines.slice(0, 4);
    expect(levelsFromList(found, [60, 70, 75], new Map([[found[1]!, 75]]))).toBeNull();
  });
});

describe('iso-lines in pieces', () => {
  /** A found line through the level points given, as the normal pass finds it (u columns, v rows). */
  const through = (...pts: [number, number][]) => ({ track: { u: pts.map((p) => p[0]), v: pts.map((p) => p[1]), room: pts.map(() => 20), len: pts.map(() => 2), joins: [] } as unknown as Track, traced: [] });

  it('says where one line runs on into another: its lower end beside the other\'s upper end', () => {
    const upper = through([300, 100], [280, 250]);
    const lower = through([278, 270], [260, 400]); // the same line past a label 20 px tall
    expect(linesMeeting([upper, lower], 20)).toEqual([280, 250]);
    expect(linesMeeting([lower, upper], 20)).toEqual([280, 250]);
  });

  it('does not for lines side by side ending side by side on the smallest curve, nor one gap more than 1.5 text heights', () => {
    const a = through([300, 100], [280, 400]);
    const b = through([320, 100], [290, 402]); // lower ends 10 px apart
    expect(linesMeeting([a, b], 20)).toBeNull();
    const far = through([276, 285], [260, 400]); // 35 px below the upper line's end
    expect(linesMeeting([through([300, 100], [280, 250]), far], 20)).toBeNull();
  });

  it('a steep line found on the turned ink is looked at on the page', () => {
    // Turned: u rows, v columns. Upper piece rows 100–250, lower piece rows 265–400.
    const upperT = { ...through([100, 300], [250, 280]), transposed: true };
    const lowerT = { ...through([265, 279], [400, 260]), transposed: true };
    expect(linesMeeting([upperT, lowerT], 20)).toEqual([280, 250]);
  });
});

describe('iso levels on a scan, with a line the tracer lost', () => {
  /** A reader that knows each label by its ink: the darkest grey of each band of rows in the picture names the text. */
  const reader = (texts: ReadonlyMap<number, string>): TextReader => ({
    read: async ({ width, height, grey }) => {
      const out: { text: string; confidence: number; box: [number, number, number, number] }[] = [];
      let top = -1;
      let darkest = 255;
      for (let y = 0; y <= height; y++) {
        let row = 255;
        if (y < height) for (let x = 0; x < width; x++) row = Math.min(row, grey[y * width + x] as number);
        if (row < 250) [top, darkest] = [top < 0 ? y : top, Math.min(darkest, row)];
        else if (top >= 0) {
          const key = [...texts.keys()].find((g) => Math.abs(g - darkest) <= 10);
          if (key !== undefined) out.push({ text: texts.get(key) as string, confidence: 90, box: [0, top, width, y] });
          [top, darkest] = [-1, 255];
        }
      }
      return out;
    },
  });
  /** A line found on the page (u columns, v rows) from its lower end to its upper end, and the tracer's line on it (sheet = level pixels here). */
  const isoLine = (x0: number, y0: number, x1: number, y1: number, traced = true) => {
    const n = 40;
    const pts: [number, number][] = Array.from({ length: n + 1 }, (_, i) => [x0 + ((x1 - x0) * i) / n, y0 + ((y1 - y0) * i) / n]);
    pts.sort((a, b) => a[0] - b[0]);
    return { track: { u: pts.map((p) => p[0]), v: pts.map((p) => p[1]), room: pts.map(() => 20), len: pts.map(() => 2), joins: [] } as unknown as Track, traced: traced ? pts.map(([x, y]) => sheetPoint(x, y)) : ([] as SheetPoint[]) };
  };
  // Left branch 70 %, 72 %; right branch 72 % (lost by the tracer), 70 % (no label).
  const a = isoLine(100, 500, 120, 100);
  const b = isoLine(200, 500, 220, 100);
  const c = isoLine(300, 500, 400, 300, false);
  const d = isoLine(400, 500, 500, 300);
  const ink = new Uint8Array(600 * 600);
  const clean: InkMap = { width: 600, height: 600, ink };
  const label = (cx: number, cy: number, v: number): FrameWord => {
    for (let y = cy - 10; y < cy + 10; y++) for (let x = cx - 20; x < cx + 20; x++) ink[y * 600 + x] = v;
    return { word: { l: cx - 20, t: cy - 10, r: cx + 20, b: cy + 10 }, clean, at: [0, 0] };
  };
  const onLines = new Map<FrameWord, typeof a>([[label(110, 300, 100), a], [label(210, 300, 150), b], [label(350, 400, 200), c]]);
  const texts = new Map([[155, '70%'], [105, '72%'], [55, '72%']]);
  const onSheet = (line: typeof a) => line.track.u.map((u, i) => sheetPoint(u, line.track.v[i] as number));

  it('takes the level of a word of weaker evidence only when its reading alone and larger agrees', async () => {
    // The reader gives "72%" for the ink of b's label at the usual size, and "SS" when it is read larger.
    const sized: TextReader = {
      read: async (image, what) => {
        const words = await reader(texts).read(image, what);
        return words.map((w) => (w.box[3] - w.box[1] > 50 && w.text === '72%' ? { ...w, text: 'SS' } : w));
      },
    };
    const [wa, wb] = [...onLines.keys()] as [FrameWord, FrameWord];
    const plain = new Map([[wa, a], [wb, b]]);
    const plainRead = await isoLevelsOnScan([a, b], plain, sized, 255, 'head', undefined, 20);
    expect(plainRead.levels.get(b)).toBe(72); // read once at the usual size: taken
    const weak = new Map([[wa, a], [{ ...wb, confirm: true }, b]]);
    const weakRead = await isoLevelsOnScan([a, b], weak, sized, 255, 'head', undefined, 20);
    expect(weakRead.levels.get(a)).toBe(70);
    expect(weakRead.levels.has(b)).toBe(false); // "72%" then "SS": not confirmed
    const agreed = await isoLevelsOnScan([a, b], weak, reader(texts), 255, 'head', undefined, 20);
    expect(agreed.levels.get(b)).toBe(72);
  });

  it('takes the unlabelled right line\'s level by order only with the lost line standing in the order', async () => {
    const withLost = await isoLevelsOnScan([a, b, d], onLines, reader(texts), 255, 'head', undefined, 20, { lines: [c], onSheet });
    expect([withLost.levels.get(a), withLost.levels.get(b), withLost.levels.get(d)]).toEqual([70, 72, 70]);
    expect(withLost.levels.has(c)).toBe(false); // a lost line gets no level
    expect(withLost.unsure.has(d)).toBe(true); // by order: unsure
    const without = await isoLevelsOnScan([a, b, d], new Map([...onLines].filter(([, l]) => l !== c)), reader(texts), 255, 'head', undefined, 20);
    expect(without.levels.has(d)).toBe(false);
    expect(without.missing).toContain('1 of the 3 lines');
  });
});

describe('an iso-line cut in two by its label (scan bed seed 69)', () => {
  // The line runs from (100, 300) to (200, 200); its label, 20 px high and 40 wide, sits on it at
  // (150, 250), and the line found stops short of the label on both sides.
  const lower = line(100, 300, 130, 270);
  const upper = line(170, 230, 200, 200);
  const tracedAll = Array.from({ length: 101 }, (_, i) => sheetPoint(100 + i, 300 - i)); // the tracer runs across the gap
  const toLevel = (p: SheetPoint): [number, number] => [p[0], p[1]];
  const label = word(130, 240, 170, 260);
  const head = { track: line(0, 100, 400, 120) };

  it("places the label on the line by the tracer's line across the gap, not by the pieces alone", () => {
    const piece = { track: lower, traced: tracedAll };
    expect(wordsOnIsoLines([label], [piece], [head]).size).toBe(0); // 28 px from the piece's end
    const found = wordsOnIsoLines([label], [piece], [head], undefined, (c) => c.traced.map(toLevel));
    expect(found.get(label)).toBe(piece);
  });

  it("takes the piece whose tracer stopped short of the other's far end for a piece of the other", () => {
    const sure = { track: lower, traced: tracedAll, confidence: 0.5 };
    // The upper piece's tracer ran down across the label but stopped 10 px short of the lower piece's start.
    const piece = { track: upper, traced: Array.from({ length: 91 }, (_, i) => sheetPoint(110 + i, 290 - i)), confidence: 0.45 };
    expect([...isoPiecesAcross([sure, piece], toLevel)]).toEqual([piece]);
    // A line beside it, whose tracer ran on onto this one, is no piece of it.
    const other = { track: line(170, 250, 200, 220), traced: [...Array.from({ length: 31 }, (_, i) => sheetPoint(200 - i, 220 + i)), ...Array.from({ length: 40 }, (_, i) => sheetPoint(130 - i, 270 + i))], confidence: 0.45 };
    expect(isoPiecesAcross([sure, other], toLevel).has(other)).toBe(false);
  });
});

describe('head-curve pieces sorted as iso-lines', () => {
  it('drops a line lying along a head curve\'s tracer\'s line, and keeps an iso-line crossing it', () => {
    const headTraced = Array.from({ length: 101 }, (_, i) => sheetPoint(100 + 5 * i, 200 + i)); // falling gently, sheet = level here
    const piece = { track: line(400, 260, 550, 290), traced: [] as SheetPoint[] }; // the head curve's own course past a break
    const iso = { track: line(300, 100, 330, 400), traced: [] as SheetPoint[] }; // steep, crossing it once
    const beside = { track: line(400, 268, 550, 298), traced: [] as SheetPoint[] }; // 8 px below: another line
    const toLevel = (p: SheetPoint): [number, number] => [p[0], p[1]];
    const out = headPieces([piece, iso, beside], [{ traced: headTraced }], toLevel);
    expect([...out]).toEqual([piece]);
    expect(headPieces([piece], [{ traced: [] }], toLevel).size).toBe(0); // no tracer's line: nothing to lie along
  });
});

describe('iso-lines on a scan of the random bed', () => {
  it('seed 24: levels from labels only, each a level the sheet draws; one-branch levels unsure', { timeout: 180_000 }, async () => {
    const { plan, found } = await detectBedScan(24);
    const drawnLevels = new Set(plan.lines.filter((l) => l.iso !== undefined).map((l) => l.iso));
    const iso = found.takeoff.traces.filter((t) => t.iso !== undefined);
    expect(iso.length).toBeGreaterThan(0);
    for (const t of iso) expect(drawnLevels.has(t.iso)).toBe(true);
    // Each level found on one branch only is unsure, and the question names it.
    const perLevel = new Map<number, number>();
    for (const t of iso) perLevel.set(t.iso as number, (perLevel.get(t.iso as number) ?? 0) + 1);
    for (const t of iso) {
      if (perLevel.get(t.iso as number) === 1) {
        expect(t.confidence).toBeLessThan(0.5);
        expect(found.questions.join(' ')).toContain(`"${t.id}"`);
      }
    }
  });
});

describe('iso levels the engineer gives for a scan', () => {
  it('seed 23: the unlabelled lines take their levels from the list, by order, unsure; without the list they are left out', { timeout: 180_000 }, async () => {
    // INVENTED bed scan: five left-branch iso-lines 40 … 60 %, labels printed on three, two read.
    const { plan, found: bare } = await detectBedScan(23);
    const drawn = [...new Set(plan.lines.filter((l) => l.iso !== undefined).map((l) => l.iso as number))].sort((a, b) => a - b);
    expect(drawn).toEqual([40, 45, 50, 55, 60]);
    const levelsOf = (f: typeof bare) => f.takeoff.traces.filter((t) => t.iso !== undefined).map((t) => t.iso as number).sort((a, b) => a - b);
    expect(levelsOf(bare).length).toBeLessThan(5);
    expect(bare.questions.join(' ')).toContain('"iso_levels"');
    const { found } = await detectBedScan(23, { iso_levels: drawn });
    expect(levelsOf(found)).toEqual(drawn);
    // Fewer lines than both branches of every level: one may have been missed, so the order's levels are unsure and asked about.
    for (const t of found.takeoff.traces.filter((k) => k.iso !== undefined && !levelsOf(bare).includes(k.iso as number))) {
      expect(t.confidence).toBeLessThan(0.5);
      expect(found.questions.join(' ')).toContain(`"${t.id}"`);
    }
  });
});

describe('steep lines on the turned ink', () => {
  /** A 700 × 500 page with lines of ink 3 px wide drawn from point to point (a 600 × 400 frame in it). */
  const picture = (lines: [number, number, number, number][]): InkMap => inkPicture(700, 500, lines);
  const frame = [50, 50, 650, 450] as const;

  it('finds a line falling 8 rows per column, which spans too few columns for the normal pass, and not a shallow one', () => {
    const map = picture([[300, 80, 340, 400], [60, 300, 640, 200]]);
    const grid = { x: [], y: [] };
    const normal = frameLines(map, frame, { grid });
    // The shallow line is found by the normal pass; the steep one is not.
    expect(normal.length).toBe(1);
    const steep = steepLines(map, frame, { grid }, normal);
    expect(steep.length).toBe(1);
    const t = steep[0]!;
    // Turned coordinates: u runs down the rows, v across the columns; the line is x = 300 + (y − 80)·40/320.
    for (let i = 0; i < t.u.length; i += 10) {
      const y = t.u[i]!;
      if (y < 100 || y > 380) continue;
      expect(Math.abs(t.v[i]! - (300 + ((y - 80) * 40) / 320))).toBeLessThan(2);
    }
    expect(t.u[t.u.length - 1]! - t.u[0]!).toBeGreaterThan(250);
  });

  it('turns a box and shrinks the ink by keeping each block\'s darkest pixel', () => {
    expect(transposeBox([1, 2, 3, 4])).toEqual([2, 1, 4, 3]);
    const map: InkMap = { width: 4, height: 2, ink: new Uint8Array([0, 9, 0, 0, 0, 0, 0, 5]) };
    const small = turnedInk(map, [0, 0, 4, 2], 2);
    // Turned: 1 column (rows 0–1) × 2 rows (columns 0–1, 2–3); darkest of each 2 × 2 block.
    expect([small.width, small.height]).toEqual([1, 2]);
    expect([...small.ink]).toEqual([9, 5]);
  });
});
