/**
 * Naming the curves of a scan: head curves found and values given that differ in number are
 * matched by the affinity rule (head in proportion to the diameter squared) or not at all; a
 * crossing line carried on through a bunch is unsure. INVENTED heads and lines.
 */
import { describe, expect, it } from 'vitest';
import { bandsHaveNoRoom, bunchedRun, byElimination, chooseNames, continuationOf, courseBreak, joinTracks, labelCandidates, matchByAffinity, missingCurves, pointLost } from '../../src/digitize/detect/rasterCurves.ts';
import { inkMap, levelOf } from '../../src/digitize/detect/ink.ts';
import { labelPicture } from '../../src/digitize/detect/rasterText.ts';
import type { FoundPanel } from '../../src/digitize/detect/panels.ts';
import { alonePlaces, type Track } from '../../src/digitize/detect/rasterLines.ts';

const headOf = (d: number) => 0.4 * d * d; // shut-off head of an INVENTED family, m, for a diameter in inches

describe('head curves matched to the values given by affinity', () => {
  it('three curves for four values: the value with no curve is found, the rest named in order', () => {
    const values = [15.5, 14.375, 13.375, 12.25];
    expect(matchByAffinity([15.5, 13.375, 12.25].map(headOf), values)).toEqual([15.5, 13.375, 12.25]);
    expect(matchByAffinity([15.5, 14.375, 12.25].map(headOf), values)).toEqual([15.5, 14.375, 12.25]);
    // The top (or bottom) curve missing cannot be told from every name shifted by one (the heads
    // keep the rule either way, the values being evenly stepped): nothing is named.
    expect(matchByAffinity([14.375, 13.375, 12.25].map(headOf), values)).toBeNull();
  });

  it('five lines at the flow axis for four values: the one that is no head curve of the family is left without a value', () => {
    const values = [10, 9, 8, 7];
    // A line at a head no diameter of the list gives (the rule would need a 3.3 exponent).
    const heads = [headOf(10), headOf(9), 0.4 * 8.8 ** 2 * 0.92, headOf(8), headOf(7)];
    expect(matchByAffinity(heads, values)).toEqual([10, 9, undefined, 8, 7]);
  });

  it('nothing is named when two matchings fit, when none fits, with one curve only, or when the numbers agree', () => {
    // Values so close that skipping either middle one keeps the rule: two fits.
    expect(matchByAffinity([headOf(10), headOf(7)], [10, 9.9, 9.8, 7])).toBeNull();
    // Heads that break the rule with every value.
    expect(matchByAffinity([100, 20], [10, 9.5, 9])).toBeNull();
    expect(matchByAffinity([headOf(10)], [10, 9])).toBeNull();
    expect(matchByAffinity([headOf(10), headOf(9)], [10, 9])).toBeNull();
    // A shut-off head not read (no traced line) names nothing.
    expect(matchByAffinity([headOf(10), NaN, headOf(8)], [10, 9, 8, 7])).toBeNull();
  });
});

describe("a tracer's line carried on past a line's end through a bunch", () => {
  const frame = [0, 0, 400, 300] as const;
  const line = (from: number, to: number, f: (u: number) => number) => {
    const t: Track = { u: [], v: [], len: [], room: [] };
    for (let u = from; u <= to; u++) (t.u.push(u + 0.5), t.v.push(f(u + 0.5)));
    return { track: t, levelFrame: frame };
  };
  it('is in a bunch when a third of it runs along another line found in the frame; alone, or along a line of another frame, it is not', () => {
    const mine = line(100, 300, (u) => 200 - 0.2 * u);
    const other = line(0, 300, (u) => 182 - 0.15 * u);
    // Carried on to the left, onto where the other line runs 2 px away.
    const run = [...Array(30).keys()].map((k) => [70 + k, 182 - 0.15 * (70 + k) + 2] as const);
    expect(bunchedRun(run, mine, [mine, other], 3)).toBe(true);
    expect(bunchedRun(run, mine, [mine], 3)).toBe(false);
    expect(bunchedRun(run, mine, [mine, { ...other, levelFrame: [0, 0, 400, 301] as const }], 3)).toBe(false);
    const alone = [...Array(30).keys()].map((k) => [70 + k, 200 - 0.2 * (70 + k)] as const);
    expect(bunchedRun(alone, mine, [mine, other], 3)).toBe(false);
    expect(bunchedRun([], mine, [mine, other], 3)).toBe(false);
  });
});

