/**
 * Who may talk to the server.
 *
 * - Bound to loopback (the default): only requests whose Host names the loopback interface are
 *   served, so a web page elsewhere cannot reach the library through a rebound DNS name.
 * - Bound to any other address: every request must carry the access token, as
 *   `Authorization: Bearer <token>`, or the `pumpscribe_token` cookie. Opening any page once with
 *   `?token=<token>` sets that cookie (HttpOnly, SameSite=Strict) for the browser workbench.
 * - Either way, a state-changing request sent by another origin's page is refused.
 */
import { createHash, timingSafeEqual } from 'node:crypto';
import type { FastifyInstance, FastifyReply, FastifyRequest } from 'fastify';

export const TOKEN_ENV = 'PUMPSCRIBE_TOKEN';
export const TOKEN_COOKIE = 'pumpscribe_token';
/** Shorter tokens are refused: a guessable token on a shared network is no protection. */
export const MIN_TOKEN_LENGTH = 16;

const LOOPBACK_NAMES = new Set(['127.0.0.1', 'localhost', '::1', '[::1]']);

export function isLoopbackHost(host: string): boolean {
  return LOOPBACK_NAMES.has(host.toLowerCase()) || /^127\.\d+\.\d+\.\d+$/.test(host);
}

/** The host name of a Host header, without the port. */
function hostnameOf(hostHeader: string): string {
  if (hostHeader.startsWith('[')) return hostHeader.slice(0, hostHeader.indexOf(']') + 1);
  return hostHeader.split(':')[0] ?? '';
}

function digest(text: string): Buffer {
  return createHash('sha256').update(text).digest();
}

function tokenMatches(given: string | undefined, expected: Buffer): boolean {
  return given !== undefined && given.length > 0 && timingSafeEqual(digest(given), expected);
}

function cookieValue(header: string | undefined, name: string): string | undefined {
  if (!header) return undefined;
  for (const part of header.split(';')) {
    const [k, ...v] = part.trim().split('=');
    if (k === name) {
      try {
        return decodeURIComponent(v.join('='));
      } catch {
        return undefined;
      }
    }
  }
  return undefined;
}

function refuse(reply: FastifyReply, status: number, message: string): void {
  void reply.code(status).type('application/json; charset=utf-8').send({ error: message });
}

export interface AccessOptions {
  /** When set, every request must carry it. */
  token?: string | null;
  /** When true (loopback binds), the Host header must name the loopback interface. */
  loopbackOnly?: boolean;
}

export function installAccessControl(app: FastifyInstance, options: AccessOptions): void {
  const expected = options.token ? digest(options.token) : null;
  app.addHook('onRequest', async (request: FastifyRequest, reply: FastifyReply) => {
    reply.header('X-Content-Type-Options', 'nosniff');
    reply.header('Referrer-Policy', 'no-referrer');
    reply.header('X-Frame-Options', 'DENY');
    reply.header('Cross-Origin-Resource-Policy', 'same-origin');

    const host = request.headers.host ?? '';
    if (options.loopbackOnly && !isLoopbackHost(hostnameOf(host))) {
      return refuse(reply, 403, 'This server only answers requests addressed to 127.0.0.1 or localhost.');
    }
    if (request.method !== 'GET' && request.method !== 'HEAD') {
      const origin = request.headers.origin;
      if (origin !== undefined && origin !== 'null') {
        let originHost = '';
        try {
          originHost = new URL(origin).host;
        } catch {
          originHost = '';
        }
        const sameSite = originHost === host || (options.loopbackOnly === true && isLoopbackHost(hostnameOf(originHost)));
        if (!sameSite) return refuse(reply, 403, 'Requests that change the library must come from the Pumpscribe workbench itself.');
      } else if (origin === 'null') {
        return refuse(reply, 403, 'Requests that change the library must come from the Pumpscribe workbench itself.');
      }
    }
    if (!expected) return;
    const auth = request.headers.authorization;
    const bearer = auth?.startsWith('Bearer ') ? auth.slice(7).trim() : undefined;
    if (tokenMatches(bearer, expected) || tokenMatches(cookieValue(request.headers.cookie, TOKEN_COOKIE), expected)) return;
    const query = request.query as Record<string, unknown> | undefined;
    const fromQuery = typeof query?.token === 'string' ? query.token : undefined;
    if (request.method === 'GET' && tokenMatches(fromQuery, expected)) {
      // Set the cookie and drop the token from the address bar (and from any later Referer).
      const url = new URL(request.url, 'http://x');
      url.searchParams.delete('token');
      reply.header('Set-Cookie', `${TOKEN_COOKIE}=${encodeURIComponent(fromQuery as string)}; Path=/; HttpOnly; SameSite=Strict`);
      return reply.redirect(`${url.pathname}${url.search}`, 303);
    }
    return refuse(reply, 401, `This server needs the access token: send "Authorization: Bearer <token>" with the value of ${TOKEN_ENV}, or open the page once with ?token=<token>.`);
  });
}
