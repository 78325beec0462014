/**
 * The character reader of the automatic take-off on scans, in Node: tesseract.js (WebAssembly)
 * with the English data of @tesseract.js-data/eng read from node_modules, never from the
 * network. One recogniser is started on first use and kept; `closeTextReaderNode` ends it.
 * Pictures go in as binary greymaps (PGM), which the recogniser decodes itself.
 */
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import type { GreyImage, ReadWord, TextReader } from '../detect/rasterText.ts';

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

function pgm(image: GreyImage): Buffer {
  const head = Buffer.from(`P5\n${image.width} ${image.height}\n255\n`, 'latin1');
  return Buffer.concat([head, Buffer.from(image.grey.buffer, image.grey.byteOffset, image.grey.byteLength)]);
}

/** The reader, started once (about a second) and reused. */
export function textReaderNode(): TextReader {
  return {
    async read(image: GreyImage, what: 'digits' | 'words'): Promise<ReadWord[]> {
      started ??= start();
      const worker = await started;
      const { PSM } = await import('tesseract.js');
      await worker.setParameters({
        tessedit_char_whitelist: what === 'digits' ? '0123456789.,-%' : '',
        tessedit_pageseg_mode: PSM.SINGLE_BLOCK,
      });
      const result = await worker.recognize(pgm(image), {}, { blocks: true, text: false });
      const words: ReadWord[] = [];
      for (const block of result.data.blocks ?? []) {
        for (const para of block.paragraphs) {
          for (const line of para.lines) {
            for (const w of line.words) words.push({ text: w.text, confidence: w.confidence, box: [w.bbox.x0, w.bbox.y0, w.bbox.x1, w.bbox.y1] });
          }
        }
      }
      return words;
    },
  };
}

/** Ends the recogniser (a command or a test calls this when done). */
export async function closeTextReaderNode(): Promise<void> {
  const s = started;
  started = null;
  if (s) await (await s).terminate();
}
