import { describe, expect, it } from 'vitest';
import { addAnchor, addPanel, frameAnchors, nameCorners, removePanel, setAnchorValue, setAxisUnit, useProposal } from '../../src/ui/store/actions/panels.ts';
import { addTrace, deletePoint, discardEdits, insertionIndex, insertPoint, movePoint, removeTrace, setGuides, setLocked, traceName } from '../../src/ui/store/actions/traces.ts';
import { parseDiameterList, readFromSheet, setSheetUnits, SHEET_UNIT_SYSTEMS } from '../../src/ui/store/actions/setup.ts';
import { EditError } from '../../src/ui/store/actions/action.ts';
import { pointsOf, type Draft } from '../../src/ui/store/draft.ts';
import { draftWithPanel } from './fixtures.ts';

function apply(draft: Draft, ...actions: ((d: Draft) => { draft: Draft } | null)[]): Draft {
  return actions.reduce((d, a) => a(d)?.draft ?? d, draft);
}

describe('panel actions', () => {
  it('a new frame gets four corner anchors: two on the flow axis, two on the y axis, values still blank', () => {
    const next = addPanel({ corner1: [500, 100], corner2: [100, 400], plots: 'power' })(draftWithPanel())!.draft;
    const panel = next.panels[1]!;
    expect(panel.id).toBe('power-1');
    expect(panel.frame).toEqual([100, 100, 500, 400]);
    expect(panel.units).toEqual({ x: 'm3/h', y: 'kW' });
    expect(panel.anchors.map((a) => a.label)).toEqual(['x left', 'x right', 'y bottom', 'y top']);
    expect(panel.anchors.every((a) => a.x === undefined && a.y === undefined)).toBe(true);
  });

  it('refuses a frame too small to be a plot area', () => {
    expect(() => addPanel({ corner1: [10, 10], corner2: [12, 11], plots: 'head' })(draftWithPanel())).toThrow(EditError);
  });

  it('corner anchors sit on the corners found on the sheet, named by where they lie', () => {
    const corners = nameCorners([[101, 99], [499, 402], [498, 97], [102, 404]]);
    expect(corners).toEqual({ topLeft: [101, 99], topRight: [498, 97], bottomLeft: [102, 404], bottomRight: [499, 402] });
    const anchors = frameAnchors([101, 97, 499, 404], corners);
    expect(anchors.map((a) => a.at)).toEqual([[102, 404], [499, 402], [102, 404], [101, 99]]);
  });

  it('typing a value sets it on its axis; clearing it blanks the anchor again', () => {
    let d = setAnchorValue('head-1', 3, 'y', 70)(draftWithPanel())!.draft;
    expect(d.panels[0]!.anchors[3]).toMatchObject({ y: 70 });
    d = setAnchorValue('head-1', 3, 'y', undefined)(d)!.draft;
    expect(d.panels[0]!.anchors[3]!.y).toBeUndefined();
  });

  it('refuses a value that is not a number, naming the axis', () => {
    expect(() => setAnchorValue('head-1', 0, 'x', Number.NaN)(draftWithPanel())).toThrow('The x value must be a number');
  });

  it('an added anchor carries its axis in its label', () => {
    const d = addAnchor('head-1', [300, 400], 'x')(draftWithPanel())!.draft;
    expect(d.panels[0]!.anchors[4]).toEqual({ at: [300, 400], label: 'x' });
  });

  it('accepts units of the axis kind only, and stores the canonical token', () => {
    expect(setAxisUnit('head-1', 'x', 'm³/h')(draftWithPanel())).toBeNull();
    expect(setAxisUnit('head-1', 'y', 'feet')(draftWithPanel())!.draft.panels[0]!.units?.y).toBe('ft');
    expect(() => setAxisUnit('head-1', 'y', 'kW')(draftWithPanel())).toThrow('Unknown head unit "kW"');
  });

  it('taking proposed anchors replaces the anchors and the scales in one undo step', () => {
    const r = useProposal('head-1', [{ at: [1, 2], x: 0 }], 'log', 'linear')(draftWithPanel())!;
    expect(r.label).toBe('use proposed anchors');
    expect(r.draft.panels[0]).toMatchObject({ anchors: [{ at: [1, 2], x: 0 }], x_scale: 'log' });
  });

  it('removing a panel removes the traces on it', () => {
    const d = apply(draftWithPanel(), addTrace({ panel: 'head-1', quantity: 'head', diameter: 330 }, [[200, 200]], [[1, 1], [2, 2]]), removePanel('head-1'));
    expect(d.panels).toEqual([]);
    expect(d.traces).toEqual([]);
  });
});

