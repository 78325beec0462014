import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, utimesSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tempDir } from './helpers.ts';
import { buildWorkbench, workbenchState } from '../../src/server/workbench.ts';

let tmp: ReturnType<typeof tempDir>;
beforeEach(() => {
  tmp = tempDir('pumpscribe-workbench-');
  mkdirSync(join(tmp.dir, 'src', 'ui'), { recursive: true });
  writeFileSync(join(tmp.dir, 'index.html'), '<!doctype html><title>invented</title><div id="app"></div><script type="module" src="/src/ui/main.ts"></script>');
  writeFileSync(join(tmp.dir, 'src', 'ui', 'main.ts'), 'document.getElementById("app")!.textContent = "invented workbench";\n');
  writeFileSync(join(tmp.dir, 'vite.config.ts'), "export default { root: '.', base: './', publicDir: false, build: { outDir: 'dist', emptyOutDir: true } };\n");
});
afterEach(() => tmp.remove());

describe('the workbench build that start runs', () => {
  it('is needed when dist/ is missing, builds in-process, and is needed again once a source is newer', async () => {
    expect(workbenchState(tmp.dir)).toEqual({ buildable: true, built: false, stale: true });
    expect(await buildWorkbench(tmp.dir)).toBeNull();
    expect(existsSync(join(tmp.dir, 'dist', 'index.html'))).toBe(true);
    expect(workbenchState(tmp.dir)).toEqual({ buildable: true, built: true, stale: false });
    const later = new Date(Date.now() + 60_000);
    utimesSync(join(tmp.dir, 'src', 'ui', 'main.ts'), later, later);
    expect(workbenchState(tmp.dir).stale).toBe(true);
  });

  it('reports a failed build as one sentence instead of throwing', async () => {
    writeFileSync(join(tmp.dir, 'src', 'ui', 'main.ts'), 'this is not ( valid typescript');
    const failure = await buildWorkbench(tmp.dir);
    expect(failure).toEqual(expect.any(String));
    expect(failure!.includes('\n')).toBe(false);
    expect(existsSync(join(tmp.dir, 'dist', 'index.html'))).toBe(false);
  });

  it('is not buildable without index.html and src/ui', () => {
    const empty = tempDir('pumpscribe-nothing-');
    try {
      expect(workbenchState(empty.dir)).toEqual({ buildable: false, built: false, stale: false });
    } finally {
      empty.remove();
    }
  });
});
