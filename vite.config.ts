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

function copyPdfFonts(): Plugin {
  let outDir = 'dist';
  return {
    name: 'pumpscribe-copy-pdf-fonts',
    apply: 'build',
    configResolved(config) {
      outDir = config.build.outDir;
    },
    closeBundle() {
      const from = join('node_modules', 'pdfjs-dist', 'standard_fonts');
      if (existsSync(from)) cpSync(from, join(outDir, 'pdfjs', 'standard_fonts'), { recursive: true });
    },
  };
}

/** What the browser's character reader loads, by path under dist/ocr/ (OCR_FILES in ocrBrowser.ts names the same). */
const OCR_ASSETS: ReadonlyArray<readonly [string, string]> = [
  [join('tesseract.js', 'dist', 'worker.min.js'), 'worker.min.js'],
  // tesseract.js picks the fastest core the browser runs (relaxed SIMD, SIMD, plain) from this folder.
  ...['tesseract-core-relaxedsimd-lstm.wasm.js', 'tesseract-core-simd-lstm.wasm.js', 'tesseract-core-lstm.wasm.js'].map((f) => [join('tesseract.js-core', f), join('core', f)] as const),
  [join('@tesseract.js-data', 'eng', '4.0.0_best_int', 'eng.traineddata.gz'), join('eng', 'eng.traineddata.gz')],
];

function copyOcrAssets(): Plugin {
  let outDir = 'dist';
  return {
    name: 'pumpscribe-copy-ocr-assets',
    apply: 'build',
    configResolved(config) {
      outDir = config.build.outDir;
    },
    closeBundle() {
      for (const [from, to] of OCR_ASSETS) {
        const source = join('node_modules', from);
        // A missing file leaves the reader out; the workbench then says so in one sentence when a scan is read.
        if (!existsSync(source)) continue;
        mkdirSync(dirname(join(outDir, 'ocr', to)), { recursive: true });
        cpSync(source, join(outDir, 'ocr', to));
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
  plugins: [copyPdfFonts(), copyOcrAssets()],
});
