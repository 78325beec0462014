/**
 * Validators and cache headers.
 *
 * - Every successful GET/HEAD answered with a string or buffer (JSON, the library page) carries an
 *   ETag: the route's own when it set one (a stored revision, a sheet's SHA-256), otherwise a weak
 *   one from a hash of the body (weak, because compression gives the same content other bytes).
 *   A request whose If-None-Match names it gets 304 with no body (RFC 9110 §13.1.2, weak comparison).
 * - JSON and HTML answers default to `Cache-Control: no-cache`: a browser may keep them, but asks
 *   each time, and the ETag makes the asking cheap.
 * - Built assets: files whose names carry Vite's content hash never change, so they may be kept a
 *   year (`immutable`); everything else, index.html first, is `no-cache` so a new build shows at once.
 * Streams (the library export, static files) are left alone here; @fastify/static answers
 * conditional requests for its files itself.
 */
import { createHash } from 'node:crypto';
import { basename } from 'node:path';
import type { FastifyInstance } from 'fastify';

export const IMMUTABLE = 'public, max-age=31536000, immutable';
export const REVALIDATE = 'no-cache';

/** Vite names built chunks `name-<hash>.ext` with an 8-character base64url hash, under assets/. */
export function isHashedAsset(path: string): boolean {
  return /(^|[\\/])assets[\\/]/.test(path) && /-[A-Za-z0-9_-]{8,}\.[a-z0-9]+$/.test(basename(path));
}

/** Cache-Control for a file served from the built workbench. */
export function assetCacheControl(path: string): string {
  return isHashedAsset(path) ? IMMUTABLE : REVALIDATE;
}

/** True when If-None-Match names `etag` (weak comparison: W/ prefixes are ignored), or is `*`. */
export function noneMatch(header: string | undefined, etag: string): boolean {
  if (!header) return false;
  const bare = (tag: string) => tag.trim().replace(/^W\//, '');
  const wanted = bare(etag);
  return header.split(',').some((t) => t.trim() === '*' || bare(t) === wanted);
}

export function weakEtag(payload: string | Buffer): string {
  return `W/"${createHash('sha256').update(payload).digest('base64url').slice(0, 27)}"`;
}

export function installCaching(app: FastifyInstance): void {
  app.addHook('onSend', async (request, reply, payload) => {
    if (request.method !== 'GET' && request.method !== 'HEAD') return payload;
    if (reply.statusCode !== 200) return payload;
    if (typeof payload !== 'string' && !Buffer.isBuffer(payload)) return payload;
    const type = String(reply.getHeader('content-type') ?? '');
    if (!reply.hasHeader('cache-control') && /json|html/.test(type)) reply.header('Cache-Control', REVALIDATE);
    let etag = reply.getHeader('etag');
    if (typeof etag !== 'string') {
      etag = weakEtag(payload);
      reply.header('ETag', etag);
    }
    if (noneMatch(request.headers['if-none-match'], etag)) {
      reply.code(304);
      reply.removeHeader('content-type');
      reply.removeHeader('content-length');
      return '';
    }
    return payload;
  });
}
