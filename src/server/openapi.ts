/**
 * The OpenAPI 3.1 description served at /openapi.json, built from one route table and the same
 * zod schemas the server and the model use (z.toJSONSchema, draft 2020-12 — the dialect of
 * OpenAPI 3.1). The document lists the routes this app instance actually registered: `buildApp`
 * records each route Fastify registers, and every recorded route must have a row here (a test
 * compares the two, so a new route without a description fails the suite).
 *
 * Why not @fastify/swagger: it reads JSON schemas attached to each route, which would make Fastify
 * validate bodies a second time with its own validator beside zod, and the route files of the
 * library belong to another layer; one table here keeps the description in one place.
 */
import { z } from 'zod';
import { curveSetJsonSchema } from '../model/jsonSchema.ts';
import { takeoffJsonSchema } from '../model/takeoff.ts';
import { TOOL_VERSION } from '../version.ts';
import { ERROR_CODES, type ErrorCode } from './errors.ts';
import * as S from './apiSchemas.ts';

type Json = Record<string, unknown>;
export type Method = 'GET' | 'POST' | 'PUT' | 'DELETE';

interface Param {
  name: string;
  description: string;
  schema?: Json;
  required?: boolean;
}

export interface RouteDoc {
  method: Method;
  /** Fastify's path, e.g. /api/curvesets/:id */
  url: string;
  summary: string;
  tag: 'library' | 'sheets' | 'search' | 'transfer' | 'pages' | 'meta';
  query?: Param[];
  headers?: Param[];
  /** media type → schema (a component name or an inline schema) */
  body?: Record<string, string | Json>;
  /** status → description and, for JSON answers, the schema's component name or media types */
  ok: Record<string, { description: string; json?: string; content?: Record<string, Json> }>;
  errors: ErrorCode[];
}

const str = { type: 'string' };
const UNITS_Q: Param = { name: 'units', description: '"si" (flow m³/h, head m) or "us" (flow gpm, head ft)', schema: { type: 'string', enum: ['si', 'us'] }, required: true };
const WRITE_ERRORS: ErrorCode[] = ['origin-refused', 'content-type-refused', 'storage-full', 'storage-read-only', 'storage-busy', 'storage-io'];
const STORED = { description: 'The curve set exactly as stored; X-Pumpscribe-Id, X-Pumpscribe-Revision and ETag name the revision', content: { 'application/json': { schema: { $ref: '#/components/schemas/CurveSet' } } } };
const NAME_Q: Param = { name: 'name', description: 'file name to keep with it (display only)', schema: str };

