/**
 * The Fastify application: library API, source sheets, the plain library page, and (when built)
 * the browser workbench from dist/. Built from a store and options handed in, so tests run it
 * against a temporary library file on a random port.
 */
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import Fastify, { type FastifyInstance } from 'fastify';
import fastifyStatic from '@fastify/static';
import fastifyCompress from '@fastify/compress';
import type { LibraryStore } from '../library/store.ts';
import type { DutyMatcher } from '../library/dutySearch.ts';
import { TOOL_VERSION } from '../version.ts';
import { errorHandler, sendError } from './errors.ts';
import { installAccessControl } from './security.ts';
import { curveSetRoutes } from './routes/curvesets.ts';
import { searchRoutes } from './routes/search.ts';
import { sheetRoutes } from './routes/sheets.ts';
import { transferRoutes } from './routes/transfer.ts';
import { pageRoutes } from './routes/page.ts';
import { DEFAULT_SHEET_QUOTA, SheetQuota } from './quota.ts';
import { assetCacheControl, installCaching } from './caching.ts';
import { openApiDocument } from './openapi.ts';

export const LIMITS = {
  /** Curve sets and take-off files. */
  jsonBytes: 4 * 2 ** 20,
  /** One source sheet. */
  sheetBytes: 64 * 2 ** 20,
  /** One library import. */
  importBytes: 1024 * 2 ** 20,
};

export interface AppOptions {
  store: LibraryStore;
  matcher: DutyMatcher;
  /** The built workbench (dist/); served when it holds an index.html. */
  staticDir?: string | null;
  /** Why the workbench is not served, shown on the library page. */
  workbenchMessage?: string;
  /** Access token every request must carry (non-loopback binds). */
  token?: string | null;
  /** Only answer requests addressed to the loopback interface. */
  loopbackOnly?: boolean;
  /**
   * Server log (pino JSON lines): true logs warnings and errors to stderr; a stream receives them
   * instead (tests). Storage faults and refused writes are logged at warn or error with their code.
   */
  logger?: boolean | { stream: NodeJS.WritableStream; level?: 'warn' | 'error' | 'info' };
  limits?: Partial<typeof LIMITS>;
  /** Bytes of source sheets this library may hold (DEFAULT_SHEET_QUOTA when absent). */
  sheetQuota?: number;
}

export async function buildApp(options: AppOptions): Promise<FastifyInstance> {
  const limits = { ...LIMITS, ...options.limits };
  const app = Fastify({
    logger: !options.logger ? false : options.logger === true ? { level: 'warn', stream: process.stderr } : { level: options.logger.level ?? 'warn', stream: options.logger.stream },
    bodyLimit: limits.jsonBytes,
    onProtoPoisoning: 'error',
    onConstructorPoisoning: 'error',
    // Closing the server ends keep-alive and half-sent requests instead of waiting on them.
    forceCloseConnections: true,
    routerOptions: { maxParamLength: 200 },
  });
  app.setErrorHandler(errorHandler);
  // An empty JSON body reads as "no body", so that a write without content (DELETE, restore) can
  // still carry the JSON content type the cross-origin rule asks for; routes that need a body say so.
  const parseJson = app.getDefaultJsonParser('error', 'error');
  app.removeContentTypeParser('application/json');
  app.addContentTypeParser('application/json', { parseAs: 'string' }, (request, body, done) => {
    const text = typeof body === 'string' ? body : body.toString('utf8');
    if (text.trim() === '') return done(null, undefined);
    return parseJson(request, text, done);
  });
  installAccessControl(app, { token: options.token ?? null, loopbackOnly: options.loopbackOnly ?? false });

  // Every route as Fastify registers it, for the API description (and its test).
  const registered: Array<{ method: string; url: string }> = [];
  ROUTES_OF.set(app, registered);
  app.addHook('onRoute', (route) => {
    for (const method of [route.method].flat()) registered.push({ method, url: route.url });
  });
  // ETag/304 and Cache-Control run before compression, so validators describe the content, not its encoding.
  installCaching(app);
  // Answers of 1 kB and more are compressed (brotli quality 4, gzip, deflate) when the client accepts it;
  // request bodies are never decompressed, so body limits hold on the bytes that arrive.
  await app.register(fastifyCompress, { global: true, threshold: 1024, encodings: ['br', 'gzip', 'deflate'], globalDecompression: false });

  const { store, matcher } = options;
  app.get('/api/health', async () => ({ ok: true, version: TOOL_VERSION, library: store.counts() }));
  curveSetRoutes(app, store);
  searchRoutes(app, store, matcher);
  sheetRoutes(app, store, limits.sheetBytes, new SheetQuota(store, options.sheetQuota ?? DEFAULT_SHEET_QUOTA));
  transferRoutes(app, store, limits.importBytes);

  const dist = options.staticDir ? resolve(options.staticDir) : null;
  const workbench = dist !== null && existsSync(join(dist, 'index.html'));
  pageRoutes(app, store, matcher, () => workbench, options.workbenchMessage);
  if (workbench && dist) {
    await app.register(fastifyStatic, {
      root: dist,
      prefix: '/',
      index: ['index.html'],
      dotfiles: 'deny',
      serveDotFiles: false,
      decorateReply: false,
      cacheControl: false,
      setHeaders: (reply, path) => reply.header('Cache-Control', assetCacheControl(path)),
    });
  }
  let described: Record<string, unknown> | null = null;
  app.get('/openapi.json', async (_request, reply) => {
    described ??= openApiDocument(registered);
    return reply.type('application/json; charset=utf-8').send(JSON.stringify(described));
  });
  app.setNotFoundHandler((request, reply) => {
    void sendError(reply, 404, 'not-found', `Nothing is served at ${request.method} ${request.url.split('?')[0]?.slice(0, 200)}.`);
  });
  return app;
}

const ROUTES_OF = new WeakMap<FastifyInstance, ReadonlyArray<{ method: string; url: string }>>();

/** The routes an app registered, as Fastify's onRoute hook saw them (HEAD included). */
export function routesOf(app: FastifyInstance): ReadonlyArray<{ method: string; url: string }> {
  return ROUTES_OF.get(app) ?? [];
}
