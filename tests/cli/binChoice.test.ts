/**
 * bin/pumpscribe.mjs runs the prebuilt bundle (with its code cache) only while it is current:
 * when a file under src/ is newer than the bundle's stamp, or PUMPSCRIBE_FROM_SOURCE=1, it runs
 * the TypeScript sources, so a developer's edit is never silently ignored. Tried on a copy of
 * bin/ in a scratch folder, with a stand-in bundle and stand-in sources that say which ran.
 */
import { spawnSync } from 'node:child_process';
import { cpSync, mkdirSync, mkdtempSync, readdirSync, rmSync, symlinkSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const repo = join(import.meta.dirname, '..', '..');
let root: string;

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'pumpscribe-bin-'));
  cpSync(join(repo, 'bin'), join(root, 'bin'), { recursive: true });
  symlinkSync(join(repo, 'node_modules'), join(root, 'node_modules'));
  mkdirSync(join(root, 'build', 'cli'), { recursive: true });
  writeFileSync(join(root, 'build', 'cli', 'pumpscribe.cjs'), "process.stdout.write('bundle ' + process.argv.slice(2).join(' '));\n");
  mkdirSync(join(root, 'src', 'cli'), { recursive: true });
  writeFileSync(join(root, 'src', 'cli', 'main.ts'), "const said: string = 'sources ' + process.argv.slice(2).join(' ');\nprocess.stdout.write(said);\n");
  const past = new Date(Date.now() - 60_000);
  utimesSync(join(root, 'src', 'cli', 'main.ts'), past, past);
  writeFileSync(join(root, 'build', 'cli', 'stamp.json'), JSON.stringify({ builtMs: Date.now() - 30_000 }));
});

afterAll(() => {
  rmSync(root, { recursive: true, force: true });
});

function pumpscribe(args: string[], env: Record<string, string> = {}) {
  const r = spawnSync(process.execPath, [join(root, 'bin', 'pumpscribe.mjs'), ...args], { encoding: 'utf8', env: { ...process.env, PUMPSCRIBE_FROM_SOURCE: '', PUMPSCRIBE_CODE_CACHE: '', ...env } });
  return { code: r.status, out: r.stdout };
}

describe('which command line bin/pumpscribe.mjs runs', () => {
  it('the current bundle, whose code cache is written beside it and then used', () => {
    expect(pumpscribe(['check', 'x'])).toEqual({ code: 0, out: 'bundle check x' });
    expect(readdirSync(join(root, 'build', 'cli', 'code-cache')).filter((f) => f.endsWith('-check.v8cache'))).toHaveLength(1);
    expect(pumpscribe(['check', 'x'])).toEqual({ code: 0, out: 'bundle check x' });
  });

  it('the sources when asked to', () => {
    expect(pumpscribe(['check', 'x'], { PUMPSCRIBE_FROM_SOURCE: '1' })).toEqual({ code: 0, out: 'sources check x' });
  });

  it('the sources when one of them is newer than the bundle', () => {
    const now = new Date();
    utimesSync(join(root, 'src', 'cli', 'main.ts'), now, now);
    expect(pumpscribe(['check', 'x'])).toEqual({ code: 0, out: 'sources check x' });
  });
  it('with the stamp naming the sources of the bundle, those alone: an edit of one runs the sources, a file outside the bundle does not', () => {
    const stamp = join(root, 'build', 'cli', 'stamp.json');
    const past = new Date(Date.now() - 60_000);
    utimesSync(join(root, 'src', 'cli', 'main.ts'), past, past);
    writeFileSync(join(root, 'src', 'cli', 'unused.ts'), 'export {};\n'); // newer than the stamp, but not in the bundle
    writeFileSync(stamp, JSON.stringify({ builtMs: Date.now() - 30_000, sources: ['src/cli/main.ts'] }));
    expect(pumpscribe(['check', 'x'])).toEqual({ code: 0, out: 'bundle check x' });
    const now = new Date();
    utimesSync(join(root, 'src', 'cli', 'main.ts'), now, now);
    expect(pumpscribe(['check', 'x'])).toEqual({ code: 0, out: 'sources check x' });
    // A listed source that is gone: the bundle is not trusted either.
    utimesSync(join(root, 'src', 'cli', 'main.ts'), past, past);
    writeFileSync(stamp, JSON.stringify({ builtMs: Date.now() - 30_000, sources: ['src/cli/main.ts', 'src/cli/gone.ts'] }));
    expect(pumpscribe(['check', 'x'])).toEqual({ code: 0, out: 'sources check x' });
  });
});
