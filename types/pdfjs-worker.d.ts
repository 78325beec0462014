/** The minified builds of pdf.js that the command line loads (src/digitize/loaders/pdfNode.ts): the same API as pdf.mjs. */
declare module 'pdfjs-dist/legacy/build/pdf.min.mjs' {
  export * from 'pdfjs-dist/legacy/build/pdf.mjs';
}

/** pdf.js's worker module, which ships no types; the command line only hands it to pdf.js. */
declare module 'pdfjs-dist/legacy/build/pdf.worker.min.mjs' {
  export const WorkerMessageHandler: unknown;
}
