/**
 * Source sheets (the PDF or image a curve set was read from), stored once by SHA-256,
 * with the take-off files made on them kept beside them. Both are append-only.
 * The media type is decided from the bytes themselves, never from a client's claim, so a
 * stored file can only ever be served back as PDF, PNG, JPEG, WebP, GIF, TIFF or plain bytes.
 */
import type Database from 'better-sqlite3';
import { LibraryError } from './errors.ts';
import { checkSha256, clip, isEntryId, newEntryId } from './ids.ts';
import { checkTakeoff, sha256Hex } from './validate.ts';
import { guardStorage } from './storage.ts';

export interface SheetInfo {
  sha256: string;
  name: string | null;
  media_type: string;
  size: number;
  stored_at: string;
}

export interface StoredSheet extends SheetInfo {
  bytes: Buffer;
}

export interface TakeoffInfo {
  id: string;
  sheet_sha256: string;
  name: string | null;
  sha256: string;
  saved_at: string;
}

const SIGNATURES: Array<{ type: string; test: (b: Uint8Array) => boolean }> = [
  { type: 'application/pdf', test: (b) => startsWith(b, [0x25, 0x50, 0x44, 0x46, 0x2d]) },
  { type: 'image/png', test: (b) => startsWith(b, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]) },
  { type: 'image/jpeg', test: (b) => startsWith(b, [0xff, 0xd8, 0xff]) },
  { type: 'image/gif', test: (b) => startsWith(b, [0x47, 0x49, 0x46, 0x38]) },
  { type: 'image/webp', test: (b) => startsWith(b, [0x52, 0x49, 0x46, 0x46]) && startsWith(b.subarray(8), [0x57, 0x45, 0x42, 0x50]) },
  { type: 'image/tiff', test: (b) => startsWith(b, [0x49, 0x49, 0x2a, 0x00]) || startsWith(b, [0x4d, 0x4d, 0x00, 0x2a]) },
];

function startsWith(bytes: Uint8Array, prefix: number[]): boolean {
  return prefix.every((v, i) => bytes[i] === v);
}

/** The media type recognised from the first bytes; anything else is plain bytes. */
export function sniffMediaType(bytes: Uint8Array): string {
  return SIGNATURES.find((s) => s.test(bytes))?.type ?? 'application/octet-stream';
}

/** A display name only: the last path segment, without control characters, at most 200 characters. */
export function cleanSheetName(name: string | undefined | null): string | null {
  if (!name) return null;
  const last = name.split(/[\\/]/).filter(Boolean).pop() ?? '';
  const flat = last.replace(/[\u0000-\u001f\u007f]/g, '').trim().slice(0, 200);
  return flat || null;
}

export class SheetStore {
  private readonly stmts: ReturnType<typeof sheetStatements>;
  private get file(): string {
    return this.db.name;
  }

  constructor(private readonly db: Database.Database, private readonly now: () => string, private readonly beforeWrite: () => void = () => undefined) {
    this.stmts = sheetStatements(db);
  }

  /** Stores the bytes unless a sheet with the same SHA-256 is already kept. */
  put(bytes: Uint8Array, name?: string | null, storedAt?: string): SheetInfo & { created: boolean } {
    if (bytes.length === 0) throw new LibraryError('The sheet is empty; send the bytes of a PDF or image file.', 'invalid');
    this.beforeWrite();
    const sha256 = sha256Hex(bytes);
    const write = this.db.transaction(() => {
      const existing = this.stmts.find.get(sha256) as SheetInfo | undefined;
      if (existing) return { ...existing, created: false };
      const info: SheetInfo = { sha256, name: cleanSheetName(name), media_type: sniffMediaType(bytes), size: bytes.length, stored_at: storedAt ?? this.now() };
      this.stmts.insert.run(info.sha256, info.name, info.media_type, info.size, Buffer.from(bytes), info.stored_at);
      return { ...info, created: true };
    });
    return guardStorage(this.file, () => write.immediate());
  }

