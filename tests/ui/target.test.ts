import { describe, expect, it } from 'vitest';
import { nextTarget, panelAt, panelFor, retargetForPanel, targetFor, targetName, targetProblem } from '../../src/ui/store/target.ts';
import { addTrace } from '../../src/ui/store/actions/traces.ts';
import type { Draft, PanelDraft } from '../../src/ui/store/draft.ts';
import { draftWithPanel, HEAD_PANEL } from './fixtures.ts';

const POWER: PanelDraft = { ...HEAD_PANEL, id: 'power-1', plots: 'power', frame: [100, 450, 500, 600], units: { x: 'm3/h', y: 'kW' } };
const base = (): Draft => draftWithPanel({ panels: [HEAD_PANEL, POWER] });
const trace = (d: Draft, quantity: 'head' | 'power', diameter: number) => addTrace({ panel: quantity === 'head' ? 'head-1' : 'power-1', quantity, diameter }, [[1, 1]], [[1, 1], [2, 2]])(d)!.draft;

describe('what the next click traces', () => {
  it('after a curve, the next untraced diameter of the same quantity, largest first', () => {
    const d = trace(base(), 'head', 330);
    expect(nextTarget(d, { quantity: 'head', lines: 'curve', diameter: 330 })).toEqual({ quantity: 'head', lines: 'curve', diameter: 310 });
  });

  it('when a quantity is done, efficiency as iso-lines on the head panel (no efficiency panel), then power', () => {
    const d = trace(trace(base(), 'head', 330), 'head', 310);
    expect(nextTarget(d, { quantity: 'head', lines: 'curve', diameter: 310 })).toEqual({ quantity: 'efficiency', lines: 'iso' });
    const withIso = addTrace({ panel: 'head-1', quantity: 'efficiency', iso: 70 }, [[1, 1]], [[1, 1], [2, 2]])(d)!.draft;
    expect(nextTarget(withIso, { quantity: 'head', lines: 'curve', diameter: 310 })).toEqual({ quantity: 'power', lines: 'curve', diameter: 330 });
  });

  it('an iso-line is followed by another of the same value, for the other branch', () => {
    expect(nextTarget(base(), { quantity: 'efficiency', lines: 'iso', iso: 75 })).toEqual({ quantity: 'efficiency', lines: 'iso', iso: 75 });
  });

  it('a click in another panel switches to what that panel plots', () => {
    const d = trace(base(), 'power', 330);
    expect(retargetForPanel(d, { quantity: 'head', lines: 'curve', diameter: 310 }, POWER)).toEqual({ quantity: 'power', lines: 'curve', diameter: 310, panel: 'power-1' });
    const iso = { quantity: 'efficiency' as const, lines: 'iso' as const, iso: 70 };
    expect(retargetForPanel(d, iso, HEAD_PANEL)).toEqual(iso);
  });

  it('finds the panel under a point, with a small margin around its frame', () => {
    expect(panelAt(base(), [300, 500])?.id).toBe('power-1');
    expect(panelAt(base(), [95, 250])?.id).toBe('head-1');
    expect(panelAt(base(), [300, 430])).toBeUndefined();
  });

  it('says what is missing before a click can trace', () => {
    expect(targetProblem(base(), { quantity: 'npshr', lines: 'curve', diameter: 330 })).toMatch(/^No panel plots NPSHr yet/);
    expect(targetProblem(base(), { quantity: 'efficiency', lines: 'iso' })).toMatch(/^Type the value of the efficiency line/);
    expect(targetProblem({ ...base(), diameters: [] }, targetFor({ ...base(), diameters: [] }, 'head'))).toMatch(/^Type the impeller diameters/);
    expect(panelFor(base(), { quantity: 'efficiency', lines: 'iso' })?.id).toBe('head-1');
  });

  it('names the target in words for the status line', () => {
    expect(targetName({ quantity: 'head', lines: 'curve', diameter: 330 }, { flow: 'm3/h', head: 'm', diameter: 'mm', power: 'kW' })).toBe('head curve of 330 mm');
    expect(targetName({ quantity: 'efficiency', lines: 'iso', iso: 78 }, { flow: 'm3/h', head: 'm', diameter: 'mm', power: 'kW' })).toBe('78 % efficiency line');
  });
});

describe('re-doing a trace', () => {
  it('after a delete, the next click re-does the deleted curve, not the one proposed after it', async () => {
    const { addTrace, removeTrace } = await import('../../src/ui/store/actions/traces.ts');
    const { afterRemoval, nextTarget, sharedCurves, tracesOfCurve } = await import('../../src/ui/store/target.ts');
    const { draftWithPanel } = await import('./fixtures.ts');
    let d = draftWithPanel({ diameters: [330, 310, 290] });
    d = addTrace({ panel: 'head-1', quantity: 'head', diameter: 330 }, [[200, 150]], [[100, 150], [300, 160]])(d)!.draft;
    d = addTrace({ panel: 'head-1', quantity: 'head', diameter: 310 }, [[200, 180]], [[100, 180], [300, 190]])(d)!.draft;
    expect(nextTarget(d, { quantity: 'head', lines: 'curve', diameter: 310 })).toMatchObject({ diameter: 290 });
    const removed = d.traces[1]!;
    d = removeTrace(removed.id)(d)!.draft;
    const patch = afterRemoval({ selectedTrace: removed.id, lastTraced: removed.id, highlightedTrace: null }, removed);
    expect(patch).toMatchObject({ target: { quantity: 'head', lines: 'curve', diameter: 310, panel: 'head-1' }, selectedTrace: null, lastTraced: null });
    // A second trace of a traced curve is reported, never merged silently.
    expect(tracesOfCurve(d, { quantity: 'head', lines: 'curve', diameter: 330 }).map((t) => t.id)).toEqual(['t1']);
    d = addTrace({ panel: 'head-1', quantity: 'head', diameter: 330 }, [[220, 150]], [[100, 151], [300, 161]])(d)!.draft;
    expect(sharedCurves(d)).toEqual([{ quantity: 'head', diameter: 330, ids: ['t1', 't2'] }]);
  });
});
