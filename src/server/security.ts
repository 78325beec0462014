/**
 * Who may talk to the server.
 *
 * - Bound to loopback (the default): only requests whose Host names the loopback interface are
 *   served, so a web page elsewhere cannot reach the library through a rebound DNS name.
 * - Bound to any other address: every request must carry the access token, as
 *   `Authorization: Bearer <token>`, or the `pumpscribe_token` cookie. Opening any page once with
 *   `?token=<token>` sets that cookie (HttpOnly, SameSite=Strict) for the browser workbench.
 *   A token must be able to hold 128 bits (`tokenWeakness`).
 * - Either way, local pages are not trusted: another web app on this machine is "same site" to
 *   the browser (ports do not count), so SameSite cookies and loopback binds do not stop it.
 *   A request that changes anything (any method but GET, HEAD, OPTIONS) is served only when
 *   1. it carries the token in the Authorization header (a page of another origin cannot add
 *      that header without a CORS preflight, which this server never grants), or
 *   2. it comes from this very origin AND has a content type no page can send cross-origin
 *      without a preflight (`crossOriginRefusal`).
 */
import { createHash, timingSafeEqual } from 'node:crypto';
import type { FastifyInstance, FastifyReply, FastifyRequest } from 'fastify';
import { sendError, type ErrorCode } from './errors.ts';

export const TOKEN_ENV = 'PUMPSCRIBE_TOKEN';
export const TOKEN_COOKIE = 'pumpscribe_token';
/** The least strength of an access token, in bits (a random 128-bit secret cannot be guessed). */
export const MIN_TOKEN_BITS = 128;
/** Fewer distinct characters than this and the token is a pattern, whatever its length. */
export const MIN_TOKEN_DISTINCT = 10;
export const TOKEN_ADVICE = `make one with: node -e "console.log(require('node:crypto').randomBytes(32).toString('base64url'))"`;

const LOOPBACK_NAMES = new Set(['127.0.0.1', 'localhost', '::1', '[::1]']);

export function isLoopbackHost(host: string): boolean {
  return LOOPBACK_NAMES.has(host.toLowerCase()) || /^127\.\d+\.\d+\.\d+$/.test(host);
}

/** The host name of a Host header, without the port. */
function hostnameOf(hostHeader: string): string {
  if (hostHeader.startsWith('[')) return hostHeader.slice(0, hostHeader.indexOf(']') + 1);
  return hostHeader.split(':')[0] ?? '';
}

/**
 * The most bits a token can hold: its length times log2 of the alphabet its characters are drawn
 * from (hex, base64/base64url, or the union of the character classes it uses). This is an upper
 * bound — a word repeated is weaker than it says — so it is paired with a distinct-character
 * floor that refuses patterns such as "aaaa…" or "abababab…". A secret of 16 random bytes in hex
 * (32 characters, 4 bits each) passes exactly; 32 random bytes in base64url (43 characters) pass easily.
 */
export function tokenBits(token: string): number {
  const body = token.replace(/=+$/, '');
  let alphabet: number;
  if (/^[0-9a-f]+$/.test(body) || /^[0-9A-F]+$/.test(body)) alphabet = 16;
  else {
    alphabet = 0;
    if (/[a-z]/.test(body)) alphabet += 26;
    if (/[A-Z]/.test(body)) alphabet += 26;
    if (/[0-9]/.test(body)) alphabet += 10;
    // base64 and base64url add two symbols; any other punctuation opens all 33 printable ones.
    if (/[^A-Za-z0-9]/.test(body)) alphabet += /[^A-Za-z0-9+/_-]/.test(body) ? 33 : 2;
  }
  return body.length * Math.log2(Math.max(alphabet, 2));
}

