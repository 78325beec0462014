/** The published JSON Schemas (draft 2020-12), generated from the zod models. */
import { z } from 'zod';
import { CURVESET_FORMAT, CURVESET_VERSION, CurveSet } from './curveset.ts';

export function curveSetJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(CurveSet, { target: 'draft-2020-12' }) as Record<string, unknown>;
  return {
    ...schema,
    $id: `https://pumpscribe.invalid/schemas/curveset-v${CURVESET_VERSION}.json`,
    title: `Pumpscribe curve set (${CURVESET_FORMAT}, version ${CURVESET_VERSION})`,
    description: 'One pump at one speed: fitted curves per impeller diameter (or speed), in SI units, with provenance and findings.',
  };
}

/** Text of the committed schema file, so a test can tell when it goes stale. */
export function schemaText(schema: Record<string, unknown>): string {
  return `${JSON.stringify(schema, null, 2)}\n`;
}
