/**
 * Build of the workbench (index.html → dist/). pdf.js is loaded lazily inside the sheet
 * worker, so it lands in its own chunks and the first screen stays small. The standard
 * font data pdf.js needs for unembedded fonts is copied next to the build.
 */
import { defineConfig, type Plugin } from 'vite';
import { cpSync, existsSync } from 'node:fs';
import { join } from 'node:path';

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
  plugins: [copyPdfFonts()],
});
