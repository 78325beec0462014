/**
 * Step 5: the files the take-off produces, written by the same functions the command line
 * uses, and "Save to the library" through the library's HTTP API (sheet, curve set, take-off).
 */
import { stringifyCurveSet } from '../../model/curvesetIO.ts';
import { curveSetToCsv } from '../../export/csvTable.ts';
import { toTakeoffFile } from '../store/takeoffFile.ts';
import type { Store } from '../store/store.ts';
import type { Derived } from './bench.ts';
import { chartUnits } from '../views/familyChart.ts';
import { choiceWords } from '../views/words.ts';

/** What the downloads and the library save need of the workbench. */
export interface DownloadsHost {
  readonly store: Store;
  readonly derived: Derived;
  /** The opened sheet's name, type, checksum and bytes. */
  readonly sheetBytes: { name: string; mime: string; sha256: string; bytes: ArrayBuffer } | null;
}

/** A file name made of the pump's (or sheet's) name: letters, digits and dashes only. */
export function fileStem(name: string): string {
  const stem = name.normalize('NFKD').replace(/[^\w.-]+/g, '-').replace(/^-+|-+$/g, '').replace(/\.(pdf|png|jpe?g)$/i, '');
  return stem || 'takeoff';
}

function save(text: string, name: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  a.rel = 'noopener';
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** A library answer that is not a success: its status, stable code and sentence. */
export class LibraryAnswerError extends Error {
  constructor(readonly status: number, readonly code: string | undefined, message: string) {
    super(message);
    this.name = 'LibraryAnswerError';
  }
}

async function answer(response: Response): Promise<unknown> {
  const body = await response.json().catch(() => ({}));
  if (!response.ok) {
    const b = body as { error?: string; message?: string; code?: string };
    throw new LibraryAnswerError(response.status, b.code, b.error ?? b.message ?? `HTTP ${response.status}`);
  }
  return body;
}

/**
 * The one sentence a refused library save shows, by the write contract: 409 another pump's
 * entry, 412 a newer revision saved meanwhile, 428 no revision named. Nothing was stored in each case.
 */
export function refusalSentence(error: unknown, entry: { id: string; revision: number } | null): { text: string; offerNew: boolean } {
  const keep = 'so nothing was stored; your work is still here';
  if (error instanceof LibraryAnswerError && entry) {
    const said = error.message.replace(/\.$/, '');
    // By the write contract a 409 is another pump's entry; the library's own sentence says why.
    if (error.status === 409) return { text: `Not saved to the library: entry ${entry.id} did not take this take-off as its next revision (${said}), ${keep} — save it as a new entry, or correct the pump's name, maker, model or size.`, offerNew: true };
    if (error.status === 412) return { text: `Not saved to the library: entry ${entry.id} has a newer revision than ${entry.revision}, saved from elsewhere (${said}), ${keep} — save it as a new entry, or open the newer revision first.`, offerNew: true };
    if (error.status === 428) return { text: `Not saved to the library: entry ${entry.id} wants to know which revision this save follows (${said}), ${keep} — save it as a new entry.`, offerNew: true };
  }
  return { text: `Not saved to the library: ${(error as Error).message.replace(/\.$/, '')}; your work is still here — download the files to keep them.`, offerNew: false };
}

export class Downloads {
  constructor(private readonly bench: DownloadsHost) {}

  private stem(): string {
    const { draft } = this.bench.store;
    return fileStem(draft.pump.name || draft.sheet?.name || 'takeoff');
  }

  /** File names the curve set's provenance refers to. */
  names(): { sheetFile: string; takeoffName: string } {
    return { sheetFile: this.bench.store.draft.sheet?.name ?? 'sheet', takeoffName: `${this.stem()}.takeoff.json` };
  }

  download(what: 'takeoff' | 'curveset' | 'csv'): void {
    const { store, derived } = this.bench;
    try {
      if (what === 'takeoff') {
        const { takeoff, omitted } = toTakeoffFile(store.draft);
        save(`${JSON.stringify(takeoff, null, 2)}\n`, `${this.stem()}.takeoff.json`, 'application/json');
        store.say(omitted.length ? `Downloaded the take-off file. Left out: ${omitted.join(' ')}` : 'Downloaded the take-off file. Keep it next to its sheet.', omitted.length ? 'caution' : 'done');
        return;
      }
      const set = derived.curveSet;
      if (!set) {
        store.say(derived.problem ?? 'There is no curve set yet: trace some curves first.', 'error');
        return;
      }
      if (what === 'curveset') {
        save(stringifyCurveSet(set), `${this.stem()}.curveset.json`, 'application/json');
        store.say('Downloaded the curve set.', 'done');
      } else {
        save(curveSetToCsv(set, { system: store.session.unitSystem }), `${this.stem()}.csv`, 'text/csv');
        store.say(`Downloaded the CSV table in ${choiceWords(store.session.unitSystem, chartUnits(set, store.session.unitSystem))}.`, 'done');
      }
    } catch (error) {
      store.say(`Nothing was downloaded: ${(error as Error).message}`, 'error');
    }
  }

  /**
   * Saves the curve set to the library: the first save of a document makes a new entry; later
   * saves add a revision to that entry, naming the revision they follow (`If-Match`), so that a
   * save never lands on another pump's entry or over a revision made elsewhere. The entry and
   * revision belong to the document (kept with it across reloads); `asNew` starts a new entry.
   */
  async saveToLibrary(asNew = false): Promise<void> {
    const { store, derived } = this.bench;
    const set = derived.curveSet;
    const sheet = this.bench.sheetBytes;
    if (!set) {
      store.say(derived.problem ?? 'There is no curve set to save yet.', 'error');
      return;
    }
    const doc = store.doc.id;
    const entry = asNew ? null : store.doc.library;
    store.setLibraryState({ state: 'saving', text: 'Saving to the library…' });
    try {
      if (sheet) {
        await answer(await fetch(`api/sheets?name=${encodeURIComponent(sheet.name)}`, { method: 'POST', headers: { 'content-type': sheet.mime.startsWith('image/') || sheet.mime === 'application/pdf' ? sheet.mime : 'application/octet-stream' }, body: sheet.bytes }));
      }
      const body = stringifyCurveSet(set);
      let saved: { id: string; revision: number };
      if (entry) {
        saved = (await answer(await fetch(`api/curvesets/${encodeURIComponent(entry.id)}`, { method: 'PUT', headers: { 'content-type': 'application/json', 'if-match': `"${entry.revision}"` }, body }))) as typeof saved;
      } else {
        saved = (await answer(await fetch('api/curvesets', { method: 'POST', headers: { 'content-type': 'application/json' }, body }))) as typeof saved;
      }
      // The answer belongs to the document that was saved, even if another one is open by now.
      if (store.doc.id !== doc) return;
      store.setLibrary({ id: saved.id, revision: saved.revision });
      if (sheet && derived.takeoff) {
        await answer(await fetch(`api/sheets/${sheet.sha256}/takeoffs?name=${encodeURIComponent(`${this.stem()}.takeoff.json`)}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(derived.takeoff) }));
      }
      const text = `Saved to the library as ${saved.id}, revision ${saved.revision}.`;
      store.setLibraryState({ state: 'saved', text });
      store.say(text, 'done');
    } catch (error) {
      if (store.doc.id !== doc) return;
      const { text, offerNew } = refusalSentence(error, entry);
      store.setLibraryState({ state: 'failed', text, offerNew });
      store.say(text, 'error');
    }
  }
}
