/**
 * Starting and stopping the server: open (and on first start seed) the library, decide what to
 * do about the workbench, bind, and say plainly where everything is.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { FastifyInstance } from 'fastify';
import { LibraryError } from '../library/errors.ts';
import { LibraryStore } from '../library/store.ts';
import { libraryMatcher } from '../library/matcher.ts';
import { buildApp } from './app.ts';
import { isLoopbackHost, TOKEN_ENV, tokenWeakness } from './security.ts';
import { DEFAULT_SHEET_QUOTA, parseSize, sizeText } from './quota.ts';
import { DIST_DIR, PROJECT_ROOT, buildWorkbench, workbenchState } from './workbench.ts';

export { DEFAULT_LIBRARY_FILE } from '../library/defaultFile.ts';
import { DEFAULT_LIBRARY_FILE } from '../library/defaultFile.ts';
export const DEFAULT_HOST = '127.0.0.1';
export const DEFAULT_PORT = 5280;
export const DEMO_DIR = join(PROJECT_ROOT, 'samples', 'demo');

export interface ServeOptions {
  /** A number, or the text of a --port flag. */
  port?: number | string;
  host?: string;
  /** Library file; relative paths are taken from the working directory. */
  library?: string;
  /** Build dist/ first when it is missing or older than its sources (`start`). */
  buildWorkbench?: boolean;
  /** Seed a new library with the invented demo curve sets. */
  seed?: boolean;
  demoDir?: string;
  staticDir?: string;
  /** Environment to read the access token from. */
  env?: NodeJS.ProcessEnv;
  /** Where to say what is happening (stdout by default). */
  say?: (line: string) => void;
  /** Bytes of source sheets the library may hold, or a size with a unit ("2GiB") from --sheet-quota. */
  sheetQuota?: number | string;
  /** Server log of warnings and errors on stderr (on unless false). */
  logger?: boolean;
}

export interface RunningServer {
  app: FastifyInstance;
  store: LibraryStore;
  url: string;
  close(): Promise<void>;
}

export function parsePort(value: string | number | undefined): number {
  if (value === undefined) return DEFAULT_PORT;
  const n = typeof value === 'number' ? value : /^\d+$/.test(value.trim()) ? Number(value) : NaN;
  if (!Number.isInteger(n) || n < 0 || n > 65535) throw new LibraryError(`The port must be a whole number from 0 to 65535 (0 picks a free one), not "${value}".`, 'invalid');
  return n;
}

/** Adds each samples/demo/*.curveset.json to a new library; returns how many were added. */
export function seedDemo(store: LibraryStore, demoDir: string, say: (line: string) => void): number {
  if (!existsSync(demoDir)) {
    say(`No demo curve sets found in ${demoDir}; the library starts empty.`);
    return 0;
  }
  let added = 0;
  for (const file of readdirSync(demoDir).filter((f) => f.endsWith('.curveset.json')).sort()) {
    try {
      store.create(JSON.parse(readFileSync(join(demoDir, file), 'utf8')));
      added += 1;
    } catch (error) {
      say(`Skipped demo file ${file}: ${error instanceof Error ? error.message : String(error)}`);
    }
  }
  if (added) say(`Seeded the new library with ${added} demo curve sets from ${demoDir}. They are invented demo entries, not real pumps; archive them when you no longer need them.`);
  return added;
}

