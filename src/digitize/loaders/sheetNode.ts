/**
 * Opens a sheet file in Node, whatever it is: a PDF page, or a PNG or JPEG scan. The file's
 * size is checked before it is read, and its kind is told from its first bytes, not its name.
 */
import { closeSync, existsSync, openSync, readFileSync, readSync, statSync } from 'node:fs';
import { basename } from 'node:path';
import { checkFileSize, DEFAULT_SHEET_LIMITS, SheetError, type Sheet, type SheetLimits } from '../sheet.ts';
import { loadPdfSheetNode } from './pdfNode.ts';
import { loadImageSheetNode } from './imageNode.ts';
import { sniffFormat } from './imageHeader.ts';
import { looksLikePdf } from './pdfPage.ts';

export interface SheetFileOptions {
  page?: number;
  limits?: SheetLimits;
  /** Told one sentence about how the sheet was read when the user should know (a page reduced on load). */
  onNote?: (sentence: string) => void;
}

export async function loadSheetFileNode(path: string, options: SheetFileOptions = {}): Promise<Sheet> {
  const name = basename(path);
  const limits = options.limits ?? DEFAULT_SHEET_LIMITS;
  if (!existsSync(path)) throw new SheetError(`The sheet file "${path}" does not exist; check the "sheet" path, which is relative to the take-off file.`);
  const stat = statSync(path);
  if (!stat.isFile()) throw new SheetError(`The sheet "${path}" is not a file; give the path of a PDF, PNG or JPEG file.`);
  checkFileSize(stat.size, limits, `The sheet file "${name}"`);
  const head = new Uint8Array(1024);
  const fd = openSync(path, 'r');
  try {
    readSync(fd, head, 0, head.length, 0);
  } finally {
    closeSync(fd);
  }
  if (looksLikePdf(head)) {
    return loadPdfSheetNode(new Uint8Array(readFileSync(path)), { name, limits, ...(options.page !== undefined ? { page: options.page } : {}) });
  }
  if (sniffFormat(head)) {
    if (options.page !== undefined && options.page !== 1) throw new SheetError(`The sheet "${name}" is an image with a single page; page ${options.page} does not exist.`);
    const bytes = readFileSync(path);
    return loadImageSheetNode(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength), { name, limits, ...(options.onNote ? { onNote: options.onNote } : {}) });
  }
  throw new SheetError(`The sheet file "${name}" is neither a PDF nor a PNG or JPEG image; export the sheet in one of those formats.`);
}
