/** A real server on 127.0.0.1 with a random port, over a real SQLite file, for the integration tests. */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { FastifyInstance } from 'fastify';
import { buildApp, type AppOptions } from '../../src/server/app.ts';
import { LibraryStore, type OpenOptions } from '../../src/library/store.ts';
import { libraryMatcher } from '../../src/library/matcher.ts';

export interface TestServer {
  url: string;
  store: LibraryStore;
  app: FastifyInstance;
  close(): Promise<void>;
}

export function tempDir(prefix = 'pumpscribe-server-'): { dir: string; remove(): void } {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  return { dir, remove: () => rmSync(dir, { recursive: true, force: true }) };
}

export async function startTestServer(file: string, options: Partial<AppOptions> = {}, storeOptions: OpenOptions = {}): Promise<TestServer> {
  const store = LibraryStore.open(file, storeOptions);
  const app = await buildApp({ store, matcher: libraryMatcher, staticDir: null, loopbackOnly: true, ...options });
  const address = await app.listen({ port: 0, host: '127.0.0.1' });
  return {
    url: address,
    store,
    app,
    async close() {
      await app.close();
      store.close();
    },
  };
}

export async function json(url: string, init: RequestInit = {}): Promise<{ status: number; body: any; headers: Headers; text: string }> {
  const res = await fetch(url, init);
  const text = await res.text();
  let body: unknown = undefined;
  try {
    body = JSON.parse(text);
  } catch {
    body = undefined;
  }
  return { status: res.status, body, headers: res.headers, text };
}

export function postJson(url: string, value: unknown, method = 'POST', headers: Record<string, string> = {}) {
  return json(url, { method, headers: { 'content-type': 'application/json', ...headers }, body: JSON.stringify(value) });
}
