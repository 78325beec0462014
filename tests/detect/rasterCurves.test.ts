/**
 * Curves on scans: lines followed column by column through a grid, places for guides only
 * where a line stands alone, names checked by order and affinity, and the whole take-off of an
 * INVENTED scan of the independent random bed with no panels and no traces given, scored
 * against the bed's exact truth at 15–95 % of each curve's flow range.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { affinityHolds, chooseNames, frameWords, guidePlaces, joinPointWords, joinUnitWords, labelCandidates, labelUnits, misreadInchLabel, nearLine, piecesOf, pointLost } from '../../src/digitize/detect/rasterCurves.ts';
import { alonePlaces, continuesCourse, frameLines, trackAt, type Track } from '../../src/digitize/detect/rasterLines.ts';
import type { InkMap } from '../../src/digitize/detect/ink.ts';
import { detectTakeoff } from '../../src/digitize/detect/detect.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoffToDetect } from '../../src/model/takeoff.ts';
import { decode } from '../../scripts/randomSheets/camera.ts';
import { sheetGeometry, truthOf } from '../../scripts/randomSheets/randomSheet.ts';
import { scoreReplay } from '../../scripts/randomSheets/score.ts';
import { scanFor } from '../../scripts/detectSheets/scanBed.ts';

afterAll(() => closeTextReaderNode());

const W = 600;
const H = 400;
const FRAME = [50, 50, 550, 350] as const;

/** An ink map with a grid every 50 px (darkness 60, 1 px) and lines y = f(x), 2 px wide, darkness 200; dashed lines leave gaps. */
function inkWith(lines: { f: (x: number) => number; from?: number; to?: number; dash?: [number, number] }[]): InkMap {
  const ink = new Uint8Array(W * H);
  for (let g = 100; g < 550; g += 50) for (let y = 50; y < 350; y++) ink[y * W + g] = 60;
  for (let g = 100; g < 350; g += 50) for (let x = 50; x < 550; x++) ink[g * W + x] = 60;
  for (const l of lines) {
    for (let x = l.from ?? 51; x < (l.to ?? 549); x += 0.25) {
      if (l.dash && (x - 51) % (l.dash[0] + l.dash[1]) >= l.dash[0]) continue;
      const y = l.f(x);
      for (let yy = Math.floor(y - 1); yy <= Math.ceil(y + 1); yy++) {
        const cover = Math.max(0, Math.min(1, 1.5 - Math.abs(yy + 0.5 - y)));
        const i = yy * W + Math.floor(x);
        ink[i] = Math.max(ink[i] as number, Math.round(200 * cover));
      }
    }
  }
  return { width: W, height: H, ink };
}

const grid = { x: [100, 150, 200, 250, 300, 350, 400, 450, 500].map((g) => g + 0.5), y: [100, 150, 200, 250, 300].map((g) => g + 0.5) };

describe('lines in a frame', () => {
  it('three falling curves through a grid come back as three lines, each within a pixel and a half of where it was drawn (the tracer gives the geometry; these are for placing guides); the grid makes none', () => {
    const curves = [(x: number) => 90 + 0.0006 * (x - 50) ** 2, (x: number) => 150 + 0.0005 * (x - 50) ** 2, (x: number) => 210 + 0.0004 * (x - 50) ** 2];
    const tracks = frameLines(inkWith(curves.map((f) => ({ f, to: 450 }))), FRAME, { grid, ceiling: 100 });
    expect(tracks).toHaveLength(3);
    for (const f of curves) {
      const t = tracks.find((k) => Math.abs((trackAt(k, 300) ?? 1e9) - f(300)) < 2);
      expect(t).toBeDefined();
      let worst = 0;
      for (let x = 60; x < 440; x += 5) worst = Math.max(worst, Math.abs((trackAt(t!, x) ?? 1e9) - f(x)));
      expect(worst).toBeLessThan(1.5);
    }
  });

  it('a dashed line is one line, its gaps bridged', () => {
    const f = (x: number) => 200 - 0.2 * (x - 50);
    const tracks = frameLines(inkWith([{ f, dash: [12, 5] }]), FRAME, { grid, ceiling: 100 });
    expect(tracks).toHaveLength(1);
    expect(tracks[0]!.u[0]!).toBeLessThan(70);
    expect(tracks[0]!.u[tracks[0]!.u.length - 1]!).toBeGreaterThan(530);
  });

  it('guides go only where a line stands alone; without spreading they lie on one stretch', () => {
    // Two lines together (1 px apart) up to x = 300, then apart.
    const a = (x: number) => (x < 300 ? 200 : 200 - 0.5 * (x - 300));
    const b = (x: number) => (x < 300 ? 201 : 201 + 0.5 * (x - 300));
    const tracks = frameLines(inkWith([{ f: a }, { f: b }]), FRAME, { grid, ceiling: 100 });
    for (const t of tracks) {
      const places = alonePlaces(t, 8, 8, 60);
      for (const p of places) expect(p.u).toBeGreaterThan(300 + 8 / 0.5 / 2);
    }
  });
});

