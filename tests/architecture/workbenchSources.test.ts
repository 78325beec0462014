import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative, resolve } from 'node:path';
import { build } from 'esbuild';
import { importSpecifiers } from '../../src/server/importGraph.ts';
import { PROJECT_ROOT, workbenchSources, workbenchState } from '../../src/server/workbench.ts';

describe('importSpecifiers reads what a bundler follows', () => {
  it('finds static, re-export, side-effect, dynamic and worker-URL imports, and none in comments', () => {
    const source = [
      "import { a } from './a.ts';",
      "import type { B } from '../b.ts';",
      "export * from './c.ts';",
      "export { d } from './d.ts';",
      "import './e.css';",
      "const f = await import('./f.ts');",
      "new Worker(new URL('./g.ts', import.meta.url), { type: 'module' });",
      "// import { no } from './commented.ts';",
      "/* import './blocked.ts'; */",
      "const text = 'import nothing';",
      "import pdf from 'pdfjs-dist';",
    ].join('\n');
    expect(importSpecifiers(source)).toEqual(['./a.ts', '../b.ts', './c.ts', './d.ts', './e.css', './f.ts', './g.ts', 'pdfjs-dist']);
  });
});

describe('the workbench staleness check follows the real import graph', () => {
  it('lists every source file esbuild bundles from the page and its worker, src/physics included', async () => {
    const result = await build({
      entryPoints: [join(PROJECT_ROOT, 'src/ui/main.ts'), join(PROJECT_ROOT, 'src/ui/worker/sheetWorker.ts')],
      bundle: true,
      write: false,
      metafile: true,
      format: 'esm',
      platform: 'browser',
      logLevel: 'silent',
      outdir: join(tmpdir(), 'pumpscribe-esbuild-unused'),
      plugins: [{ name: 'packages-outside', setup: (b) => b.onResolve({ filter: /^[^./]/ }, (a) => ({ path: a.path, external: true })) }],
      loader: { '.css': 'empty' },
    });
    const bundled = Object.keys(result.metafile!.inputs).map((p) => resolve(PROJECT_ROOT, p)).filter((p) => !p.includes('node_modules'));
    const ours = new Set(workbenchSources(PROJECT_ROOT).files);
    expect(bundled.length).toBeGreaterThan(50);
    expect(bundled.filter((p) => !ours.has(p)).map((p) => relative(PROJECT_ROOT, p))).toEqual([]);
    expect([...ours].some((p) => relative(PROJECT_ROOT, p).startsWith('src/physics/'))).toBe(true);
  });

  describe('in an invented project', () => {
    let dir: string;
    beforeEach(() => {
      dir = mkdtempSync(join(tmpdir(), 'pumpscribe-graph-'));
      mkdirSync(join(dir, 'src', 'ui'), { recursive: true });
      mkdirSync(join(dir, 'src', 'physics'), { recursive: true });
      mkdirSync(join(dir, 'src', 'cli'), { recursive: true });
      mkdirSync(join(dir, 'dist'), { recursive: true });
      writeFileSync(join(dir, 'index.html'), '<script type="module" src="/src/ui/main.ts"></script>');
      writeFileSync(join(dir, 'src', 'ui', 'main.ts'), "import { g } from '../physics/gravity.ts';\nconsole.log(g);\n");
      writeFileSync(join(dir, 'src', 'physics', 'gravity.ts'), 'export const g = 9.80665;\n');
      writeFileSync(join(dir, 'src', 'cli', 'unrelated.ts'), 'export const x = 1;\n');
      writeFileSync(join(dir, 'dist', 'index.html'), 'built');
      const past = new Date(Date.now() - 120_000);
      for (const f of ['index.html', 'src/ui/main.ts', 'src/physics/gravity.ts', 'src/cli/unrelated.ts']) utimesSync(join(dir, f), past, past);
    });
    afterEach(() => rmSync(dir, { recursive: true, force: true }));

    it('is fresh when nothing changed after the build', () => {
      expect(workbenchState(dir)).toEqual({ buildable: true, built: true, stale: false });
    });
    it('is stale after a change in a folder the UI reaches through an import (src/physics)', () => {
      const later = new Date(Date.now() + 60_000);
      utimesSync(join(dir, 'src', 'physics', 'gravity.ts'), later, later);
      expect(workbenchState(dir).stale).toBe(true);
    });
    it('is not stale after a change in a file the bundle does not import', () => {
      const later = new Date(Date.now() + 60_000);
      utimesSync(join(dir, 'src', 'cli', 'unrelated.ts'), later, later);
      expect(workbenchState(dir).stale).toBe(false);
    });
    it('is stale when an import names a file that is not there, so the rebuild reports it', () => {
      writeFileSync(join(dir, 'src', 'ui', 'main.ts'), "import { g } from '../physics/gone.ts';\n");
      const past = new Date(Date.now() - 120_000);
      utimesSync(join(dir, 'src', 'ui', 'main.ts'), past, past);
      expect(workbenchState(dir).stale).toBe(true);
    });
  });
});
