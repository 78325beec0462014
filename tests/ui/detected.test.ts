/**
 * The automatic take-off in the workbench's document: found parts go in as one undoable edit,
 * an edit makes a found part the engineer's, a second detection keeps the engineer's parts, the
 * take-off file keeps the provenance, and the questions are answered one at a time.
 */
import { describe, expect, it } from 'vitest';
import { adoptSheetUnits, applyDetection, answerKind, markUserEdits, provenance } from '../../src/ui/store/actions/detected.ts';
import { sheetUnitsRead } from '../../src/digitize/detect/detect.ts';
import { moveAnchor } from '../../src/ui/store/actions/panels.ts';
import { movePoint, setHidden, setTraceSpec } from '../../src/ui/store/actions/traces.ts';
import { Store } from '../../src/ui/store/store.ts';
import { fromTakeoffFile, toTakeoffFile } from '../../src/ui/store/takeoffFile.ts';
import { Detection, readLevels } from '../../src/ui/app/detection.ts';
import type { DetectAnswer } from '../../src/ui/worker/protocol.ts';
import type { SheetWorkerClient } from '../../src/ui/worker/client.ts';
import { OcrUnavailableError } from '../../src/digitize/loaders/ocrBrowser.ts';
import { draftWithPanel } from './fixtures.ts';

const BY = 'pumpscribe detect 1 (vector sheets)';

/** What the detector answers for an invented two-curve head panel. */
function answer(extra: Partial<DetectAnswer> = {}): DetectAnswer {
  return {
    panels: [{
      id: 'head', origin: 'detected', confidence: 0.9, quantity: 'head', frame: [100, 100, 500, 400],
      anchors: [{ at: [100, 400], x: 0 }, { at: [500, 400], x: 400 }, { at: [100, 400], y: 0 }, { at: [100, 100], y: 60 }],
      x_scale: 'linear', y_scale: 'linear', units: { x: 'm3/h', y: 'm' },
    }],
    traces: [330, 310].map((d, i) => ({
      id: `head-${d}`, origin: 'detected' as const, confidence: 0.8, panel: 'head', quantity: 'head' as const, diameter: d,
      captured: [[100, 150 + 20 * i], [300, 160 + 20 * i], [450, 200 + 20 * i]] as [number, number][], captured_by: 'vector' as const, method: 'vector' as const,
    })),
    questions: [],
    by: BY,
    refused: null,
    ...extra,
  } as DetectAnswer;
}

const empty = () => draftWithPanel({ panels: [], diameters: [] });

describe('found parts in the document', () => {
  it('go in as one undoable edit, marked as found, with the family labels read from them', () => {
    const store = new Store(empty());
    expect(store.dispatch(applyDetection(answer()))).toBe(true);
    const d = store.draft;
    expect(d.panels.map((p) => [p.id, p.plots, p.origin])).toEqual([['head', 'head', 'detected']]);
    expect(d.traces.map((t) => [t.id, t.origin, t.confidence, t.guides.length])).toEqual([['head-330', 'detected', 0.8, 0], ['head-310', 'detected', 0.8, 0]]);
    expect(d.diameters).toEqual([330, 310]);
    expect(d.detected).toEqual({ by: BY, questions: [] });
    expect(provenance(d)).toEqual({ found: 3, set: 0 });
    expect(store.history.past).toHaveLength(1);
    store.undo();
    expect(store.draft.traces).toHaveLength(0);
    expect(store.draft.detected).toBeUndefined();
  });

  it('become the engineer\'s when edited (points, label, anchors), but not when only hidden', () => {
    const store = new Store(empty());
    store.dispatch(applyDetection(answer()));
    store.dispatch(setHidden('head-310', true));
    expect(store.draft.traces.find((t) => t.id === 'head-310')?.origin).toBe('detected');
    store.dispatch(movePoint('head-330', 1, [300, 158]));
    const moved = store.draft.traces.find((t) => t.id === 'head-330');
    expect(moved?.origin).toBe('user');
    expect(moved?.confidence).toBeUndefined();
    store.dispatch(setTraceSpec('head-310', { diameter: 300 }));
    expect(store.draft.traces.find((t) => t.id === 'head-310')?.origin).toBe('user');
    store.dispatch(moveAnchor('head', 3, [100, 101]));
    expect(store.draft.panels[0]?.origin).toBe('user');
    expect(provenance(store.draft)).toEqual({ found: 0, set: 3 });
  });

  it('are replaced by a second detection, which keeps what the engineer set and adds no second copy of it', () => {
    const store = new Store(empty());
    store.dispatch(applyDetection(answer()));
    store.dispatch(movePoint('head-330', 1, [300, 158]));
    const edited = store.draft.traces.find((t) => t.id === 'head-330');
    store.dispatch(applyDetection(answer({ questions: ['Which is it?'] })));
    const d = store.draft;
    expect(d.traces.map((t) => [t.id, t.origin])).toEqual([['head-330', 'user'], ['head-310', 'detected']]);
    expect(d.traces[0]).toBe(edited);
    expect(d.detected?.questions).toEqual(['Which is it?']);
  });

  it('give way to a panel the engineer drew over the same plot: the found curves lie on it', () => {
    const mine = draftWithPanel({ diameters: [] }); // head-1, drawn by hand over the same frame
    const next = applyDetection(answer())(mine)!.draft;
    expect(next.panels.map((p) => p.id)).toEqual(['head-1']);
    expect(next.traces.map((t) => t.panel)).toEqual(['head-1', 'head-1']);
  });

  it('markUserEdits leaves a draft alone when no found part changed', () => {
    const d = applyDetection(answer())(empty())!.draft;
    expect(markUserEdits(d, { ...d })).toEqual(d);
  });
});

