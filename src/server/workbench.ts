/**
 * The browser workbench as the server sees it: dist/ built by Vite from index.html and src/ui.
 * `start` rebuilds it in-process (Vite's JS API) when dist/ is missing or older than its sources.
 */
import { existsSync, readdirSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The repository root (this file lives in src/server/). */
export const PROJECT_ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const DIST_DIR = join(PROJECT_ROOT, 'dist');

/** Folders whose code ends up in the workbench bundle. */
const SOURCE_DIRS = ['src/ui', 'src/model', 'src/units', 'src/fit', 'src/duty', 'src/digitize', 'src/export'];
const SOURCE_FILES = ['index.html', 'vite.config.ts'];

export interface WorkbenchState {
  /** index.html and src/ui exist, so a build can be attempted. */
  buildable: boolean;
  /** dist/index.html exists. */
  built: boolean;
  /** dist/ is older than the newest source file. */
  stale: boolean;
}

function newestMtime(path: string): number {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of readdirSync(path, { withFileTypes: true })) {
    if (entry.name.startsWith('.') || entry.name === 'node_modules') continue;
    newest = Math.max(newest, newestMtime(join(path, entry.name)));
  }
  return newest;
}

export function workbenchState(root = PROJECT_ROOT): WorkbenchState {
  const buildable = existsSync(join(root, 'index.html')) && existsSync(join(root, 'src', 'ui'));
  const index = join(root, 'dist', 'index.html');
  const built = existsSync(index);
  if (!built) return { buildable, built, stale: buildable };
  const builtAt = statSync(index).mtimeMs;
  const sources = Math.max(...SOURCE_DIRS.map((d) => newestMtime(join(root, d))), ...SOURCE_FILES.map((f) => newestMtime(join(root, f))));
  return { buildable, built, stale: buildable && sources > builtAt };
}

/**
 * Builds dist/ with Vite, in this process. Returns null on success, or a sentence saying why it failed.
 * The working directory is the project root for the duration (the Vite config resolves paths from it).
 */
export async function buildWorkbench(root = PROJECT_ROOT): Promise<string | null> {
  const before = process.cwd();
  try {
    process.chdir(root);
    const { build } = await import('vite');
    await build({ root, configFile: join(root, 'vite.config.ts'), logLevel: 'warn', clearScreen: false });
    return existsSync(join(root, 'dist', 'index.html')) ? null : 'Vite finished without writing dist/index.html';
  } catch (error) {
    const text = error instanceof Error ? error.message : String(error);
    return text.split('\n')[0]?.slice(0, 300) ?? 'unknown error';
  } finally {
    process.chdir(before);
  }
}
