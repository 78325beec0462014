/**
 * The layer rules, checked on the source text (tsconfig.core.json and tsconfig.ui.json hold the
 * same rules for the compiler; this test names the file and the import that breaks one):
 * - the core (units, model, fit, physics, duty, export, demo, study, digitize except loaders)
 *   imports no Node module, uses no DOM or Node global, and imports nothing from ui, cli, server,
 *   library or the loaders;
 * - the UI imports no Node module and nothing from cli, server or library, and nothing it reaches
 *   through its imports does either.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { join, relative, resolve, dirname } from 'node:path';
import { importSpecifiers } from '../../src/server/importGraph.ts';

const ROOT = resolve(import.meta.dirname, '..', '..');

type Layer = 'core' | 'ui' | 'edge' | 'other';
const CORE = ['units', 'model', 'fit', 'physics', 'duty', 'export', 'demo', 'study', 'record', 'digitize'];
const EDGE = ['cli', 'server', 'library'];

export function layerOf(path: string): Layer {
  const parts = path.split('/');
  if (parts[0] !== 'src') return 'other';
  if (parts.length === 2) return 'core'; // src/version.ts
  const top = parts[1] as string;
  if (top === 'digitize' && parts[2] === 'loaders') return 'edge';
  if (CORE.includes(top)) return 'core';
  if (top === 'ui') return 'ui';
  if (EDGE.includes(top)) return 'edge';
  return 'other';
}

const NODE_MODULES = new Set(builtinModules.flatMap((m) => [m, `node:${m}`]));
const isNodeModule = (spec: string) => spec.startsWith('node:') || NODE_MODULES.has(spec.split('/')[0] as string);

/** Globals of the browser or of Node that the core must not touch (the compiler would also refuse them). */
const FOREIGN_GLOBALS = [
  'document', 'window', 'navigator', 'localStorage', 'sessionStorage', 'indexedDB', 'location', 'self',
  'HTMLElement', 'HTMLCanvasElement', 'OffscreenCanvas', 'CanvasRenderingContext2D', 'requestAnimationFrame',
  'XMLHttpRequest', 'Worker', 'Image', 'alert', 'fetch',
  'process', 'Buffer', '__dirname', '__filename', 'require', 'global', 'console',
];

/** Code with comments and string contents blanked, so that words in them do not count. */
function codeOnly(text: string): string {
  return text
    .replace(/\/\*[\s\S]*?\*\//g, ' ')
    .replace(/\/\/[^\n]*/g, ' ')
    .replace(/`(?:\\[\s\S]|[^`\\])*`/g, '``')
    .replace(/'(?:\\.|[^'\\\n])*'/g, "''")
    .replace(/"(?:\\.|[^"\\\n])*"/g, '""');
}

export function foreignGlobals(text: string): string[] {
  const code = codeOnly(text);
  // A global is a bare word: not a property (`.document`), not an object key (`document:`), not declared here.
  return FOREIGN_GLOBALS.filter((g) => {
    const declared = new RegExp(`\\b(?:const|let|var|function|class|interface|type)\\s+${g}\\b|[,({]\\s*${g}\\s*[,:)=}]`).test(code);
    return !declared && new RegExp(`(?<![.\\w$'"])${g}(?![\\w$]|\\s*:(?!:))`).test(code);
  });
}

export interface SourceFile {
  path: string;
  text: string;
}

