/**
 * The published JSON Schemas (draft 2020-12), generated from the zod models, each with a
 * stable `$id`.
 *
 * `$id` form: `urn:pumpscribe:schema:<format>:<version>`. A URN names a schema without
 * pretending to locate it: Pumpscribe runs offline and has no web site, so an https address
 * would be a placeholder that never resolves (or one day resolves to someone else's page).
 * The name changes only when the format's version does, so it is stable for every file of
 * that version; the schema itself ships in `schemas/` beside the code.
 */
import { z } from 'zod';
import { CURVESET_FORMAT, CURVESET_VERSION, CurveSet } from './curveset.ts';
import { takeoffJsonSchema, TAKEOFF_FORMAT, TAKEOFF_VERSION } from './takeoff.ts';

export function schemaId(format: string, version: number): string {
  return `urn:pumpscribe:schema:${format.replace(/^pumpscribe\./, '')}:${version}`;
}

export function curveSetJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(CurveSet, { target: 'draft-2020-12', io: 'input' }) as Record<string, unknown>;
  return {
    $schema: schema.$schema,
    $id: schemaId(CURVESET_FORMAT, CURVESET_VERSION),
    title: `Pumpscribe curve set (${CURVESET_FORMAT}, version ${CURVESET_VERSION})`,
    description:
      'One pump at one speed: fitted curves per impeller diameter (or speed), in SI units, with provenance and findings. ' +
      'The keyword "x-ascending" marks a pair that must be in ascending order, a rule standard JSON Schema cannot state.',
    ...Object.fromEntries(Object.entries(schema).filter(([k]) => k !== '$schema')),
  };
}

/** Gives a generated schema its `$id` and title, keeping `$schema` first. */
export function withId(schema: Record<string, unknown>, format: string, version: number, title: string): Record<string, unknown> {
  const { $schema, $id: _old, title: _t, ...rest } = schema;
  return { $schema: $schema ?? 'https://json-schema.org/draft/2020-12/schema', $id: schemaId(format, version), title, ...rest };
}

/** The take-off file's schema as published, with its `$id`. */
export function takeoffPublishedSchema(): Record<string, unknown> {
  return withId(takeoffJsonSchema(), TAKEOFF_FORMAT, TAKEOFF_VERSION, `Pumpscribe take-off file (${TAKEOFF_FORMAT}, version ${TAKEOFF_VERSION})`);
}

/** Text of the committed schema file, so a test can tell when it goes stale. */
export function schemaText(schema: Record<string, unknown>): string {
  return `${JSON.stringify(schema, null, 2)}\n`;
}