/** Null for a token strong enough, else one sentence saying why it is refused and what to do. */
export function tokenWeakness(token: string | undefined | null): string | null {
  if (!token) return `Set ${TOKEN_ENV} to a random secret of at least ${MIN_TOKEN_BITS} bits (${TOKEN_ADVICE}).`;
  if (/\s/.test(token)) return `${TOKEN_ENV} contains white space; use a random secret of letters and digits (${TOKEN_ADVICE}).`;
  const bits = tokenBits(token);
  if (bits < MIN_TOKEN_BITS) {
    return `${TOKEN_ENV} can hold at most ${Math.floor(bits)} bits (${token.length} characters), less than the ${MIN_TOKEN_BITS} bits needed; use a longer random secret (${TOKEN_ADVICE}).`;
  }
  if (new Set(token).size < MIN_TOKEN_DISTINCT) {
    return `${TOKEN_ENV} uses only ${new Set(token).size} different characters, which is a pattern rather than a secret; use a random secret of at least ${MIN_TOKEN_BITS} bits (${TOKEN_ADVICE}).`;
  }
  return null;
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

/** Methods that never change anything here; every other method is treated as a write. */
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Content types a page of another origin cannot send without a CORS preflight (the Fetch
 * standard's CORS-safelisted types are only text/plain, multipart/form-data and
 * application/x-www-form-urlencoded; a no-cors fetch silently drops any other). JSON for the API,
 * JSON Lines for imports, and a sheet's own bytes for uploads.
 */
export function isWriteContentType(header: string | undefined): boolean {
  if (!header) return false;
  const type = header.split(';')[0]?.trim().toLowerCase() ?? '';
  return (
    type === 'application/json' ||
    type === 'application/x-ndjson' ||
    type === 'application/jsonl' ||
    type === 'application/jsonlines' ||
    type === 'application/pdf' ||
    type === 'application/octet-stream' ||
    /^image\/[\w.+-]+$/.test(type)
  );
}

export interface Refusal {
  status: number;
  code: ErrorCode;
  message: string;
}

const FOREIGN_PAGE = 'Requests that change the library must come from the Pumpscribe workbench itself (this server\'s own address and port), not from a page of another site or another local port.';

/**
 * The same-origin and content-type rule for one write request (see the header of this file).
 * `host` is the request's Host header, already checked against loopback (or guarded by the token).
 *
 * When `Origin` is absent, `Sec-Fetch-Site` decides (sent by every current browser engine on every
 * request; only "same-origin" passes), then `Referer` (must be this origin). A request with none of
 * the three is not from a browser page — every browser adds Origin to non-GET requests it sends for a
 * page — so it is a local script (curl, the CLI, tests), which the content-type rule still binds.
 */
export function crossOriginRefusal(headers: FastifyRequest['headers'], host: string): Refusal | null {
  const own = `http://${host}`.toLowerCase();
  const origin = headers.origin;
  const sameOrigin = (url: string): boolean => {
    try {
      const u = new URL(url);
      return `${u.protocol}//${u.host}`.toLowerCase() === own;
    } catch {
      return false;
    }
  };
  if (origin !== undefined) {
    if (origin === 'null' || !sameOrigin(origin)) return { status: 403, code: 'origin-refused', message: FOREIGN_PAGE };
  } else {
    const site = headers['sec-fetch-site'];
    const referer = headers.referer;
    if (site !== undefined) {
      if (site !== 'same-origin') return { status: 403, code: 'origin-refused', message: FOREIGN_PAGE };
    } else if (referer !== undefined && !sameOrigin(referer)) {
      return { status: 403, code: 'origin-refused', message: FOREIGN_PAGE };
    }
  }
  if (!isWriteContentType(headers['content-type'])) {
    return {
      status: 403,
      code: 'content-type-refused',
      message: 'Requests that change the library must send Content-Type application/json (send {} when there is nothing to say), application/x-ndjson for imports, or the sheet\'s own type for uploads; plain-text and form posts are refused because any web page can send them.',
    };
  }
  return null;
}

function refuse(reply: FastifyReply, status: number, code: ErrorCode, message: string): void {
  void sendError(reply, status, code, message);
}

export interface AccessOptions {
  /** When set, every request must carry it. */
  token?: string | null;
  /** When true (loopback binds), the Host header must name the loopback interface. */
  loopbackOnly?: boolean;
}

export function installAccessControl(app: FastifyInstance, options: AccessOptions): void {
  if (options.token) {
    const weak = tokenWeakness(options.token);
    if (weak) throw new Error(weak);
  }
  const expected = options.token ? digest(options.token) : null;
  app.addHook('onRequest', async (request: FastifyRequest, reply: FastifyReply) => {
    reply.header('X-Content-Type-Options', 'nosniff');
    reply.header('Referrer-Policy', 'no-referrer');
    reply.header('X-Frame-Options', 'DENY');
    reply.header('Cross-Origin-Resource-Policy', 'same-origin');

    const host = request.headers.host ?? '';
    if (options.loopbackOnly && !isLoopbackHost(hostnameOf(host))) {
      return refuse(reply, 403, 'host-refused', 'This server only answers requests addressed to 127.0.0.1 or localhost.');
    }
    const auth = request.headers.authorization;
    const bearer = auth?.startsWith('Bearer ') ? auth.slice(7).trim() : undefined;
    // The header proves the caller knows the token; a cookie only proves a browser once did.
    const headerToken = expected !== null && tokenMatches(bearer, expected);
    if (!SAFE_METHODS.has(request.method) && !headerToken) {
      const refusal = crossOriginRefusal(request.headers, host);
      if (refusal) {
        request.log.warn({ code: refusal.code, method: request.method, url: request.url.split('?')[0], origin: request.headers.origin }, 'refused a write');
        return refuse(reply, refusal.status, refusal.code, refusal.message);
      }
    }
    if (!expected || headerToken) return;
    if (tokenMatches(cookieValue(request.headers.cookie, TOKEN_COOKIE), expected)) return;
    const query = request.query as Record<string, unknown> | undefined;
    const fromQuery = typeof query?.token === 'string' ? query.token : undefined;
    if (request.method === 'GET' && tokenMatches(fromQuery, expected)) {
      // Set the cookie and drop the token from the address bar (and from any later Referer).
      const url = new URL(request.url, 'http://x');
      url.searchParams.delete('token');
      reply.header('Set-Cookie', `${TOKEN_COOKIE}=${encodeURIComponent(fromQuery as string)}; Path=/; HttpOnly; SameSite=Strict`);
      return reply.redirect(`${url.pathname}${url.search}`, 303);
    }
    return refuse(reply, 401, 'token-required', `This server needs the access token: send "Authorization: Bearer <token>" with the value of ${TOKEN_ENV}, or open the page once with ?token=<token>.`);
  });
}