describe('a line carried on past the end found', () => {
  // A falling, bending curve found from column 60 to 300 (its ink lost there), drawn on to 450.
  const f = (x: number) => 100 + 0.002 * (x - 50) ** 2;
  const track: Track = { u: [], v: [], len: [], room: [] };
  for (let u = 60.5; u <= 300; u++) [track.u.push(u), track.v.push(f(u)), track.len.push(2), track.room.push(50)];
  const along = (from: number, to: number, g: (x: number) => number) => {
    const out: [number, number][] = [];
    for (let x = from; x <= to; x += 3) out.push([x, g(x)]);
    return out;
  };
  it('the rest of the line, on its own bending course, carries it on at either end', () => {
    expect(continuesCourse(track, along(301, 450, f), 'end', 3, 75)).toBe(true);
    const head: Track = { u: track.u.filter((u) => u >= 150), v: track.v.filter((_, i) => (track.u[i] as number) >= 150), len: [], room: [] };
    expect(continuesCourse(head, along(60, 149, f), 'start', 3, 75)).toBe(true);
  });
  it('a turn off into a label beside the end, or onto another line, does not; nor a run on twice the stretch judged', () => {
    // Up and to the right, into a label: 12 px above the course within 20 columns.
    expect(continuesCourse(track, along(301, 330, (x) => f(x) - 0.6 * (x - 300)), 'end', 3, 75)).toBe(false);
    // Onto a neighbour 10 px below, from the end on.
    expect(continuesCourse(track, along(320, 450, (x) => f(x) + 10), 'end', 3, 75)).toBe(false);
    expect(continuesCourse(track, along(301, 480, f), 'end', 3, 75)).toBe(false);
    expect(continuesCourse(track, [], 'end', 3, 75)).toBe(false);
  });
});

describe('guides on a line in a bunch', () => {
  const track = (room: number): Track => {
    const t: Track = { u: [], v: [], len: [], room: [] };
    for (let u = 60.5; u < 400; u++) [t.u.push(u), t.v.push(200 - 0.1 * u), t.len.push(2), t.room.push(room)];
    return t;
  };
  it('a line with other ink 7 px away all along gets guides on one stretch, trusted less; one alone is trusted fully; one with ink 4 px away gets none', () => {
    const bunched = guidePlaces(track(7), 2, 500, true);
    expect(bunched.places.length).toBeGreaterThan(0);
    expect(bunched.trust).toBe(0.8);
    const alone = guidePlaces(track(20), 2, 500, true);
    expect(alone.places.length).toBeGreaterThan(0);
    expect(alone.trust).toBe(1);
    expect(guidePlaces(track(4), 2, 500, true).places).toEqual([]);
  });
});