export async function startServer(options: ServeOptions = {}): Promise<RunningServer> {
  const say = options.say ?? ((line: string) => process.stdout.write(`${line}\n`));
  const env = options.env ?? process.env;
  const host = options.host ?? DEFAULT_HOST;
  const port = parsePort(options.port);
  const libraryFile = resolve(options.library ?? DEFAULT_LIBRARY_FILE);
  const sheetQuota = options.sheetQuota === undefined ? DEFAULT_SHEET_QUOTA : typeof options.sheetQuota === 'number' ? options.sheetQuota : parseSize(options.sheetQuota);

  const loopback = isLoopbackHost(host);
  let token: string | null = null;
  if (!loopback) {
    token = env[TOKEN_ENV]?.trim() || null;
    const weak = tokenWeakness(token);
    if (weak) {
      throw new LibraryError(`Binding ${host} exposes the library to the network, so it needs a strong access token (or bind 127.0.0.1): ${weak}`, 'invalid');
    }
    say(`WARNING: binding ${host} makes the library reachable from other machines. Every request must carry the token from ${TOKEN_ENV} (header "Authorization: Bearer <token>", or open the page once with ?token=<token>). Traffic is not encrypted; use this only on a network you trust.`);
  }

  let staticDir = options.staticDir ?? DIST_DIR;
  let workbenchMessage: string | undefined;
  const state = workbenchState();
  if (options.buildWorkbench && state.buildable && (!state.built || state.stale)) {
    say(state.built ? 'The workbench sources changed since the last build; rebuilding dist/ …' : 'Building the workbench into dist/ …');
    const failure = await buildWorkbench();
    if (failure) {
      say(`The workbench could not be built (${failure}).${state.built ? ' Serving the previous build.' : ' Serving the library page instead.'}`);
      if (!state.built) workbenchMessage = `The workbench could not be built (${failure}); this page lists and searches the library meanwhile.`;
    }
  } else if (!state.built && !options.staticDir) {
    workbenchMessage = state.buildable
      ? 'The workbench is not built yet; run "npm start" (which builds it) or "npm run build". This page lists and searches the library meanwhile.'
      : 'The workbench is not part of this installation; this page lists and searches the library.';
  }
  if (!existsSync(join(staticDir, 'index.html'))) staticDir = '';

  const store = LibraryStore.open(libraryFile);
  for (const notice of store.importNotices) say(notice);
  try {
    if (store.isNew) {
      say(`Created a new library file: ${libraryFile}`);
      if (options.seed !== false) seedDemo(store, options.demoDir ?? DEMO_DIR, say);
    }
    const app = await buildApp({
      store,
      matcher: libraryMatcher,
      staticDir: staticDir || null,
      ...(workbenchMessage ? { workbenchMessage } : {}),
      token,
      loopbackOnly: loopback,
      logger: options.logger ?? true,
      sheetQuota,
    });
    let address: string;
    try {
      address = await app.listen({ port, host });
    } catch (error) {
      await app.close();
      const code = (error as NodeJS.ErrnoException).code;
      if (code === 'EADDRINUSE') throw new LibraryError(`Port ${port} on ${host} is already in use; choose another with --port (0 picks a free one).`, 'conflict');
      if (code === 'EADDRNOTAVAIL' || code === 'ENOTFOUND' || code === 'EACCES') {
        throw new LibraryError(`Cannot bind ${host}:${port} (${code}); give an address of this machine with --host, or a port above 1023.`, 'invalid');
      }
      throw error;
    }
    const actual = new URL(address);
    const url = `http://${loopback && host === 'localhost' ? 'localhost' : actual.hostname.includes(':') ? `[${actual.hostname}]` : actual.hostname}:${actual.port}/`;
    const counts = store.counts();
    say(`Pumpscribe is serving at ${url}`);
    say(`Library file: ${libraryFile} (${counts.entries} entries, ${counts.archived} archived, ${counts.revisions} revisions; source sheets may take up to ${sizeText(sheetQuota)}, see --sheet-quota).`);
    say(staticDir ? `Workbench: ${url}   Library page: ${url}library   API: ${url}api/curvesets` : `Library page: ${url}   API: ${url}api/curvesets`);
    // Parse every entry's search copy in the background, so that duty searches run warm.
    void store.warmSearchCache().catch(() => undefined);
    let closed = false;
    return {
      app,
      store,
      url,
      async close() {
        if (closed) return;
        closed = true;
        await app.close();
        store.close();
      },
    };
  } catch (error) {
    store.close();
    throw error;
  }
}
