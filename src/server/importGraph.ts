/**
 * The import graph of our own sources, read from the text of the files: which files a bundle
 * built from an entry really contains. The workbench's staleness check follows it (so a change in
 * any file the UI reaches, src/physics included, triggers a rebuild), and the layer test uses the
 * same reading of import specifiers.
 *
 * Followed: `import … from '…'`, `export … from '…'`, side-effect `import '…'`, dynamic
 * `import('…')`, `new URL('…', import.meta.url)` (how workers are started) and, in HTML,
 * `<script src="…">`. Only relative and root-absolute specifiers lead to files; bare package
 * names are reported but not followed.
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';

/** Comments removed, so that an import written in a comment does not count. Strings are kept. */
function withoutComments(text: string): string {
  let out = '';
  let i = 0;
  let quote: string | null = null;
  while (i < text.length) {
    const c = text[i] as string;
    const next = text[i + 1];
    if (quote) {
      out += c;
      if (c === '\\') {
        out += next ?? '';
        i += 2;
        continue;
      }
      if (c === quote) quote = null;
      i++;
    } else if (c === '/' && next === '/') {
      while (i < text.length && text[i] !== '\n') i++;
    } else if (c === '/' && next === '*') {
      const end = text.indexOf('*/', i + 2);
      i = end < 0 ? text.length : end + 2;
      out += ' ';
    } else {
      if (c === '"' || c === "'" || c === '`') quote = c;
      out += c;
      i++;
    }
  }
  return out;
}

const PATTERNS = [
  /(?:^|[;\s}])import\s+(?:type\s+)?[\w*{}\s,$]*?\bfrom\s*(['"])([^'"\n]+)\1/g,
  /(?:^|[;\s}])export\s+(?:type\s+)?(?:\*(?:\s+as\s+[\w$]+)?|\{[^}]*\})\s*from\s*(['"])([^'"\n]+)\1/g,
  /(?:^|[;\s}])import\s*(['"])([^'"\n]+)\1/g,
  /\bimport\s*\(\s*(['"])([^'"\n]+)\1\s*[,)]/g,
  /\bnew\s+URL\s*\(\s*(['"])([^'"\n]+)\1\s*,\s*import\.meta\.url\s*\)/g,
];

/** Every module specifier a TypeScript or JavaScript source names, in order of appearance. */
export function importSpecifiers(source: string): string[] {
  const text = withoutComments(source);
  const found: { at: number; spec: string }[] = [];
  for (const pattern of PATTERNS) {
    for (const m of text.matchAll(pattern)) found.push({ at: m.index ?? 0, spec: m[2] as string });
  }
  return [...new Set(found.sort((a, b) => a.at - b.at).map((f) => f.spec))];
}

/** Script sources named by an HTML page (`<script … src="…">`). */
export function htmlScripts(html: string): string[] {
  return [...html.matchAll(/<script\b[^>]*\bsrc\s*=\s*(['"])([^'"]+)\1/gi)].map((m) => m[2] as string);
}

const EXTENSIONS = ['', '.ts', '.tsx', '.mts', '.js', '.mjs', '/index.ts', '/index.js'];

/** The file a relative or root-absolute specifier names, or null for a package or a missing file. */
export function resolveSpecifier(root: string, fromFile: string, spec: string): string | null {
  const clean = spec.replace(/[?#].*$/, '');
  let base: string;
  if (clean.startsWith('./') || clean.startsWith('../')) base = resolve(dirname(fromFile), clean);
  else if (clean.startsWith('/')) base = join(root, clean);
  else return null;
  for (const ext of EXTENSIONS) {
    const candidate = base + ext;
    if (existsSync(candidate) && statSync(candidate).isFile()) return candidate;
  }
  return null;
}

export interface ImportGraph {
  /** Absolute paths of every file reached, entries included. */
  files: string[];
  /** Specifiers that name a file that is not there (a broken import; the build will say more). */
  missing: { from: string; spec: string }[];
  /** Bare package specifiers met (not followed). */
  packages: string[];
}

/** Follows imports from `entries` (absolute paths; .html entries contribute their scripts). */
export function importGraph(root: string, entries: readonly string[]): ImportGraph {
  const seen = new Set<string>();
  const missing: { from: string; spec: string }[] = [];
  const packages = new Set<string>();
  const queue = [...entries];
  while (queue.length > 0) {
    const file = queue.pop() as string;
    if (seen.has(file) || !existsSync(file)) continue;
    seen.add(file);
    const text = readFileSync(file, 'utf8');
    const specs = file.endsWith('.html') ? htmlScripts(text) : /\.(m?[jt]sx?)$/.test(file) ? importSpecifiers(text) : [];
    for (const spec of specs) {
      const target = resolveSpecifier(root, file, spec);
      if (target) {
        if (!target.split(sep).includes('node_modules')) queue.push(target);
      } else if (spec.startsWith('.') || spec.startsWith('/')) missing.push({ from: relative(root, file), spec });
      else packages.add(spec);
    }
  }
  return { files: [...seen].sort(), missing, packages: [...packages].sort() };
}