describe('a head line that turns off its course', () => {
  const track = (f: (u: number) => number, from = 0, to = 800) => {
    const t: Track = { u: [], v: [], len: [], room: [] };
    for (let u = from; u < to; u++) (t.u.push(u + 0.5), t.v.push(f(u + 0.5)));
    return t;
  };
  const head = (u: number) => 100 + 0.0003 * u * u;
  it('is cut where it leaves its course onto a line crossing at a shallow angle', () => {
    // From column 600 on, the line found follows an iso-line falling 0.15 px a column faster.
    const t = track((u) => (u < 600 ? head(u) : head(u) + 0.15 * (u - 600)));
    const cut = courseBreak(t, 3, 120);
    expect(cut).not.toBeNull();
    expect(t.u[cut!]!).toBeGreaterThan(570);
    expect(t.u[cut!]!).toBeLessThan(640);
  });
  it('is not cut along its own course, nor at a label or crossing a few columns long', () => {
    expect(courseBreak(track(head), 3, 120)).toBeNull();
    expect(courseBreak(track((u) => (u > 400 && u < 406 ? head(u) + 9 : head(u))), 3, 120)).toBeNull();
  });
  it('is not cut at a label longer than half its reach, where the line found runs over the glyphs and comes back (scan bed seed 42)', () => {
    // 80 columns of label, the line found 10 px off over them, then on the line again.
    const labelled = track((u) => (u > 600 && u < 680 ? head(u) - 10 : head(u)));
    expect(courseBreak(labelled, 3, 120)).toBeNull();
    // The same turn onto an iso-line as above is still cut after such a label.
    const t = track((u) => (u > 300 && u < 380 ? head(u) - 10 : u < 600 ? head(u) : head(u) + 0.15 * (u - 600)));
    expect(t.u[courseBreak(t, 3, 120)!]!).toBeGreaterThan(570);
  });
});

describe('guides never in a band of lines run together, nor across a step onto another line', () => {
  const frame = [0, 0, 600, 300] as const;
  const lineOf = (n: number, len: (u: number) => number, v: (u: number) => number = (u) => 150 - 0.1 * u) => {
    const t: Track = { u: [], v: [], len: [], room: [] };
    for (let u = 0; u < n; u++) (t.u.push(u + 0.5), t.v.push(v(u + 0.5)), t.len.push(len(u)), t.room.push(Infinity));
    return t;
  };
  it('a line whose ink is a band five lines wide over its first half gets guides only on its second half', () => {
    const band = { track: lineOf(500, (u) => (u < 250 ? 12 : 2)), levelFrame: frame };
    const others = [1, 2, 3].map(() => ({ track: lineOf(300, () => 2), levelFrame: frame }));
    const curves = [band, ...others];
    bandsHaveNoRoom(curves);
    const places = alonePlaces(band.track, 8, 8, 90);
    expect(places.length).toBeGreaterThan(0);
    for (const p of places) expect(p.u).toBeGreaterThan(250);
    for (const o of others) expect(o.track.room.every((r) => r === Infinity)).toBe(true);
  });
  it('a line that steps 9 px onto another across a short gap has its guides on one side of the step', () => {
    const t = lineOf(500, () => 2, (u) => (u < 300 ? 150 - 0.1 * u : 150 - 0.1 * u - 9));
    const places = alonePlaces(t, 8, 8, 90);
    expect(places.length).toBe(2);
    expect(places.every((p) => p.u < 300) || places.every((p) => p.u > 300)).toBe(true);
    // Without the step, the guides lie a quarter and three quarters along the whole line.
    const smooth = alonePlaces(lineOf(500, () => 2), 8, 8, 90);
    expect(smooth.some((p) => p.u < 300) && smooth.some((p) => p.u > 300)).toBe(true);
  });
});

describe('curves missing on a panel', () => {
  it('each panel other than the head panel says which of the values named has no curve on it', () => {
    const panel = (id: string, quantity: FoundPanel['quantity']) => ({ id, quantity }) as FoundPanel;
    const head = panel('head', 'head');
    const eff = panel('efficiency', 'efficiency');
    const power = panel('power', 'power');
    const curves = [{ panel: eff, value: 13.125 }, ...[14, 13.125, 12.375, 11.5].map((value) => ({ panel: power, value }))];
    const out = missingCurves([head, eff, power], curves, [14, 13.125, 12.375, 11.5]);
    expect(out).toHaveLength(1);
    expect(out[0]).toContain('"efficiency"');
    expect(out[0]).toContain('14, 12.375, 11.5');
    expect(missingCurves([head, power], curves, [14, 13.125, 12.375, 11.5])).toEqual([]);
    expect(missingCurves([head, eff], [], [14])).toHaveLength(1);
  });
});

