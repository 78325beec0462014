import { describe, expect, it } from 'vitest';
import { FrameTool, sharedFlowAnchors } from '../../src/ui/tools/frameTool.ts';
import { AnchorTool, axisNear } from '../../src/ui/tools/anchorTool.ts';
import { TraceTool, withGuide } from '../../src/ui/tools/traceTool.ts';
import { pointsOf } from '../../src/ui/store/draft.ts';
import { FakeHost, pointer, settle } from './fakeHost.ts';
import { draftWithPanel, HEAD_PANEL } from './fixtures.ts';

describe('the frame tool', () => {
  it('a drag from corner to corner makes a panel with its corners snapped to the crossings', async () => {
    const host = new FakeHost(draftWithPanel({ panels: [] }));
    host.store.setSession({ step: 'axes', framePlots: 'power' });
    host.crossings = [[100, 500], [500, 700], [100, 700], [500, 500]];
    const tool = new FrameTool(host);
    expect(tool.status()).toMatch(/^Drag from one corner of the power plot area/);
    tool.down(pointer(102, 502));
    tool.move(pointer(300, 600));
    expect(host.preview).toMatchObject({ kind: 'frame', a: [100, 500] });
    tool.move(pointer(498, 698));
    tool.up(pointer(498, 698));
    await settle();
    const panel = host.store.draft.panels[0]!;
    expect(panel).toMatchObject({ id: 'power-1', plots: 'power', frame: [100, 500, 500, 700] });
    expect(panel.anchors.map((a) => a.at)).toEqual([[100, 700], [500, 700], [100, 700], [100, 500]]);
    expect(host.store.session).toMatchObject({ activePanel: 'power-1', drawingFrame: false });
  });

  it('once every panel is calibrated, the status line says to go on to tracing, not to draw another frame', () => {
    const host = new FakeHost(draftWithPanel());
    host.store.setSession({ step: 'axes', framePlots: 'head' });
    const tool = new FrameTool(host);
    // Not calibrated yet: the frame tool still asks for a drag.
    expect(tool.status()).toMatch(/^Drag from one corner of the head plot area/);
    host.flow = 10;
    expect(tool.status()).toMatch(/^All 1 panel is calibrated: go on to “Trace the curves” \(3\)/);
  });

  it('a click without a drag places the first corner; the next click the opposite one', async () => {
    const host = new FakeHost(draftWithPanel({ panels: [] }));
    const tool = new FrameTool(host);
    tool.down(pointer(100, 100));
    tool.up(pointer(100, 100));
    expect(tool.status()).toMatch(/^Click the opposite corner/);
    tool.down(pointer(400, 300));
    await settle();
    expect(host.store.draft.panels[0]!.frame).toEqual([100, 100, 400, 300]);
  });

  it('Escape drops a frame half drawn', () => {
    const host = new FakeHost(draftWithPanel({ panels: [] }));
    const tool = new FrameTool(host);
    tool.down(pointer(100, 100));
    tool.up(pointer(100, 100));
    expect(tool.key(new KeyboardEventStub('Escape') as unknown as KeyboardEvent)).toBe(true);
    expect(tool.status()).toMatch(/^Drag from one corner/);
  });

  it('the title beside the frame names what the panel plots', async () => {
    const host = new FakeHost(draftWithPanel({ panels: [] }));
    host.plots = 'npshr';
    const tool = new FrameTool(host);
    tool.down(pointer(100, 100));
    tool.move(pointer(400, 300));
    tool.up(pointer(400, 300));
    await settle();
    expect(host.store.draft.panels[0]!.plots).toBe('npshr');
  });

  it('a panel under another with the same flow range takes its flow values, read through its calibration', () => {
    const flowAt = (_id: string, at: readonly [number, number]) => ((at[0] - 100) / 400) * 400 + 0.3;
    const anchors = sharedFlowAnchors([HEAD_PANEL], [101, 450, 499, 600], { bottomLeft: [101, 600], bottomRight: [499.5, 600] }, flowAt);
    // 1.3 m³/h and 399.8 m³/h lie within 0.5 % of the span of the head panel's 0 and 400.
    expect(anchors).toEqual([{ at: [101, 600], label: 'x left', x: 0 }, { at: [499.5, 600], label: 'x right', x: 400 }]);
    expect(sharedFlowAnchors([HEAD_PANEL], [200, 450, 300, 600], { bottomLeft: [200, 600], bottomRight: [300, 600] }, flowAt)).toBeNull();
  });
});

class KeyboardEventStub {
  constructor(readonly key: string) {}
}

describe('the anchor tool', () => {
  it('drags an anchor onto the crossing it is dropped near', () => {
    const host = new FakeHost(draftWithPanel());
    host.store.setSession({ step: 'axes', activePanel: 'head-1' });
    host.crossings = [[100, 103]];
    const tool = new AnchorTool(host);
    tool.down(pointer(101, 99));
    tool.move(pointer(101, 104));
    tool.up(pointer(101, 104));
    expect(host.store.draft.panels[0]!.anchors[3]!.at).toEqual([100, 103]);
  });

  it('a click on the sheet adds an anchor for the axis whose edge is nearer, and asks for its value', () => {
    const host = new FakeHost(draftWithPanel());
    host.store.setSession({ step: 'axes', activePanel: 'head-1' });
    const tool = new AnchorTool(host);
    tool.down(pointer(300, 395));
    expect(host.store.draft.panels[0]!.anchors[4]).toEqual({ at: [300, 395], label: 'x' });
    expect(host.focused).toEqual(['head-1', 4]);
    expect(axisNear([100, 100, 500, 400], [105, 250])).toBe('y');
  });
});

