/**
 * Step 5: the files the take-off produces, written by the same functions the command line
 * uses, and "Save to the library" through the library's HTTP API (sheet, curve set, take-off).
 */
import { stringifyCurveSet } from '../../model/curvesetIO.ts';
import { curveSetToCsv } from '../../export/csvTable.ts';
import { toTakeoffFile } from '../store/takeoffFile.ts';
import type { Workbench } from './workbench.ts';

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

async function answer(response: Response): Promise<unknown> {
  const body = await response.json().catch(() => ({}));
  if (!response.ok) {
    const message = (body as { error?: string; message?: string }).error ?? (body as { message?: string }).message ?? `HTTP ${response.status}`;
    throw new Error(message);
  }
  return body;
}

export class Downloads {
  /** The library entry this take-off was saved to, so that saving again adds a revision. */
  private libraryId: string | null = null;

  constructor(private readonly bench: Workbench) {}

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
        store.say(`Downloaded the CSV table in ${store.session.unitSystem.toUpperCase()} units.`, 'done');
      }
    } catch (error) {
      store.say(`Nothing was downloaded: ${(error as Error).message}`, 'error');
    }
  }

  async saveToLibrary(): Promise<void> {
    const { store, derived } = this.bench;
    const set = derived.curveSet;
    const sheet = this.bench.flow.sheetBytes;
    if (!set) {
      store.say(derived.problem ?? 'There is no curve set to save yet.', 'error');
      return;
    }
    this.bench.library = { state: 'saving', text: 'Saving to the library…' };
    this.bench.requestRender();
    try {
      if (sheet) {
        await answer(await fetch(`api/sheets?name=${encodeURIComponent(sheet.name)}`, { method: 'POST', headers: { 'content-type': sheet.mime.startsWith('image/') || sheet.mime === 'application/pdf' ? sheet.mime : 'application/octet-stream' }, body: sheet.bytes }));
      }
      const body = stringifyCurveSet(set);
      let saved: { id: string; revision: number };
      if (this.libraryId) {
        saved = (await answer(await fetch(`api/curvesets/${encodeURIComponent(this.libraryId)}`, { method: 'PUT', headers: { 'content-type': 'application/json' }, body }))) as typeof saved;
      } else {
        saved = (await answer(await fetch('api/curvesets', { method: 'POST', headers: { 'content-type': 'application/json' }, body }))) as typeof saved;
      }
      this.libraryId = saved.id;
      if (sheet && derived.takeoff) {
        await answer(await fetch(`api/sheets/${sheet.sha256}/takeoffs?name=${encodeURIComponent(`${this.stem()}.takeoff.json`)}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(derived.takeoff) }));
      }
      this.bench.library = { state: 'saved', text: `Saved to the library as ${saved.id}, revision ${saved.revision}.` };
      store.say(this.bench.library.text, 'done');
    } catch (error) {
      this.bench.library = { state: 'failed', text: `Not saved to the library: ${(error as Error).message}. Your work is still here; download the files to keep them.` };
      store.say(this.bench.library.text, 'error');
    }
    this.bench.requestRender();
  }
}