/** Every route the server can register. `/` and `/*` exist only with or without a built workbench. */
export const ROUTES: RouteDoc[] = [
  { method: 'GET', url: '/api/health', tag: 'meta', summary: 'Server version and library counts', ok: { 200: { description: 'Alive', json: 'Health' } }, errors: [] },
  { method: 'GET', url: '/openapi.json', tag: 'meta', summary: 'This description (OpenAPI 3.1)', ok: { 200: { description: 'The document', content: { 'application/json': { type: 'object' } } } }, errors: [] },
  {
    method: 'GET', url: '/api/curvesets', tag: 'library', summary: 'List entries, newest first, optionally filtered by words in name, maker or model',
    query: [
      { name: 'q', description: 'words to look for', schema: str },
      { name: 'archived', description: 'false (default), true, or "all"', schema: str },
      { name: 'limit', description: '1–1000, default 100', schema: { type: 'integer', minimum: 1, maximum: 1000 } },
      { name: 'offset', description: 'entries to skip', schema: { type: 'integer', minimum: 0 } },
    ],
    ok: { 200: { description: 'A page of entries and the total', json: 'EntryList' } }, errors: ['invalid-input'],
  },
  {
    method: 'POST', url: '/api/curvesets', tag: 'library', summary: 'Create an entry from a curve set (revision 1)',
    query: [{ name: 'accept_failing', description: 'store a set whose checks fail (it is marked and ranked last)', schema: str }],
    body: { 'application/json': 'CurveSet' }, ok: { 201: { description: 'Created; Location names the entry', json: 'SavedRevision' } },
    errors: ['invalid-input', 'invalid-json', 'too-large', 'unsupported-media-type', ...WRITE_ERRORS],
  },
  { method: 'GET', url: '/api/curvesets/:id', tag: 'library', summary: 'The latest revision of an entry', ok: { 200: STORED }, errors: ['not-found'] },
  {
    method: 'PUT', url: '/api/curvesets/:id', tag: 'library', summary: 'Add a revision; If-Match names the revision edited',
    headers: [{ name: 'If-Match', description: 'the revision you edited, e.g. "3"', schema: str }],
    query: [
      { name: 'as_new_revision', description: 'true to store a curve set of a different pump as a revision anyway', schema: str },
      { name: 'accept_failing', description: 'store a set whose checks fail', schema: str },
    ],
    body: { 'application/json': 'CurveSet' }, ok: { 200: { description: 'Stored as the next revision', json: 'SavedRevision' } },
    errors: ['invalid-input', 'invalid-json', 'not-found', 'conflict', 'precondition-failed', 'precondition-required', 'too-large', ...WRITE_ERRORS],
  },
  { method: 'DELETE', url: '/api/curvesets/:id', tag: 'library', summary: 'Archive an entry (kept, hidden from lists and search); send Content-Type application/json', ok: { 200: { description: 'The archived entry', json: 'EntryInfo' } }, errors: ['not-found', ...WRITE_ERRORS] },
  { method: 'POST', url: '/api/curvesets/:id/restore', tag: 'library', summary: 'Bring an archived entry back; send {} as application/json', body: { 'application/json': { type: 'object' } }, ok: { 200: { description: 'The restored entry', json: 'EntryInfo' } }, errors: ['not-found', ...WRITE_ERRORS] },
  { method: 'GET', url: '/api/curvesets/:id/summary', tag: 'library', summary: 'Summary of an entry', ok: { 200: { description: 'Summary', json: 'EntryInfo' } }, errors: ['not-found'] },
  { method: 'GET', url: '/api/curvesets/:id/revisions', tag: 'library', summary: 'Every revision of an entry', ok: { 200: { description: 'Revisions, oldest first', json: 'RevisionList' } }, errors: ['not-found'] },
  { method: 'GET', url: '/api/curvesets/:id/revisions/:revision', tag: 'library', summary: 'One revision of an entry, exactly as stored', ok: { 200: STORED }, errors: ['not-found'] },
  {
    method: 'GET', url: '/api/search', tag: 'search', summary: 'Pumps of the library that meet a duty point, ranked',
    query: [
      { name: 'flow', description: 'duty flow in the chosen units', schema: { type: 'number' }, required: true },
      { name: 'head', description: 'duty head in the chosen units', schema: { type: 'number' }, required: true },
      UNITS_Q,
      { name: 'static', description: 'static head of the system curve', schema: { type: 'number' } },
      { name: 'hours', description: 'running hours per year', schema: { type: 'number' } },
      { name: 'tariff', description: 'energy price per kWh', schema: { type: 'number' } },
      { name: 'limit', description: 'candidates to return, 1–500', schema: { type: 'integer', minimum: 1, maximum: 500 } },
    ],
    ok: { 200: { description: 'Candidates and the caution that goes with them', json: 'DutySearch' } }, errors: ['invalid-input'],
  },
  {
    method: 'POST', url: '/api/sheets', tag: 'sheets', summary: 'Store a source sheet (PDF or image bytes), once per SHA-256, within the library\'s sheet quota',
    query: [NAME_Q],
    body: { 'application/pdf': { type: 'string', contentMediaType: 'application/pdf' }, 'image/*': { type: 'string', contentMediaType: 'image/*' }, 'application/octet-stream': { type: 'string', contentMediaType: 'application/octet-stream' } },
    ok: { 200: { description: 'Already stored', json: 'SheetStored' }, 201: { description: 'Stored', json: 'SheetStored' } },
    errors: ['invalid-input', 'too-large', 'sheet-quota-exceeded', ...WRITE_ERRORS],
  },
  { method: 'GET', url: '/api/sheets', tag: 'sheets', summary: 'Every stored sheet', ok: { 200: { description: 'Sheets', json: 'SheetList' } }, errors: [] },
  {
    method: 'GET', url: '/api/sheets/:sha256', tag: 'sheets', summary: 'The bytes of a sheet, typed from the bytes themselves, sandboxed',
    ok: { 200: { description: 'The sheet', content: { 'application/pdf': { type: 'string' }, 'image/*': { type: 'string' }, 'application/octet-stream': { type: 'string' } } } }, errors: ['not-found'],
  },
  { method: 'GET', url: '/api/sheets/:sha256/takeoffs', tag: 'sheets', summary: 'The take-off files kept with a sheet', ok: { 200: { description: 'Take-offs', json: 'TakeoffList' } }, errors: ['not-found'] },
  { method: 'POST', url: '/api/sheets/:sha256/takeoffs', tag: 'sheets', summary: 'Keep a take-off file with its sheet', query: [NAME_Q], body: { 'application/json': 'Takeoff' }, ok: { 200: { description: 'Already kept', json: 'TakeoffStored' }, 201: { description: 'Kept', json: 'TakeoffStored' } }, errors: ['invalid-input', 'invalid-json', 'not-found', ...WRITE_ERRORS] },
  { method: 'GET', url: '/api/takeoffs/:id', tag: 'sheets', summary: 'A take-off file', ok: { 200: { description: 'The take-off file', json: 'Takeoff' } }, errors: ['not-found'] },
  {
    method: 'GET', url: '/api/library/export', tag: 'transfer', summary: 'The whole library as JSON Lines (a consistent snapshot)',
    ok: { 200: { description: 'One header line, then one line per entry, sheet and take-off', content: { 'application/x-ndjson': { type: 'string' } } } }, errors: [],
  },
  {
    method: 'POST', url: '/api/library/import', tag: 'transfer', summary: 'Add an export to this library, all or nothing',
    body: { 'application/x-ndjson': { type: 'string' } }, ok: { 200: { description: 'What was added', json: 'ImportReport' } },
    errors: ['invalid-input', 'too-large', ...WRITE_ERRORS],
  },
  {
    method: 'GET', url: '/library', tag: 'pages', summary: 'The plain library page (HTML): list, filter, duty search',
    query: [{ name: 'q', description: 'words to look for', schema: str }, { name: 'flow', description: 'duty flow', schema: str }, { name: 'head', description: 'duty head', schema: str }, { name: 'static', description: 'static head', schema: str }, { name: 'units', description: '"si" or "us"', schema: str }],
    ok: { 200: { description: 'The page', content: { 'text/html': { type: 'string' } } } }, errors: ['invalid-input'],
  },
  { method: 'GET', url: '/', tag: 'pages', summary: 'Home: the workbench when built, else the library page', ok: { 200: { description: 'The page', content: { 'text/html': { type: 'string' } } } }, errors: [] },
  { method: 'GET', url: '/*', tag: 'pages', summary: 'Files of the built workbench (hashed assets are immutable for a year; index.html is revalidated)', ok: { 200: { description: 'A file', content: { '*/*': {} } } }, errors: ['not-found'] },
];

