/**
 * The workbench's take-off record for a sheet of one impeller at several speeds: the kind of
 * sheet is asked before the curves are labelled, speeds are typed in rpm or in % of the rated
 * speed, traces are labelled `speed` (rpm), and the take-off file carries them both ways.
 * A diameter sheet stays as it was.
 */
import { describe, expect, it } from 'vitest';
import { EditError } from '../../src/ui/store/actions/action.ts';
import { parseSpeedList, setFamilyKind, setSpeeds } from '../../src/ui/store/actions/setup.ts';
import { addTrace, setTraceSpec } from '../../src/ui/store/actions/traces.ts';
import type { Draft } from '../../src/ui/store/draft.ts';
import { fromTakeoffFile, toTakeoffFile } from '../../src/ui/store/takeoffFile.ts';
import { nextTarget, targetFor } from '../../src/ui/store/target.ts';
import { traceOfFinding } from '../../src/ui/views/reviewStep.ts';
import { draftWithPanel } from '../ui/fixtures.ts';
import type { CurveSet } from '../../src/model/curveset.ts';

const apply = (draft: Draft, action: (d: Draft) => { draft: Draft } | null): Draft => action(draft)?.draft ?? draft;

describe('a speed family in the workbench record', () => {
  it('reads speeds in rpm, or in % of the rated speed, fastest first', () => {
    expect(parseSpeedList('950 1450 1200', 1450)).toEqual([1450, 1200, 950]);
    expect(parseSpeedList('1450 rpm, 1200 rpm', 1450)).toEqual([1450, 1200]);
    expect(parseSpeedList('100 90 80 70 %', 1450)).toEqual([1450, 1305, 1160, 1015]);
    expect(parseSpeedList('100% 90% 80%', 2900)).toEqual([2900, 2610, 2320]);
    expect(() => parseSpeedList('1450 fast', 1450)).toThrow(EditError);
    expect(() => parseSpeedList('1450 fast', 1450)).toThrow(/"fast" is not a speed/);
    expect(() => parseSpeedList('300 %', 1450)).toThrow(/at most 200 %/);
  });

  it('labels traces by speed once the sheet is a speed family, proposes the next speed, and saves `speed`', () => {
    let d = draftWithPanel({ diameters: [] });
    d = apply(d, setFamilyKind('speed'));
    d = apply(d, setSpeeds(parseSpeedList('100 90 80 %', 1480)));
    expect(d.speeds).toEqual([1480, 1332, 1184]);
    const first = targetFor(d, 'head');
    expect(first.speed).toBe(1480);
    expect(first.diameter).toBeUndefined();
    d = apply(d, addTrace({ panel: 'head-1', quantity: 'head', speed: first.speed as number }, [[150, 150]], [[100, 120], [300, 200], [480, 300]]));
    expect(d.traces[0]).toMatchObject({ speed: 1480 });
    expect(d.traces[0]?.diameter).toBeUndefined();
    expect(nextTarget(d, first).speed).toBe(1332);
    d = apply(d, addTrace({ panel: 'head-1', quantity: 'head', speed: 1332 }, [[150, 170]], [[100, 140], [300, 220], [450, 320]]));
    // Relabelled in the list of traces: the speed changes, no diameter appears.
    d = apply(d, setTraceSpec(d.traces[1]!.id, { speed: 1184 }));
    expect(d.traces[1]).toMatchObject({ speed: 1184 });
    expect(d.traces[1]?.diameter).toBeUndefined();
    const { takeoff } = toTakeoffFile(d);
    expect(takeoff.traces.map((t) => t.speed)).toEqual([1480, 1184]);
    expect(takeoff.traces.every((t) => t.diameter === undefined)).toBe(true);
    // Read back: the sheet is a speed family again, with the speeds its traces carry.
    const back = fromTakeoffFile(takeoff, d.sheet!);
    expect(back.family).toBe('speed');
    expect(back.speeds).toEqual([1480, 1184]);
    expect(toTakeoffFile(back).takeoff).toEqual(takeoff);
    // A finding about a speed leads to that speed's trace on the sheet.
    const finding = { id: 'x', code: 'affinity.outlier', severity: 'fail' as const, subject: { speed_rpm: 1184, quantity: 'head' as const }, message: 'm', method: 'm', figures: {} };
    expect(traceOfFinding(d, finding, { members: [] } as unknown as CurveSet, new Map())).toBe(d.traces[1]!.id);
  });

  it('refuses to change the kind of sheet while traces are labelled by the other kind', () => {
    let d = draftWithPanel();
    d = apply(d, addTrace({ panel: 'head-1', quantity: 'head', diameter: 330 }, [[150, 150]], [[100, 120], [300, 200]]));
    expect(() => setFamilyKind('speed')(d)).toThrow(/1 trace is labelled by diameter already/);
  });

  it('leaves a diameter sheet as it was: traces carry `diameter`, the file reads back as a diameter family', () => {
    let d = draftWithPanel();
    expect(d.family).toBe('diameter');
    d = apply(d, addTrace({ panel: 'head-1', quantity: 'head', diameter: 330 }, [[150, 150]], [[100, 120], [300, 200], [480, 300]]));
    expect(d.traces[0]).toMatchObject({ diameter: 330 });
    expect(d.traces[0]?.speed).toBeUndefined();
    const { takeoff } = toTakeoffFile(d);
    expect(takeoff.traces[0]?.diameter).toBe(330);
    expect(fromTakeoffFile(takeoff, d.sheet!).family).toBe('diameter');
  });
});
