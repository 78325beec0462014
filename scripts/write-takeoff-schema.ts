/** Writes schemas/takeoff.schema.json from the zod schema in src/model/takeoff.ts. */
import { writeFileSync, mkdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { takeoffJsonSchema } from '../src/model/takeoff.ts';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const target = join(root, 'schemas', 'takeoff.schema.json');
mkdirSync(dirname(target), { recursive: true });
writeFileSync(target, `${JSON.stringify(takeoffJsonSchema(), null, 2)}\n`);
process.stdout.write(`wrote ${target}\n`);
