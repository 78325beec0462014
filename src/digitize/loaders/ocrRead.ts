/**
 * What the two character readers of scans share (ocrNode.ts in Node, ocrBrowser.ts in the
 * workbench's sheet worker): the picture handed to tesseract.js as a binary greymap (PGM, which
 * the recogniser decodes itself), the reader's settings for tick labels and for words, and its
 * answer turned into the detector's words. Only the way the recogniser is started differs.
 *
 * No Node and no DOM here; tesseract.js is reached through the worker handed in.
 */
import type { GreyImage, ReadWord } from '../detect/rasterText.ts';

type Worker = import('tesseract.js').Worker;

/** tesseract.js's page segmentation mode "a single uniform block of text" (PSM.SINGLE_BLOCK). */
const SINGLE_BLOCK = '6';

/** The characters a tick label is printed with. */
export const DIGIT_CHARACTERS = '0123456789.,-%';

/** The picture as a binary greymap: a short text header, then one byte a pixel. */
export function pgmBytes(image: GreyImage): Uint8Array {
  const head = new TextEncoder().encode(`P5\n${image.width} ${image.height}\n255\n`);
  const out = new Uint8Array(head.length + image.grey.length);
  out.set(head, 0);
  out.set(image.grey, head.length);
  return out;
}

/** Reads the words of a picture with a started recogniser; `digits` limits it to the characters of tick labels. */
export async function readWords(worker: Worker, image: GreyImage, what: 'digits' | 'words'): Promise<ReadWord[]> {
  await worker.setParameters({
    tessedit_char_whitelist: what === 'digits' ? DIGIT_CHARACTERS : '',
    tessedit_pageseg_mode: SINGLE_BLOCK as import('tesseract.js').PSM,
  });
  const result = await worker.recognize(pgmBytes(image) as unknown as Parameters<Worker['recognize']>[0], {}, { blocks: true, text: false });
  const words: ReadWord[] = [];
  for (const block of result.data.blocks ?? []) {
    for (const para of block.paragraphs) {
      for (const line of para.lines) {
        for (const w of line.words) words.push({ text: w.text, confidence: w.confidence, box: [w.bbox.x0, w.bbox.y0, w.bbox.x1, w.bbox.y1] });
      }
    }
  }
  return words;
}