/** `/api/curvesets/:id` → `/api/curvesets/{id}`; Fastify's wildcard becomes a path parameter. */
export function openApiPath(url: string): string {
  return url.replace(/:([A-Za-z_]\w*)/g, '{$1}').replace(/\/\*$/, '/{file}');
}

function pathParams(url: string): Json[] {
  const names = [...openApiPath(url).matchAll(/\{(\w+)\}/g)].map((m) => m[1] as string);
  return names.map((name) => ({ name, in: 'path', required: true, schema: str, ...(name === 'file' ? { description: 'path of a file of the built workbench' } : {}) }));
}

/** JSON Schema for a component: draft 2020-12 without the meta keys OpenAPI components do not need. */
function component(schema: Json): Json {
  const { $schema: _s, $id: _i, ...rest } = schema;
  return rest;
}

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });

export function componentSchemas(): Record<string, Json> {
  const fromZod = (s: z.ZodType) => component(z.toJSONSchema(s, { target: 'draft-2020-12', io: 'output', unrepresentable: 'any' }) as Json);
  return {
    CurveSet: component(curveSetJsonSchema()),
    Takeoff: component(takeoffJsonSchema()),
    Error: fromZod(S.ErrorBody),
    Health: fromZod(S.Health),
    EntryInfo: fromZod(S.EntryInfo),
    EntryList: fromZod(S.EntryList),
    SavedRevision: fromZod(S.SavedRevision),
    RevisionList: fromZod(S.RevisionList),
    SheetStored: fromZod(S.SheetStored),
    SheetList: fromZod(S.SheetList),
    TakeoffStored: fromZod(S.TakeoffStored),
    TakeoffList: fromZod(S.TakeoffList),
    ImportReport: fromZod(S.ImportReport),
    DutySearch: fromZod(S.DutySearch),
  };
}

