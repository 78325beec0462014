/**
 * Every error reply is JSON: { "error": "<one clear sentence>", "code": "<stable-word>" } with a
 * fitting status. `ERROR_CODES` is the one table of codes: scripts branch on `code`, people read
 * `error`. Library errors carry their own sentence; storage faults (a full disk, a read-only
 * folder, a busy or damaged library file) are recognised by their code, logged on the server and
 * answered with a sentence saying what is wrong — never "please report" for a fault we know.
 */
import type { FastifyError, FastifyReply, FastifyRequest } from 'fastify';
import { LibraryError } from '../library/errors.ts';
import { UserError } from '../model/errors.ts';

export interface ErrorCodeInfo {
  status: number;
  /** When it happens, for the API description. */
  meaning: string;
}

/** The stable error codes of the HTTP API. Adding one is fine; renaming one breaks scripts. */
export const ERROR_CODES = {
  'invalid-input': { status: 400, meaning: 'The body, a query value or a header is not valid; the sentence names it.' },
  'invalid-json': { status: 400, meaning: 'The body is not one valid JSON document (or uses __proto__/constructor keys).' },
  'token-required': { status: 401, meaning: 'The server was bound beyond loopback and the request carries no valid access token.' },
  'host-refused': { status: 403, meaning: 'A loopback server was addressed by a name other than 127.0.0.1 or localhost (DNS rebinding).' },
  'origin-refused': { status: 403, meaning: 'A request that changes the library came from a page of another origin (another site or another local port).' },
  'content-type-refused': { status: 403, meaning: 'A request that changes the library had a content type any web page can send (form or plain text).' },
  forbidden: { status: 403, meaning: 'The path is refused (a hidden file of the workbench build, for instance).' },
  'not-found': { status: 404, meaning: 'No entry, revision, sheet, take-off or route by that name.' },
  conflict: { status: 409, meaning: 'The change conflicts with what is stored (an archived entry, another pump, an id in use, a port in use).' },
  'precondition-failed': { status: 412, meaning: 'If-Match names a revision that is no longer the latest; nothing was stored.' },
  'too-large': { status: 413, meaning: 'The body is larger than this route accepts.' },
  'unsupported-media-type': { status: 415, meaning: 'This route does not read that Content-Type.' },
  'precondition-required': { status: 428, meaning: 'A revision must name the revision it edits with If-Match.' },
  'library-damaged': { status: 500, meaning: 'The library file is damaged or is not a Pumpscribe library; verify or restore it.' },
  'internal-error': { status: 500, meaning: 'A fault the server did not foresee; it is logged, and the request changed nothing that was not already saved.' },
  'storage-read-only': { status: 503, meaning: 'The library file or its folder cannot be written (read-only folder, file or file system); reading still works.' },
  'storage-busy': { status: 503, meaning: 'Another process holds the library file for writing; try again in a moment.' },
  'storage-io': { status: 503, meaning: 'The disk reported an input/output error while reading or writing the library file.' },
  'storage-full': { status: 507, meaning: 'The disk (or quota) holding the library file is full; nothing was stored.' },
  // The library's own finer words (src/library/errors.ts), each with the status of its reason.
  'revision-required': { status: 428, meaning: 'A new revision must name the revision it edits with If-Match: "<revision>".' },
  'revision-stale': { status: 412, meaning: 'If-Match names a revision that is no longer the latest; reload the entry and save again. Nothing was stored.' },
  'other-pump': { status: 409, meaning: 'The curve set is of another pump than the entry (maker, model, size or name differ); save it as a new entry, or add ?as_new_revision=true.' },
  'failing-set': { status: 400, meaning: 'The curve set has fail findings; fix it, or add ?accept_failing=true to keep it marked as failing.' },
  'unsound-set': { status: 400, meaning: 'The curve set has unknown units or no fitted head curve, so no duty could be checked against it.' },
  'import-busy': { status: 409, meaning: 'An import is being written to this library; try again when it has finished.' },
  'damaged-rows': { status: 409, meaning: 'The library holds damaged rows, so a backup written now could not be imported; run library verify, or export with --skip-damaged.' },
  'storage-fault': { status: 503, meaning: 'The disk reported an input/output error on the library file; nothing was changed.' },
  'sheet-quota-exceeded': { status: 507, meaning: "The library's quota for source sheets would be exceeded by this upload." },
} as const satisfies Record<string, ErrorCodeInfo>;