describe('the trace tool', () => {
  it('a click traces the target curve at once and proposes the next diameter', async () => {
    const host = new FakeHost(draftWithPanel());
    host.store.setSession({ target: { quantity: 'head', lines: 'curve', diameter: 330 } });
    const tool = new TraceTool(host);
    expect(tool.status()).toBe('Click on the head curve of 330 mm to trace it.');
    tool.down(pointer(300, 200));
    await settle();
    const t = host.store.draft.traces[0]!;
    expect(t).toMatchObject({ quantity: 'head', diameter: 330, guides: [[300, 200]] });
    expect(pointsOf(t)).toEqual([[250, 200], [350, 200]]);
    expect(host.store.session.target).toMatchObject({ diameter: 310 });
    expect(host.store.session.lastTraced).toBe(t.id);
    expect(host.store.history.labels).toEqual(['trace head 330 mm']);
    // Captured with the panel and the curve of the new trace, as the replay traces it.
    expect(host.captureAsked[0]).toEqual({ panel: 'head-1', traceId: undefined, curve: { panel: 'head-1', quantity: 'head', diameter: 330 } });
    // A head trace lends its colour to the same impeller's other traces: they are asked to be traced again.
    expect(host.leaningAsked).toEqual([t.id]);
  });

  it('Shift-click adds a guide to the last trace, in order along the flow axis, and traces again', async () => {
    const host = new FakeHost(draftWithPanel());
    host.store.setSession({ target: { quantity: 'head', lines: 'curve', diameter: 330 } });
    const tool = new TraceTool(host);
    tool.down(pointer(300, 200));
    await settle();
    tool.down(pointer(150, 190, { shift: true }));
    await settle();
    expect(host.captures.at(-1)).toEqual([[150, 190], [300, 200]]);
    expect(host.store.draft.traces[0]!.guides).toEqual([[150, 190], [300, 200]]);
    // Once after the first click and once after the guide was added.
    expect(host.leaningAsked).toHaveLength(2);
    expect(withGuide([[1, 0], [9, 0]], [5, 0])).toEqual([[1, 0], [5, 0], [9, 0]]);
  });

  it('a click right on a traced line picks that trace instead of tracing it twice', async () => {
    const host = new FakeHost(draftWithPanel());
    host.store.setSession({ target: { quantity: 'head', lines: 'curve', diameter: 330 } });
    const tool = new TraceTool(host);
    tool.down(pointer(300, 200));
    await settle();
    tool.move(pointer(300, 202));
    tool.down(pointer(300, 202));
    await settle();
    expect(host.store.draft.traces).toHaveLength(1);
    expect(host.store.session.selectedTrace).toBe('t1');
  });

  it('on the selected trace, dragging a point moves it, a press without a move only selects it, Delete removes it', async () => {
    const host = new FakeHost(draftWithPanel());
    host.store.setSession({ target: { quantity: 'head', lines: 'curve', diameter: 330 } });
    const tool = new TraceTool(host);
    tool.down(pointer(300, 200));
    await settle();
    host.store.setSession({ selectedTrace: 't1' });
    tool.down(pointer(250, 200));
    tool.up(pointer(250, 200));
    expect(host.store.draft.traces[0]!.points).toBeUndefined();
    expect(host.store.session.selectedPoint).toBe(0);
    tool.down(pointer(350, 201));
    tool.move(pointer(350, 210));
    tool.up(pointer(350, 210));
    expect(pointsOf(host.store.draft.traces[0]!)).toEqual([[250, 200], [350, 210]]);
    host.store.setSession({ selectedPoint: 1 });
    expect(tool.key({ key: 'Delete' } as KeyboardEvent)).toBe(true);
    expect(pointsOf(host.store.draft.traces[0]!)).toEqual([[250, 200]]);
  });

  it('says where a guide was read elsewhere than clicked (on a label printed over the line)', async () => {
    const host = new FakeHost(draftWithPanel());
    host.moved = ['Guide 1 sat on a label printed over the line; the line was taken up where it leaves the label, near (250.0, 200.0) and (350.0, 200.0).'];
    host.store.setSession({ target: { quantity: 'head', lines: 'curve', diameter: 330 } });
    const tool = new TraceTool(host);
    tool.down(pointer(300, 200));
    await settle();
    expect(host.store.session.message).toMatchObject({ tone: 'done' });
    expect(host.store.session.message?.text).toBe(`Traced head 330 mm: 2 points. ${host.moved[0]}`);
  });

  it('a guide that finds no line alone is kept, and the status line says how to go on', async () => {
    const host = new FakeHost(draftWithPanel());
    host.tracer = (g) => (g.length < 2 ? [] : [[g[0]![0], g[0]![1]], [g[1]![0], g[1]![1]]]);
    host.store.setSession({ target: { quantity: 'head', lines: 'curve', diameter: 330 } });
    const tool = new TraceTool(host);
    tool.down(pointer(300, 200));
    await settle();
    expect(host.store.draft.traces[0]).toMatchObject({ guides: [[300, 200]], captured: [] });
    expect(host.store.session.message?.tone).toBe('caution');
    tool.down(pointer(450, 220, { shift: true }));
    await settle();
    expect(pointsOf(host.store.draft.traces[0]!)).toEqual([[300, 200], [450, 220]]);
  });

  it('says what is missing instead of tracing when no diameter is known', async () => {
    const host = new FakeHost(draftWithPanel({ diameters: [] }));
    host.store.setSession({ target: { quantity: 'head', lines: 'curve' } });
    const tool = new TraceTool(host);
    tool.down(pointer(300, 200));
    await settle();
    expect(host.store.draft.traces).toHaveLength(0);
    expect(host.store.session.message?.text).toMatch(/^Type the impeller diameters/);
  });
});
