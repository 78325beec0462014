/**
 * "Selection record" in the workbench: the same record PDF `pumpscribe report` writes, made by the
 * same code (src/record) from the take-off the review was computed from, its calibrations, the
 * curve set and the duty study on screen. pdf-lib is loaded only when the button is pressed.
 */
import { calibratePanels } from '../../digitize/calibration.ts';
import { h } from '../dom/h.ts';
import type { Bench } from '../app/bench.ts';
import type { Store } from '../store/store.ts';
import type { Derived } from '../app/bench.ts';
import type { DutyOutcome } from './dutyPanel.ts';

export type RecordPaper = 'a4' | 'letter';

/** The record's code (src/record and pdf-lib), loaded once, on first need. */
let recordCode: Promise<typeof import('../../record/makeRecord.ts')> | null = null;
function loadRecordCode() {
  recordCode ??= import('../../record/makeRecord.ts').catch((error: unknown) => {
    recordCode = null; // a failed load is tried again at the next click
    throw error;
  });
  return recordCode;
}

/** The buttons beside the study results; nothing until the study has a result. */
export function recordButtons(bench: Bench): HTMLElement | null {
  const outcome = bench.duty.outcome;
  if (!outcome || !('result' in outcome) || !bench.derived.takeoff) return null;
  // The study has a result: fetch the record's code while the engineer reads it, so the click only makes the PDF.
  void loadRecordCode().catch(() => undefined);
  return h('div', { class: 'record-download' },
    h('h4', null, 'Selection record'),
    h('p', { class: 'hint' }, 'A PDF to file with the project: the sheet with the system curves and operating points drawn on it, the ranked options, the family chart, the findings, NPSH and motor with their cautions, and the provenance.'),
    h('label', { class: 'toggle' },
      h('input', { type: 'checkbox', id: 'record-overlay', checked: bench.studyOnSheet, onchange: (e: Event) => bench.showStudyOnSheet((e.target as HTMLInputElement).checked) }),
      ' Show the study on the sheet (system curves, operating points, duty flow)'),
    h('button', { type: 'button', id: 'record-a4', onclick: () => bench.downloadRecord('a4') }, 'Selection record (A4)'),
    h('button', { type: 'button', id: 'record-letter', onclick: () => bench.downloadRecord('letter') }, 'Selection record (US Letter)'));
}

interface RecordSources {
  store: Store;
  derived: Derived;
  outcome: DutyOutcome;
  sheetBytes: { bytes: ArrayBuffer; name: string; sha256: string } | null;
}

/** Makes the record and hands it to the browser as a download; says what went wrong otherwise. */
export async function downloadRecord(src: RecordSources, paper: RecordPaper): Promise<void> {
  const { store, derived, outcome, sheetBytes } = src;
  const takeoff = derived.takeoff;
  const set = derived.curveSet;
  const ref = store.draft.sheet;
  if (!outcome || !('result' in outcome) || !takeoff || !set || !sheetBytes || !ref) {
    store.say('No record yet: open a sheet, trace it and type a duty so that the study has a result.', 'error');
    return;
  }
  store.say('Making the selection record…', 'info');
  try {
    const t0 = performance.now();
    const { calibrations } = calibratePanels(takeoff.panels);
    const { makeRecord } = await loadRecordCode();
    const loaded = performance.now() - t0;
    const now = new Date().toISOString();
    const { pdf } = await makeRecord({
      takeoff,
      takeoffName: `${sheetBytes.name.replace(/\.[^.]+$/, '')}.takeoff.json`,
      takeoffDate: now,
      sheet: { bytes: new Uint8Array(sheetBytes.bytes.slice(0)), name: sheetBytes.name, sha256: sheetBytes.sha256, page: ref.page, width: ref.width, height: ref.height },
      calibrations,
      curveSet: set,
      result: outcome.result,
      studyFile: 'the workbench study',
      paper,
      created: now,
    });
    const url = URL.createObjectURL(new Blob([pdf as BlobPart], { type: 'application/pdf' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = `${sheetBytes.name.replace(/\.[^.]+$/, '').replace(/[^\w.-]+/g, '-') || 'selection'}.record.pdf`;
    a.rel = 'noopener';
    document.body.append(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 10_000);
    store.say(`Downloaded the selection record (${paper === 'a4' ? 'A4' : 'US Letter'}, made in ${Math.round(performance.now() - t0)} ms, of which ${Math.round(loaded)} ms waiting for the record's code).`, 'done');
  } catch (error) {
    store.say(`No record was made: ${(error as Error).message}`, 'error');
  }
}
