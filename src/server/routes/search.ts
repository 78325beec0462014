/** GET /api/search — rank the library's pumps for a duty point, in the unit system asked for. */
import type { FastifyInstance } from 'fastify';
import type { LibraryBackend } from '../../library/backend.ts';
import { searchByDuty, type DutyMatcher } from '../../library/dutySearch.ts';
import { dutyFromDisplay, dutySearchView, unitSystemNamed } from '../../library/dutyView.ts';
import { integer, number, required, text, type Query } from '../query.ts';

export function runDutyQuery(store: LibraryBackend, matcher: DutyMatcher, query: Query) {
  const units = unitSystemNamed(text(query, 'units'));
  const flow = required(number(query, 'flow', 'The flow'), 'The flow (flow=…)');
  const head = required(number(query, 'head', 'The head'), 'The head (head=…)');
  const staticHead = number(query, 'static', 'The static head');
  const hours = number(query, 'hours', 'Hours per year');
  const tariff = number(query, 'tariff', 'The tariff');
  const limit = integer(query, 'limit', 'limit', 1, 500);
  const duty = dutyFromDisplay(units, flow, head, staticHead);
  const result = searchByDuty(store, duty, matcher, {
    ...(hours === undefined ? {} : { hoursPerYear: hours }),
    ...(tariff === undefined ? {} : { tariffPerKWh: tariff }),
    ...(limit === undefined ? {} : { limit }),
  });
  return dutySearchView(result, units);
}

export function searchRoutes(app: FastifyInstance, store: LibraryBackend, matcher: DutyMatcher): void {
  app.get('/api/search', async (request) => runDutyQuery(store, matcher, request.query as Query));
}
