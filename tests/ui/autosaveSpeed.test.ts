/**
 * Kept work survives the change of the trace target: a record kept by the workbench before the
 * target named a speed (autosave version 2, where a speed sat in `target.diameter`) loads with
 * every trace and captured point, and its target becomes a speed target.
 *
 * The fixture `fixtures/autosave-v2-speed-sheet.json` is the IndexedDB record the workbench of
 * version 2 wrote in Chromium after the four head curves of the INVENTED speed sheet of
 * tests/e2e/speedSheet.test.ts (seed 5, 100/90/80/70 % of 1750 rpm) were clicked: it was read out
 * of the browser as it was stored, not written by hand.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { AUTOSAVE_FORMAT, AUTOSAVE_VERSION, migrateSaved } from '../../src/ui/persist/records.ts';
import { Store } from '../../src/ui/store/store.ts';
import { addTrace } from '../../src/ui/store/actions/traces.ts';
import { curveTarget, nextTarget, sharedCurves, sharedCurveSentence, targetFor, targetName, targetProblem, tracesOfCurve, withLabel } from '../../src/ui/store/target.ts';
import { toTakeoffFile } from '../../src/ui/store/takeoffFile.ts';
import { traceStep } from '../../src/ui/steps/trace.ts';
import { draftWithPanel } from './fixtures.ts';

const V2_SPEED = JSON.parse(readFileSync(join(import.meta.dirname, 'fixtures', 'autosave-v2-speed-sheet.json'), 'utf8')) as {
  version: number;
  draft: { traces: { id: string; speed?: number; diameter?: number; captured: [number, number][]; guides: [number, number][] }[] };
  target: unknown;
};

/** The record as version 2 kept it half-way through: the next click was to trace the 1575 rpm head curve (v2 wrote the speed into `diameter`). */
const midTrace = () => ({ ...structuredClone(V2_SPEED), target: { quantity: 'head', lines: 'diameter', diameter: 1575 } });

describe('a speed sheet kept by the workbench of autosave version 2', () => {
  it('is the record version 2 wrote: four speed-labelled head traces with their captured points', () => {
    expect(V2_SPEED.version).toBe(2);
    expect(V2_SPEED.draft.traces.map((t) => t.speed)).toEqual([1750, 1575, 1400, 1225]);
    expect(V2_SPEED.draft.traces.every((t) => t.captured.length > 50)).toBe(true);
  });

  it('loads with every trace, guide and captured point as it was', () => {
    const doc = migrateSaved(structuredClone(V2_SPEED), () => 'unused')!;
    expect(doc).not.toBeNull();
    expect(doc.version).toBe(AUTOSAVE_VERSION);
    expect(doc.draft.family).toBe('speed');
    expect(doc.draft.speeds).toEqual([1750, 1575, 1400, 1225]);
    // Field for field: not one captured point, guide or label lost or moved.
    expect(doc.draft.traces).toEqual(V2_SPEED.draft.traces);
    // The target kept at the end (efficiency as iso-lines) stays as it was.
    expect(doc.target).toEqual(V2_SPEED.target);
  });

  it('turns the old target of a speed (`lines: "diameter"`, `diameter: 1575`) into a speed target, which the next click traces', () => {
    const doc = migrateSaved(midTrace(), () => 'unused')!;
    expect(doc.target).toEqual({ quantity: 'head', lines: 'curve', speed: 1575 });
    const store = new Store();
    store.replace(doc.draft, { step: doc.step, target: doc.target, unitSystem: doc.unitSystem }, { id: doc.id, library: doc.library });
    expect(targetProblem(store.draft, store.session.target)).toBeNull();
    // Opening the trace step keeps the restored target.
    expect(traceStep.enter?.(store.draft, store.session)).toEqual({});
    const before = store.draft.traces.length;
    expect(store.dispatch(addTrace({ panel: 'head-1', quantity: 'head', speed: 1575 }, [[300, 150]], [[300, 150], [310, 160]]))).toBe(true);
    expect(store.draft.traces[before]).toMatchObject({ speed: 1575 });
    expect(store.draft.traces[before]?.diameter).toBeUndefined();
  });

  it('writes the take-off file of the restored work with the speeds and the captured points', () => {
    const doc = migrateSaved(midTrace(), () => 'unused')!;
    const { takeoff } = toTakeoffFile(doc.draft);
    expect(takeoff.traces.map((t) => t.speed)).toEqual([1750, 1575, 1400, 1225]);
    expect(takeoff.traces.every((t) => t.diameter === undefined)).toBe(true);
    expect(takeoff.traces.map((t) => t.captured)).toEqual(V2_SPEED.draft.traces.map((t) => t.captured));
  });

  it('migrates once: the migrated record read again is the same record', () => {
    const doc = migrateSaved(midTrace(), () => 'unused')!;
    expect(migrateSaved(JSON.parse(JSON.stringify(doc)), () => 'unused')).toEqual(doc);
  });
});

