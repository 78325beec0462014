import { describe, expect, it } from 'vitest';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { picture, stroke } from './rasterPictures.ts';
import { bedLineTrace } from './fixtures/bedTrace.ts';

// Two lines of one colour that meet at a shallow angle and run together for longer than the
// follower bridges on its prediction alone (its gap, 50 line widths), then part again.
const guided = (x: number) => 200 + 0.0002 * (x - 40) ** 2; // bends gently down, y down
const other = (x: number) => guided(x) - 0.035 * (x - 330); // crosses it at x = 330, about 2°

describe('a whole-line trace through a bunch', () => {
  it('follows the guided line through a shallow crossing to its far end, with a doubt naming the bunch', () => {
    const image = picture(640, 320, (ctx) => {
      stroke(ctx, guided, 40, 600, '#222222', 2);
      stroke(ctx, other, 60, 600, '#222222', 2);
    });
    const got = traceRaster(image, [sheetPoint(80, guided(80)), sheetPoint(120, guided(120))]);
    const xs = got.points.map((p) => p[0]);
    expect(Math.max(...xs)).toBeGreaterThan(585);
    expect(Math.min(...xs)).toBeLessThan(55);
    // On the guided line all along, the far side included (the other line lies 8 px off at x = 560).
    for (const p of got.points) if (p[0] > 460) expect(Math.abs(p[1] - guided(p[0]))).toBeLessThan(2);
    expect(got.doubts.map((d) => d.code)).toContain('takeoff.end-through-bunch');
  });

  it('stops where the lines part evenly about its course, rather than pick one', () => {
    // The guided line runs straight; two lines leave the bunch one each side of it, and the
    // guided line itself ends inside the bunch: nothing tells which one is its continuation.
    const straight = (x: number) => 200;
    const image = picture(640, 320, (ctx) => {
      stroke(ctx, straight, 40, 330, '#222222', 2);
      stroke(ctx, (x) => 200 - 0.02 * (x - 300) * (x > 300 ? 1 : 0), 250, 600, '#222222', 2);
      stroke(ctx, (x) => 200 + 0.02 * (x - 300) * (x > 300 ? 1 : 0), 250, 600, '#222222', 2);
    });
    const got = traceRaster(image, [sheetPoint(80, 200), sheetPoint(120, 200)]);
    // It stops in the bunch: on neither branch beyond it.
    expect(Math.max(...got.points.map((p) => p[0]))).toBeLessThan(400);
    expect(Math.min(...got.points.map((p) => p[0]))).toBeLessThan(55);
  });
});

/**
 * One trace of a random-bed sheet (a scan unless asked) followed with the bed's own (hurried)
 * guides, or its careful ones, the other traces' guides and its panel's frame, as the replay does.
 */
const bedTrace = async (seed: number, id: string, options: { kind?: 'scan' | 'photo'; careful?: boolean } = {}) => (await bedLineTrace(seed, id, options)).got;

describe('an end that runs together with a neighbour from its outermost guide on', () => {
  it('says so, though the follow across a dotted line\'s gaps keeps few points there (random bed scan 319, NPSHr 8.875 in)', async () => {
    // Invented sheet of the random bed: three black dotted NPSHr lines that run together below
    // mid-flow; the hurried guide at a quarter of the line sits where they touch, and the trace
    // from it to the line's start lies on the bunch, up to 1.8 % of span off its own line.
    const got = await bedTrace(319, 'npshr-8.875');
    expect(got.doubts.map((d) => d.code)).toContain('takeoff.end-through-bunch');
  });
});

describe('an end that comes out of a bunch and ends a little past it', () => {
  it('says so, though only a short piece follows the bunch (random bed scan 382, NPSHr 12.625 in)', async () => {
    // Invented sheet of the random bed: four black dashed NPSHr lines run together at low flow,
    // a diameter label printed over them. From its one hurried guide the trace runs down past the
    // label, onto a neighbour in the bunch, and ends a short gap beyond it: 1.6 % of span off its
    // own line, and the bunch was not said because no long stretch followed it.
    const got = await bedTrace(382, 'npshr-12.625');
    expect(got.doubts.map((d) => d.code)).toContain('takeoff.end-through-bunch');
  });
});

