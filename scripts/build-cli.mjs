#!/usr/bin/env node
/**
 * Builds the prebuilt command line: src/cli/main.ts and the commands it imports, bundled by
 * esbuild into one CommonJS script, build/cli/pumpscribe.cjs, with the small pure-JavaScript
 * packages (commander, zod, ml-matrix, simplify-js) inside; native and very large packages stay
 * in node_modules. Runs in `npm install` / `npm ci` (the `prepare` script) and as `npm run build:cli`.
 *
 * One script, not ES modules, because Node 20 can keep a V8 code cache of a script only
 * (bin/runBundle.mjs runs it with `vm.Script` and its cache). Commands still load lazily: esbuild
 * wraps every module reached only through `import()` in a function run on that import, so
 * `check` never runs the server's code and a CSV `build` never touches pdf.js.
 * Three things the sources rely on are given to the script by its wrapper (WRAPPER_NAMES in
 * bin/runBundle.mjs): `import.meta.url` becomes `__pumpscribe_url`, the bundle's own URL;
 * `import("<package>")` of a package left outside becomes `__psi_("<package>")` (same length, so
 * the source map stays exact), a real dynamic import; `require` is Node's, for the packages
 * imported statically (fastify, better-sqlite3, pdf-lib). zod's error messages in 50 languages are
 * left out but for English, the only one the command line uses (`z.locales` holds `en` alone).
 *
 * The bundle sits two folders below the root, like the sources in src/cli, so that paths
 * computed from `import.meta.url` (the project root, the workbench's dist/) stay right.
 * build/cli/stamp.json records when it was built; bin/pumpscribe.mjs runs the sources instead
 * when anything under src/ is newer (a developer's edit). build/cli/main.mjs runs the bundle
 * from an ES module (for whoever imports it; `pumpscribe` itself goes through bin/).
 */
import { build } from 'esbuild';
import { existsSync, mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const out = join(root, 'build', 'cli');
const entry = join(root, 'src', 'cli', 'main.ts');

if (!existsSync(entry)) {
  // An installed copy without sources: nothing to build.
  process.exit(0);
}

/** Packages left in node_modules: native, very large or self-locating. */
const EXTERNAL = ['@napi-rs/canvas', 'sharp', 'better-sqlite3', 'pdfjs-dist', 'pdfjs-dist/*', 'fastify', '@fastify/*', 'vite', 'tsx', 'konva', 'konva/*', 'pdf-lib', 'epanet-js', 'tesseract.js', '@tesseract.js-data/*'];
const isExternal = (path) => EXTERNAL.some((e) => (e.endsWith('/*') ? path.startsWith(e.slice(0, -1)) : path === e || path.startsWith(`${e}/`)));

/** zod's `locales` namespace with English alone (the command line sets no other locale). */
const englishOnly = {
  name: 'zod-english-only',
  setup(b) {
    b.onResolve({ filter: /\/locales\/index\.js$/ }, (args) =>
      /[\\/]node_modules[\\/]zod[\\/]/.test(args.importer) ? { path: join(dirname(args.importer), args.path), namespace: 'zod-english' } : undefined,
    );
    b.onLoad({ filter: /.*/, namespace: 'zod-english' }, (args) => ({
      contents: `export { default as en } from ${JSON.stringify(join(dirname(args.path), 'en.js'))};`,
      resolveDir: dirname(args.path),
    }));
  },
};

const started = Date.now();
const tmp = `${out}.${process.pid}.tmp`;
rmSync(tmp, { recursive: true, force: true });
mkdirSync(tmp, { recursive: true });
const script = join(tmp, 'pumpscribe.cjs');
const result = await build({
  entryPoints: [entry],
  outfile: script,
  bundle: true,
  format: 'cjs',
  platform: 'node',
  target: 'node20',
  external: EXTERNAL,
  define: { 'import.meta.url': '__pumpscribe_url' },
  plugins: [englishOnly],
  sourcemap: 'linked',
  minify: true,
  keepNames: true,
  legalComments: 'none',
  metafile: true,
  logLevel: 'error',
  absWorkingDir: root,
});
// import.meta other than .url would be empty in a script: refuse to build rather than ship that.
const emptyMeta = result.warnings.filter((w) => w.id === 'empty-import-meta');
if (emptyMeta.length) {
  process.stderr.write(`pumpscribe: the command line uses import.meta beyond import.meta.url (${emptyMeta.map((w) => `${w.location?.file}:${w.location?.line}`).join(', ')}), which a CommonJS bundle cannot give; use import.meta.url.\n`);
  process.exit(1);
}
// Dynamic imports of outside packages go through the wrapper's `__psi_` (see bin/runBundle.mjs).
let text = readFileSync(script, 'utf8');
const dynamic = new Set(Object.values(result.metafile.outputs).flatMap((o) => o.imports.filter((i) => i.kind === 'dynamic-import' && i.external).map((i) => i.path)));
text = text.replace(/\bimport\((["'])([^"'\s]+)\1\)/g, (whole, quote, path) => (isExternal(path) ? `__psi_(${quote}${path}${quote})` : whole));
const left = [...dynamic].filter((path) => text.includes(`import("${path}")`) || text.includes(`import('${path}')`) || !text.includes(`__psi_("${path}")`));
if (left.length) {
  process.stderr.write(`pumpscribe: the bundle still imports ${left.join(', ')} in a way the script cannot run; check scripts/build-cli.mjs.\n`);
  process.exit(1);
}
writeFileSync(script, text);
writeFileSync(
  join(tmp, 'main.mjs'),
  "// Runs the command line bundle (pumpscribe.cjs) with its code cache; see bin/runBundle.mjs.\nimport { fileURLToPath } from 'node:url';\nimport { runBundle } from '../../bin/runBundle.mjs';\n\nrunBundle(fileURLToPath(new URL('./pumpscribe.cjs', import.meta.url)));\n",
);
// The stamp names the source files the bundle was made of (paths from the root, "/" between
// folders): bin/pumpscribe.mjs checks only those for a newer edit, a few dozen stat calls at start-up
// instead of a walk of src/. A new file counts once a file of the bundle imports it (that file changes).
const sources = Object.keys(result.metafile.inputs).filter((path) => path.startsWith('src/')).sort();
writeFileSync(join(tmp, 'stamp.json'), `${JSON.stringify({ built: new Date().toISOString(), builtMs: Date.now(), sources })}\n`);
// Swap the whole folder at once, so a running command never sees half a bundle.
const old = `${out}.${process.pid}.old`;
if (existsSync(out)) renameSync(out, old);
renameSync(tmp, out);
rmSync(old, { recursive: true, force: true });
process.stdout.write(`pumpscribe: built the command line into build/cli in ${Date.now() - started} ms\n`);
