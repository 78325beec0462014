/**
 * Getting a sheet onto the workbench: opening a PDF or image (or a take-off file with its
 * sheet), picking the page, reading it in the worker, restoring autosaved work, and keeping
 * the autosave up to date. A bad file is refused with a sentence; the draft on screen is
 * never replaced until the new sheet has been read successfully.
 */
import { ZodError } from 'zod';
import { describeZodError } from '../../model/errors.ts';
import { choosePage, newSheetDraft, readFromSheet } from '../store/actions/setup.ts';
import { readHints, type TextItem } from '../geometry/hints.ts';
import type { Draft, SheetRef } from '../store/draft.ts';
import { pointsOf } from '../store/draft.ts';
import { fromTakeoffFile } from '../store/takeoffFile.ts';
import { unitSystemOf, type Step } from '../store/store.ts';
import { isStep } from '../steps/registry.ts';
import { AUTOSAVE_FORMAT, AUTOSAVE_VERSION, chooseOffer, type SavedDocument } from '../persist/records.ts';
import type { LoadedSheet } from './bench.ts';
import type { Store } from '../store/store.ts';
import type { SheetCanvas } from '../canvas/sheetCanvas.ts';
import type { Autosave } from '../persist/autosave.ts';
import type { SheetWorkerClient } from '../worker/client.ts';
import { captureContext } from './captureContext.ts';

/** What getting a sheet onto the workbench needs of it. */
export interface SheetFlowHost {
  readonly store: Store;
  /** The worker that traces, and the one that replays the review. */
  readonly worker: SheetWorkerClient;
  readonly reviewWorker: SheetWorkerClient;
  readonly canvas: Pick<SheetCanvas, 'clear' | 'showPage'>;
  readonly autosave: Autosave;
  /** What the top bar says about autosave. */
  autosaved: string;
  refreshDerived(): void;
  requestRender(): void;
}

interface SheetBytes {
  bytes: ArrayBuffer;
  name: string;
  mime: string;
  sha256: string;
}

function mimeOf(file: File): string {
  if (file.type) return file.type;
  if (/\.pdf$/i.test(file.name)) return 'application/pdf';
  if (/\.png$/i.test(file.name)) return 'image/png';
  if (/\.jpe?g$/i.test(file.name)) return 'image/jpeg';
  return 'application/octet-stream';
}

function baseName(path: string): string {
  return path.split(/[\\/]/).pop() ?? path;
}

export class SheetFlow {
  sheet: LoadedSheet | null = null;
  private bytes: SheetBytes | null = null;
  /** The text layer of the chosen page (empty for scans). */
  words: TextItem[] = [];
  /** What the loader said of the page shown (e.g. a big scan read at a reduced resolution). */
  private pageNotes: readonly string[] = [];
  /** True while autosaved work is being restored. */
  restoring = false;
  /** True once the worker has read the chosen page (captures and snapping work from then on). */
  pageReady = false;

  constructor(private readonly bench: SheetFlowHost) {}

  private get store() {
    return this.bench.store;
  }

  private progress(label: string | null, fraction: number | null = null): void {
    this.store.setSession({ progress: label === null ? null : { label, fraction } });
  }

  async openFiles(files: readonly File[]): Promise<void> {
    const json = files.find((f) => /\.json$/i.test(f.name) || f.type === 'application/json');
    const sheetFile = files.find((f) => f !== json);
    try {
      if (json) {
        let raw: unknown;
        try {
          raw = JSON.parse(await json.text());
        } catch (error) {
          throw new Error(`"${json.name}" is not valid JSON (${(error as Error).message}); choose a take-off file written by Pumpscribe.`);
        }
        const wanted = typeof (raw as { sheet?: unknown })?.sheet === 'string' ? baseName((raw as { sheet: string }).sheet) : null;
        if (sheetFile) {
          await this.openSheet(sheetFile, { takeoff: raw, takeoffName: json.name });
        } else if (this.bytes && wanted === this.bytes.name) {
          await this.openBytes(this.bytes, { takeoff: raw, takeoffName: json.name });
        } else {
          this.store.say(`Open the take-off file together with its sheet${wanted ? ` "${wanted}"` : ''}: choose both files at once, or drop both.`, 'error');
        }
        return;
      }
      if (sheetFile) await this.openSheet(sheetFile, {});
    } catch (error) {
      this.progress(null);
      const message = error instanceof ZodError ? describeZodError(error, 'The take-off file') : (error as Error).message;
      this.store.say(`${message} Nothing on the workbench was changed.`, 'error');
    }
  }

