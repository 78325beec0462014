/**
 * Every error reply is JSON: { "error": "<one clear sentence>" } with a fitting status.
 * Library errors carry their own reason; Fastify's body errors are reworded for people.
 */
import type { FastifyError, FastifyReply, FastifyRequest } from 'fastify';
import { LibraryError, type LibraryErrorReason } from '../library/errors.ts';

const STATUS: Record<LibraryErrorReason, number> = {
  invalid: 400,
  'not-found': 404,
  conflict: 409,
  'too-large': 413,
  'unusable-file': 500,
  'precondition-required': 428,
  'precondition-failed': 412,
  'read-only': 503,
  'storage-full': 507,
};

export interface ErrorReply {
  error: string;
}

export function statusAndMessage(error: unknown): { status: number; message: string } {
  if (error instanceof LibraryError) return { status: STATUS[error.reason], message: error.message };
  const e = error as Partial<FastifyError> & { message?: string };
  switch (e.code) {
    case 'SQLITE_BUSY':
    case 'SQLITE_BUSY_SNAPSHOT':
      return { status: 503, message: 'The library file is busy with another writer (an import or a backup in another process); nothing was changed, try again in a moment.' };
    case 'FST_ERR_CTP_BODY_TOO_LARGE':
      return { status: 413, message: 'The request body is larger than this route accepts; send a smaller file or split the import.' };
    case 'FST_ERR_CTP_INVALID_MEDIA_TYPE':
      return { status: 415, message: 'This route does not accept that Content-Type; send application/json (curve sets, take-offs), application/x-ndjson (imports) or the raw file bytes (sheets).' };
    case 'FST_ERR_CTP_EMPTY_JSON_BODY':
      return { status: 400, message: 'The request body is empty; send a JSON document.' };
    case 'FST_ERR_CTP_INVALID_JSON_BODY':
      return { status: 400, message: 'The request body is not valid JSON; send one JSON document.' };
    case 'FST_ERR_CTP_INVALID_CONTENT_LENGTH':
      return { status: 400, message: 'The request body does not match its Content-Length.' };
  }
  if (e instanceof SyntaxError || e.statusCode === 400) {
    // secure-json-parse refuses __proto__ and constructor.prototype keys with a SyntaxError.
    return { status: 400, message: `The request body was refused: ${oneLine(e.message ?? 'malformed input')}.` };
  }
  if (typeof e.statusCode === 'number' && e.statusCode >= 400 && e.statusCode < 500) {
    return { status: e.statusCode, message: oneLine(e.message ?? 'The request was refused.') };
  }
  return { status: 500, message: 'Unexpected internal error; the request changed nothing that was not already saved. Please report it.' };
}

function oneLine(text: string): string {
  return text.replace(/\s+/g, ' ').replace(/\.$/, '').slice(0, 300);
}

export function errorHandler(error: unknown, request: FastifyRequest, reply: FastifyReply): void {
  const { status, message } = statusAndMessage(error);
  if (status >= 500) request.log.error({ err: error }, 'internal error');
  const code = error instanceof LibraryError ? error.code : status >= 500 ? 'internal' : 'invalid-input';
  void reply.code(status).type('application/json; charset=utf-8').send({ error: message, code });
}
