/**
 * "Find panels and curves": runs the automatic take-off (src/digitize/detect) on the chosen
 * page in the sheet worker — a vector page, or a scan whose tick labels the browser's character
 * reader reads (src/digitize/loaders/ocrBrowser.ts, files served from the workbench's own ocr/
 * folder) — with progress on the status line, and puts what it found into the document as one
 * undoable edit. When the reader's files cannot be loaded, one sentence says so and the
 * engineer goes on by hand. The detector's questions are asked one at a time; an
 * answer (the family's labels, or the iso levels drawn) runs the labelling again.
 */
import { speedNotGiven } from '../views/words.ts';
import { TAKEOFF_FORMAT, TAKEOFF_VERSION } from '../../model/takeoff.ts';
import { readDecimal } from '../../units/readNumber.ts';
import { adoptSheetUnits, applyDetection, answerKind, type AnswerKind, type DetectionGiven } from '../store/actions/detected.ts';
import { EditError } from '../store/actions/action.ts';
import { parseDiameterList, readFromSheet } from '../store/actions/setup.ts';
import { speedDisagrees, speedMismatchSentence } from '../../digitize/detect/sheetSpeed.ts';
import { familyLabels, type Draft } from '../store/draft.ts';
import { unitSystemOf, type Store } from '../store/store.ts';
import type { SheetWorkerClient } from '../worker/client.ts';

export interface DetectionHost {
  readonly store: Store;
  readonly worker: SheetWorkerClient;
  /** True once the worker has read the chosen page (a vector page or a scan). */
  pageReady(): boolean;
  /** Absolute URL of the folder the character reader of scans loads its files from. */
  ocrBase(): string;
  requestRender(): void;
  /** Opens a step of the workbench (the review, once everything was found). */
  goto(step: 'review'): void;
}

/** The question on screen: its text, its place in the list, and what answers it. */
export interface OpenQuestion {
  text: string;
  index: number;
  count: number;
  kind: AnswerKind;
  /** What the field asks for, e.g. "Impeller diameters (mm), largest first"; empty when nothing typed answers it (kind "none"). */
  field: string;
}

export class Detection {
  /** True while the detector runs. */
  running = false;
  /** Index of the question on screen among the document's questions. */
  private index = 0;

  constructor(private readonly host: DetectionHost) {}

  get available(): boolean {
    return this.host.pageReady();
  }

  /** Forgets the answers and the question shown: a new sheet or page. */
  reset(): void {
    this.index = 0;
  }

  question(): OpenQuestion | null {
    const { draft } = this.host.store;
    const list = draft.detected?.questions ?? [];
    if (list.length === 0 || this.index >= list.length) return null;
    const text = list[this.index] as string;
    const kind = answerKind(text);
    const field = kind === 'none'
      ? ''
      : kind === 'iso'
      ? 'Efficiency levels drawn (%), e.g. 60 70 75 80'
      : draft.family === 'speed' ? 'Speeds drawn (rpm), fastest first' : `Impeller diameters (${draft.units.diameter}), largest first`;
    return { text, index: this.index, count: list.length, kind, field };
  }

  /** Shows the next question without answering this one. */
  skip(): void {
    this.index += 1;
    this.host.requestRender();
  }

  /**
   * The minimal take-off the detector completes: the sheet, the pump, the units, and the answers
   * given (now, or kept in the document from an earlier answer).
   */
  private document(draft: Draft, given: DetectionGiven): Record<string, unknown> {
    if (!draft.sheet) throw new EditError('Load a sheet first.');
    const labels = given.labels ?? (draft.labelsGiven && familyLabels(draft).length ? familyLabels(draft) : undefined);
    const iso = given.iso ?? draft.iso_levels;
    return {
      format: TAKEOFF_FORMAT,
      version: TAKEOFF_VERSION,
      sheet: draft.sheet.path,
      page: draft.sheet.page,
      pump: { ...draft.pump, name: draft.pump.name.trim() || 'Unnamed pump' },
      units: { ...draft.units },
      ...(labels ? { [draft.family === 'speed' ? 'speeds' : 'diameters']: [...labels] } : {}),
      ...(iso ? { iso_levels: [...iso] } : {}),
    };
  }

