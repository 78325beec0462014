/**
 * The browser's character reader of scans (src/digitize/loaders/ocrBrowser.ts) and the reading
 * it shares with the Node reader (ocrRead.ts): its files are looked for on the workbench's own
 * server first, and a missing one is one sentence naming it, never a hang or a stack trace.
 */
import { describe, expect, it } from 'vitest';
import { OCR_FILES, OcrUnavailableError, textReaderBrowser } from '../../src/digitize/loaders/ocrBrowser.ts';
import { pgmBytes } from '../../src/digitize/loaders/ocrRead.ts';

const BLANK = { width: 4, height: 2, grey: new Uint8Array(8).fill(255) };

function fakeFetch(answers: Record<string, number | Error>, asked: string[]): typeof fetch {
  return (async (input: RequestInfo | URL) => {
    const url = String(input);
    asked.push(url);
    const a = answers[url] ?? 200;
    if (a instanceof Error) throw a;
    return new Response(null, { status: a });
  }) as typeof fetch;
}

describe('the browser reader of scans', () => {
  it('looks for its worker script, its core and the English data under its own folder, and names the one missing in one sentence', async () => {
    const base = 'http://127.0.0.1:5000/ocr/';
    const asked: string[] = [];
    const reader = textReaderBrowser({ base, fetchImpl: fakeFetch({ [`${base}${OCR_FILES.languageData}`]: 404 }, asked) });
    const failure = await reader.read(BLANK, 'digits').catch((e: unknown) => e);
    expect(failure).toBeInstanceOf(OcrUnavailableError);
    expect((failure as OcrUnavailableError).code).toBe('ocr-unavailable');
    expect((failure as Error).message).toBe('The text reader for scans could not be loaded from this server (eng/eng.traineddata.gz answered 404), so panels and curves are not found on this scan; draw the panel frames and trace the curves by hand.');
    expect(asked).toEqual([`${base}worker.min.js`, `${base}core/tesseract-core-lstm.wasm.js`, `${base}eng/eng.traineddata.gz`]);
    // Every file is on our own origin: nothing is asked of a CDN.
    for (const url of asked) expect(new URL(url).origin).toBe('http://127.0.0.1:5000');
  });

  it('tries again on the next read after a failed start (the server may come back)', async () => {
    const base = 'http://127.0.0.1:5000/ocr/';
    const asked: string[] = [];
    const reader = textReaderBrowser({ base, fetchImpl: fakeFetch({ [`${base}${OCR_FILES.worker}`]: new TypeError('Failed to fetch') }, asked) });
    await expect(reader.read(BLANK, 'words')).rejects.toThrow(/\(worker\.min\.js: Failed to fetch\)/);
    await expect(reader.read(BLANK, 'words')).rejects.toThrow(OcrUnavailableError);
    expect(asked.filter((u) => u.endsWith('worker.min.js'))).toHaveLength(2);
    await reader.close();
  });

  it('hands the picture over as a binary greymap: header, then one byte a pixel', () => {
    const bytes = pgmBytes({ width: 3, height: 2, grey: new Uint8Array([0, 128, 255, 1, 2, 3]) });
    const head = 'P5\n3 2\n255\n';
    expect(new TextDecoder().decode(bytes.subarray(0, head.length))).toBe(head);
    expect([...bytes.subarray(head.length)]).toEqual([0, 128, 255, 1, 2, 3]);
  });
});
