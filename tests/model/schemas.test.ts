import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { curveSetJsonSchema, schemaText, takeoffPublishedSchema } from '../../src/model/jsonSchema.ts';
import { CURVESET_VERSION } from '../../src/model/curveset.ts';
import { TAKEOFF_VERSION } from '../../src/model/takeoff.ts';

describe('published JSON Schemas', () => {
  it('schemas/curveset.schema.json matches the zod model (run `npm run schemas` after changing it)', () => {
    expect(readFileSync('schemas/curveset.schema.json', 'utf8')).toBe(schemaText(curveSetJsonSchema()));
  });

  it('schemas/takeoff.schema.json matches the zod model (run `npm run schemas` after changing it)', () => {
    expect(readFileSync('schemas/takeoff.schema.json', 'utf8')).toBe(schemaText(takeoffPublishedSchema()));
  });

  it('each schema has a stable, non-placeholder $id naming its format and version', () => {
    for (const [file, version] of [['curveset', CURVESET_VERSION], ['takeoff', TAKEOFF_VERSION]] as const) {
      const schema = JSON.parse(readFileSync(`schemas/${file}.schema.json`, 'utf8')) as Record<string, unknown>;
      expect(schema.$id).toBe(`urn:pumpscribe:schema:${file}:${version}`);
    }
  });
});
