/**
 * A speed family (one impeller drawn at several speeds) read from a points table: the speed
 * affinity law (Q ∝ n, H ∝ n²; Karassik, Pump Handbook; Lobanoff & Ross) must pass an exact
 * invented family and name the curve whose speed label is wrong.
 */
import { describe, expect, it } from 'vitest';
import { inventedSpeedFamily, speedFamilyPointsText } from '../../src/demo/inventedSpeedFamily.ts';
import { readPointsTable, PointsTableError } from '../../src/model/pointsTable.ts';
import { buildSpeedSetFromText } from './buildSpeedSet.ts';
import { SPEED_RANGE_SHORT, speedCurveFindings, speedRangeFindings } from '../../src/fit/speedFamilyCheck.ts';

describe('a speed family from a points table', () => {
  it('reads a speed column in place of the diameter column, long and wide', () => {
    const long = readPointsTable(speedFamilyPointsText(inventedSpeedFamily()));
    expect(long.family).toBe('speed');
    expect(new Set(long.rows.map((r) => r.speed))).toEqual(new Set([1450, 1300, 1150, 1000]));
    expect(long.rows.every((r) => r.diameter === undefined)).toBe(true);
    const wide = readPointsTable('speed [rpm],flow [m3/h],head [m]\n1450,0,24\n1450,50,22\n');
    expect(wide.family).toBe('speed');
    expect(wide.rows[1]).toMatchObject({ speed: 1450, flow: 50, value: 22 });
  });

  it('refuses a table that mixes diameters and speeds, or gives speed in another unit, with one sentence', () => {
    expect(() => readPointsTable('diameter [mm],speed [rpm],flow [m3/h],head [m]\n200,1450,0,24\n')).toThrow(PointsTableError);
    expect(() => readPointsTable('diameter [mm],speed [rpm],flow [m3/h],head [m]\n200,1450,0,24\n')).toThrow(/one family/);
    expect(() => readPointsTable('speed [Hz],flow [m3/h],head [m]\n50,0,24\n')).toThrow(/rpm/);
  });

  it('builds the invented four-speed family and passes the speed-affinity check', () => {
    const set = buildSpeedSetFromText(speedFamilyPointsText(inventedSpeedFamily(), { seed: 5 }));
    expect(set.family).toBe('speed');
    expect(set.members.map((m) => m.speed_rpm)).toEqual([1450, 1300, 1150, 1000]);
    expect(set.findings.filter((f) => f.severity !== 'note')).toEqual([]);
    const summary = set.findings.find((f) => f.code === 'affinity.summary');
    expect(summary?.method).toMatch(/Karassik/);
    // The invented family obeys the law exactly; with 0.2 % reading noise the worst head deviation stays under 1 %.
    expect(summary?.figures.worst_head_deviation).toBeLessThan(0.01);
    // Exponent 2 of H ∝ n², within 0.1.
    expect(Math.abs((summary?.figures.implied_exponent ?? 0) - 2)).toBeLessThan(0.1);
  });

  it('fails when one curve carries a wrong speed label, and names that curve and the speed it fits', () => {
    const set = buildSpeedSetFromText(speedFamilyPointsText(inventedSpeedFamily(), { seed: 5, relabel: { 1: 1200 } }));
    const fails = set.findings.filter((f) => f.severity === 'fail');
    expect(fails).toHaveLength(1);
    const f = fails[0]!;
    expect(f.code).toBe('affinity.outlier');
    expect(f.subject.speed_rpm).toBe(1200);
    expect(f.message).toMatch(/^The 1200 rpm head curve/);
    // The curve was drawn at 1300 rpm: the implied speed is within 2 % of it.
    expect(Math.abs((f.figures.implied_size ?? 0) / 1300 - 1)).toBeLessThan(0.02);
    expect(f.message).toMatch(/fits about 1[23]\d\d rpm/);
  });

  it('warns when neighbouring drawn speeds are more than 20 % apart', () => {
    const fam = { ...inventedSpeedFamily(), speeds_rpm: [1450, 1000] };
    const set = buildSpeedSetFromText(speedFamilyPointsText(fam, { seed: 2 }));
    const span = set.findings.find((f) => f.code === 'affinity.speed-span');
    expect(span?.severity).toBe('warn');
    expect(span?.message).toMatch(/1450 rpm and 1000 rpm/);
  });

  it('warns when one speed\'s efficiency or power curve was read off a neighbouring line, and names that speed', () => {
    const set = buildSpeedSetFromText(speedFamilyPointsText(inventedSpeedFamily(), { seed: 5 }));
    expect(speedCurveFindings(set)).toEqual([]);
    // The 1150 rpm member given the 1450 rpm member's efficiency and power curves (as when the trace jumped lines).
    const fast = set.members.find((m) => m.speed_rpm === 1450)!;
    const misread = { ...set, members: set.members.map((m) => (m.speed_rpm === 1150 ? { ...m, curves: { ...m.curves, efficiency: fast.curves.efficiency!, power: fast.curves.power! } } : m)) };
    const found = speedCurveFindings(misread);
    expect(found.map((f) => `${f.subject.speed_rpm} ${f.subject.quantity} ${f.severity}`).sort()).toEqual(['1150 efficiency warn', '1150 power warn']);
    expect(found[0]!.message).toMatch(/^The 1150 rpm (efficiency|power) curve differs by up to/);
  });

  it('warns when one speed\'s curve was traced over much less than its neighbours\' range scaled by Q ∝ n, and names only that speed', () => {
    const set = buildSpeedSetFromText(speedFamilyPointsText(inventedSpeedFamily(), { seed: 5 }));
    expect(speedRangeFindings(set)).toEqual([]);
    // The 1150 rpm power trace stopped at 60 % of its range, as when the line was lost where the curves bunch.
    const cut = (share: number, speeds = [1150]) => ({
      ...set,
      members: set.members.map((m) => {
        const power = m.curves.power!;
        const [lo, hi] = power.fit!.domain;
        return speeds.includes(m.speed_rpm) ? { ...m, curves: { ...m.curves, power: { ...power, fit: { ...power.fit!, domain: [lo, lo + share * (hi - lo)] as [number, number] } } } } : m;
      }),
    });
    const found = speedRangeFindings(cut(0.6));
    expect(found.map((f) => `${f.subject.speed_rpm} ${f.subject.quantity} ${f.severity}`)).toEqual(['1150 power warn']);
    expect(found[0]!.figures.missing_share).toBeCloseTo(0.4, 1);
    expect(found[0]!.message).toMatch(/^The 1150 rpm power curve (covers \d+ % or less of the flow range|ends \d+ % of the head curve's flow range before)/);
    // Every power curve cut short alike: the neighbours agree, but each ends well before its own speed's head curve.
    const all = speedRangeFindings(cut(0.6, [1450, 1300, 1150, 1000]));
    expect(all.map((f) => `${f.subject.speed_rpm} ${f.subject.quantity}`).sort()).toEqual(['1000 power', '1150 power', '1300 power', '1450 power']);
    expect(all[0]!.message).toMatch(/ends \d+ % of the head curve's flow range before the \d+ rpm head curve does/);
    // A trace stopped a little short (within the limit) is not named.
    expect(speedRangeFindings(cut(1 - SPEED_RANGE_SHORT / 2))).toEqual([]);
    // A diameter family is never judged by the speed law.
    expect(speedRangeFindings({ ...cut(0.6), family: 'diameter' })).toEqual([]);
  });

  it('does not blame efficiency read from iso-lines for ending at the last iso-line, and still judges efficiency drawn as curves', () => {
    const set = buildSpeedSetFromText(speedFamilyPointsText(inventedSpeedFamily(), { seed: 5 }));
    // Every speed's efficiency ends at 60 % of its range, as where the last iso-line crosses the head curve.
    const ending = (drawn_as: 'curve' | 'iso-lines' | 'both' | undefined) => ({
      ...set,
      members: set.members.map((m) => {
        const eta = m.curves.efficiency!;
        const [lo, hi] = eta.fit!.domain;
        const fit = { ...eta.fit!, domain: [lo, lo + 0.6 * (hi - lo)] as [number, number] };
        return { ...m, curves: { ...m.curves, efficiency: drawn_as ? { ...eta, fit, drawn_as } : { ...eta, fit } } };
      }),
    });
    const named = (s: ReturnType<typeof ending>) => speedRangeFindings(s).filter((f) => f.code === 'affinity.speed-range').map((f) => `${f.subject.speed_rpm} ${f.subject.quantity}`).sort();
    expect(named(ending('iso-lines'))).toEqual([]);
    // Drawn as curves (or both, or not known), a curve ending there was cut short: each speed is named.
    const all = ['1000 efficiency', '1150 efficiency', '1300 efficiency', '1450 efficiency'];
    expect(named(ending('curve'))).toEqual(all);
    expect(named(ending('both'))).toEqual(all);
    expect(named(ending(undefined))).toEqual(all);
  });

  it('warns when one speed\'s curve runs on past the end of curve the rest of the family gives it by Q ∝ n, and names only that speed', () => {
    const set = buildSpeedSetFromText(speedFamilyPointsText(inventedSpeedFamily(), { seed: 5 }));
    expect(speedRangeFindings(set).filter((f) => f.code === 'affinity.speed-overrun')).toEqual([]);
    // The 1000 rpm efficiency trace ran on into the 1150 rpm line past its own end of curve, as a follower does where the curves cross.
    const longer = (share: number) => ({
      ...set,
      members: set.members.map((m) => {
        const eta = m.curves.efficiency!;
        const [lo, hi] = eta.fit!.domain;
        return m.speed_rpm === 1000 ? { ...m, curves: { ...m.curves, efficiency: { ...eta, fit: { ...eta.fit!, domain: [lo, hi + share * (hi - lo)] as [number, number] } } } } : m;
      }),
    });
    const found = speedRangeFindings(longer(0.25)).filter((f) => f.code === 'affinity.speed-overrun');
    expect(found.map((f) => `${f.subject.speed_rpm} ${f.subject.quantity} ${f.severity}`)).toEqual(['1000 efficiency warn']);
    // 25 % of its own range beyond its end, against the farthest other end scaled by Q ∝ n: about 20–25 % (the table's curves end a little apart).
    expect(found[0]!.figures.overrun_share).toBeGreaterThan(0.18);
    expect(found[0]!.figures.overrun_share).toBeLessThan(0.26);
    expect(found[0]!.message).toMatch(/^The 1000 rpm efficiency curve runs 2\d % past the farthest end of curve any other curve of the family reaches/);
    // Other curves cut short do not make a whole curve look long.
    const shortened = { ...set, members: set.members.map((m) => (m.speed_rpm === 1150 ? { ...m, curves: { ...m.curves, head: { ...m.curves.head!, fit: { ...m.curves.head!.fit!, domain: [0, 0.5 * m.curves.head!.fit!.domain[1]] as [number, number] } } } } : m)) };
    expect(speedRangeFindings(shortened).filter((f) => f.code === 'affinity.speed-overrun')).toEqual([]);
    // A trace that runs a little past its end (within the limit) is not named.
    expect(speedRangeFindings(longer(SPEED_RANGE_SHORT / 2)).filter((f) => f.code === 'affinity.speed-overrun')).toEqual([]);
  });
});