describe('a guide the finished trace does not pass over', () => {
  it('is said, where the clicked line runs together with a neighbour (random bed scan 88, efficiency 242)', async () => {
    // Invented sheet of the random bed: two black dashed efficiency lines 4–6 px apart at low
    // flow; the hurried guides at 6 % and 57 % of the line sit on it, but the line model sampled
    // over both lines is twice as wide, and the trace runs between them, 3.3 px off the first
    // guide and 2.35 points of efficiency off its line.
    const got = await bedTrace(88, 'efficiency-242');
    const missed = got.doubts.filter((d) => d.code === 'takeoff.guide-missed');
    expect(missed.length).toBeGreaterThan(0);
    expect(missed[0]?.message).toMatch(/^the trace does not pass over guide 1 near/);
  });

  it('is said of a guide whose grey sample is lines of several colours run together (random bed photo 1205, NPSHr 310, hurried guides)', async () => {
    // Its low-flow guide sits where four dashed NPSHr lines of other colours run together: the
    // sample there reads grey and 4.5 px wide, the other guide's blue and 3.2 px. Taken for a
    // washed-out sample of the blue, it raised no doubt, and the trace ran 4-5 px along a
    // neighbour there (1.4 % of span off).
    const got = await bedTrace(1205, 'npshr-310', { kind: 'photo' });
    expect(got.doubts.map((d) => d.code)).toContain('takeoff.guide-in-bunch');
  });

  it('is not said of a trace on a line that stands alone, its guides clicked a pixel off', () => {
    const line = (x: number) => 150 + 0.0008 * (x - 300) ** 2;
    const image = picture(640, 320, (ctx) => stroke(ctx, line, 40, 600, '#1f5fbf', 2));
    const got = traceRaster(image, [sheetPoint(120, line(120) + 1), sheetPoint(300, line(300) - 1), sheetPoint(480, line(480) + 1)]);
    expect(got.doubts.map((d) => d.code)).not.toContain('takeoff.guide-missed');
    expect(got.doubts.map((d) => d.code)).not.toContain('takeoff.stretch-unseen');
    expect(got.points.length).toBeGreaterThan(5);
  });
});

describe('a stretch between guides over which the line was not seen', () => {
  it('is said, where the follow coasts over a stretch of the line it does not see (random bed scan 108, efficiency 12.75 in, careful guides)', async () => {
    // Invented sheet of the random bed, scanned: black dashed efficiency lines run close together
    // between the first two careful guides. The trace holds no point of its own line over a long
    // stretch after guide 1, and what it holds there lies off the line: 2.1 points of efficiency
    // off, with no other finding. (The bed's earlier case, photo 134, is now lost and said so.)
    const got = await bedTrace(108, 'efficiency-12.75', { careful: true });
    const unseen = got.doubts.filter((d) => d.code === 'takeoff.stretch-unseen');
    expect(unseen.length).toBe(1);
    expect(unseen[0]?.message).toMatch(/^after guide 1 near .* part of the trace between guides 1 and 2 is a guess/);
  });
});

describe('a lone guide where other lines touch the line', () => {
  it('is said: nothing tells which line of the bunch the trace is on (random bed photo 521, NPSHr 9.125 in, hurried guides)', async () => {
    // Five faint dotted NPSHr lines run together at low flow; the one guide on this line sits
    // there, with no room beside it. The trace ran out along a neighbour, 10.6 % of span off.
    const got = await bedTrace(521, 'npshr-9.125', { kind: 'photo' });
    const doubt = got.doubts.find((d) => d.code === 'takeoff.guide-in-bunch');
    expect(doubt?.message).toMatch(/^the one guide, near .* sits where other lines touch the line/);
  });
});

describe('the line model where a dashed line is clicked inside a bunch and where it stands alone', () => {
  it('is sampled on the clean stroke, not on the bunch whose dashes fall out of step (random bed scan 552, NPSHr 212 mm, hurried guides)', async () => {
    // Guide 1 sits where four dashed NPSHr lines run together (its sample measured 8.8 px wide,
    // dashed); guides 2 and 3 on the line alone (1.4 and 1.9 px). The bunch's model had taken the
    // trace along a lower line, 1.5 % of span off, unflagged.
    const got = await bedTrace(552, 'npshr-212');
    expect(got.line.widthPx).toBeLessThan(3);
  });
});
