/**
 * Source sheets and their take-off files.
 * POST /api/sheets takes the raw bytes (any Content-Type but JSON); the reply names the SHA-256.
 * Uploads count against the library's sheet quota (quota.ts): 507 when a new sheet would cross it.
 * GET /api/sheets/:sha256 serves them back with a media type sniffed from the bytes at upload,
 * sandboxed, so a hostile upload cannot run script in the workbench's origin.
 */
import type { FastifyInstance, FastifyReply, FastifyRequest } from 'fastify';
import type { LibraryStore } from '../../library/store.ts';
import { LibraryError } from '../../library/errors.ts';
import { text, type Query } from '../query.ts';
import { sha256Hex } from '../../library/validate.ts';
import type { SheetQuota } from '../quota.ts';

export const SHEET_MEDIA_TYPES = ['application/octet-stream', 'application/pdf'];
/** Any image type is accepted as bytes; what it is served back as is decided from the bytes. */
export const SHEET_IMAGE_TYPES = /^image\/[\w.+-]+$/;

function isStored(store: LibraryStore, sha256: string): boolean {
  try {
    store.sheets.info(sha256);
    return true;
  } catch {
    return false;
  }
}

export function sheetRoutes(app: FastifyInstance, store: LibraryStore, sheetLimit: number, quota: SheetQuota): void {
  app.register(async (scope) => {
    scope.addContentTypeParser(SHEET_MEDIA_TYPES, { parseAs: 'buffer', bodyLimit: sheetLimit }, (_req, body, done) => done(null, body));
    scope.addContentTypeParser(SHEET_IMAGE_TYPES, { parseAs: 'buffer', bodyLimit: sheetLimit }, (_req, body, done) => done(null, body));
    // Refuse before reading the body when its declared length already crosses the quota; the
    // connection closes, so the client stops sending instead of the server taking the bytes.
    const early = async (request: FastifyRequest, reply: FastifyReply) => {
      const declared = Number(request.headers['content-length']);
      if (Number.isFinite(declared) && declared > 0 && declared <= sheetLimit) {
        try {
          quota.check(declared);
        } catch (error) {
          reply.header('Connection', 'close');
          throw error;
        }
      }
    };
    scope.post('/api/sheets', { bodyLimit: sheetLimit, onRequest: early }, async (request, reply) => {
      if (!Buffer.isBuffer(request.body)) throw new LibraryError('Send the sheet as the raw bytes of the file (Content-Type application/pdf, image/… or application/octet-stream).', 'invalid');
      if (request.body.length > 0 && !isStored(store, sha256Hex(request.body))) quota.check(request.body.length);
      const name = text(request.query as Query, 'name', 500);
      const stored = store.sheets.put(request.body, name);
      return reply.code(stored.created ? 201 : 200).header('Location', `/api/sheets/${stored.sha256}`).send(stored);
    });
  });

  app.get('/api/sheets', async () => ({ sheets: store.sheets.list() }));

  app.get<{ Params: { sha256: string } }>('/api/sheets/:sha256', async (request, reply) => {
    const sheet = store.sheets.get(request.params.sha256);
    return reply
      .type(sheet.media_type)
      .header('Content-Security-Policy', "sandbox; default-src 'none'")
      .header('Content-Disposition', `inline; filename="sheet-${sheet.sha256.slice(0, 12)}"`)
      .header('ETag', `"${sheet.sha256}"`)
      .header('Cache-Control', 'private, max-age=31536000, immutable')
      .send(sheet.bytes);
  });

  app.get<{ Params: { sha256: string } }>('/api/sheets/:sha256/takeoffs', async (request) => ({
    sheet: store.sheets.info(request.params.sha256),
    takeoffs: store.sheets.takeoffs(request.params.sha256),
  }));

  app.post<{ Params: { sha256: string } }>('/api/sheets/:sha256/takeoffs', async (request, reply) => {
    const name = text(request.query as Query, 'name', 500);
    const saved = store.sheets.addTakeoff(request.params.sha256, request.body, name);
    return reply.code(saved.created ? 201 : 200).header('Location', `/api/takeoffs/${saved.id}`).send(saved);
  });

  app.get<{ Params: { id: string } }>('/api/takeoffs/:id', async (request, reply) => {
    const t = store.sheets.takeoff(request.params.id);
    return reply.type('application/json; charset=utf-8').header('X-Pumpscribe-Sheet', t.sheet_sha256).send(t.body);
  });
}