describe('the take-off file of a detection', () => {
  it('records which parts were found and which the engineer set, and reads them back', () => {
    const store = new Store(empty());
    store.dispatch(applyDetection(answer({ questions: ['A question left open.'] })));
    store.dispatch(movePoint('head-330', 1, [300, 158]));
    const { takeoff } = toTakeoffFile(store.draft);
    expect(takeoff.detected).toEqual({ by: BY, questions: ['A question left open.'] });
    expect(takeoff.panels[0]).toMatchObject({ id: 'head', origin: 'detected', confidence: 0.9, quantity: 'head' });
    expect(takeoff.traces.map((t) => [t.id, t.origin, t.confidence])).toEqual([['head-330', 'user', undefined], ['head-310', 'detected', 0.8]]);
    const back = fromTakeoffFile(JSON.parse(JSON.stringify(takeoff)), { name: 'invented.pdf', kind: 'pdf', mime: 'application/pdf', page: 1, pageCount: 1, width: 600, height: 800 });
    expect(toTakeoffFile(back).takeoff).toEqual(takeoff);
  });
});

describe('the questions of the detector', () => {
  it('are answered by the family labels, or by the iso levels for iso-lines', () => {
    expect(answerKind('The sheet names no impeller diameters for the 4 head curves of panel "head"; give them as "diameters" in the take-off file.')).toBe('labels');
    expect(answerKind('2 iso-lines on panel "head" (starting at 120 m3/h) carry no "%" label; give every level drawn as "iso_levels".')).toBe('iso');
    // A scan's iso-lines left without a level take the levels typed (or are traced by hand); questions
    // that ask for work by hand only take no typed answer.
    expect(answerKind('Some curves need you: (1) 1 of the 3 lines on panel "head" that start neither at the flow axis nor at the bottom (iso-lines, or pieces of a curve the finder broke) has no level (no "%" label read on it, and the order of the lines does not tell it) (levels read: 64 %, 68 %); it is left out, and the levels of the others are unsure (their efficiency rests on part of the crossings): look at them; give every efficiency level drawn as iso-lines ("iso_levels" in the take-off file), or trace what is missing by hand with its level. (2) A power curve on panel "power" ending at 113.3 m3/h does not end where exactly one head curve ends (nearest: the 345 head curve, ending at 166.2 m3/h); it is left out: trace it by hand with its diameter.')).toBe('iso');
    expect(answerKind('Some curves need you: (1) A power curve on panel "power" ending at 113.3 m3/h does not end where exactly one head curve ends (nearest: the 345 head curve, ending at 166.2 m3/h); it is left out: trace it by hand with its diameter. (2) On panel "npshr" no NPSHr curve was found for 330: trace it by hand if the sheet draws it.')).toBe('none');
    expect(answerKind('The frame at [10, 20, 300, 400] could not be calibrated from its tick labels; place its anchors by hand.')).toBe('none');
    // The flow unit is set with the sheet's units, not typed as diameters.
    expect(answerKind('The flow titles "Flow Q (mam)" of panel "head", "Flow Q (m3/m)" of panel "power" name a unit this tool does not know; the take-off\'s flow unit m3/h is used. Is that the sheet\'s?')).toBe('none');
    // What a panel plots is set on the panel, not typed as diameters.
    expect(answerKind('What does the panel at [183, 256, 1600, 889] plot (its left axis title was not read)? Set its quantity (head, efficiency, power or NPSHr) on the panel.')).toBe('none');
    // A doubted label is answered with the values the sheet prints.
    expect(answerKind('The label "328 mm" at [332, 407] (59 of 100) was read with little certainty; its head curve and the curves named after it are proposed unsure. Is 328 what the sheet prints?')).toBe('labels');
    expect(answerKind('The efficiency read from the iso-lines of panel "head" is left out until every iso-line there has its level; answer the questions about them, or trace them by hand.')).toBe('none');
    expect(answerKind('The head curve ending at [400, 300] has no label and ends at no head curve\'s flow; which diameter is it?')).toBe('labels');
    expect(readLevels('60 70, 75%')).toEqual([60, 70, 75]);
    expect(() => readLevels('60 120')).toThrow(/between 0 and 100/);
    expect(() => readLevels('')).toThrow(/efficiency levels/);
  });

  it('come one at a time, and an answer runs the detection again with it', async () => {
    const store = new Store(empty());
    const sent: Record<string, unknown>[] = [];
    const replies: DetectAnswer[] = [
      answer({ panels: [], traces: [], questions: ['The sheet names no impeller diameters for the 2 head curves of panel "head".', 'Another question.'], refused: 'Nothing could be named.' }),
      answer(),
    ];
    const worker = { call: async (_op: string, args: { document: Record<string, unknown> }) => { sent.push(args.document); return replies.shift(); } } as unknown as SheetWorkerClient;
    const steps: string[] = [];
    const detection = new Detection({ store, worker, pageReady: () => true, ocrBase: () => 'http://127.0.0.1/ocr/', requestRender: () => undefined, goto: (s) => steps.push(s) });
    await detection.run();
    expect(store.draft.traces).toHaveLength(0);
    expect(detection.question()).toMatchObject({ index: 0, count: 2, kind: 'labels', field: 'Impeller diameters (mm), largest first' });
    detection.skip();
    expect(detection.question()?.text).toBe('Another question.');
    detection.skip();
    expect(detection.question()).toBeNull();
    detection.reset();
    await detection.answer('250 x');
    expect(store.session.message?.text).toMatch(/"x" is not a diameter/);
    expect(sent).toHaveLength(1);
    await detection.answer('330, 310');
    expect(sent[1]).toMatchObject({ sheet: 'invented.pdf', page: 1, units: { diameter: 'mm' }, diameters: [330, 310] });
    expect(store.draft.traces.map((t) => t.diameter)).toEqual([330, 310]);
    expect(detection.question()).toBeNull();
    expect(steps).toEqual(['review']);
    // The answer is kept with the document: the file carries it, and the next detection uses it.
    expect(store.draft.labelsGiven).toBe(true);
    const file = toTakeoffFile(store.draft).takeoff;
    expect(file.diameters).toEqual([330, 310]);
    const back = fromTakeoffFile(JSON.parse(JSON.stringify(file)), { name: 'invented.pdf', kind: 'pdf', mime: 'application/pdf', page: 1, pageCount: 1, width: 600, height: 800 });
    expect(toTakeoffFile(back).takeoff).toEqual(file);
    replies.push(answer());
    await detection.run();
    expect(sent[2]).toMatchObject({ diameters: [330, 310] });
    expect(sent[2]).not.toHaveProperty('iso_levels');
  });

  it('keep the iso levels given in the document and in its file', async () => {
    const store = new Store(empty());
    const sent: Record<string, unknown>[] = [];
    const replies = [answer({ questions: ['2 iso-lines on panel "head" carry no "%" label; give every level drawn as "iso_levels".'] }), answer()];
    const worker = { call: async (_op: string, args: { document: Record<string, unknown> }) => { sent.push(args.document); return replies.shift(); } } as unknown as SheetWorkerClient;
    const detection = new Detection({ store, worker, pageReady: () => true, ocrBase: () => 'http://127.0.0.1/ocr/', requestRender: () => undefined, goto: () => undefined });
    await detection.run();
    expect(detection.question()).toMatchObject({ kind: 'iso', field: expect.stringMatching(/Efficiency levels/) });
    await detection.answer('70 80');
    expect(sent[1]).toMatchObject({ iso_levels: [70, 80] });
    expect(store.draft.iso_levels).toEqual([70, 80]);
    expect(toTakeoffFile(store.draft).takeoff.iso_levels).toEqual([70, 80]);
    store.undo();
    expect(store.draft.iso_levels).toBeUndefined();
  });

  it('is refused with a sentence before the page is read', async () => {
    const store = new Store(empty());
    const detection = new Detection({ store, worker: {} as SheetWorkerClient, pageReady: () => false, ocrBase: () => 'http://127.0.0.1/ocr/', requestRender: () => undefined, goto: () => undefined });
    await detection.run();
    expect(store.session.message).toMatchObject({ tone: 'caution', text: expect.stringMatching(/wait until its page is read/) });
  });

  it('on a scan whose text reader cannot be loaded, says so in the reader sentence and leaves the document as it was', async () => {
    const store = new Store(empty());
    const sent: { document: Record<string, unknown>; ocr: string }[] = [];
    const failing = new OcrUnavailableError('worker.min.js answered 404');
    const worker = { call: async (_op: string, args: { document: Record<string, unknown>; ocr: string }) => { sent.push(args); throw Object.assign(new Error(failing.message), { name: failing.name }); } } as unknown as SheetWorkerClient;
    const detection = new Detection({ store, worker, pageReady: () => true, ocrBase: () => 'http://127.0.0.1:8080/ocr/', requestRender: () => undefined, goto: () => undefined });
    const before = store.draft;
    await detection.run();
    expect(sent[0]?.ocr).toBe('http://127.0.0.1:8080/ocr/');
    expect(store.draft).toBe(before);
    expect(store.session.message).toMatchObject({ tone: 'caution', text: failing.message });
    expect(failing.message).toMatch(/^The text reader for scans could not be loaded from this server \(worker\.min\.js answered 404\), .*trace the curves by hand\.$/);
    expect(detection.running).toBe(false);
  });
});