describe('labels read again where the first reading named no curve', () => {
  it('an inch label whose decimal point was lost: each place of a point giving sixteenths, never a trailing zero, never without inches', () => {
    expect(labelCandidates('155°', '155')).toEqual([15.5]); // the mark read as a degree sign
    expect(labelCandidates('155', '155', 'in')).toEqual([15.5]);
    expect(labelCandidates('105°', '1057')).toEqual([10.5]); // the mark read as a 7 by the digits reading
    expect(labelCandidates('95', '95', 'in')).toEqual([9.5]);
    expect(labelCandidates('13375', '13375', 'in')).toEqual([13.375]);
    expect(labelCandidates('155', '155')).toEqual([]); // no inches read anywhere
    expect(labelCandidates('155', '155', 'mm')).toEqual([155]);
    expect(labelCandidates('155', '165', 'in')).toEqual([]); // the two readings disagree
    expect(pointLost('230', '230', 'in')).toEqual([]); // "23.0"" is not printed
    expect(pointLost('1013', '1013', 'in')).toEqual([]); // no point gives sixteenths
    expect(pointLost('57', '57', 'in')).toEqual([]); // a whole number of inches as read
  });
  it('a label whose unit word was read but its number garbled takes the digits reading, in a millimetre frame only', () => {
    expect(labelCandidates('19°" mm,', '197,', 'mm')).toEqual([197]);
    expect(labelCandidates('19°" mm,', '197,')).toEqual([]);
    expect(labelCandidates('19°" mm,', '197,', 'in')).toEqual([]);
    expect(labelCandidates('19° mm', '', 'mm')).toEqual([]);
  });
  it('a millimetre unit misread ("175 mn") leaves a bare number, counted only in a frame read in millimetres', () => {
    expect(labelCandidates('175 mn', '175', 'mm')).toEqual([175]);
    expect(labelCandidates('175 mn', '175')).toEqual([]);
    expect(labelCandidates('175 mx', '175', 'mm')).toEqual([]);
  });
  it('several readings of one label are candidates, and order with affinity picks the one consistent set', () => {
    // INVENTED shut-off heads following H ∝ D²: 230 → 50 m.
    const heads = [230, 214, 197, 181].map((d) => 50 * (d / 230) ** 2);
    expect(chooseNames([[230], [214], [19, 197], [181]], heads)).toEqual([230, 214, 197, 181]);
    // Both readings of the third label fit the order (a digit misread): two namings, none chosen.
    expect(chooseNames([[230], [214], [197, 194], [181]], heads)).toBeNull();
  });

  describe('the label picture', () => {
    // An INVENTED strip of a scan: white paper, a grey grid column at x 48–51, an orange glyph
    // (a block 20 × 20) across it, a small orange mark 6 px right of the glyph (a unit), and an
    // orange line's stub (3 px thick) from x 84 on.
    const W = 200;
    const H = 60;
    const data = new Uint8ClampedArray(W * H * 4).fill(255);
    const paint = (x0: number, x1: number, y0: number, y1: number, rgb: [number, number, number]) => {
      for (let y = y0; y < y1; y++) for (let x = x0; x < x1; x++) data.set(rgb, 4 * (y * W + x));
    };
    const orange: [number, number, number] = [224, 123, 0];
    paint(48, 52, 0, H, [190, 190, 190]);
    paint(40, 60, 20, 40, orange);
    paint(66, 72, 24, 30, orange);
    paint(84, 160, 29, 32, orange);
    const image = { width: W, height: H, data, scale: 1 };
    const raw = inkMap(image);
    // The grid-free ink: the grid column's own darkness taken off its columns (as the frame's
    // row and column medians are), which leaves the glyph faint where it crosses the grid.
    const grid = raw.ink[5 * W + 49] as number;
    const plain = { width: W, height: H, ink: raw.ink.map((v, i) => (i % W >= 48 && i % W < 52 ? Math.max(0, v - grid) : v)) };
    const word = { l: 40, t: 20, r: 60, b: 40 };
    const picture = labelPicture(image, levelOf(0, W, H), raw, plain, [0, 0], [word]);
    it('widens the box over the mark beside the word, and stops before a line', () => {
      expect(picture.boxes).toHaveLength(1);
      expect(picture.boxes[0]!.r).toBeGreaterThanOrEqual(72);
      expect(picture.boxes[0]!.r).toBeLessThanOrEqual(86);
    });
    it('shows coloured print as dark as its darkest channel, also where it crosses the grid', () => {
      const crop = picture.crops[0]!;
      const at = (x: number, y: number) => picture.map.ink[(crop.box.t + y - picture.boxes[0]!.t) * picture.map.width + (x - (picture.boxes[0]!.l - crop.box.l))] as number;
      expect(plain.ink[30 * W + 50]).toBeLessThan(0.5 * (raw.ink[30 * W + 44] as number));
      expect(at(44, 30)).toBeGreaterThan(200);
      expect(at(50, 30)).toBeGreaterThan(170); // the grid-free ink kept under half of it
      expect(at(64, 30)).toBeLessThan(40); // paper between glyph and mark
    });
  });
});

