/**
 * zod schemas of the HTTP API's own answers (the curve set and take-off bodies come from
 * src/model). They describe the wire format for the OpenAPI document; the library's TypeScript
 * types are the source, and a test checks live answers against these schemas.
 */
import { z } from 'zod';
import { ERROR_CODES, type ErrorCode } from './errors.ts';

const iso = z.string().describe('ISO 8601 UTC time');
const entryId = z.string().regex(/^[0-9a-f]{16}$/).describe('library entry id, 16 hex digits');
const sha256 = z.string().regex(/^[0-9a-f]{64}$/);

export const ErrorBody = z
  .strictObject({
    error: z.string().describe('one sentence: what was wrong and what to do'),
    code: z.enum(Object.keys(ERROR_CODES) as [ErrorCode, ...ErrorCode[]]).describe('stable machine-readable word; see the table in the API description'),
  })
  .describe('Every error answer');

export const Health = z.strictObject({
  ok: z.literal(true),
  version: z.string(),
  library: z.strictObject({ entries: z.number().int(), archived: z.number().int(), revisions: z.number().int(), sheets: z.number().int() }),
});

export const EntryInfo = z
  .looseObject({
    id: entryId,
    revision: z.number().int().min(1),
    name: z.string(),
    maker: z.string().nullable(),
    model: z.string().nullable(),
    size: z.string().nullable(),
    type: z.string().nullable(),
    family: z.string(),
    speed_rpm: z.number(),
    diameters_m: z.array(z.number()),
    flow_range_m3s: z.tuple([z.number(), z.number()]),
    head_range_m: z.tuple([z.number(), z.number()]),
    bep: z.strictObject({ flow_m3s: z.number(), head_m: z.number(), efficiency: z.number() }).nullable(),
    created_at: iso,
    updated_at: iso,
    archived_at: iso.nullable(),
  })
  .describe('Summary of a library entry (SI figures, named with their unit)');

export const EntryList = z.looseObject({ total: z.number().int(), entries: z.array(EntryInfo) });

export const SavedRevision = z.looseObject({ id: entryId, revision: z.number().int().min(1), saved_at: iso });

export const RevisionList = z.strictObject({
  id: entryId,
  revisions: z.array(z.looseObject({ revision: z.number().int(), saved_at: iso, sha256, bytes: z.number().int() })),
});

export const SheetInfo = z.looseObject({ sha256, name: z.string().nullable(), media_type: z.string(), size: z.number().int(), stored_at: iso });
export const SheetStored = SheetInfo.extend({ created: z.boolean() });
export const SheetList = z.strictObject({ sheets: z.array(SheetInfo) });

export const TakeoffInfo = z.looseObject({ id: entryId, sheet_sha256: sha256, name: z.string().nullable(), sha256, saved_at: iso });
export const TakeoffStored = TakeoffInfo.extend({ created: z.boolean() });
export const TakeoffList = z.strictObject({ sheet: SheetInfo, takeoffs: z.array(TakeoffInfo) });

export const ImportReport = z.looseObject({
  entries_created: z.number().int(),
  entries_extended: z.number().int(),
  revisions_added: z.number().int(),
  revisions_already_present: z.number().int(),
  sheets_added: z.number().int(),
  takeoffs_added: z.number().int(),
});

export const DutySearch = z
  .looseObject({
    units: z.looseObject({ flow: z.string(), head: z.string(), diameter: z.string(), power: z.string(), npshr: z.string(), efficiency: z.literal('%') }),
    duty: z.looseObject({ flow: z.number(), head: z.number(), static_head: z.number().nullable() }),
    examined: z.number().int(),
    matched: z.number().int(),
    complete: z.boolean(),
    candidates: z.array(z.looseObject({ id: entryId, revision: z.number().int(), name: z.string(), diameter: z.number().nullable(), efficiency: z.number().nullable() })),
    notice: z.string().describe('the caution that goes with every duty answer'),
  })
  .describe('Pumps of the library that meet the duty, ranked, in the unit system asked for');
