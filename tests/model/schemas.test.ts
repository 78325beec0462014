import { describe, expect, it } from 'vitest';
import { readFileSync, existsSync } from 'node:fs';
import { curveSetJsonSchema, schemaText } from '../../src/model/jsonSchema.ts';

describe('published JSON Schemas', () => {
  it('schemas/curveset.schema.json matches the zod model (run `npm run schemas` after changing it)', () => {
    expect(readFileSync('schemas/curveset.schema.json', 'utf8')).toBe(schemaText(curveSetJsonSchema()));
  });

  it('schemas/takeoff.schema.json matches the zod model (run `npm run schemas` after changing it)', async () => {
    const takeoff = (await import('../../src/model/takeoff.ts')) as { takeoffJsonSchema: () => Record<string, unknown> };
    expect(existsSync('schemas/takeoff.schema.json')).toBe(true);
    expect(readFileSync('schemas/takeoff.schema.json', 'utf8')).toBe(schemaText(takeoff.takeoffJsonSchema()));
  });
});