  private async openSheet(file: File, options: { takeoff?: unknown; takeoffName?: string }): Promise<void> {
    const bytes = await file.arrayBuffer();
    await this.openBytes({ bytes, name: file.name, mime: mimeOf(file), sha256: '' }, options);
  }

  /**
   * Opens sheet bytes in the worker; on success the sheet is replaced, and with it the document:
   * a new sheet or a take-off file starts a new document (a fresh id, no library entry), a
   * restore brings back the kept one.
   */
  async openBytes(sheet: SheetBytes, options: { takeoff?: unknown; takeoffName?: string; restore?: SavedDocument }): Promise<void> {
    this.progress(`Opening ${sheet.name}`);
    const [opened] = await Promise.all([
      this.bench.worker.call('open', { bytes: sheet.bytes.slice(0), mime: sheet.mime, name: sheet.name }, (p) => this.progress(p.label, p.fraction)),
      this.bench.reviewWorker.call('open', { bytes: sheet.bytes.slice(0), mime: sheet.mime, name: sheet.name }),
    ]);
    const kept = { ...sheet, sha256: opened.sha256 };
    const pageCount = opened.pages.length;
    const pageSize = (page: number) => opened.pages[page - 1] ?? opened.pages[0] ?? { width: 1, height: 1 };
    const opening = (page: number): Omit<SheetRef, 'path'> => ({ name: sheet.name, sha256: opened.sha256, kind: opened.kind, mime: sheet.mime, page, pageCount, width: pageSize(page).width, height: pageSize(page).height });

    let draft: Draft | null = null;
    let step: Step = 'axes';
    const cautions: string[] = [];
    if (options.takeoff !== undefined) {
      const rebuilt = fromTakeoffFile(options.takeoff, opening(1));
      const wanted = rebuilt.sheet?.page ?? 1;
      const page = Math.min(wanted, pageCount);
      if (page !== wanted) cautions.push(`The take-off file names page ${wanted}, but the sheet has ${pageCount}; page ${page} is shown.`);
      draft = { ...rebuilt, sheet: { ...opening(page), path: rebuilt.sheet?.path ?? sheet.name } };
      if (rebuilt.sheet_sha256 && rebuilt.sheet_sha256 !== opened.sha256) cautions.push('This sheet is not the one the take-off file was captured from (its SHA-256 differs): check that the anchors and guides still sit on its lines.');
      step = 'review';
    } else if (options.restore) {
      draft = options.restore.draft;
      // A record kept by a workbench with other steps opens at the axes.
      step = isStep(options.restore.step) ? options.restore.step : 'axes';
    }
    // Only now, with the new sheet readable, does anything on the workbench change. The document
    // on screen is written first, before the new one takes its place.
    void this.bench.autosave.writeScheduled();
    this.pageReady = false;
    this.canvas().clear();
    this.bytes = kept;
    this.sheet = { name: sheet.name, mime: sheet.mime, kind: opened.kind, pages: opened.pages, thumbnails: new Map(), loadedKind: null, texts: 0 };
    if (options.restore && draft) {
      const r = options.restore;
      this.store.replace(draft, { step, target: r.target, unitSystem: r.unitSystem }, { id: r.id, library: r.library });
    } else {
      this.store.newDocument(draft ?? newSheetDraft({ ...opening(1), path: sheet.name }, sheet.name.replace(/\.[^.]+$/, ''), this.store.draft));
      void this.bench.autosave.claim(this.store.doc.id);
    }
    void this.bench.autosave.saveSheet({ key: opened.sha256, name: sheet.name, mime: sheet.mime, bytes: sheet.bytes }).catch((e: Error) => this.store.say(e.message, 'caution'));
    if (pageCount > 1) void this.makeThumbnails();
    if (draft || pageCount === 1) {
      await this.showPage(this.store.draft.sheet?.page ?? 1);
      this.store.setSession({ step: draft ? step : 'axes', drawingFrame: !draft || this.store.draft.panels.length === 0, activePanel: null });
      if (options.takeoff !== undefined) await this.captureMissing();
      if (draft) this.store.say(`Opened ${options.takeoffName ?? sheet.name}: ${this.store.draft.traces.length} traces on ${this.store.draft.panels.length} panels.${cautions.length ? ` ${cautions.join(' ')}` : ''}`, cautions.length ? 'caution' : 'done');
      else this.takeHints(sheet.name);
    } else {
      this.progress(null);
      this.store.setSession({ step: 'load' });
      this.store.say(`${sheet.name} has ${pageCount} pages: pick the one with the curves.`, 'info');
    }
  }

