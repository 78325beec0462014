/**
 * Runs the prebuilt command line (build/cli/pumpscribe.cjs, one CommonJS script made by
 * scripts/build-cli.mjs) in this process, with a V8 code cache.
 *
 * Why: a command spends a good part of its start-up parsing and compiling the bundle's
 * JavaScript. V8 can save the compiled bytecode of a script (`vm.Script#createCachedData`) and
 * take it back on the next start (`cachedData`), which skips that work. Node 20 offers this for
 * scripts only, not for ES modules, hence one CommonJS script run through `vm.Script`.
 *
 * The cache:
 * - lives in build/cli/code-cache/ beside the bundle (as trusted as the bundle itself), or in the
 *   folder PUMPSCRIBE_CODE_CACHE names; PUMPSCRIBE_CODE_CACHE=off turns it off. Deleting the
 *   folder is always safe: the next command compiles again and writes a new cache;
 * - is keyed on the SHA-256 of the bundle's text, the Node version and the CPU, and on the
 *   command named (`takeoff`, `check`, …; `--help` runs apart), so it can never give the code of
 *   another bundle; V8 also refuses data from another V8 version or other flags, and then the
 *   script compiles as if there were no cache and the cache is written again;
 * - is written once, when a command ends with exit 0 or 1 (it did its work, so the cache holds
 *   the bytecode of what that command runs), to a temporary file renamed into place, so no reader
 *   sees half a file. A missing, read-only or unusable folder only means no cache: nothing fails.
 *
 * The script is wrapped like a CommonJS module, plus two names the build gives it (see
 * scripts/build-cli.mjs): `__pumpscribe_url`, the bundle's own file URL (what `import.meta.url`
 * is in the sources), and `__psi_`, which loads a package by dynamic import, as the sources'
 * `import('sharp')` does (Node 20 loses the dynamic-import hook of a script compiled from cache).
 */
import { createHash } from 'node:crypto';
import { mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import vm from 'node:vm';

/** The names the bundle is wrapped in, in order (scripts/build-cli.mjs writes code against them). */
export const WRAPPER_NAMES = ['exports', 'require', 'module', '__filename', '__dirname', '__pumpscribe_url', '__psi_'];

/** The cache folder for a bundle, or null when the cache is turned off. */
export function codeCacheFolder(bundleFile, env = process.env) {
  const setting = env.PUMPSCRIBE_CODE_CACHE;
  if (setting === 'off' || setting === '0') return null;
  return setting ? resolve(setting) : join(dirname(bundleFile), 'code-cache');
}

/** What a run is cached under: the command named (the first word that is not an option), help runs apart. */
export function runLabel(args) {
  let named = 'none';
  for (const a of args) {
    if (a === '--') break;
    if (!a.startsWith('-')) {
      named = a;
      break;
    }
  }
  const help = args.includes('--help') || args.includes('-h') || named === 'help';
  // Only plain words name a file; anything else shares one label (such runs end with exit 2 and write nothing).
  return `${/^[a-z][a-z0-9-]{0,30}$/.test(named) ? named : 'other'}${help ? '-help' : ''}`;
}

/** The cache file of a bundle's text (a string, or its UTF-8 bytes: the same hash) for a run label. */
export function codeCacheFile(folder, source, label) {
  const hash = createHash('sha256').update(source).digest('hex').slice(0, 32);
  return join(folder, `${hash}-node${process.versions.node}-${process.arch}-${label}.v8cache`);
}

function readCache(file) {
  try {
    return readFileSync(file);
  } catch {
    return undefined; // no cache yet, or an unreadable folder
  }
}

function writeCache(file, data) {
  const tmp = `${file}.${process.pid}.tmp`;
  try {
    mkdirSync(dirname(file), { recursive: true });
    writeFileSync(tmp, data);
    renameSync(tmp, file);
  } catch {
    // A read-only or vanished folder (the bundle rebuilt meanwhile): run without a cache next time.
    try {
      rmSync(tmp, { force: true });
    } catch {
      // nothing to clean
    }
  }
}

/**
 * Compiles and runs the bundle with the code cache. Returns once the bundle's top level has run
 * (the command itself goes on asynchronously, as an ES module's top level would).
 * Returns what happened to the cache, for tests: 'off', 'used', 'rejected' or 'none'.
 */
export function runBundle(bundleFile, args = process.argv.slice(2), env = process.env) {
  // Hashed as read: the bytes hash four times faster than the decoded text, to the same digest.
  const bytes = readFileSync(bundleFile);
  const folder = codeCacheFolder(bundleFile, env);
  const cacheFile = folder ? codeCacheFile(folder, bytes, runLabel(args)) : undefined;
  const source = bytes.toString('utf8');
  const cachedData = cacheFile ? readCache(cacheFile) : undefined;
  // "use strict": the sources are ES modules, which are always strict; so is their bundle.
  // The wrapper's head sits on a line of its own, and lineOffset keeps the bundle's line numbers
  // (stack traces and profiles follow its source map).
  const script = new vm.Script(`(function (${WRAPPER_NAMES.join(', ')}) {"use strict";\n${source}\n})`, {
    filename: bundleFile,
    lineOffset: -1,
    ...(cachedData ? { cachedData } : {}),
  });
  const state = !cacheFile ? 'off' : !cachedData ? 'none' : script.cachedDataRejected ? 'rejected' : 'used';
  if (cacheFile && state !== 'used') {
    process.once('exit', (code) => {
      if (code === 0 || code === 1) writeCache(cacheFile, script.createCachedData());
    });
  }
  const module = { exports: {} };
  const load = (specifier) => import(specifier);
  script.runInThisContext()(module.exports, createRequire(bundleFile), module, bundleFile, dirname(bundleFile), pathToFileURL(bundleFile).href, load);
  return state;
}