export type ErrorCode = keyof typeof ERROR_CODES;

export interface ErrorReply {
  error: string;
  code: ErrorCode;
}

export interface MappedError {
  status: number;
  code: ErrorCode;
  message: string;
  /** How the server logs it: faults of the machine are errors, contention a warning, user mistakes nothing. */
  log?: 'error' | 'warn';
}

function isErrorCode(code: unknown): code is ErrorCode {
  return typeof code === 'string' && Object.hasOwn(ERROR_CODES, code);
}

function mapped(code: ErrorCode, message: string, log?: 'error' | 'warn'): MappedError {
  return { status: ERROR_CODES[code].status, code, message, ...(log ? { log } : {}) };
}

const REASON_CODES: Record<string, ErrorCode> = {
  invalid: 'invalid-input',
  'not-found': 'not-found',
  conflict: 'conflict',
  'too-large': 'too-large',
  'unusable-file': 'library-damaged',
  // Words another layer may use for the same faults; a reason that is itself a code maps to it.
  stale: 'precondition-failed',
  'missing-if-match': 'precondition-required',
  'read-only': 'storage-read-only',
  full: 'storage-full',
  busy: 'storage-busy',
};

/** Log level of each storage code: these are faults of the machine, never of the request. */
const STORAGE_LOG: Partial<Record<ErrorCode, 'error' | 'warn'>> = {
  'storage-full': 'error',
  'storage-io': 'error',
  'storage-read-only': 'warn',
  'storage-busy': 'warn',
  'library-damaged': 'error',
  'storage-fault': 'error',
  'sheet-quota-exceeded': 'warn',
};

/**
 * Storage faults by the code SQLite (better-sqlite3's SqliteError) or Node's file system gives.
 * SQLite codes: https://www.sqlite.org/rescode.html (extended codes keep the primary as prefix).
 */
function storageFault(code: string): MappedError | null {
  if (/^SQLITE_FULL/.test(code) || code === 'ENOSPC' || code === 'EDQUOT') {
    return mapped('storage-full', 'The disk holding the library file is full, so nothing was stored; free some space (or move the library) and try again.', 'error');
  }
  if (/^SQLITE_READONLY/.test(code) || code === 'EROFS') {
    return mapped('storage-read-only', 'The library file or its folder is read-only, so nothing was stored; reading still works — make the folder writable or copy the library elsewhere to change it.', 'warn');
  }
  if (/^SQLITE_(BUSY|LOCKED)/.test(code)) {
    return mapped('storage-busy', 'The library file is busy with another writer (an import or a backup in another process); nothing was changed, try again in a moment.', 'warn');
  }
  if (/^SQLITE_(IOERR|CANTOPEN)/.test(code) || code === 'EIO') {
    return mapped('storage-io', 'The disk reported an input/output error on the library file, so the request was not completed; check the disk and the library folder.', 'error');
  }
  if (/^SQLITE_(CORRUPT|NOTADB)/.test(code)) {
    return mapped('library-damaged', 'The library file is damaged; nothing was changed — run "pumpscribe library verify" and restore from a backup if it finds damage.', 'error');
  }
  return null;
}

