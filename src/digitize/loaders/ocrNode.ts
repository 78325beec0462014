/**
 * The character reader of the automatic take-off on scans, in Node: tesseract.js (WebAssembly)
 * with the English data of @tesseract.js-data/eng read from node_modules, never from the
 * network. One recogniser is started on first use and kept; `closeTextReaderNode` ends it.
 * Reading a picture is shared with the browser's reader (ocrRead.ts, ocrBrowser.ts).
 */
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import type { GreyImage, ReadWord, TextReader } from '../detect/rasterText.ts';
import { readWords } from './ocrRead.ts';

type Worker = import('tesseract.js').Worker;

let started: Promise<Worker> | null = null;

/** Where the English data lies: the package's LSTM model (the kind tesseract.js 7 reads). */
function dataFolder(): string {
  const require = createRequire(import.meta.url);
  return join(dirname(require.resolve('@tesseract.js-data/eng/package.json')), '4.0.0_best_int');
}

async function start(): Promise<Worker> {
  const { createWorker, OEM } = await import('tesseract.js');
  // cacheMethod 'none': nothing is written beside the working folder; langPath a folder: read from disk.
  return createWorker('eng', OEM.LSTM_ONLY, { langPath: dataFolder(), cacheMethod: 'none', gzip: true });
}

/** The reader, started once (about a second) and reused. */
export function textReaderNode(): TextReader {
  return {
    async read(image: GreyImage, what: 'digits' | 'words'): Promise<ReadWord[]> {
      started ??= start();
      return readWords(await started, image, what);
    },
  };
}

/** Ends the recogniser (a command or a test calls this when done). */
export async function closeTextReaderNode(): Promise<void> {
  const s = started;
  started = null;
  if (s) await (await s).terminate();
}