  /** Runs the detector and puts what it found into the document (one undoable edit). */
  async run(given: DetectionGiven = {}): Promise<void> {
    const { store } = this.host;
    if (this.running) return;
    if (!this.available) {
      store.say('Open a sheet and wait until its page is read; then find the panels and curves, or draw the frames and trace the curves.', 'caution');
      return;
    }
    this.running = true;
    store.setSession({ busy: true, progress: { label: 'Finding panels and curves', fraction: 0 } });
    try {
      const found = await this.host.worker.call('detect', { document: this.document(store.draft, given), ocr: this.host.ocrBase() }, (p) => store.setSession({ progress: { label: p.label, fraction: p.fraction } }));
      this.index = 0;
      if (found.refused !== null && found.panels.length === 0) {
        store.dispatch((draft) => ({ draft: { ...draft, detected: { by: found.by, questions: found.questions } }, label: 'questions of the automatic take-off', undoable: false }));
        store.say(found.questions.length ? `Nothing could be named yet: answer the question below (${found.questions.length}).` : found.refused, 'caution');
        return;
      }
      store.dispatch(applyDetection(found, given));
      // The record takes the units the sheet prints while nothing of the engineer's is in it; the review follows.
      let unitWords = '';
      if (found.sheetUnits && store.dispatch(adoptSheetUnits(found.sheetUnits))) {
        const u = store.draft.units;
        store.setSession({ unitSystem: unitSystemOf(store.draft) });
        unitWords = ` Units taken from the sheet: flow ${u.flow}, head ${u.head}${u.power ? `, power ${u.power}` : ''}, diameter ${u.diameter}.`;
      }
      // The speed the scan prints fills in a speed not yet given; one that disagrees with the speed given is said.
      let speedWords = '';
      let speedOff = false;
      if (found.speedRead && !store.draft.speedGiven) {
        store.dispatch(readFromSheet({ speed_rpm: found.speedRead.rpm }));
        speedWords = ` The pump's speed, ${found.speedRead.rpm} rpm, was read from the sheet ("${found.speedRead.text}").`;
      } else if (found.speedRead && speedDisagrees(found.speedRead.rpm, store.draft.pump.speed_rpm)) {
        speedWords = ` ${speedMismatchSentence(found.speedRead, store.draft.pump.speed_rpm)}`;
        speedOff = true;
      }
      const curves = found.traces.filter((t) => t.iso === undefined).length;
      const isos = found.traces.length - curves;
      const kept = store.draft.traces.filter((t) => t.origin !== 'detected').length + store.draft.panels.filter((p) => p.origin !== 'detected').length;
      const asks = found.questions.length ? ` ${found.questions.length} question${found.questions.length === 1 ? '' : 's'} below.` : ' Check them in the review; correct any part with the usual tools.';
      if (found.questions.length === 0) this.host.goto('review');
      store.say(`Found ${found.panels.length} panel${found.panels.length === 1 ? '' : 's'}${isos ? ',' : ' and'} ${curves} curve${curves === 1 ? '' : 's'}${isos ? ` and ${isos} iso-line${isos === 1 ? '' : 's'}` : ''}${kept ? `; ${kept} part${kept === 1 ? '' : 's'} you set kept` : ''}.${asks}${unitWords}${speedWords}${store.draft.speedGiven ? '' : ` ${speedNotGiven(store.draft.pump.speed_rpm)}`}`, found.questions.length || !store.draft.speedGiven || speedOff ? 'caution' : 'done');
    } catch (error) {
      const e = error as Error;
      // The reader's own sentence says what is missing and that the sheet is read by hand.
      if (e.name === 'OcrUnavailableError') store.say(e.message, 'caution');
      else store.say(`Finding panels and curves failed: ${e.message}`, 'error');
    } finally {
      this.running = false;
      store.setSession({ busy: false, progress: null });
    }
  }

  /** Reads the answer to the question on screen and runs the labelling again with it. */
  async answer(text: string): Promise<void> {
    const q = this.question();
    if (!q || q.kind === 'none') return;
    let given: DetectionGiven;
    try {
      given = q.kind === 'iso' ? { iso: readLevels(text) } : { labels: parseDiameterList(text) };
    } catch (error) {
      this.host.store.say((error as Error).message, 'error');
      return;
    }
    await this.run(given);
  }
}

/** Efficiency levels typed as one list ("60 70 75 80"), each between 0 and 100 %. */
export function readLevels(text: string): number[] {
  const parts = text.split(/[\s,;%]+/).filter(Boolean);
  if (parts.length === 0) throw new EditError('Type the efficiency levels drawn, in %, separated by spaces, e.g. 60 70 75 80.');
  const values = parts.map((p) => readDecimal(p, 'An efficiency level', { sign: 'positive' }));
  const bad = values.find((v) => !(v < 100));
  if (bad !== undefined) throw new EditError(`${bad} % is not an efficiency level; each lies between 0 and 100 %.`);
  return [...new Set(values)].sort((a, b) => a - b);
}