describe('a line found in pieces', () => {
  const frame = [50, 50, 550, 350] as [number, number, number, number];
  const line = (f: (x: number) => number, from: number, to: number): Track => {
    const t: Track = { u: [], v: [], len: [], room: [] };
    for (let u = from + 0.5; u < to; u++) [t.u.push(u), t.v.push(f(u)), t.len.push(2), t.room.push(50)];
    return t;
  };
  const f = (x: number) => 100 + 0.002 * (x - 50) ** 2;
  const g = (x: number) => 130 + 0.002 * (x - 50) ** 2;
  // The tracer's line in sheet units is the level line here (toLevel is the identity).
  const sheetLine = (h: (x: number) => number, from: number, to: number) => line(h, from, to).u.map((u, i) => [u, line(h, from, to).v[i] as number] as [number, number]);
  const id = (p: readonly [number, number]) => [p[0], p[1]] as [number, number];
  it("a piece lying along the tracer's line of a surer line of its frame is that line: dropped; the whole line and its neighbour stay", () => {
    const whole = { track: line(f, 55, 500), traced: sheetLine(f, 55, 545), confidence: 0.95, levelFrame: frame };
    const piece = { track: line(f, 380, 470), traced: sheetLine(f, 55, 545), confidence: 0.95, levelFrame: frame };
    const lost = { track: line(f, 300, 360), traced: [], confidence: 0, levelFrame: frame };
    const neighbour = { track: line(g, 55, 500), traced: sheetLine(g, 55, 545), confidence: 0.95, levelFrame: frame };
    const dropped = piecesOf([whole, piece, lost, neighbour] as never, id as never);
    expect([...dropped]).toEqual([piece, lost]);
  });
  it('nothing is dropped along an unsure line, nor along a line of another frame', () => {
    const unsure = { track: line(f, 55, 500), traced: sheetLine(f, 55, 545), confidence: 0.3, levelFrame: frame };
    const piece = { track: line(f, 380, 470), traced: [], confidence: 0, levelFrame: frame };
    expect(piecesOf([unsure, piece] as never, id as never).size).toBe(0);
    const elsewhere = { track: line(f, 55, 500), traced: sheetLine(f, 55, 545), confidence: 0.95, levelFrame: [50, 50, 550, 350] as [number, number, number, number] };
    expect(piecesOf([elsewhere, piece] as never, id as never).size).toBe(0);
  });
  it("a line whose own tracer keeps to it is no piece of a line whose tracer ran on onto it", () => {
    // A short line on f's left, its tracer running on and down onto g; g's tracer keeps to g.
    const runner = { track: line(f, 55, 200), traced: [...sheetLine(f, 55, 200), ...sheetLine(g, 260, 545)], confidence: 0.95, levelFrame: frame };
    const other = { track: line(g, 300, 500), traced: sheetLine(g, 55, 545), confidence: 0.48, levelFrame: frame };
    expect(piecesOf([runner, other] as never, id as never).size).toBe(0);
  });
});

