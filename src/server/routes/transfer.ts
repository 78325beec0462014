/**
 * GET /api/library/export streams the whole library as JSON Lines (a consistent snapshot);
 * POST /api/library/import reads JSON Lines (application/x-ndjson) and adds them all or nothing.
 */
import { Readable } from 'node:stream';
import type { FastifyInstance } from 'fastify';
import type { LibraryBackend } from '../../library/backend.ts';
import { LibraryError } from '../../library/errors.ts';
import { linesOf } from '../../library/lines.ts';
import { exportLines, importLines } from '../../library/transfer.ts';
import { flag, type Query } from '../query.ts';

export const NDJSON_TYPES = ['application/x-ndjson', 'application/jsonl', 'application/jsonlines'];

export function transferRoutes(app: FastifyInstance, store: LibraryBackend, importLimit: number): void {
  app.get('/api/library/export', async (_request, reply) => {
    const stamp = store.now().slice(0, 10);
    // Every row is checked before the first byte is sent, so a refusal (damaged rows) is a clean
    // error reply rather than a cut-off backup that could not be imported.
    for (const _line of exportLines(store)) void _line;
    const lines = exportLines(store);
    const body = Readable.from(
      (function* () {
        for (const line of lines) yield `${line}\n`;
      })(),
    );
    return reply
      .type('application/x-ndjson; charset=utf-8')
      .header('Content-Disposition', `attachment; filename="pumpscribe-library-${stamp}.jsonl"`)
      .send(body);
  });

  app.register(async (scope) => {
    scope.addContentTypeParser(NDJSON_TYPES, (_request, payload, done) => done(null, payload));
    scope.post('/api/library/import', async (request, reply) => {
      const payload = request.body as Readable | undefined;
      if (!payload || typeof payload.iterator !== 'function') {
        throw new LibraryError('Send the export as JSON Lines with Content-Type application/x-ndjson.', 'invalid');
      }
      try {
        // Keep the request stream alive when reading stops early, so that the error reply still reaches the client.
        const acceptFailing = flag(request.query as Query, 'accept_failing') === true;
        return await importLines(store, linesOf(payload.iterator({ destroyOnReturn: false }), importLimit), { acceptFailing, source: 'an upload to the server' });
      } catch (error) {
        if (error instanceof LibraryError && error.reason === 'too-large') reply.header('Connection', 'close');
        else payload.resume();
        throw error;
      }
    });
  });
}
