/** Regenerates schemas/*.schema.json from the zod models. Run: npm run schemas */
import { writeFileSync, mkdirSync } from 'node:fs';
import { curveSetJsonSchema, schemaText } from '../src/model/jsonSchema.ts';

const written: string[] = [];
mkdirSync('schemas', { recursive: true });
writeFileSync('schemas/curveset.schema.json', schemaText(curveSetJsonSchema()));
written.push('schemas/curveset.schema.json');
try {
  const takeoff = (await import('../src/model/takeoff.ts')) as { takeoffJsonSchema?: () => Record<string, unknown> };
  if (takeoff.takeoffJsonSchema) {
    writeFileSync('schemas/takeoff.schema.json', schemaText(takeoff.takeoffJsonSchema()));
    written.push('schemas/takeoff.schema.json');
  }
} catch (error) {
  if ((error as NodeJS.ErrnoException).code !== 'ERR_MODULE_NOT_FOUND') throw error;
}
{
  const { studyJsonSchema } = await import('../src/model/study.ts');
  writeFileSync('schemas/study.schema.json', schemaText(studyJsonSchema()));
  written.push('schemas/study.schema.json');
}
console.log(`Wrote ${written.join(', ')}`);