/** Every broken rule, as "file: what". `files` paths are relative to the repository root. */
export function layerViolations(files: readonly SourceFile[]): string[] {
  const byPath = new Map(files.map((f) => [f.path, f]));
  const resolveRel = (from: string, spec: string): string | null => {
    if (!spec.startsWith('.')) return null;
    const base = relative(ROOT, resolve(ROOT, dirname(from), spec.replace(/[?#].*$/, '')));
    for (const ext of ['', '.ts', '/index.ts']) if (byPath.has(base + ext)) return base + ext;
    return base;
  };
  const out: string[] = [];
  const edges = new Map<string, string[]>();
  for (const f of files) {
    const layer = layerOf(f.path);
    const targets: string[] = [];
    for (const spec of importSpecifiers(f.text)) {
      const target = resolveRel(f.path, spec);
      if (target) targets.push(target);
      if ((layer === 'core' || layer === 'ui') && isNodeModule(spec)) out.push(`${f.path}: imports the Node module "${spec}"`);
      if (!target) continue;
      const to = layerOf(target);
      if (layer === 'core' && (to === 'ui' || to === 'edge')) out.push(`${f.path}: the core imports ${target} (${to === 'ui' ? 'the UI' : 'a Node edge'})`);
      if (layer === 'ui' && to === 'edge' && !target.startsWith('src/digitize/loaders/')) out.push(`${f.path}: the UI imports ${target} (a Node edge; reach the library over HTTP)`);
    }
    edges.set(f.path, targets);
    if (layer === 'core') for (const g of foreignGlobals(f.text)) out.push(`${f.path}: the core uses the global "${g}"`);
  }
  // What the UI reaches through its imports (the browser loaders, say) must not need Node either.
  const reached = new Set<string>();
  const queue = files.filter((f) => layerOf(f.path) === 'ui').map((f) => f.path);
  while (queue.length) {
    const p = queue.pop() as string;
    if (reached.has(p)) continue;
    reached.add(p);
    queue.push(...(edges.get(p) ?? []).filter((t) => byPath.has(t)));
  }
  for (const p of reached) {
    if (layerOf(p) === 'ui') continue;
    for (const spec of importSpecifiers(byPath.get(p)!.text)) if (isNodeModule(spec)) out.push(`${p}: reached from the UI, imports the Node module "${spec}"`);
  }
  return [...new Set(out)].sort();
}

function sourcesUnder(dir: string): SourceFile[] {
  const out: SourceFile[] = [];
  for (const entry of readdirSync(join(ROOT, dir), { withFileTypes: true })) {
    const path = `${dir}/${entry.name}`;
    if (entry.isDirectory()) out.push(...sourcesUnder(path));
    else if (/\.ts$/.test(entry.name) && !entry.name.endsWith('.d.ts')) out.push({ path, text: readFileSync(join(ROOT, path), 'utf8') });
  }
  return out;
}

describe('layer rules', () => {
  it('hold for every file under src/', () => {
    const files = sourcesUnder('src');
    expect(files.length).toBeGreaterThan(100);
    expect(layerViolations(files)).toEqual([]);
  });

  it('every file under src/ belongs to a layer (a new folder must be named here and in its tsconfig)', () => {
    expect(sourcesUnder('src').filter((f) => layerOf(f.path) === 'other').map((f) => f.path)).toEqual([]);
  });

  it('the per-layer tsconfigs cover the same folders as these rules', () => {
    const config = (name: string) => JSON.parse(readFileSync(join(ROOT, name), 'utf8')) as { include: string[]; exclude?: string[] };
    const core = config('tsconfig.core.json');
    expect(core.include.filter((p) => p !== 'src/version.ts').map((p) => p.replace(/^src\//, '')).sort()).toEqual([...CORE].sort());
    expect(core.exclude).toEqual(['src/digitize/loaders']);
    expect(config('tsconfig.ui.json').include).toContain('src/ui');
    for (const edge of EDGE) expect(config('tsconfig.node.json').include).toContain(`src/${edge}`);
    expect(config('tsconfig.node.json').include).toContain('src/digitize/loaders');
  });

  it('a core file importing node:fs is refused', () => {
    expect(layerViolations([{ path: 'src/fit/bad.ts', text: "import { readFileSync } from 'node:fs';\nexport const x = readFileSync;\n" }])).toEqual([
      'src/fit/bad.ts: imports the Node module "node:fs"',
    ]);
    expect(layerViolations([{ path: 'src/units/bad.ts', text: "import path from 'path';\n" }])).toEqual(['src/units/bad.ts: imports the Node module "path"']);
  });

  it('a core file importing the UI, the CLI, the server, the library or a loader is refused', () => {
    const files = [
      { path: 'src/duty/bad.ts', text: "import { a } from '../ui/views/words.ts';\nimport { b } from '../cli/io.ts';\nimport { c } from '../server/app.ts';\nimport { d } from '../library/store.ts';\nimport { e } from '../digitize/loaders/pdfNode.ts';\n" },
    ];
    expect(layerViolations(files)).toEqual([
      'src/duty/bad.ts: the core imports src/cli/io.ts (a Node edge)',
      'src/duty/bad.ts: the core imports src/digitize/loaders/pdfNode.ts (a Node edge)',
      'src/duty/bad.ts: the core imports src/library/store.ts (a Node edge)',
      'src/duty/bad.ts: the core imports src/server/app.ts (a Node edge)',
      'src/duty/bad.ts: the core imports src/ui/views/words.ts (the UI)',
    ]);
  });

  it('a core file using a DOM or Node global is refused; words in comments, strings and properties are not', () => {
    expect(layerViolations([{ path: 'src/model/bad.ts', text: 'export const t = document.title;\nexport const c = process.cwd();\n' }])).toEqual([
      'src/model/bad.ts: the core uses the global "document"',
      'src/model/bad.ts: the core uses the global "process"',
    ]);
    const innocent = "// the document says\nexport const s = 'window';\nexport const o = { process: 1, self: 2 };\nexport const p = o.process;\n";
    expect(layerViolations([{ path: 'src/model/fine.ts', text: innocent }])).toEqual([]);
  });

  it('a UI file importing node:*, the CLI, the server or the library is refused, also through a core file it imports', () => {
    const files = [
      { path: 'src/ui/bad.ts', text: "import { x } from 'node:path';\nimport { s } from '../library/store.ts';\nimport { y } from '../fit/helper.ts';\n" },
      { path: 'src/fit/helper.ts', text: "export const y = 1;\nimport { z } from '../digitize/loaders/pdfNode.ts';\n" },
      { path: 'src/digitize/loaders/pdfNode.ts', text: "import { readFile } from 'node:fs/promises';\nexport const z = readFile;\n" },
    ];
    expect(layerViolations(files)).toEqual([
      'src/digitize/loaders/pdfNode.ts: reached from the UI, imports the Node module "node:fs/promises"',
      'src/fit/helper.ts: the core imports src/digitize/loaders/pdfNode.ts (a Node edge)',
      'src/ui/bad.ts: imports the Node module "node:path"',
      'src/ui/bad.ts: the UI imports src/library/store.ts (a Node edge; reach the library over HTTP)',
    ]);
  });

  it('the UI may use the browser loaders', () => {
    const files = [
      { path: 'src/ui/ok.ts', text: "import { open } from '../digitize/loaders/pdfBrowser.ts';\n" },
      { path: 'src/digitize/loaders/pdfBrowser.ts', text: "import * as pdf from 'pdfjs-dist';\nexport const open = pdf;\n" },
    ];
    expect(layerViolations(files)).toEqual([]);
  });
});