  private canvas() {
    return this.bench.canvas;
  }

  async choosePage(page: number): Promise<void> {
    const size = this.sheet?.pages[page - 1];
    if (!size) return;
    if (this.store.draft.sheet?.page !== page) {
      if (!this.store.dispatch(choosePage(page, size.width, size.height))) return;
    }
    await this.showPage(page);
    this.store.setSession({ step: 'axes', drawingFrame: true, activePanel: null });
    this.takeHints(this.sheet?.name ?? 'the sheet');
  }

  /** Prefills speed, diameters and units from the text of a vector page, and says what was read. */
  private takeHints(name: string): void {
    const hints = readHints(this.words);
    const found = { ...(hints.speed_rpm ? { speed_rpm: hints.speed_rpm } : {}), ...(hints.diameters ? { diameters: hints.diameters } : {}), units: { ...hints.units, ...(hints.diameterUnit ? { diameter: hints.diameterUnit } : {}) } };
    const read: string[] = [];
    if (this.store.dispatch(readFromSheet(found))) {
      const d = this.store.draft;
      // The review starts in the units the sheet is drawn in.
      this.store.setSession({ unitSystem: unitSystemOf(d) });
      if (hints.speed_rpm) read.push(`${d.pump.speed_rpm} rpm`);
      if (hints.diameters) read.push(`diameters ${d.diameters.join(' ')} ${d.units.diameter}`);
      if (hints.units) read.push(`flow in ${d.units.flow}, head in ${d.units.head}, power in ${d.units.power}`);
    }
    // The automatic take-off is offered once, here (vector pages and scans); the button stays in step 2.
    const next = 'Click “Find panels and curves” to have them found, or draw the frame of the head panel.';
    const notes = this.pageNotes.length > 0 ? ` ${this.pageNotes.join(' ')}` : '';
    this.store.say(`${read.length ? `Loaded ${name}. Read from the sheet: ${read.join('; ')} — check them. ${next}` : `Loaded ${name}. Choose the units on the sheet, then ${next.charAt(0).toLowerCase()}${next.slice(1)}`}${notes}`, notes ? 'caution' : 'done');
  }

  private async showPage(page: number): Promise<void> {
    const sheet = this.sheet;
    const size = sheet?.pages[page - 1];
    if (!sheet || !size) return;
    this.pageReady = false;
    try {
      await this.canvas().showPage({ page, width: size.width, height: size.height, kind: sheet.kind }, (label, fraction) => this.progress(label, fraction));
      const [read] = await Promise.all([
        this.bench.worker.call('prepare', { page }, (p) => this.progress(p.label, p.fraction)),
        this.bench.reviewWorker.call('prepare', { page }),
      ]);
      sheet.loadedKind = read.kind;
      sheet.texts = read.texts;
      // A big scan read at a reduced resolution is said, as the command line says it.
      this.pageNotes = read.notes;
      if (read.notes.length > 0) this.store.say(read.notes.join(' '), 'caution');
      this.words = read.texts > 0 ? await this.bench.worker.call('words', {}) : [];
      this.pageReady = true;
      this.bench.refreshDerived();
    } finally {
      this.progress(null);
    }
  }

  private async makeThumbnails(): Promise<void> {
    const sheet = this.sheet;
    if (!sheet) return;
    for (let n = 1; n <= sheet.pages.length && this.sheet === sheet; n++) {
      try {
        const { bitmap } = await this.bench.worker.call('thumbnail', { page: n, size: 160 });
        const canvas = document.createElement('canvas');
        canvas.width = bitmap.width;
        canvas.height = bitmap.height;
        canvas.getContext('2d')?.drawImage(bitmap, 0, 0);
        bitmap.close();
        sheet.thumbnails.set(n, canvas.toDataURL('image/png'));
        this.bench.requestRender();
      } catch {
        // A page that cannot be drawn small still has its button.
      }
    }
  }