describe('older records of a sheet of diameters', () => {
  it('keep their diameter target', () => {
    const v2 = { format: AUTOSAVE_FORMAT, version: 2, id: 'd1', savedAt: '2026', draft: draftWithPanel(), library: null, step: 'trace', target: { quantity: 'head', lines: 'diameter', diameter: 310 }, unitSystem: 'si', sheetKey: null };
    expect(migrateSaved(v2, () => 'x')?.target).toEqual({ quantity: 'head', lines: 'curve', diameter: 310 });
  });

  it('kept before the family question get the kind their traces are labelled by', () => {
    const { family: _f, speeds: _s, ...draft } = draftWithPanel({ traces: [{ id: 't1', panel: 'head-1', quantity: 'head', diameter: 330, guides: [[1, 1]], method: 'auto', captured: [[1, 1]] }] });
    const v2 = { format: AUTOSAVE_FORMAT, version: 2, id: 'd2', savedAt: '2026', draft, library: null, step: 'trace', target: { quantity: 'head', lines: 'diameter' }, unitSystem: 'si', sheetKey: null };
    const doc = migrateSaved(v2, () => 'x')!;
    expect(doc.draft.family).toBe('diameter');
    expect(doc.draft.speeds).toEqual([]);
    expect(doc.target).toEqual({ quantity: 'head', lines: 'curve' });
  });
});

describe('the trace target names a diameter or a speed, as the take-off file does', () => {
  const speedDraft = () => draftWithPanel({ family: 'speed', speeds: [1450, 1200], diameters: [] });

  it('is labelled by the kind of sheet', () => {
    expect(targetFor(speedDraft(), 'head')).toEqual({ quantity: 'head', lines: 'curve', speed: 1450 });
    expect(targetFor(draftWithPanel(), 'head')).toEqual({ quantity: 'head', lines: 'curve', diameter: 330 });
    expect(withLabel(speedDraft(), { quantity: 'head', lines: 'iso', iso: 70 }, 1200)).toEqual({ quantity: 'head', lines: 'curve', speed: 1200 });
    expect(curveTarget(speedDraft(), 'power', 1200, 'p1')).toEqual({ quantity: 'power', lines: 'curve', speed: 1200, panel: 'p1' });
  });

  it('proposes the next speed after a speed is traced', () => {
    const store = new Store(speedDraft());
    store.dispatch(addTrace({ panel: 'head-1', quantity: 'head', speed: 1450 }, [[1, 1]], [[1, 1]]));
    expect(nextTarget(store.draft, { quantity: 'head', lines: 'curve', speed: 1450 })).toEqual({ quantity: 'head', lines: 'curve', speed: 1200 });
  });

  it('says when two traces are filed under one speed, naming the speed', () => {
    const store = new Store(speedDraft());
    store.dispatch(addTrace({ panel: 'head-1', quantity: 'head', speed: 1450 }, [[1, 1]], [[1, 1], [2, 2]]));
    store.dispatch(addTrace({ panel: 'head-1', quantity: 'head', speed: 1450 }, [[3, 3]], [[3, 3], [4, 4]]));
    const shared = sharedCurves(store.draft);
    expect(shared).toEqual([{ quantity: 'head', speed: 1450, ids: ['t1', 't2'] }]);
    expect(sharedCurveSentence(shared[0]!, 'mm')).toBe('Head 1450 rpm has 2 traces (t1, t2); their points are fitted together as one curve. If one belongs to another speed, relabel or delete it.');
    expect(tracesOfCurve(store.draft, { quantity: 'head', lines: 'curve', speed: 1450 }).map((t) => t.id)).toEqual(['t1', 't2']);
    expect(targetName({ quantity: 'head', lines: 'curve', speed: 1450 }, store.draft.units)).toBe('head curve of 1450 rpm');
  });

  it('refuses a label of the other kind with a sentence', () => {
    const store = new Store(speedDraft());
    expect(store.dispatch(addTrace({ panel: 'head-1', quantity: 'head', diameter: 1450 }, [[1, 1]], [[1, 1]]))).toBe(false);
    expect(store.session.message?.text).toMatch(/drawn for speeds.*rpm, not a diameter/);
    const diameters = new Store(draftWithPanel());
    expect(diameters.dispatch(addTrace({ panel: 'head-1', quantity: 'head', speed: 1450 }, [[1, 1]], [[1, 1]]))).toBe(false);
    expect(diameters.session.message?.text).toMatch(/drawn for impeller diameters/);
  });
});