/** Status, stable code, sentence and log level for anything a route may throw. */
export function mapError(error: unknown): MappedError {
  if (error instanceof UserError) {
    // A specific code chosen by the layer that threw wins; the library's generic reasons come next.
    const why: string | undefined = error instanceof LibraryError ? error.reason : undefined;
    const reason = why === undefined ? undefined : REASON_CODES[why] ?? (isErrorCode(why) ? why : undefined);
    const code = error.code !== 'invalid-input' && isErrorCode(error.code) ? error.code : reason ?? 'invalid-input';
    return mapped(code, error.message, STORAGE_LOG[code]);
  }
  const e = error as Partial<FastifyError> & { message?: string; code?: string };
  if (typeof e?.code === 'string') {
    const fault = storageFault(e.code);
    if (fault) return fault;
  }
  switch (e?.code) {
    case 'FST_ERR_CTP_BODY_TOO_LARGE':
      return mapped('too-large', 'The request body is larger than this route accepts; send a smaller file or split the import.');
    case 'FST_ERR_CTP_INVALID_MEDIA_TYPE':
      return mapped('unsupported-media-type', 'This route does not accept that Content-Type; send application/json (curve sets, take-offs), application/x-ndjson (imports) or the raw file bytes (sheets).');
    case 'FST_ERR_CTP_EMPTY_JSON_BODY':
      return mapped('invalid-input', 'The request body is empty; send a JSON document.');
    case 'FST_ERR_CTP_INVALID_JSON_BODY':
      return mapped('invalid-json', 'The request body is not valid JSON; send one JSON document.');
    case 'FST_ERR_CTP_INVALID_CONTENT_LENGTH':
      return mapped('invalid-input', 'The request body does not match its Content-Length.');
  }
  if (e instanceof SyntaxError) {
    // secure-json-parse refuses __proto__ and constructor.prototype keys with a SyntaxError.
    return mapped('invalid-json', `The request body was refused: ${oneLine(e.message ?? 'malformed input')}.`);
  }
  if (e?.statusCode === 400) return mapped('invalid-input', `The request was refused: ${oneLine(e.message ?? 'malformed input')}.`);
  if (e?.statusCode === 413) return mapped('too-large', 'The request body is larger than this route accepts; send a smaller file or split the import.');
  if (e?.statusCode === 415) return mapped('unsupported-media-type', `This route does not accept that Content-Type (${oneLine(e.message ?? '')}).`);
  if (typeof e?.statusCode === 'number' && e.statusCode >= 400 && e.statusCode < 500) {
    const code: ErrorCode = e.statusCode === 403 ? 'forbidden' : e.statusCode === 404 ? 'not-found' : 'invalid-input';
    return { status: e.statusCode, code, message: `${oneLine(e.message ?? 'The request was refused')}.` };
  }
  return mapped('internal-error', 'Unexpected internal error; the request changed nothing that was not already saved. Please report it.', 'error');
}

/** Kept for callers that only need the status and the sentence. */
export function statusAndMessage(error: unknown): { status: number; message: string; code: ErrorCode } {
  const { status, message, code } = mapError(error);
  return { status, message, code };
}

function oneLine(text: string): string {
  return text.replace(/\s+/g, ' ').replace(/\.$/, '').slice(0, 300);
}

/** Sends an error body in the one shape every route uses. */
export function sendError(reply: FastifyReply, status: number, code: ErrorCode, message: string): FastifyReply {
  return reply.code(status).type('application/json; charset=utf-8').send({ error: message, code } satisfies ErrorReply);
}

export function errorHandler(error: unknown, request: FastifyRequest, reply: FastifyReply): void {
  const m = mapError(error);
  const where = { code: m.code, method: request.method, url: request.url.split('?')[0]?.slice(0, 200) };
  if (m.log === 'error') request.log.error({ ...where, err: error }, m.message);
  else if (m.log === 'warn') request.log.warn({ ...where, cause: (error as { code?: unknown })?.code }, m.message);
  if (m.code === 'storage-busy') reply.header('Retry-After', '1');
  void sendError(reply, m.status, m.code, m.message);
}
