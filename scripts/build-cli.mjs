#!/usr/bin/env node
/**
 * Builds the prebuilt command line: src/cli/main.ts and the commands it imports, bundled by
 * esbuild into build/cli/ (ES modules, one chunk per lazily imported command), with the small
 * pure-JavaScript packages (commander, zod, ml-matrix, simplify-js) inside; native and very
 * large packages stay in node_modules. Runs in `npm install` / `npm ci` (the `prepare` script) and as `npm run build:cli`.
 *
 * The bundle sits two folders below the root, like the sources in src/cli, so that paths
 * computed from `import.meta.url` (the project root, the workbench's dist/) stay right.
 * build/cli/stamp.json records when it was built; bin/pumpscribe.mjs runs the sources
 * instead when anything under src/ is newer (a developer's edit).
 */
import { build } from 'esbuild';
import { existsSync, mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const out = join(root, 'build', 'cli');
const entry = join(root, 'src', 'cli', 'main.ts');

if (!existsSync(entry)) {
  // An installed copy without sources: nothing to build.
  process.exit(0);
}

const started = Date.now();
const tmp = `${out}.${process.pid}.tmp`;
rmSync(tmp, { recursive: true, force: true });
mkdirSync(tmp, { recursive: true });
await build({
  entryPoints: { main: entry },
  outdir: tmp,
  bundle: true,
  splitting: true,
  format: 'esm',
  platform: 'node',
  target: 'node20',
  // Small pure-JavaScript packages are bundled (one file to load instead of hundreds starts
  // faster); native, very large or self-locating packages stay external.
  external: ['@napi-rs/canvas', 'sharp', 'better-sqlite3', 'pdfjs-dist', 'pdfjs-dist/*', 'fastify', '@fastify/*', 'vite', 'tsx', 'konva', 'konva/*', 'pdf-lib', 'epanet-js', 'tesseract.js', '@tesseract.js-data/*'],
  outExtension: { '.js': '.mjs' },
  chunkNames: 'chunk-[hash]',
  sourcemap: 'linked',
  minify: true,
  keepNames: true,
  legalComments: 'none',
  // Bundled CommonJS packages (commander) call require() for Node's own modules.
  banner: { js: "import { createRequire as __pumpscribeRequire } from 'node:module'; const require = __pumpscribeRequire(import.meta.url);" },
  logLevel: 'warning',
});
writeFileSync(join(tmp, 'stamp.json'), `${JSON.stringify({ built: new Date().toISOString(), builtMs: Date.now() })}\n`);
// Swap the whole folder at once, so a running command never sees half a bundle.
const old = `${out}.${process.pid}.old`;
if (existsSync(out)) renameSync(out, old);
renameSync(tmp, out);
rmSync(old, { recursive: true, force: true });
process.stdout.write(`pumpscribe: built the command line into build/cli in ${Date.now() - started} ms\n`);
