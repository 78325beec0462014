/**
 * The browser workbench as the server sees it: dist/ built by Vite from index.html and src/ui.
 * `start` rebuilds it in-process (Vite's JS API) when dist/ is missing or older than its sources.
 */
import { existsSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { importGraph } from './importGraph.ts';

/** The repository root (this file lives in src/server/). */
export const PROJECT_ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const DIST_DIR = join(PROJECT_ROOT, 'dist');

/** Files that shape the build besides the sources the page imports. */
const CONFIG_FILES = ['index.html', 'vite.config.ts'];

export interface WorkbenchState {
  /** index.html and src/ui exist, so a build can be attempted. */
  buildable: boolean;
  /** dist/index.html exists. */
  built: boolean;
  /** dist/ is older than the newest source file. */
  stale: boolean;
}

/**
 * The files the workbench bundle is built from: index.html, its scripts and everything they
 * import, followed through the real import graph (workers and dynamic imports included), so that
 * a change in any folder the UI reaches — src/physics through src/duty, say — makes dist/ stale.
 */
export function workbenchSources(root = PROJECT_ROOT): { files: string[]; broken: boolean } {
  const graph = importGraph(root, [join(root, 'index.html')]);
  const files = [...new Set([...graph.files, ...CONFIG_FILES.map((f) => join(root, f)).filter((f) => existsSync(f))])];
  return { files, broken: graph.missing.length > 0 };
}

export function workbenchState(root = PROJECT_ROOT): WorkbenchState {
  const buildable = existsSync(join(root, 'index.html')) && existsSync(join(root, 'src', 'ui'));
  const index = join(root, 'dist', 'index.html');
  const built = existsSync(index);
  if (!built) return { buildable, built, stale: buildable };
  const builtAt = statSync(index).mtimeMs;
  const sources = workbenchSources(root);
  // A broken import is "stale" too: the rebuild then reports it as one sentence.
  const newest = Math.max(0, ...sources.files.map((f) => statSync(f).mtimeMs));
  return { buildable, built, stale: buildable && (sources.broken || newest > builtAt) };
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