  info(sha256: string): SheetInfo {
    checkSha256(sha256);
    const row = this.stmts.find.get(sha256) as SheetInfo | undefined;
    if (!row) throw new LibraryError(`No sheet with SHA-256 ${sha256} is stored in this library.`, 'not-found');
    return row;
  }

  get(sha256: string): StoredSheet {
    checkSha256(sha256);
    const row = this.stmts.bytes.get(sha256) as StoredSheet | undefined;
    if (!row) throw new LibraryError(`No sheet with SHA-256 ${sha256} is stored in this library.`, 'not-found');
    return row;
  }

  list(): SheetInfo[] {
    return this.stmts.list.all() as SheetInfo[];
  }

  /**
   * Keeps a take-off file beside its sheet, validated against the take-off schema. The same
   * content saved twice for the same sheet is kept once. A clashing imported id gets a fresh one.
   */
  addTakeoff(sheetSha256: string, body: unknown, name?: string | null, id?: string, savedAt?: string): TakeoffInfo & { created: boolean } {
    this.info(sheetSha256);
    this.beforeWrite();
    const text = JSON.stringify(checkTakeoff(body));
    const sha256 = sha256Hex(text);
    const write = this.db.transaction(() => {
      const existing = this.stmts.takeoffBySha.get(sheetSha256, sha256) as TakeoffInfo | undefined;
      if (existing) return { ...existing, created: false };
      const free = id !== undefined && !this.stmts.takeoff.get(id);
      const info: TakeoffInfo = { id: free ? (id as string) : newEntryId(), sheet_sha256: sheetSha256, name: cleanSheetName(name), sha256, saved_at: savedAt ?? this.now() };
      this.stmts.insertTakeoff.run(info.id, info.sheet_sha256, info.name, info.sha256, text, info.saved_at);
      return { ...info, created: true };
    });
    return guardStorage(this.file, () => write.immediate());
  }

  takeoffs(sheetSha256: string): TakeoffInfo[] {
    this.info(sheetSha256);
    return this.stmts.takeoffs.all(sheetSha256) as TakeoffInfo[];
  }

  takeoff(id: string): TakeoffInfo & { body: string } {
    if (!isEntryId(id)) throw new LibraryError(`No take-off file has the id "${clip(id)}".`, 'not-found');
    const row = this.stmts.takeoff.get(id) as (TakeoffInfo & { body: string }) | undefined;
    if (!row) throw new LibraryError(`No take-off file has the id ${id}.`, 'not-found');
    return row;
  }

  /** Every take-off with its body, for export. */
  allTakeoffs(): Array<TakeoffInfo & { body: string }> {
    return this.stmts.allTakeoffs.all() as Array<TakeoffInfo & { body: string }>;
  }
}

function sheetStatements(db: Database.Database) {
  return {
    find: db.prepare('SELECT sha256, name, media_type, size, stored_at FROM sheets WHERE sha256 = ?'),
    bytes: db.prepare('SELECT sha256, name, media_type, size, stored_at, bytes FROM sheets WHERE sha256 = ?'),
    insert: db.prepare('INSERT INTO sheets (sha256, name, media_type, size, bytes, stored_at) VALUES (?, ?, ?, ?, ?, ?)'),
    list: db.prepare('SELECT sha256, name, media_type, size, stored_at FROM sheets ORDER BY stored_at, sha256'),
    takeoffBySha: db.prepare('SELECT id, sheet_sha256, name, sha256, saved_at FROM takeoffs WHERE sheet_sha256 = ? AND sha256 = ?'),
    insertTakeoff: db.prepare('INSERT INTO takeoffs (id, sheet_sha256, name, sha256, body, saved_at) VALUES (?, ?, ?, ?, ?, ?)'),
    takeoffs: db.prepare('SELECT id, sheet_sha256, name, sha256, saved_at FROM takeoffs WHERE sheet_sha256 = ? ORDER BY saved_at, id'),
    takeoff: db.prepare('SELECT id, sheet_sha256, name, sha256, saved_at, body FROM takeoffs WHERE id = ?'),
    allTakeoffs: db.prepare('SELECT id, sheet_sha256, name, sha256, saved_at, body FROM takeoffs ORDER BY saved_at, id'),
  };
}