describe('the units the sheet prints', () => {
  /** An invented US sheet found with its diameters converted into the record's millimetres (10.5 in = 266.7 mm). */
  const usAnswer = () => {
    const a = answer();
    a.panels[0]!.units = { x: 'gpm', y: 'ft' };
    a.traces.forEach((t, i) => Object.assign(t, { id: `head-${[266.7, 254][i]}`, diameter: [266.7, 254][i] }));
    return a;
  };

  it('are read from the found panels and the diameter labels, and only where every panel says the same', () => {
    const panels = [
      { origin: 'detected' as const, quantity: 'head' as const, units: { x: 'gpm', y: 'ft' } },
      { origin: 'detected' as const, quantity: 'power' as const, units: { x: 'gpm', y: 'hp' } },
      { origin: 'detected' as const, quantity: 'npshr' as const, units: { x: 'gpm' } },
    ];
    expect(sheetUnitsRead(panels, 'in')).toEqual({ flow: 'gpm', head: 'ft', power: 'hp', diameter: 'in' });
    // A flow title left unread on one panel leaves the flow unit open; user panels do not count.
    expect(sheetUnitsRead([...panels, { origin: 'detected', quantity: 'head', units: { y: 'ft' } }], null)).toEqual({ head: 'ft', power: 'hp' });
    expect(sheetUnitsRead([{ origin: 'user', quantity: 'head', units: { x: 'm3/h', y: 'm' } }], 'rpm')).toEqual({});
  });

  it("become the record's after a detection, the found diameters converted, as one undoable edit", () => {
    const store = new Store(empty());
    store.dispatch(applyDetection(usAnswer()));
    expect(store.draft.units.diameter).toBe('mm');
    expect(store.dispatch(adoptSheetUnits({ flow: 'gpm', head: 'ft', diameter: 'in' }))).toBe(true);
    const d = store.draft;
    expect([d.units.flow, d.units.head, d.units.diameter]).toEqual(['gpm', 'ft', 'in']);
    expect(d.traces.map((t) => [t.id, t.diameter, t.origin])).toEqual([['head-10.5', 10.5, 'detected'], ['head-10', 10, 'detected']]);
    expect(d.diameters).toEqual([10.5, 10]);
    store.undo();
    expect(store.draft.units.diameter).toBe('mm');
    expect(store.draft.traces.map((t) => t.diameter)).toEqual([266.7, 254]);
  });

  it('leave the record alone when the engineer set parts in its units, or when nothing differs', () => {
    const store = new Store(draftWithPanel({ diameters: [] }));
    store.dispatch(applyDetection(usAnswer()));
    expect(store.dispatch(adoptSheetUnits({ flow: 'gpm', diameter: 'in' }))).toBe(false);
    const same = new Store(empty());
    same.dispatch(applyDetection(answer()));
    expect(same.dispatch(adoptSheetUnits({ flow: 'm3/h', head: 'm', diameter: 'mm' }))).toBe(false);
  });
});

