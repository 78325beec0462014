/**
 * The character reader of the automatic take-off on scans, in the browser (the workbench's sheet
 * worker): tesseract.js with its worker script, its LSTM cores and the English data of
 * @tesseract.js-data/eng loaded from the workbench's own server (dist/ocr/, copied there by the
 * Vite build), never from a CDN, so that it works offline. The same TextReader as ocrNode.ts, so
 * the detector (src/digitize/detect) is one and the same in Node and in the browser.
 *
 * One recogniser is started on first use and kept. When its files cannot be loaded, `read`
 * rejects with OcrUnavailableError (one sentence); the workbench says so and the engineer goes
 * on by hand.
 */
import { UserError } from '../../model/errors.ts';
import type { GreyImage, ReadWord, TextReader } from '../detect/rasterText.ts';
import { readWords } from './ocrRead.ts';

type Worker = import('tesseract.js').Worker;

/** The files the reader loads, by path under its folder (vite.config.ts copies the same). */
export const OCR_FILES = {
  worker: 'worker.min.js',
  core: 'core/',
  /** The plain core, which every browser with WebAssembly runs: its presence stands for the folder. */
  plainCore: 'core/tesseract-core-lstm.wasm.js',
  language: 'eng/',
  languageData: 'eng/eng.traineddata.gz',
} as const;

/** How long the recogniser may take to start (its files are about 15 MB from the local server). */
const START_LIMIT_MS = 90_000;

/** The reader's files could not be loaded; the scan is then read by hand. */
export class OcrUnavailableError extends UserError {
  override name = 'OcrUnavailableError';
  constructor(reason: string) {
    super(`The text reader for scans could not be loaded from this server (${reason}), so panels and curves are not found on this scan; draw the panel frames and trace the curves by hand.`, 'ocr-unavailable');
  }
}

export interface BrowserReaderOptions {
  /** Absolute URL of the folder holding the reader's files (ending in "/"), e.g. new URL('ocr/', document.baseURI).href. */
  base: string;
  /** Told while the recogniser starts, with a fraction 0–1 and what it loads. */
  onStart?: (fraction: number, what: string) => void;
  /** The fetch used to look for the files first (the worker's own by default). */
  fetchImpl?: typeof fetch;
}

export interface BrowserTextReader extends TextReader {
  /** Ends the recogniser; the next read starts a new one. */
  close(): Promise<void>;
}

/** Every file the reader needs answers, or the sentence says which one does not. */
async function checkFiles(base: string, fetchImpl: typeof fetch): Promise<void> {
  for (const file of [OCR_FILES.worker, OCR_FILES.plainCore, OCR_FILES.languageData]) {
    const url = new URL(file, base).href;
    let status: number;
    try {
      status = (await fetchImpl(url, { method: 'HEAD', cache: 'no-store' })).status;
    } catch (error) {
      throw new OcrUnavailableError(`${file}: ${(error as Error).message}`);
    }
    if (status !== 200) throw new OcrUnavailableError(`${file} answered ${status}`);
  }
}

async function start(options: BrowserReaderOptions): Promise<Worker> {
  const { base } = options;
  await checkFiles(base, options.fetchImpl ?? fetch);
  const { createWorker, OEM } = await import('tesseract.js');
  let timer: ReturnType<typeof setTimeout> | undefined;
  let ready = false;
  const limit = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new OcrUnavailableError(`it did not start within ${START_LIMIT_MS / 1000} s`)), START_LIMIT_MS);
  });
  let started: Promise<Worker> | undefined;
  try {
    started = createWorker('eng', OEM.LSTM_ONLY, {
      workerPath: new URL(OCR_FILES.worker, base).href,
      corePath: new URL(OCR_FILES.core, base).href,
      langPath: new URL(OCR_FILES.language, base).href.replace(/\/$/, ''),
      // A plain worker from our own origin (no blob: URL), data read afresh, nothing cached in IndexedDB.
      workerBlobURL: false,
      cacheMethod: 'none',
      gzip: true,
      // Only the start is told: once reading, the detector's own steps are the progress shown.
      logger: (m: { status: string; progress: number }) => {
        if (!ready) options.onStart?.(m.progress, m.status);
      },
    });
    const worker = await Promise.race([started, limit]);
    ready = true;
    return worker;
  } catch (error) {
    // A recogniser that starts after the limit is ended at once, so no worker is left behind.
    if (!ready) void started?.then((late) => late.terminate(), () => undefined);
    if (error instanceof OcrUnavailableError) throw error;
    // tesseract.js rejects with the worker's error event's message, which may be empty.
    const text = error instanceof Error ? error.message : typeof error === 'string' && error ? error : 'its worker failed to start';
    throw new OcrUnavailableError(text);
  } finally {
    clearTimeout(timer);
  }
}

/** The reader: started on first use, reused, and started again after a failed start. */
export function textReaderBrowser(options: BrowserReaderOptions): BrowserTextReader {
  let started: Promise<Worker> | null = null;
  return {
    async read(image: GreyImage, what: 'digits' | 'words'): Promise<ReadWord[]> {
      started ??= start(options);
      let worker: Worker;
      try {
        worker = await started;
      } catch (error) {
        started = null;
        throw error;
      }
      return readWords(worker, image, what);
    },
    async close(): Promise<void> {
      const s = started;
      started = null;
      if (s) await (await s.catch(() => null))?.terminate();
    },
  };
}