describe('labels touching their line', () => {
  it('a label printed on a line, its glyphs touching the line on either side, stands free once the line is taken out', () => {
    const f = (x: number) => 120 + 0.2 * (x - 50);
    const map = inkWith([{ f, to: 300 }, { f, from: 338 }]);
    // Three glyphs (8 × 14 px, solid) from x = 300 to 338, centred on the line, touching it.
    for (let k = 0; k < 3; k++) for (let x = 300 + 15 * k; x < 308 + 15 * k; x++) for (let y = Math.round(f(319)) - 7; y < Math.round(f(319)) + 7; y++) map.ink[y * W + x] = 200;
    const lines = frameLines(map, FRAME, { grid, ceiling: 100 });
    const word = (w: { l: number; r: number }, at: [number, number]) => [w.l + at[0], w.r + at[0]];
    const before = frameWords(map, FRAME, 200, 14);
    expect(before.words.map((w) => word(w, before.at)).filter(([l]) => (l as number) >= 290 && (l as number) <= 310)).toHaveLength(0);
    const after = frameWords(map, FRAME, 200, 14, lines);
    const found = after.words.map((w) => word(w, after.at));
    expect(found).toHaveLength(1);
    expect(found[0]![0]).toBeGreaterThanOrEqual(298);
    expect(found[0]![1]).toBeLessThanOrEqual(342);
  });
  it('only a word on a line, or just past its end, is read as a label', () => {
    const t: Track = { u: [100.5, 200.5, 300.5], v: [200, 180, 160], len: [2, 2, 2], room: [50, 50, 50] };
    expect(nearLine({ l: 140, t: 182, r: 170, b: 196 }, [t])).toBe(true); // on it
    expect(nearLine({ l: 306, t: 140, r: 340, b: 156 }, [t])).toBe(true); // beside its end
    expect(nearLine({ l: 140, t: 120, r: 170, b: 134 }, [t])).toBe(false); // far above it
    expect(nearLine({ l: 400, t: 140, r: 430, b: 156 }, [t])).toBe(false); // far past its end
  });
  it('a bare number counts in the unit of the labels read whole; never without one, and never a number of inches finer than a sixteenth', () => {
    expect(labelCandidates('214', '214')).toEqual([]);
    expect(labelCandidates('214', '214', 'mm')).toEqual([214]);
    expect(labelCandidates('230 mm,', '230,')).toEqual([230]);
    expect(labelCandidates('- 230 mm', '230')).toEqual([230]);
    expect(labelCandidates('214', '244', 'mm')).toEqual([]);
    expect(labelCandidates('9.25', '9.25', 'in')).toEqual([9.25]);
    expect(labelCandidates('9.3', '9.3', 'in')).toEqual([]);
    expect(labelCandidates('6.675"', '6.675')).toEqual([]); // a misread 6.625": finer than a sixteenth
    expect(labelCandidates('6.625"', '6.625')).toEqual([6.625]);
    // An inch mark read as a 7 on a whole number: only in a frame labelled in inches, and only past 60 in.
    expect(labelCandidates('147', '147', 'in')).toEqual([14]);
    expect(labelCandidates('147', '147', 'mm')).toEqual([147]);
    expect(labelCandidates('147', '147')).toEqual([]);
    expect(labelCandidates('57', '57', 'in')).toEqual([57]);
  });
  it('a number with pieces of an m after it is the frame\'s unit misread, taken only where other labels were read with their unit', () => {
    // INVENTED bed scans 50 ("260 mm" read "260m": its second m under the line) and 69 (7" read "7m").
    expect(labelCandidates('260m', '260', 'mm')).toEqual([260]);
    expect(labelCandidates('7m', '7', 'in')).toEqual([7]);
    expect(labelCandidates('260 m', '', 'mm')).toEqual([260]);
    // Without a frame unit read on other labels, a metre is not taken for anything.
    expect(labelCandidates('260m', '260')).toEqual([]);
    // The digits reading must agree, and an inch value finer than a sixteenth is no label.
    expect(labelCandidates('260m', '280', 'mm')).toEqual([]);
    expect(labelCandidates('7.1m', '7.1', 'in')).toEqual([]);
    // Up to three pieces of an m after the number are the unit misread (bed scan 38) …
    expect(labelCandidates('175 mun', '175', 'mm')).toEqual([175]);
    // … pieces of an m only, no more letters than a garbled "mm".
    expect(labelCandidates('158 nt', '158', 'mm')).toEqual([]);
    expect(labelCandidates('175 mmmm', '175', 'mm')).toEqual([]);
  });
  it('a decimal point read as a space is a point lost (bed scan 75: "14 25"" for 14.25")', () => {
    expect(pointLost('14 25"', '1425', 'in')).toEqual([14.25]);
    expect(pointLost('14 25', '1425', 'in')).toEqual([14.25]);
    expect(pointLost('14 25', '1425', 'mm')).toEqual([]);
  });
});

describe('names of head curves', () => {
  // Shut-off heads of an INVENTED family following affinity (H ∝ D²): 390 → 60 m.
  const heads = [390, 346, 302].map((d) => 60 * (d / 390) ** 2);
  it('the one naming with values falling downwards and heads in the ratio of the values squared', () => {
    expect(chooseNames([[390], [346], [302]], heads)).toEqual([390, 346, 302]);
    expect(chooseNames([[390, 39], [346, 34], [302]], heads)).toEqual([390, 346, 302]);
  });
  it('no naming when a curve has no label, when the order is broken, or when two namings fit', () => {
    expect(chooseNames([[390], [], [302]], heads)).toBeNull();
    expect(chooseNames([[346], [390], [302]], heads)).toBeNull();
    expect(chooseNames([[390], [346, 345], [302]], heads)).toBeNull();
  });
  it('affinity: head in proportion to the diameter squared passes; a label misread by a tenth fails', () => {
    expect(affinityHolds(390, 60, 346, 60 * (346 / 390) ** 2)).toBe(true);
    expect(affinityHolds(390, 60, 3460, 60 * (346 / 390) ** 2)).toBe(false);
    expect(affinityHolds(15.5, 100, 12.2, 100 * (12.25 / 15.5) ** 2)).toBe(true); // a near value is not caught by affinity alone
    expect(affinityHolds(15.5, 100, 155, 100 * (12.25 / 15.5) ** 2)).toBe(false);
  });
});