describe('trace actions', () => {
  const traced = () => addTrace({ panel: 'head-1', quantity: 'head', diameter: 330 }, [[200, 150]], [[100, 150], [200, 150], [300, 160]])(draftWithPanel())!.draft;

  it('a trace needs a diameter, or an iso value for an iso-line', () => {
    expect(() => addTrace({ panel: 'head-1', quantity: 'head' }, [[1, 1]], [])(draftWithPanel())).toThrow('Choose the impeller diameter');
    expect(() => addTrace({ panel: 'head-1', quantity: 'head', iso: 70 }, [[1, 1]], [])(draftWithPanel())).toThrow('Only efficiency and power');
    expect(() => addTrace({ panel: 'nope', quantity: 'head', diameter: 1 }, [[1, 1]], [])(draftWithPanel())).toThrow('There is no panel "nope"');
  });

  it('hand edits go to the trace points and leave the capture as it was', () => {
    const d = movePoint('t1', 1, [200, 155])(traced())!.draft;
    expect(pointsOf(d.traces[0]!)).toEqual([[100, 150], [200, 155], [300, 160]]);
    expect(d.traces[0]!.captured).toEqual([[100, 150], [200, 150], [300, 160]]);
    const back = discardEdits('t1')(d)!.draft;
    expect(back.traces[0]!.points).toBeUndefined();
  });

  it('a point is inserted where it adds the least length, and deleted by index', () => {
    const d = apply(traced(), insertPoint('t1', [250, 156]), deletePoint('t1', 0));
    expect(pointsOf(d.traces[0]!)).toEqual([[200, 150], [250, 156], [300, 160]]);
  });

  it('inserting beyond an end extends the line at that end', () => {
    expect(insertionIndex([[0, 0], [10, 0], [20, 0]], [30, 0])).toBe(3);
    expect(insertionIndex([[0, 0], [10, 0], [20, 0]], [-5, 0])).toBe(0);
    expect(insertionIndex([[0, 0], [10, 0], [20, 0]], [15, 1])).toBe(2);
  });

  it('new guides replace the hand edits with the new capture', () => {
    const d = apply(traced(), movePoint('t1', 0, [0, 0]), setGuides('t1', [[150, 150], [250, 150]], [[150, 150], [250, 150]]));
    expect(d.traces[0]!.points).toBeUndefined();
    expect(d.traces[0]!.guides).toEqual([[150, 150], [250, 150]]);
  });

  it('a locked trace refuses edits with a sentence that says how to unlock it', () => {
    const d = setLocked('t1', true)(traced())!.draft;
    expect(() => movePoint('t1', 0, [1, 1])(d)).toThrow('is locked; unlock it to edit');
    expect(() => removeTrace('t1')(d)).toThrow(EditError);
  });

  it('names traces as the trade does', () => {
    expect(traceName({ quantity: 'npshr', diameter: 330 }, 'mm')).toBe('NPSHr 330 mm');
    expect(traceName({ quantity: 'efficiency', iso: 78 }, 'mm')).toBe('efficiency 78 % line');
  });
});

describe('setup actions', () => {
  it('reads a diameter list typed with spaces, commas or semicolons, largest first', () => {
    expect(parseDiameterList('250, 235;220  205')).toEqual([250, 235, 220, 205]);
    expect(parseDiameterList('12 13 12')).toEqual([13, 12]);
    expect(() => parseDiameterList('250 abc')).toThrow('"abc" is not a diameter');
  });

  it('changing the units of the sheet moves the panel axes that used the old units', () => {
    const d = setSheetUnits(SHEET_UNIT_SYSTEMS.us)(draftWithPanel())!.draft;
    expect(d.units).toEqual(SHEET_UNIT_SYSTEMS.us);
    expect(d.panels[0]!.units).toEqual({ x: 'gpm', y: 'ft' });
  });

  it('details read from the sheet fill the speed, units and an empty diameter list in one step', () => {
    const r = readFromSheet({ speed_rpm: 1780, diameters: [12, 13], units: { flow: 'gpm', head: 'ft' } })({ ...draftWithPanel(), diameters: [] })!;
    expect(r.draft.pump.speed_rpm).toBe(1780);
    expect(r.draft.diameters).toEqual([13, 12]);
    expect(r.draft.units).toMatchObject({ flow: 'gpm', head: 'ft' });
    expect(readFromSheet({})(draftWithPanel())).toBeNull();
  });
});
