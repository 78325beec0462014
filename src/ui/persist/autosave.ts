/**
 * Autosave in the browser (IndexedDB): the draft after every edit, and the sheet's bytes once
 * per sheet, so that a reload or a crash loses nothing. A failed write is reported, never
 * fatal: the draft in memory stays as it is.
 */
import { UserError } from '../../model/errors.ts';
import type { Draft } from '../store/draft.ts';
import type { Step, TraceTarget } from '../store/store.ts';

const DB_NAME = 'pumpscribe-workbench';
const DB_VERSION = 1;
const DRAFTS = 'drafts';
const SHEETS = 'sheets';
const CURRENT = 'current';

/** The saved record; `format` and `version` let a later workbench migrate it. */
export interface SavedWork {
  format: 'pumpscribe.autosave';
  version: 1;
  savedAt: string;
  draft: Draft;
  step: Step;
  target: TraceTarget;
  /** Key of the sheet's bytes in the sheet store. */
  sheetKey: string | null;
}

export interface SavedSheet {
  key: string;
  name: string;
  mime: string;
  bytes: ArrayBuffer;
}

/** Thrown when the browser refuses to keep the work; the message says what to do instead. */
export class AutosaveError extends UserError {
  override name = 'AutosaveError';
}

function open(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    if (typeof indexedDB === 'undefined') {
      reject(new AutosaveError('This browser offers no storage for autosave; download the take-off file to keep your work.'));
      return;
    }
    const request = indexedDB.open(DB_NAME, DB_VERSION);
    request.onupgradeneeded = () => {
      const db = request.result;
      if (!db.objectStoreNames.contains(DRAFTS)) db.createObjectStore(DRAFTS);
      if (!db.objectStoreNames.contains(SHEETS)) db.createObjectStore(SHEETS, { keyPath: 'key' });
    };
    request.onsuccess = () => resolve(request.result);
    request.onerror = () => reject(new AutosaveError(`The browser storage could not be opened (${request.error?.message ?? 'unknown reason'}); download the take-off file to keep your work.`));
  });
}

function run<T>(db: IDBDatabase, store: string, mode: IDBTransactionMode, body: (s: IDBObjectStore) => IDBRequest<T> | void): Promise<T | undefined> {
  return new Promise((resolve, reject) => {
    const tx = db.transaction(store, mode);
    let result: T | undefined;
    const request = body(tx.objectStore(store));
    if (request) request.onsuccess = () => (result = request.result);
    tx.oncomplete = () => resolve(result);
    tx.onerror = () => reject(new AutosaveError(`Autosave failed (${tx.error?.message ?? 'unknown reason'}); your work is still on screen — download the take-off file to keep it.`));
    tx.onabort = () => reject(new AutosaveError(`Autosave was refused (${tx.error?.message ?? 'storage full?'}); your work is still on screen — download the take-off file to keep it.`));
  });
}

export class Autosave {
  private db: Promise<IDBDatabase> | null = null;
  private pending: SavedWork | null = null;
  private writing: Promise<void> | null = null;

  private database(): Promise<IDBDatabase> {
    this.db ??= open();
    return this.db;
  }

  async saveSheet(sheet: SavedSheet): Promise<void> {
    const db = await this.database();
    await run(db, SHEETS, 'readwrite', (s) => {
      s.clear();
      return s.put(sheet);
    });
  }

  async loadSheet(key: string): Promise<SavedSheet | null> {
    const db = await this.database();
    return ((await run<SavedSheet>(db, SHEETS, 'readonly', (s) => s.get(key))) as SavedSheet | undefined) ?? null;
  }

  /**
   * Queues the work for writing; writes coalesce so that a burst of edits costs one write.
   * Resolves when this state (or a later one) is on disk; rejects with AutosaveError.
   */
  save(work: SavedWork): Promise<void> {
    this.pending = work;
    if (!this.writing) {
      this.writing = (async () => {
        try {
          const db = await this.database();
          while (this.pending) {
            const next = this.pending;
            this.pending = null;
            await run(db, DRAFTS, 'readwrite', (s) => s.put(next, CURRENT));
          }
        } finally {
          this.writing = null;
        }
      })();
    }
    return this.writing;
  }

  async load(): Promise<SavedWork | null> {
    const db = await this.database();
    const saved = (await run<SavedWork>(db, DRAFTS, 'readonly', (s) => s.get(CURRENT))) as SavedWork | undefined;
    if (!saved || saved.format !== 'pumpscribe.autosave' || saved.version !== 1) return null;
    return saved;
  }

  async clear(): Promise<void> {
    const db = await this.database();
    await run(db, DRAFTS, 'readwrite', (s) => s.delete(CURRENT));
    await run(db, SHEETS, 'readwrite', (s) => s.clear());
  }

  /** Waits until everything queued is written. */
  async flush(): Promise<void> {
    while (this.writing) await this.writing;
  }
}