function operation(route: RouteDoc): Json {
  const parameters = [
    ...pathParams(route.url),
    ...(route.query ?? []).map((p) => ({ name: p.name, in: 'query', description: p.description, required: p.required ?? false, schema: p.schema ?? str })),
    ...(route.headers ?? []).map((p) => ({ name: p.name, in: 'header', description: p.description, required: p.required ?? false, schema: p.schema ?? str })),
  ];
  const responses: Json = {};
  for (const [status, r] of Object.entries(route.ok)) {
    const content = r.json ? { 'application/json': { schema: ref(r.json) } } : r.content ? Object.fromEntries(Object.entries(r.content).map(([t, s]) => [t, { schema: s }])) : undefined;
    responses[status] = { description: r.description, ...(content ? { content } : {}) };
  }
  if (route.method === 'GET') responses['304'] = { description: 'Not modified: If-None-Match named the current ETag' };
  const byStatus = new Map<number, ErrorCode[]>();
  for (const code of new Set(route.errors)) byStatus.set(ERROR_CODES[code].status, [...(byStatus.get(ERROR_CODES[code].status) ?? []), code]);
  for (const [status, codes] of [...byStatus].sort((a, b) => a[0] - b[0])) {
    responses[String(status)] = { description: `Refused; code ${codes.map((c) => `"${c}"`).join(', ')}`, content: { 'application/json': { schema: ref('Error') } } };
  }
  responses['500'] ??= { description: 'Unexpected fault, logged; code "internal-error" (or "library-damaged")', content: { 'application/json': { schema: ref('Error') } } };
  const body = route.body
    ? { requestBody: { required: route.method !== 'DELETE', content: Object.fromEntries(Object.entries(route.body).map(([t, s]) => [t, { schema: typeof s === 'string' ? ref(s) : s }])) } }
    : {};
  return {
    operationId: `${route.method.toLowerCase()}${openApiPath(route.url).replace(/[{}]/g, '').split(/[^A-Za-z0-9]+/).map((w) => w.charAt(0).toUpperCase() + w.slice(1)).join('') || 'Root'}`,
    summary: route.summary,
    tags: [route.tag],
    ...(parameters.length ? { parameters } : {}),
    ...body,
    responses,
  };
}

function codeTable(): string {
  const rows = Object.entries(ERROR_CODES).map(([code, info]) => `| \`${code}\` | ${info.status} | ${info.meaning} |`);
  return ['| code | status | when |', '|---|---|---|', ...rows].join('\n');
}

/**
 * The document for the routes given (method + Fastify url, as registered). Routes without a row in
 * `ROUTES` are listed too, marked undocumented, so the document never hides a route.
 */
export function openApiDocument(registered: ReadonlyArray<{ method: string; url: string }>): Json {
  const paths: Record<string, Json> = {};
  const seen = new Set<string>();
  for (const r of registered) {
    if (r.method === 'HEAD' || r.method === 'OPTIONS') continue;
    const key = `${r.method} ${r.url}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const doc = ROUTES.find((d) => d.method === r.method && d.url === r.url) ?? { method: r.method as Method, url: r.url, tag: 'meta', summary: 'Undocumented route', ok: { 200: { description: 'Answer' } }, errors: [] };
    const path = openApiPath(r.url);
    paths[path] = { ...(paths[path] ?? {}), [r.method.toLowerCase()]: operation(doc) };
  }
  return {
    openapi: '3.1.0',
    info: {
      title: 'Pumpscribe library API',
      version: TOOL_VERSION,
      summary: 'The office pump library: curve sets with revisions, source sheets, take-off files, duty search.',
      description: [
        'Curve sets are SI inside (see the CurveSet schema). Results are for preliminary engineering: verify them against the manufacturer\'s certified data and the local codes, and have selections approved by a licensed professional.',
        '',
        'Writes (POST, PUT, DELETE) are served only from this server\'s own origin with Content-Type application/json (or application/x-ndjson for imports, or the sheet\'s own type for uploads), or with the access token in the Authorization header. Plain-text and form posts are refused (403).',
        '',
        'Every error answer is `{ "error": "<one sentence>", "code": "<stable word>" }`:',
        '',
        codeTable(),
      ].join('\n'),
      license: { name: 'MIT', identifier: 'MIT' },
    },
    servers: [{ url: '/' }],
    tags: [
      { name: 'library', description: 'Entries and their revisions' },
      { name: 'search', description: 'Duty search' },
      { name: 'sheets', description: 'Source sheets and take-off files' },
      { name: 'transfer', description: 'Moving a whole library' },
      { name: 'pages', description: 'HTML pages and the workbench' },
      { name: 'meta', description: 'Health and this description' },
    ],
    paths,
    components: {
      schemas: componentSchemas(),
      securitySchemes: { token: { type: 'http', scheme: 'bearer', description: 'Needed only when the server binds beyond loopback (PUMPSCRIBE_TOKEN)' } },
    },
  };
}
