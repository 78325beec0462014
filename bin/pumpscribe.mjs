#!/usr/bin/env node
/**
 * The `pumpscribe` command. Runs the prebuilt command line (build/cli/pumpscribe.cjs, made by
 * `npm install` through the `prepare` script, or by `npm run build:cli`) in this process, with
 * a V8 code cache (see runBundle.mjs; PUMPSCRIBE_CODE_CACHE=off runs without it).
 * In a developer's checkout where the bundle is missing, or older than a file under src/,
 * it runs the TypeScript sources through tsx instead, so an edit is never silently ignored.
 * PUMPSCRIBE_FROM_SOURCE=1 forces the sources.
 * The check stats only the source files the bundle was built from (listed in build/cli/stamp.json);
 * an older stamp without that list has the whole of src/ walked. Nothing else is loaded up front:
 * child_process is imported only to run the sources.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const bundle = join(root, 'build', 'cli', 'pumpscribe.cjs');
const sources = join(root, 'src');

/** Newest modification time of a source file that goes into the command line (src/ui is the browser's). */
function newestSource(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    if (entry.name.startsWith('.')) continue;
    const path = join(dir, entry.name);
    if (entry.isDirectory()) {
      if (path === join(sources, 'ui')) continue;
      newest = Math.max(newest, newestSource(path));
    } else if (entry.name.endsWith('.ts')) {
      newest = Math.max(newest, statSync(path).mtimeMs);
    }
  }
  return newest;
}

function bundleIsCurrent() {
  if (process.env.PUMPSCRIBE_FROM_SOURCE === '1' || !existsSync(bundle)) return false;
  if (!existsSync(sources)) return true; // an installed copy without sources
  try {
    const { builtMs, sources: built } = JSON.parse(readFileSync(join(root, 'build', 'cli', 'stamp.json'), 'utf8'));
    if (typeof builtMs !== 'number') return false;
    if (!Array.isArray(built)) return newestSource(sources) <= builtMs;
    for (const path of built) {
      // A source that vanished, or is newer than the bundle: run the sources.
      const stat = typeof path === 'string' ? statSync(`${root}/${path}`, { throwIfNoEntry: false }) : undefined;
      if (!stat || stat.mtimeMs > builtMs) return false;
    }
    return built.length > 0;
  } catch {
    return false;
  }
}

if (bundleIsCurrent()) {
  const { runBundle } = await import('./runBundle.mjs');
  runBundle(bundle);
} else {
  const tsx = join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs');
  if (!existsSync(tsx) || !existsSync(join(sources, 'cli', 'main.ts'))) {
    process.stderr.write('pumpscribe: the prebuilt command line is missing; run "npm install" (or "npm run build:cli") in the Pumpscribe folder.\n');
    process.exit(3);
  }
  const { spawnSync } = await import('node:child_process');
  const result = spawnSync(process.execPath, [tsx, join(sources, 'cli', 'main.ts'), ...process.argv.slice(2)], { stdio: 'inherit' });
  if (result.signal) process.kill(process.pid, result.signal);
  process.exit(result.status ?? 3);
}
