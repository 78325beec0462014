/**
 * Autosave in the browser (IndexedDB): every document under its own id, after every edit, and
 * each sheet's bytes once under its checksum, so that a reload or a crash loses nothing and
 * several take-offs are kept side by side.
 *
 * Several tabs: a tab writes only the documents it has open, and it holds a Web Lock named after
 * each one ("pumpscribe-document:<id>") for as long as it has it open. A tab is never offered a
 * document another tab holds, so two tabs never write one document; and nothing is deleted
 * while any tab holds it. A tab remembers its document in its session storage, which survives
 * a reload, so a reload offers the document that tab had.
 *
 * A failed write is reported, never fatal: the work in memory stays as it is.
 */
import { UserError } from '../../model/errors.ts';
import { documentsToPrune, migrateSaved, sheetsToPrune, type SavedDocument } from './records.ts';

export type { SavedDocument } from './records.ts';

const DB_NAME = 'pumpscribe-workbench';
/** 1: one slot ("drafts"/"current"); 2: one record per document. */
const DB_VERSION = 2;
const DOCUMENTS = 'documents';
const SHEETS = 'sheets';
const V1_DRAFTS = 'drafts';
const V1_CURRENT = 'current';
const LOCK_PREFIX = 'pumpscribe-document:';
const TAB_KEY = 'pumpscribe-document';

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

function newId(): string {
  return globalThis.crypto?.randomUUID?.() ?? `doc-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 12)}`;
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
      const tx = request.transaction as IDBTransaction;
      if (!db.objectStoreNames.contains(DOCUMENTS)) db.createObjectStore(DOCUMENTS, { keyPath: 'id' });
      if (!db.objectStoreNames.contains(SHEETS)) db.createObjectStore(SHEETS, { keyPath: 'key' });
      // Version 1 kept one draft in one slot: it becomes a document of its own.
      if (db.objectStoreNames.contains(V1_DRAFTS)) {
        const read = tx.objectStore(V1_DRAFTS).get(V1_CURRENT);
        read.onsuccess = () => {
          const doc = migrateSaved(read.result, newId);
          if (doc) tx.objectStore(DOCUMENTS).put(doc);
          db.deleteObjectStore(V1_DRAFTS);
        };
      }
    };
    request.onsuccess = () => {
      const db = request.result;
      // Another tab with a newer workbench needs the database: let it go rather than block it.
      db.onversionchange = () => db.close();
      resolve(db);
    };
    request.onblocked = () => reject(new AutosaveError('The browser storage is held by an older workbench in another tab; close or reload that tab, then reload this one.'));
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

interface LockManagerLike {
  request(name: string, options: { ifAvailable?: boolean; signal?: AbortSignal }, callback: (lock: unknown) => Promise<void> | void): Promise<unknown>;
  query(): Promise<{ held?: { name?: string }[] }>;
}

function locks(): LockManagerLike | null {
  return (globalThis.navigator as { locks?: LockManagerLike } | undefined)?.locks ?? null;
}

export class Autosave {
  private db: Promise<IDBDatabase> | null = null;
  /** Latest unwritten record per document. */
  private readonly pending = new Map<string, SavedDocument>();
  private writing: Promise<void> | null = null;
  /** The document this tab holds, and how to let it go. */
  private held: { id: string; release: () => void } | null = null;
  /** A write asked for and not yet made: the record is built when it is made, from the state then. */
  private scheduled: { build: () => SavedDocument | null; done: (error: Error | null) => void; timer: ReturnType<typeof setTimeout> } | null = null;

  private database(): Promise<IDBDatabase> {
    this.db ??= open();
    return this.db;
  }

  // ── the document of this tab ───────────────────────────────────────────────

  /** The document this tab had before a reload (kept in the tab's session storage). */
  tabDocument(): string | null {
    try {
      return sessionStorage.getItem(TAB_KEY);
    } catch {
      return null;
    }
  }

  /**
   * Takes a document for this tab: holds its lock (letting go of the one held before) and
   * remembers it for a reload. Answers false when another tab holds it; `waitMs` waits that
   * long for it (a reloaded page waits for its own previous page to let go).
   */
  async claim(id: string, waitMs = 0): Promise<boolean> {
    if (this.held?.id === id) return true;
    const manager = locks();
    let got = true;
    if (manager) {
      got = await new Promise<boolean>((resolve) => {
        const options = waitMs > 0 ? { signal: AbortSignal.timeout(waitMs) } : { ifAvailable: true };
        manager
          .request(`${LOCK_PREFIX}${id}`, options, (lock) => {
            if (!lock) {
              resolve(false);
              return;
            }
            const previous = this.held;
            return new Promise<void>((release) => {
              this.held = { id, release };
              previous?.release();
              resolve(true);
            });
          })
          .catch(() => resolve(false));
      });
    } else {
      this.held?.release();
      this.held = { id, release: () => undefined };
    }
    if (got) {
      try {
        sessionStorage.setItem(TAB_KEY, id);
      } catch {
        // No session storage: a reload then offers the most recent document instead.
      }
    }
    return got;
  }

