/** Regenerates schemas/*.schema.json from the zod models. Run: npm run schemas */
import { writeFileSync, mkdirSync } from 'node:fs';
import { curveSetJsonSchema, schemaText, takeoffPublishedSchema } from '../src/model/jsonSchema.ts';

const written: string[] = [];
mkdirSync('schemas', { recursive: true });
function write(name: string, schema: Record<string, unknown>): void {
  writeFileSync(`schemas/${name}`, schemaText(schema));
  written.push(`schemas/${name}`);
}
write('curveset.schema.json', curveSetJsonSchema());
write('takeoff.schema.json', takeoffPublishedSchema());

// Schemas other rooms may offer: written when their module exports them.
const optional: Array<[string, string, string]> = [
  ['../src/library/transfer.ts', 'libraryExportLineJsonSchema', 'library-export-line.schema.json'],
  ['../src/duty/reportView.ts', 'dutyReportJsonSchema', 'duty-report.schema.json'],
];
for (const [module, name, file] of optional) {
  const mod = (await import(module)) as Record<string, unknown>;
  const make = mod[name];
  if (typeof make === 'function') write(file, (make as () => Record<string, unknown>)());
}
{
  const { studyJsonSchema } = await import('../src/model/study.ts');
  writeFileSync('schemas/study.schema.json', schemaText(studyJsonSchema()));
  written.push('schemas/study.schema.json');
}
console.log(`Wrote ${written.join(', ')}`);
