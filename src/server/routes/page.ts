/** GET /library — the plain HTML library page (also the home page when the workbench is not built). */
import { basename } from 'node:path';
import type { FastifyInstance, FastifyReply, FastifyRequest } from 'fastify';
import type { LibraryStore } from '../../library/store.ts';
import type { DutyMatcher } from '../../library/dutySearch.ts';
import type { DutySearchView } from '../../library/dutyView.ts';
import { renderLibraryPage } from '../libraryPage.ts';
import { text, type Query } from '../query.ts';
import { runDutyQuery } from './search.ts';
import { statusAndMessage } from '../errors.ts';

export const PAGE_CSP = "default-src 'none'; style-src 'unsafe-inline'; form-action 'self'; base-uri 'none'; frame-ancestors 'none'";

export function libraryPageHandler(store: LibraryStore, matcher: DutyMatcher, workbenchAvailable: () => boolean, message?: string) {
  return async (request: FastifyRequest, reply: FastifyReply) => {
    const query = request.query as Query;
    let notice = message;
    let status = 200;
    const unitsParam = text(query, 'units');
    const units = unitsParam === 'us' ? 'us' : 'si';
    const flow = text(query, 'flow', 40) ?? '';
    const head = text(query, 'head', 40) ?? '';
    const staticHead = text(query, 'static', 40) ?? '';
    let search: DutySearchView | undefined;
    if (flow !== '' || head !== '') {
      try {
        search = runDutyQuery(store, matcher, { flow, head, units, ...(staticHead ? { static: staticHead } : {}) });
      } catch (error) {
        const { status: s, message: m } = statusAndMessage(error);
        status = s;
        notice = m;
      }
    }
    const q = text(query, 'q') ?? '';
    const list = store.list({ q, limit: 500 });
    const html = renderLibraryPage({
      libraryName: basename(store.file),
      counts: store.counts(),
      units,
      q,
      total: list.total,
      entries: list.entries,
      duty: { flow, head, static: staticHead },
      ...(search ? { search } : {}),
      ...(notice ? { message: notice } : {}),
      workbenchAvailable: workbenchAvailable(),
    });
    return reply.code(status).type('text/html; charset=utf-8').header('Content-Security-Policy', PAGE_CSP).send(html);
  };
}

export function pageRoutes(app: FastifyInstance, store: LibraryStore, matcher: DutyMatcher, workbenchAvailable: () => boolean, message?: string): void {
  app.get('/library', libraryPageHandler(store, matcher, workbenchAvailable));
  if (!workbenchAvailable()) app.get('/', libraryPageHandler(store, matcher, workbenchAvailable, message));
}