  /** Lets go of this tab's document (it stays kept) and forgets it for a reload. */
  release(): void {
    this.held?.release();
    this.held = null;
    try {
      sessionStorage.removeItem(TAB_KEY);
    } catch {
      // Nothing to forget.
    }
  }

  /** Ids of the documents other tabs (or windows) have open now. */
  async heldElsewhere(): Promise<Set<string>> {
    const manager = locks();
    if (!manager) return new Set();
    const state = await manager.query().catch(() => ({ held: [] }));
    const ids = (state.held ?? []).flatMap((l) => (l.name?.startsWith(LOCK_PREFIX) ? [l.name.slice(LOCK_PREFIX.length)] : []));
    return new Set(ids.filter((id) => id !== this.held?.id));
  }

  // ── sheets ─────────────────────────────────────────────────────────────────

  /** Keeps a sheet's bytes under its checksum; other sheets stay (other documents may need them). */
  async saveSheet(sheet: SavedSheet): Promise<void> {
    const db = await this.database();
    await run(db, SHEETS, 'readwrite', (s) => s.put(sheet));
  }

  async loadSheet(key: string): Promise<SavedSheet | null> {
    const db = await this.database();
    return ((await run<SavedSheet>(db, SHEETS, 'readonly', (s) => s.get(key))) as SavedSheet | undefined) ?? null;
  }

  // ── documents ──────────────────────────────────────────────────────────────

  /**
   * Queues a document for writing under its own id; writes coalesce per document, so a burst of
   * edits costs one write. Resolves when this state (or a later one) is on disk; rejects with
   * AutosaveError.
   */
  save(doc: SavedDocument): Promise<void> {
    this.pending.set(doc.id, doc);
    if (!this.writing) {
      this.writing = (async () => {
        try {
          const db = await this.database();
          while (this.pending.size > 0) {
            const batch = [...this.pending.values()];
            this.pending.clear();
            await run(db, DOCUMENTS, 'readwrite', (s) => {
              for (const d of batch) s.put(d);
            });
          }
        } finally {
          this.writing = null;
        }
      })();
    }
    return this.writing;
  }

  /** One kept document, migrated to the current version; null when there is none (or it cannot be read). */
  async load(id: string): Promise<SavedDocument | null> {
    const db = await this.database();
    const raw = await run<unknown>(db, DOCUMENTS, 'readonly', (s) => s.get(id));
    return migrateSaved(raw, newId);
  }

  /** Every kept document that can be read, newest first. */
  async list(): Promise<SavedDocument[]> {
    const db = await this.database();
    const raw = ((await run<unknown[]>(db, DOCUMENTS, 'readonly', (s) => s.getAll())) ?? []) as unknown[];
    return raw.flatMap((r) => {
      const d = migrateSaved(r, newId);
      return d ? [d] : [];
    }).sort((a, b) => b.savedAt.localeCompare(a.savedAt));
  }

  /** Deletes the oldest documents beyond the number kept, and their sheets when no other document needs them; never one a tab has open. */
  async prune(): Promise<void> {
    await this.flush();
    const db = await this.database();
    const docs = await this.list();
    const open = await this.heldElsewhere();
    if (this.held) open.add(this.held.id);
    const drop = documentsToPrune(docs, { open });
    if (drop.length) await run(db, DOCUMENTS, 'readwrite', (s) => drop.forEach((id) => s.delete(id)));
    // Only the sheets of the documents deleted now: a sheet another tab has just kept may not
    // have its document written yet.
    const kept = docs.filter((d) => !drop.includes(d.id));
    const unused = sheetsToPrune(docs.filter((d) => drop.includes(d.id)).flatMap((d) => (d.sheetKey ? [d.sheetKey] : [])), kept);
    if (unused.length) await run(db, SHEETS, 'readwrite', (s) => unused.forEach((k) => s.delete(k)));
  }

  /**
   * Asks for a write a moment from now (`delayMs`): a burst of edits and screen changes costs one
   * copy of the record on the main thread, built from the state when it is written. `done` hears
   * how the write went.
   */
  schedule(build: () => SavedDocument | null, done: (error: Error | null) => void, delayMs = 150): void {
    if (this.scheduled) clearTimeout(this.scheduled.timer);
    this.scheduled = { build, done, timer: setTimeout(() => void this.writeScheduled(), delayMs) };
  }

  /** Makes the write asked for now (before the state it reads changes, e.g. another document opens). */
  writeScheduled(): Promise<void> {
    const job = this.scheduled;
    if (!job) return Promise.resolve();
    clearTimeout(job.timer);
    this.scheduled = null;
    let doc: SavedDocument | null;
    try {
      doc = job.build();
    } catch (error) {
      job.done(error as Error);
      return Promise.resolve();
    }
    if (!doc) return Promise.resolve();
    return this.save(doc).then(() => job.done(null), (error: Error) => job.done(error));
  }

  /** Waits until everything asked for is written. */
  async flush(): Promise<void> {
    await this.writeScheduled();
    while (this.writing) await this.writing;
  }
}