  /** Traces of a take-off file that carry guides only get their points now, in the worker. */
  private async captureMissing(): Promise<void> {
    const missing = this.store.draft.traces.filter((t) => pointsOf(t).length === 0 && t.guides.length > 0);
    for (const [i, t] of missing.entries()) {
      this.progress(`Tracing ${i + 1} of ${missing.length}`, i / missing.length);
      try {
        const answer = await this.bench.worker.call('capture', { guides: t.guides.map((g) => [g[0], g[1]]), method: t.method, ...(t.extent ? { extent: t.extent } : {}), ...captureContext(this.store.draft, t.panel, t.id) });
        const draft = this.store.draft;
        this.store.dispatch(() => ({ draft: { ...draft, traces: draft.traces.map((x) => (x.id === t.id ? { ...x, captured: answer.points } : x)) }, label: 'capture', undoable: false }));
        if (answer.doubts.length) this.store.say(`Trace ${t.id}: ${answer.doubts.join(' ')}`, 'caution');
      } catch (error) {
        this.store.say(`Trace ${t.id}: ${(error as Error).message}`, 'caution');
      }
    }
    this.progress(null);
  }

  /** The record autosave keeps of the document on screen now. */
  private savedDocument(): SavedDocument | null {
    const { draft, session, doc } = this.store;
    if (!draft.sheet) return null;
    return { format: AUTOSAVE_FORMAT, version: AUTOSAVE_VERSION, id: doc.id, savedAt: new Date().toISOString(), draft, library: doc.library, step: session.step, target: session.target, unitSystem: session.unitSystem, sheetKey: this.bytes?.sha256 ?? null };
  }

  /** Keeps this document in the browser, under its own id, a moment after the last change. */
  autosaveNow(): void {
    this.bench.autosave.schedule(() => this.savedDocument(), (error) => {
      if (error) {
        this.bench.autosaved = 'Not kept in this browser';
        this.store.say(error.message, 'error');
      } else {
        this.bench.autosaved = `Kept in this browser at ${new Date().toLocaleTimeString()}`;
      }
      this.bench.requestRender();
    });
  }

  /**
   * On start: the kept document to offer — the one this tab had before a reload, else the most
   * recent one that no other tab has open. The offered document is taken for this tab at once,
   * so that another tab opened meanwhile is not offered it too.
   */
  async offerRestore(): Promise<SavedDocument | null> {
    try {
      const autosave = this.bench.autosave;
      let tabDocument = autosave.tabDocument();
      // A reloaded page waits a moment for its previous page to let go of the document. A
      // duplicated tab inherits the id of a document its original still has open: it is then
      // offered another one.
      if (tabDocument && !(await autosave.claim(tabDocument, 3000))) tabDocument = null;
      const docs = await autosave.list();
      const offer = chooseOffer(docs, { tabDocument, heldElsewhere: await autosave.heldElsewhere() });
      if (!offer) return null;
      if (offer.id !== tabDocument && !(await autosave.claim(offer.id))) return null;
      void autosave.prune().catch(() => undefined);
      return offer;
    } catch {
      return null;
    }
  }

  /** The other kept take-offs no other tab has open, newest first (at most `limit`). */
  async otherKept(except: string, limit = 8): Promise<SavedDocument[]> {
    try {
      const held = await this.bench.autosave.heldElsewhere();
      const docs = await this.bench.autosave.list();
      return docs.filter((d) => d.id !== except && d.draft.sheet !== null && d.sheetKey !== null && !held.has(d.id)).slice(0, limit);
    } catch {
      return [];
    }
  }

  async restore(saved: SavedDocument): Promise<void> {
    const sheet = saved.sheetKey ? await this.bench.autosave.loadSheet(saved.sheetKey) : null;
    if (!sheet) {
      this.store.say('The autosaved sheet could not be found in this browser; open the sheet again to continue.', 'error');
      return;
    }
    this.restoring = true;
    try {
      if (!(await this.bench.autosave.claim(saved.id))) {
        this.store.say('This take-off is open in another tab; continue there, or close that tab first.', 'error');
        return;
      }
      await this.openBytes({ bytes: sheet.bytes, name: sheet.name, mime: sheet.mime, sha256: sheet.key }, { restore: saved });
      this.store.say(`Restored the take-off of ${sheet.name}: ${saved.draft.traces.length} traces, ${saved.draft.traces.reduce((s, t) => s + pointsOf(t).length, 0)} points.`, 'done');
    } catch (error) {
      this.progress(null);
      this.store.say(`The autosaved work could not be restored: ${(error as Error).message}`, 'error');
    } finally {
      this.restoring = false;
    }
  }

  /** The sheet file's name and bytes, for saving to the library. */
  get sheetBytes(): SheetBytes | null {
    return this.bytes;
  }
}
