/**
 * /api/curvesets — entries, their revisions, archive and restore.
 * A curve set comes back as the exact stored JSON text; which entry and revision it is travels in
 * headers (X-Pumpscribe-Id, X-Pumpscribe-Revision, ETag "<revision>").
 *
 * Writes guard identity: POST creates an entry; PUT adds a revision only with
 * `If-Match: "<current revision>"` (missing → 428, stale → 412) and only for the same pump
 * (maker, model, size and name; another pump → 409 unless `?as_new_revision=true`). A set with
 * `fail` findings is kept only with `?accept_failing=true`. Every answer to a write is
 * `{ id, revision, saved_at }` with `ETag: "<revision>"`; a refusal stores nothing.
 */
import type { FastifyInstance, FastifyReply } from 'fastify';
import type { LibraryBackend } from '../../library/backend.ts';
import type { StoredRevision } from '../../library/types.ts';
import { LibraryError } from '../../library/errors.ts';
import { expectedRevision, flag, integer, text, type Query } from '../query.ts';

function sendStored(reply: FastifyReply, stored: StoredRevision): FastifyReply {
  reply
    .header('X-Pumpscribe-Id', stored.id)
    .header('X-Pumpscribe-Revision', String(stored.revision))
    .header('X-Pumpscribe-Saved-At', stored.saved_at)
    .header('ETag', `"${stored.revision}"`)
    .type('application/json; charset=utf-8');
  if (stored.archived_at) reply.header('X-Pumpscribe-Archived-At', stored.archived_at);
  return reply.send(stored.body);
}

export function curveSetRoutes(app: FastifyInstance, store: LibraryBackend): void {
  app.get('/api/curvesets', async (request) => {
    const query = request.query as Query;
    const archivedFlag = text(query, 'archived');
    const archived = archivedFlag === 'all' ? 'all' : flag(query, 'archived') ?? false;
    return store.list({
      q: text(query, 'q') ?? '',
      archived,
      limit: integer(query, 'limit', 'limit', 1, 1000) ?? 100,
      offset: integer(query, 'offset', 'offset', 0, Number.MAX_SAFE_INTEGER) ?? 0,
    });
  });

  app.post('/api/curvesets', async (request, reply) => {
    if (request.body === undefined || request.body === null) throw new LibraryError('Send the curve set as the JSON body.', 'invalid');
    const query = request.query as Query;
    const saved = store.create(request.body, { acceptFailing: flag(query, 'accept_failing') === true });
    return reply.code(201).header('Location', `/api/curvesets/${saved.id}`).header('ETag', `"${saved.revision}"`).send(saved);
  });

  app.get<{ Params: { id: string } }>('/api/curvesets/:id', async (request, reply) => sendStored(reply, store.get(request.params.id)));

  app.put<{ Params: { id: string } }>('/api/curvesets/:id', async (request, reply) => {
    const query = request.query as Query;
    const asNewRevision = flag(query, 'as_new_revision') === true;
    const acceptFailing = flag(query, 'accept_failing') === true;
    const expected = expectedRevision(request.headers['if-match']);
    // An unknown entry is a 404 whatever the headers say; only then is the revision asked for.
    if (expected === undefined) {
      store.info(request.params.id);
      throw new LibraryError(
        'Say which revision you edited with an If-Match header (If-Match: "3", the ETag you were given), so that nobody else\'s save is overwritten unknowingly; nothing was stored.',
        'precondition-required',
      );
    }
    if (request.body === undefined || request.body === null) throw new LibraryError('Send the curve set as the JSON body.', 'invalid');
    const saved = store.addRevision(request.params.id, request.body, { expectedRevision: expected, asNewRevision, acceptFailing });
    return reply.header('ETag', `"${saved.revision}"`).send(saved);
  });

  app.get<{ Params: { id: string } }>('/api/curvesets/:id/summary', async (request) => store.info(request.params.id));

  app.get<{ Params: { id: string } }>('/api/curvesets/:id/revisions', async (request) => ({
    id: request.params.id,
    revisions: store.revisions(request.params.id),
  }));

  app.get<{ Params: { id: string; revision: string } }>('/api/curvesets/:id/revisions/:revision', async (request, reply) => {
    const n = /^\d{1,9}$/.test(request.params.revision) ? Number(request.params.revision) : NaN;
    if (!(n >= 1)) throw new LibraryError('A revision is a whole number from 1 up.', 'not-found');
    return sendStored(reply, store.get(request.params.id, n));
  });

  app.delete<{ Params: { id: string } }>('/api/curvesets/:id', async (request) => store.archive(request.params.id));

  app.post<{ Params: { id: string } }>('/api/curvesets/:id/restore', async (request) => store.restore(request.params.id));
}