describe('a label whose unit stands apart from its number', () => {
  // Boxes as a 300-dpi scan gives them: digits 26 px high, "mm" in small letters 20 px high, 13 px apart.
  const box = (l: number, t: number, r: number, b: number) => ({ word: { l, t, r, b } });
  it('is read as one label: the bare number and the unit word just right of it on its row', () => {
    const words = [box(980, 490, 1037, 516), box(1050, 496, 1104, 516), box(1181, 665, 1237, 691), box(1250, 671, 1304, 690)];
    const readings = [{ text: '440', digits: '440' }, { text: 'mm', digits: '' }, { text: '408', digits: '408' }, { text: 'mm', digits: '' }];
    joinUnitWords(words, readings);
    expect(readings).toEqual([{ text: '440 mm', digits: '440' }, { text: '', digits: '' }, { text: '408 mm', digits: '408' }, { text: '', digits: '' }]);
  });
  it('is left apart when the unit word lies on another row, too far right, to the left, or when the number already has a unit', () => {
    const words = [box(100, 100, 150, 126), box(160, 140, 200, 160), box(300, 100, 350, 126), box(400, 106, 440, 126), box(500, 100, 550, 126), box(455, 106, 495, 126), box(600, 100, 690, 126), box(700, 106, 740, 126)];
    const readings = [
      { text: '440', digits: '440' }, { text: 'mm', digits: '' }, // the unit a row lower
      { text: '408', digits: '408' }, { text: 'mm', digits: '' }, // 50 px apart: more than a digit height
      { text: '377', digits: '377' }, { text: 'in', digits: '' }, // the unit word on the left
      { text: '345 mm', digits: '345' }, { text: 'mm', digits: '' }, // a whole label already
    ];
    const before = JSON.parse(JSON.stringify(readings));
    joinUnitWords(words, readings);
    expect(readings).toEqual(before);
  });
});

describe('an inch label whose decimal point the scan lost', () => {
  // Boxes as a 240-dpi scan in a serif face gave them: "8.125"" read as "8" and "125"", 11 px apart, digits 17 px high.
  const box = (l: number, t: number, r: number, b: number) => ({ word: { l, t, r, b } });
  it('is read as one number with a point between the bare whole number and the digits just right of it', () => {
    const readings = [{ text: '8', digits: '8' }, { text: '125"', digits: '125' }];
    joinPointWords([box(886, 699, 898, 716), box(909, 699, 955, 716)], readings);
    expect(readings).toEqual([{ text: '8.125"', digits: '8.125' }, { text: '', digits: '' }]);
    expect(labelCandidates(readings[0]!.text, readings[0]!.digits)).toEqual([8.125]);
  });
  it('is left apart on another row, too far right, or when either word is no bare number', () => {
    const words = [box(100, 100, 112, 117), box(200, 100, 240, 117), box(300, 100, 312, 117), box(315, 130, 350, 147), box(400, 100, 436, 117), box(440, 100, 480, 117), box(500, 100, 512, 117), box(515, 100, 560, 117)];
    const readings = [
      { text: '8', digits: '8' }, { text: '125"', digits: '125' }, // 88 px apart: more than a digit height
      { text: '9', digits: '9' }, { text: '5"', digits: '5' }, // a row lower
      { text: '230', digits: '230' }, { text: 'mm', digits: '' }, // three digits: a whole label, its unit beside
      { text: '8', digits: '8' }, { text: '12.5"', digits: '125' }, // the word right of it has its own point
    ];
    const before = JSON.parse(JSON.stringify(readings));
    joinPointWords(words, readings);
    expect(readings).toEqual(before);
  });
});