describe('a head line broken by a label printed on it', () => {
  const track = (f: (u: number) => number, from: number, to: number) => {
    const t: Track = { u: [], v: [], len: [], room: [] };
    for (let u = from; u < to; u++) (t.u.push(u + 0.5), t.v.push(f(u + 0.5)), t.len.push(2), t.room.push(20));
    return t;
  };
  const head = (u: number) => 100 + 0.0003 * u * u;
  const iso = (u: number) => 40 + 0.6 * u;
  it('is joined to the line that carries its course on past the label', () => {
    // The head line stops at a label over columns 500-540 and goes on beyond it; an iso-line
    // crossing near there starts past the label too, off the course.
    const before = track(head, 0, 500);
    const beyond = { track: track(head, 540, 900) };
    const crossing = { track: track(iso, 520, 700) };
    expect(continuationOf(before, [crossing, beyond], 2, 1000)).toBe(beyond);
    const joined = joinTracks(before, beyond.track);
    expect(joined.u).toHaveLength(860);
    expect(joined.joins).toBeUndefined();
  });
  it('is not joined to a line off its course, nor to one starting beyond a label\'s length', () => {
    const before = track(head, 0, 500);
    expect(continuationOf(before, [{ track: track((u) => head(u) + 12, 540, 900) }], 2, 1000)).toBeUndefined();
    expect(continuationOf(before, [{ track: track(head, 600, 900) }], 2, 1000)).toBeUndefined();
    // Two lines on the course: which one goes on is not clear, and neither is joined.
    expect(continuationOf(before, [{ track: track(head, 540, 900) }, { track: track((u) => head(u) + 1, 545, 900) }], 2, 1000)).toBeUndefined();
  });
  it('of an efficiency curve past its peak, level there, only when the fall is not asked for (scan bed seed 39)', () => {
    // Rising to a peak at column 600; a label printed over it at columns 480-520, and beyond it
    // the line as high at column 680 as at 520.
    const efficiency = (u: number) => 500 - 1.2 * u + 0.001 * u * u;
    const before = track(efficiency, 0, 480);
    const beyond = { track: track(efficiency, 520, 680) };
    expect(continuationOf(before, [beyond], 2, 1000)).toBeUndefined(); // a head line's rest falls
    expect(continuationOf(before, [beyond], 2, 1000, false)).toBe(beyond);
  });
});

describe('a curve named by elimination', () => {
  // INVENTED: an NPSHr panel whose curves for 240 and 190 were found; the 190 head curve was cut
  // short (it ends at 764 on the flow axis), so the 190 NPSHr line, drawn to 790, matches no end.
  const panel = { id: 'npshr' } as unknown as FoundPanel;
  const head = { id: 'head' } as unknown as FoundPanel;
  const line = (end: number) => ({ panel, quantity: 'npshr' as const, flows: [100, end] as [number, number], traced: [] });
  const named240 = { panel, quantity: 'npshr' as const, value: 240 };
  const refs = [
    { value: 240, end: 965, how: 'sure' },
    { value: 190, end: 764, how: 'sure' },
  ];
  const span = 1000;

  it('the only curve left on its panel, near the end of the only value left there, takes that value', () => {
    const c = line(790);
    expect(byElimination(c, [named240, c], [c], [240, 190], refs, span)?.reference.value).toBe(190);
  });

  it('a piece ending far from that end, two curves left, two values left, or no end for the value: no name', () => {
    const piece = line(500);
    expect(byElimination(piece, [named240, piece], [piece], [240, 190], refs, span)).toBeNull();
    const a = line(790);
    const b = line(700);
    expect(byElimination(a, [a, b], [a, b], [240, 190], refs, span)).toBeNull();
    const c = line(790);
    expect(byElimination(c, [named240, c], [c], [240, 190, 160], refs, span)).toBeNull();
    expect(byElimination(c, [named240, c], [c], [240, 190], refs.filter((r) => r.value !== 190), span)).toBeNull();
    // A curve of another panel, or of another quantity, takes no value of this one.
    const other = { panel: head, quantity: 'npshr' as const, value: 190 };
    expect(byElimination(c, [named240, other, c], [c], [240, 190], refs, span)?.reference.value).toBe(190);
  });
});
