/** pdf.js's worker module, which ships no types; the command line only hands it to pdf.js (src/digitize/loaders/pdfNode.ts). */
declare module 'pdfjs-dist/legacy/build/pdf.worker.mjs' {
  export const WorkerMessageHandler: unknown;
}
