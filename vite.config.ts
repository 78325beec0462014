/**
 * Build of the workbench (index.html → dist/). pdf.js is loaded lazily inside the sheet
 * worker, so it lands in its own chunks and the first screen stays small. The standard
 * font data pdf.js needs for unembedded fonts is copied next to the build, and so is the
 * character reader of scans (tesseract.js's worker script, its LSTM cores and the English
 * data of @tesseract.js-data/eng) under dist/ocr/: the workbench reads scans offline, from
 * its own server, never from a CDN (src/digitize/loaders/ocrBrowser.ts).
 */
import { defineConfig, type Plugin } from 'vite';
import { cpSync, existsSync, mkdirSync } from 'node:fs';
import { dirname, join } from 'node:path';

/** Files copied from node_modules next to the build: [from under node_modules, to under the build folder]. */
const BESIDE_BUILD: ReadonlyArray<readonly [string, string]> = [
  // pdf.js's standard font data, for unembedded fonts (a folder).
  [join('pdfjs-dist', 'standard_fonts'), join('pdfjs', 'standard_fonts')],
  // The browser's character reader of scans, under ocr/ (OCR_FILES in ocrBrowser.ts names the same paths).
  [join('tesseract.js', 'dist', 'worker.min.js'), join('ocr', 'worker.min.js')],
  // tesseract.js picks the fastest core the browser runs (relaxed SIMD, SIMD, plain) from ocr/core/.
  ...['tesseract-core-relaxedsimd-lstm.wasm.js', 'tesseract-core-simd-lstm.wasm.js', 'tesseract-core-lstm.wasm.js'].map((f) => [join('tesseract.js-core', f), join('ocr', 'core', f)] as const),
  [join('@tesseract.js-data', 'eng', '4.0.0_best_int', 'eng.traineddata.gz'), join('ocr', 'eng', 'eng.traineddata.gz')],
];

function copyBesideBuild(): Plugin {
  let outDir = 'dist';
  return {
    name: 'pumpscribe-copy-beside-build',
    apply: 'build',
    configResolved(config) {
      outDir = config.build.outDir;
    },
    closeBundle() {
      for (const [from, to] of BESIDE_BUILD) {
        const source = join('node_modules', from);
        // A missing file is left out: pdf.js then uses its built-in fonts, and the workbench says in
        // one sentence that scans are read by hand when the reader's files are missing.
        if (!existsSync(source)) continue;
        mkdirSync(dirname(join(outDir, to)), { recursive: true });
        cpSync(source, join(outDir, to), { recursive: true });
      }
    },
  };
}

export default defineConfig({
  root: '.',
  base: './',
  publicDir: false,
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    target: 'es2022',
    sourcemap: true,
    chunkSizeWarningLimit: 600,
  },
  worker: { format: 'es' },
  plugins: [copyBesideBuild()],
});
