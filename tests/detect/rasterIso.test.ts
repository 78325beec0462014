/**
 * Iso-efficiency lines on scans (src/digitize/detect/rasterIso.ts): a "%" label read two ways,
 * the label's word placed on its line, and, on a scan of the independent random bed, levels
 * taken from labels only, a level found on one branch only left unsure, and never a level that
 * the sheet does not draw.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { detectTakeoff } from '../../src/digitize/detect/detect.ts';
import { distanceToTrack, isoLevelOf, isoLevelRead, wordsOnIsoLines, type FrameWord } from '../../src/digitize/detect/rasterIso.ts';
import type { Track } from '../../src/digitize/detect/rasterLines.ts';
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { parseTakeoffToDetect } from '../../src/model/takeoff.ts';
import { sheetGeometry } from '../../scripts/randomSheets/randomSheet.ts';
import { scanFor } from '../../scripts/detectSheets/scanBed.ts';

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

describe('iso-lines on a scan of the random bed', () => {
  it('seed 24: levels from labels only, each a level the sheet draws; one-branch levels unsure', { timeout: 180_000 }, async () => {
    const seed = 24;
    const { plan } = sheetGeometry(seed, 'scan');
    const drawnLevels = new Set(plan.lines.filter((l) => l.iso !== undefined).map((l) => l.iso));
    const { jpeg, takeoff } = await scanFor(seed);
    const sheet = await loadImageSheetNode(jpeg, { name: `${seed}.jpg` });
    const raw: Record<string, unknown> = { ...takeoff, sheet: `${seed}.jpg`, diameters: [...plan.family.diameters] };
    delete raw.panels;
    delete raw.traces;
    const found = await detectTakeoff(parseTakeoffToDetect(raw), raw, sheet, { reader: textReaderNode() });
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
