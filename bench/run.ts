/**
 * Runs every bench/*.bench.ts in turn (or only those whose name contains one of the
 * arguments: `npm run bench -- fit`). Each file's default export prints its own figures.
 */
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const filters = process.argv.slice(2);
const files = readdirSync(here)
  .filter((name) => name.endsWith('.bench.ts'))
  .filter((name) => filters.length === 0 || filters.some((f) => name.includes(f)))
  .sort();

if (files.length === 0) {
  process.stderr.write(`No benchmark matches ${filters.join(', ') || 'bench/*.bench.ts'}.\n`);
  process.exit(2);
}

for (const name of files) {
  process.stdout.write(`\n=== ${name} ===\n`);
  const module = (await import(pathToFileURL(join(here, name)).href)) as { default?: () => Promise<void> };
  if (typeof module.default !== 'function') {
    process.stdout.write(`(${name} has no default export function; skipped)\n`);
    continue;
  }
  await module.default();
}