describe('an inch mark read as "%"', () => {
  it('is an inch label beside a head curve only in a frame labelled in inches, for a small whole number of sixteenths', () => {
    expect(labelCandidates('10.5%', '10.5%', 'in')).toEqual([10.5]);
    expect(labelCandidates('10.5%', '10.5%', null)).toEqual([]); // no inch labels read: a level, or nothing
    expect(labelCandidates('10.5%', '10.5%', 'mm')).toEqual([]);
    expect(labelCandidates('50%', '50%', 'in')).toEqual([]); // an iso level
    expect(labelCandidates('10.3%', '10.3%', 'in')).toEqual([]); // no whole number of sixteenths
  });
});

describe('the unit of the curve labels read', () => {
  it('is sure only when two words or more give it and none another; a word read twice counts once', () => {
    expect(labelUnits(new Map())).toEqual({ unit: null, surely: null });
    // "197 mm" read "19°" on one word, the other labels read without a unit: said only where the labels name the curves.
    expect(labelUnits(new Map([[2, new Set(['in'])]]))).toEqual({ unit: 'in', surely: null });
    expect(labelUnits(new Map([[0, new Set(['mm'])], [1, new Set(['mm'])]]))).toEqual({ unit: 'mm', surely: 'mm' });
    expect(labelUnits(new Map([[0, new Set(['mm'])], [1, new Set(['mm'])], [2, new Set(['in'])]]))).toEqual({ unit: 'mm', surely: null });
  });
});

describe('an inch label whose mark the reader misread', () => {
  it('is read in inches when the mark came out as a sign, or as a last 7 after a whole number of sixteenths', () => {
    expect(misreadInchLabel('14°')).toBe(14);
    expect(misreadInchLabel('12.25*')).toBe(12.25);
    expect(misreadInchLabel('13.3757')).toBe(13.375);
    expect(misreadInchLabel('12.257')).toBe(12.25);
    expect(misreadInchLabel('10.57')).toBe(10.5);
  });
  it('is not guessed otherwise: a number that is already sixteenths, a sign after a value too large for inches, a dot lost, a plain number', () => {
    expect(misreadInchLabel('12.4375')).toBeNull(); // 12 7/16 read whole: no mark to take off
    expect(misreadInchLabel('155°')).toBeNull(); // 15.5" with its dot lost: no guess
    expect(misreadInchLabel('105°')).toBeNull();
    expect(misreadInchLabel('12.3°')).toBeNull(); // not a sixteenth
    expect(misreadInchLabel('147')).toBeNull(); // 14" or 147 mm: the reading cannot tell
    expect(misreadInchLabel('330 mm')).toBeNull();
  });
});

describe('an INVENTED scan of the random bed, no panels and no traces given', () => {
  it('finds every head and power curve, named from the diameters given in order, each within 0.5 % of span of the exact truth', { timeout: 180_000 }, async () => {
    const seed = 3;
    const { plan } = sheetGeometry(seed, 'scan');
    const { jpeg, takeoff } = await scanFor(seed);
    const d = await decode(Buffer.from(jpeg));
    const image = { width: d.width, height: d.height, data: d.data, scale: 1 };
    const sheet = imageSheet(image, 'e'.repeat(64), () => image);
    const raw: Record<string, unknown> = { ...takeoff, sheet: `${seed}.jpg`, diameters: [...plan.family.diameters] };
    delete raw.panels;
    delete raw.traces;
    const found = await detectTakeoff(parseTakeoffToDetect(raw), raw, sheet, { reader: textReaderNode() });
    const traces = found.takeoff.traces;
    expect(traces.every((t) => t.origin === 'detected' && (t.guides?.length ?? 0) > 0 && (t.confidence ?? 0) >= 0.5)).toBe(true);
    expect(traces.map((t) => `${t.quantity}-${t.diameter}`).sort()).toEqual(plan.lines.map((l) => l.id).sort());
    const replay = await replayTakeoff(found.takeoff, sheet, { created: '2026-01-01T00:00:00.000Z' });
    const scores = scoreReplay(plan.family, truthOf(plan), replay.curveSet);
    expect(scores.length).toBe(plan.lines.length);
    for (const s of scores) expect(s.error, s.id).toBeLessThan(0.5);
  });
});
