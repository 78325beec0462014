/**
 * The per-library quota for source sheets. Sheets are append-only (kept for audit), so without a
 * quota any page or script allowed to upload could fill the disk holding the library. The quota
 * counts the bytes of every sheet stored in the library file, whoever stored them; an upload that
 * would cross it is refused with 507 before its body is read when the Content-Length says so, and
 * after it is read otherwise. A sheet already stored (same SHA-256) costs nothing and is accepted,
 * unless its declared length alone already crosses the quota (the bytes are not read to find out).
 */
import type { LibraryStore } from '../library/store.ts';
import { UserError } from '../model/errors.ts';

/** 2 GiB: about two hundred 10 MB scans, far beyond one office's pump sheets (common practice). */
export const DEFAULT_SHEET_QUOTA = 2 * 2 ** 30;

const UNITS: Record<string, number> = { b: 1, kb: 1e3, mb: 1e6, gb: 1e9, tb: 1e12, kib: 2 ** 10, mib: 2 ** 20, gib: 2 ** 30, tib: 2 ** 40 };

/** "500MB", "2 GiB", "750 MiB" → bytes. A unit is required, so that "500" is never misread. */
export function parseSize(text: string, what = 'The sheet quota'): number {
  const m = /^\s*(\d+(?:\.\d+)?)\s*([a-zA-Z]+)\s*$/.exec(text);
  const factor = m ? UNITS[(m[2] as string).toLowerCase()] : undefined;
  if (!m || factor === undefined) {
    throw new UserError(`${what} must be a size with a unit, such as 500MB or 2GiB, not "${text.slice(0, 40)}".`, 'invalid-input');
  }
  const bytes = Math.floor(Number(m[1]) * factor);
  if (!(bytes >= 1)) throw new UserError(`${what} must be at least 1 byte, not "${text.slice(0, 40)}".`, 'invalid-input');
  return bytes;
}

/** Bytes as MiB or GiB with one decimal, for sentences. */
export function sizeText(bytes: number): string {
  return bytes >= 2 ** 30 ? `${(bytes / 2 ** 30).toFixed(1)} GiB` : `${(bytes / 2 ** 20).toFixed(1)} MiB`;
}

export class SheetQuota {
  constructor(readonly store: LibraryStore, readonly bytes: number) {}

  used(): number {
    let sum = 0;
    for (const s of this.store.sheets.list()) sum += s.size;
    return sum;
  }

  /** Throws 507 `sheet-quota-exceeded` when `incoming` more bytes would cross the quota. */
  check(incoming: number): void {
    const used = this.used();
    if (used + incoming <= this.bytes) return;
    throw new UserError(
      `This library's quota for source sheets is ${sizeText(this.bytes)} and ${sizeText(used)} is used, so a sheet of ${sizeText(incoming)} is refused; start the server with a larger --sheet-quota (e.g. --sheet-quota ${Math.ceil((used + incoming) / 2 ** 30) + 1}GiB) or keep this library's sheets elsewhere.`,
      'sheet-quota-exceeded',
    );
  }
}
