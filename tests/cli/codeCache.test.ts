/**
 * The V8 code cache of the prebuilt command line (bin/runBundle.mjs): it is used on the second
 * run, it can never give the code of another bundle (it is keyed on the bundle's text), it is
 * written only by a run that did its work (exit 0 or 1), and a folder that cannot be written or
 * a damaged cache file only means running without it. Each run is a child process running a
 * small stand-in bundle through runBundle, as bin/pumpscribe.mjs runs build/cli/pumpscribe.cjs.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
// @ts-expect-error -- a plain ES module of bin/, without type declarations
import { codeCacheFolder, runLabel, WRAPPER_NAMES } from '../../bin/runBundle.mjs';

const RUN_BUNDLE = pathToFileURL(join(import.meta.dirname, '..', '..', 'bin', 'runBundle.mjs')).href;

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'pumpscribe-code-cache-'));
});
afterEach(() => {
  rmSync(dir, { recursive: true, force: true });
});

/** A stand-in bundle: uses the wrapper's names as the real one does, prints `answer`, exits with `code`. */
function writeBundle(answer: string, code = 0): string {
  const file = join(dir, 'bundle.cjs');
  writeFileSync(
    file,
    [
      `const path = require('node:path');`,
      `if (typeof __pumpscribe_url !== 'string' || !__pumpscribe_url.startsWith('file:')) throw new Error('no bundle URL');`,
      // a dynamic import through the wrapper, as import('sharp') in the sources
      `__psi_('node:os').then((os) => {`,
      `  if (typeof os.tmpdir !== 'function') throw new Error('no module');`,
      `  process.stdout.write(${JSON.stringify(answer)} + ' ' + path.basename(__filename));`,
      `  process.exit(${code});`,
      `});`,
    ].join('\n'),
  );
  return file;
}

/** Runs the bundle once through runBundle in a child; returns its output and the cache state it saw. */
function run(bundle: string, cache: string, args: string[] = ['check']) {
  const script = `import { runBundle } from ${JSON.stringify(RUN_BUNDLE)}; process.stderr.write(runBundle(${JSON.stringify(bundle)}, ${JSON.stringify(args)}));`;
  const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8', env: { ...process.env, PUMPSCRIBE_CODE_CACHE: cache } });
  return { code: r.status, out: r.stdout, state: r.stderr.trim() };
}

const cacheFiles = (folder: string) => {
  try {
    return readdirSync(folder).filter((f) => f.endsWith('.v8cache'));
  } catch {
    return [];
  }
};

describe('the code cache of the command line', () => {
  it('is written by the first run and used by the next, with the same result', () => {
    const bundle = writeBundle('forty-two');
    const cache = join(dir, 'cache');
    const first = run(bundle, cache);
    expect(first).toEqual({ code: 0, out: 'forty-two bundle.cjs', state: 'none' });
    expect(cacheFiles(cache)).toHaveLength(1);
    const second = run(bundle, cache);
    expect(second).toEqual({ code: 0, out: 'forty-two bundle.cjs', state: 'used' });
  });

  it('never gives the code of another bundle: a changed bundle runs its own code', () => {
    const cache = join(dir, 'cache');
    run(writeBundle('old answer'), cache);
    run(writeBundle('old answer'), cache);
    // Same length, other text: V8 alone would not tell them apart; the key (SHA-256 of the text) does.
    const changed = run(writeBundle('new answer'), cache);
    expect(changed).toEqual({ code: 0, out: 'new answer bundle.cjs', state: 'none' });
    expect(cacheFiles(cache)).toHaveLength(2);
  });

  it('is not written by a run that refused its input (exit 2)', () => {
    const cache = join(dir, 'cache');
    const refused = run(writeBundle('refused', 2), cache);
    expect(refused.code).toBe(2);
    expect(cacheFiles(cache)).toEqual([]);
  });

  it('keeps help runs and each command apart', () => {
    expect(runLabel(['takeoff', 'a.takeoff.json', '-o', 'b.json'])).toBe('takeoff');
    expect(runLabel(['-q', 'takeoff', '--help'])).toBe('takeoff-help');
    expect(runLabel(['help', 'takeoff'])).toBe('help-help');
    expect(runLabel(['--version'])).toBe('none');
    expect(runLabel(['../../etc/passwd'])).toBe('other');
    expect(WRAPPER_NAMES).toContain('__psi_');
  });

  it('is off with PUMPSCRIBE_CODE_CACHE=off and sits beside the bundle by default', () => {
    expect(codeCacheFolder('/x/build/cli/pumpscribe.cjs', { PUMPSCRIBE_CODE_CACHE: 'off' })).toBeNull();
    expect(codeCacheFolder('/x/build/cli/pumpscribe.cjs', {})).toBe(join('/x/build/cli', 'code-cache'));
    const bundle = writeBundle('no cache');
    expect(run(bundle, 'off')).toEqual({ code: 0, out: 'no cache bundle.cjs', state: 'off' });
  });

  it('a folder that cannot be made only means no cache', () => {
    const bundle = writeBundle('still works');
    const blocker = join(dir, 'a-file');
    writeFileSync(blocker, 'not a folder');
    const cache = join(blocker, 'cache'); // a folder under a file: cannot be created, even by root
    expect(run(bundle, cache)).toEqual({ code: 0, out: 'still works bundle.cjs', state: 'none' });
    expect(run(bundle, cache)).toEqual({ code: 0, out: 'still works bundle.cjs', state: 'none' });
  });

  it('a damaged cache file is refused by V8 and written again', () => {
    const bundle = writeBundle('mended');
    const cache = join(dir, 'cache');
    run(bundle, cache);
    const [name] = cacheFiles(cache);
    writeFileSync(join(cache, name as string), 'not a V8 code cache');
    expect(run(bundle, cache)).toEqual({ code: 0, out: 'mended bundle.cjs', state: 'rejected' });
    expect(run(bundle, cache)).toEqual({ code: 0, out: 'mended bundle.cjs', state: 'used' });
  });
});
