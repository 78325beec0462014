/**
 * Each command loads only what it needs: the import graph of the command line, as esbuild
 * bundles it (scripts/build-cli.mjs), followed from each command file along static imports
 * only (a dynamic `import()` is loaded when that path runs, not at start). No command but
 * `serve` and `start` reaches the web server; no command reaches pdf.js, the image decoders
 * or the canvas library at start (they load when a sheet of that kind is opened); a CSV
 * `build` or a `check` loads no native library at all.
 */
import { join } from 'node:path';
import { build, type Metafile } from 'esbuild';
import { beforeAll, describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..', '..');
const EXTERNAL = ['@napi-rs/canvas', 'sharp', 'better-sqlite3', 'pdfjs-dist', 'pdfjs-dist/*', 'fastify', '@fastify/*', 'vite', 'tsx', 'konva', 'konva/*', 'pdf-lib', 'epanet-js'];

let inputs: Metafile['inputs'];

beforeAll(async () => {
  const result = await build({
    entryPoints: [join(root, 'src', 'cli', 'main.ts')],
    absWorkingDir: root,
    bundle: true,
    splitting: true,
    format: 'esm',
    platform: 'node',
    target: 'node20',
    outdir: join(root, 'artifacts', 'lean-commands'),
    write: false,
    metafile: true,
    external: EXTERNAL,
    logLevel: 'silent',
  });
  inputs = result.metafile.inputs;
}, 60_000);

/** Files and packages reached from `start` along static imports. */
function loadedAtStart(start: string): { files: string[]; packages: string[] } {
  expect(inputs[start], `${start} is not in the command line's import graph`).toBeDefined();
  const seen = new Set([start]);
  const packages = new Set<string>();
  const stack = [start];
  while (stack.length) {
    const file = stack.pop() as string;
    for (const i of inputs[file]?.imports ?? []) {
      if (i.kind === 'dynamic-import') continue;
      if (i.external) {
        if (!i.path.startsWith('node:')) packages.add(i.path.startsWith('@') ? i.path.split('/').slice(0, 2).join('/') : (i.path.split('/')[0] as string));
        continue;
      }
      if (!seen.has(i.path)) {
        seen.add(i.path);
        stack.push(i.path);
      }
    }
  }
  return { files: [...seen], packages: [...packages] };
}

const SERVER = ['fastify', '@fastify/static', '@fastify/compress'];
const HEAVY = ['pdfjs-dist', 'sharp', '@napi-rs/canvas'];
/** What each command may load at start beyond the core (zod and commander are bundled inside). */
const ALLOWED: Record<string, string[]> = {
  build: [],
  check: [],
  duty: [],
  export: [],
  library: ['better-sqlite3'],
  panels: [],
  report: ['pdf-lib'],
  scale: [],
  study: [],
  takeoff: [],
  serve: ['better-sqlite3', ...SERVER],
  start: ['better-sqlite3', ...SERVER],
};

describe('lean commands', () => {
  it('the entry point loads no command until one is named', () => {
    const { files } = loadedAtStart('src/cli/main.ts');
    expect(files.filter((f) => f.startsWith('src/cli/commands/'))).toEqual([]);
    expect(files.filter((f) => !f.startsWith('src/cli/') && f !== 'src/version.ts')).toEqual([]);
  });

  for (const [command, allowed] of Object.entries(ALLOWED)) {
    it(`${command} loads at start only what it needs (${allowed.length ? allowed.join(', ') : 'no package beyond the core'})`, () => {
      const { files, packages } = loadedAtStart(`src/cli/commands/${command}.ts`);
      const extra = packages.filter((p) => p !== 'zod' && p !== 'commander' && !allowed.includes(p));
      expect(extra, `${command} loads ${extra.join(', ')} at start`).toEqual([]);
      for (const p of HEAVY) expect(packages).not.toContain(p);
      if (!allowed.includes('fastify')) {
        expect(files.filter((f) => f.startsWith('src/server/') || f.startsWith('src/ui/'))).toEqual([]);
      }
    });
  }

  it('every command file is in the table above', () => {
    const commands = Object.keys(inputs)
      .filter((f) => /^src\/cli\/commands\/[^/]+\.ts$/.test(f))
      .map((f) => f.replace(/^src\/cli\/commands\/|\.ts$/g, ''))
      .sort();
    expect(commands).toEqual(Object.keys(ALLOWED).sort());
  });

  it('a take-off loads the automatic take-off (src/digitize/detect) only with --detect', () => {
    const { files } = loadedAtStart('src/cli/commands/takeoff.ts');
    expect(files.filter((f) => f.startsWith('src/digitize/detect/'))).toEqual([]);
  });

  it('a take-off loads pdf.js only for a PDF and the image decoder only for a JPEG (dynamic imports)', () => {
    const dynamic = (file: string) => (inputs[file]?.imports ?? []).filter((i) => i.kind === 'dynamic-import').map((i) => i.path);
    expect(dynamic('src/digitize/loaders/pdfNode.ts')).toContain('pdfjs-dist/legacy/build/pdf.min.mjs');
    expect(dynamic('src/digitize/loaders/imageDecode.ts')).toContain('sharp');
  });
});
