import { describe, expect, it } from 'vitest';
import { fromTakeoffFile, toTakeoffFile, DraftIncompleteError } from '../../src/ui/store/takeoffFile.ts';
import { addPanel } from '../../src/ui/store/actions/panels.ts';
import { movePoint, addTrace as addTraceAction } from '../../src/ui/store/actions/traces.ts';
import { draftWithPanel } from './fixtures.ts';
import { EMPTY_DRAFT } from '../../src/ui/store/draft.ts';


const withTrace = () => addTraceAction({ panel: 'head-1', quantity: 'head', diameter: 330 }, [[200, 150]], [[100, 150], [300, 160]])(draftWithPanel())!.draft;

describe('the take-off file written from the workbench', () => {
  it('holds the sheet, pump, units, calibrated panels and traces with guides and captured points', () => {
    const { takeoff, omitted } = toTakeoffFile(withTrace());
    expect(omitted).toEqual([]);
    expect(takeoff).toMatchObject({ format: 'pumpscribe.takeoff', version: 1, sheet: 'invented.pdf', page: 1, pump: { speed_rpm: 1480 } });
    expect(takeoff.panels[0]).toMatchObject({ id: 'head-1', frame: [100, 100, 500, 400], units: { x: 'm3/h', y: 'm' } });
    expect(takeoff.traces[0]).toMatchObject({ id: 't1', panel: 'head-1', diameter: 330, guides: [[200, 150]], captured: [[100, 150], [300, 160]] });
  });

  it('writes hand-edited points instead of the capture they replaced', () => {
    const d = movePoint('t1', 0, [100, 152])(withTrace())!.draft;
    const trace = toTakeoffFile(d).takeoff.traces[0]!;
    expect(trace.points).toEqual([[100, 152], [300, 160]]);
    expect(trace.captured).toBeUndefined();
  });

  it('leaves out a panel whose anchors have no values yet, and says so', () => {
    const d = addPanel({ corner1: [100, 500], corner2: [500, 700], plots: 'power' })(withTrace())!.draft;
    const { takeoff, omitted } = toTakeoffFile(d);
    expect(takeoff.panels.map((p) => p.id)).toEqual(['head-1']);
    expect(omitted).toEqual(['Panel power-1 has no anchor values yet and was left out.']);
  });

  it('refuses to write a file without a sheet or without a trace, saying what is missing', () => {
    expect(() => toTakeoffFile(EMPTY_DRAFT)).toThrow(DraftIncompleteError);
    expect(() => toTakeoffFile(draftWithPanel())).toThrow('Trace at least one curve');
  });

  it('reads back what it wrote, with the diameters and what each panel plots', () => {
    const d = withTrace();
    const { takeoff } = toTakeoffFile(d);
    const back = fromTakeoffFile(JSON.parse(JSON.stringify(takeoff)), d.sheet!);
    expect(back.panels[0]).toMatchObject({ id: 'head-1', plots: 'head', frame: [100, 100, 500, 400] });
    expect(back.traces[0]).toMatchObject({ id: 't1', guides: [[200, 150]], captured: [[100, 150], [300, 160]] });
    expect(back.diameters).toEqual([330]);
    expect(back.pump).toEqual(d.pump);
  });

  it('refuses a file from a newer version rather than guess at it', () => {
    const { takeoff } = toTakeoffFile(withTrace());
    expect(() => fromTakeoffFile({ ...takeoff, version: 9 }, withTrace().sheet!)).toThrow('newer than this tool reads');
  });
});
