/**
 * The browser's image loader (src/digitize/loaders/imageBrowser.ts) in Chromium, against the
 * Node loader: the committed sample scans decode to the same pixels in both (the workbench and
 * the headless replay follow the same pixels), and a page over the working limit is read at the
 * same reduced size, with the same sheet units and the same sentence.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { build } from 'esbuild';
import { createCanvas } from '@napi-rs/canvas';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadImageRasterNode, loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { CHROMIUM, openBrowser, ROOT, type Browser } from './harness.ts';
import { existsSync } from 'node:fs';

/** FNV-1a over the bytes: equal prints mean equal pixels (for these tests' purpose). */
function print(data: Uint8ClampedArray | Uint8Array): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < data.length; i++) h = Math.imul(h ^ (data[i] as number), 0x01000193) >>> 0;
  return h;
}

interface BrowserResult {
  width: number;
  height: number;
  scale: number;
  print: number;
  notes: string[];
  sheet?: [number, number];
}

describe.skipIf(!existsSync(CHROMIUM))('the image loader in the browser', () => {
  let browser: Browser;
  beforeAll(async () => {
    const bundle = await build({
      stdin: { contents: "export { loadImageRasterBrowser, loadImageSheetBrowser } from './src/digitize/loaders/imageBrowser.ts';", resolveDir: ROOT, loader: 'ts' },
      bundle: true,
      format: 'iife',
      globalName: 'imageLoader',
      platform: 'browser',
      write: false,
      logLevel: 'silent',
    });
    browser = await openBrowser();
    await browser.page.setContent('<!doctype html><title>loader</title>');
    await browser.page.addScriptTag({ content: `${bundle.outputFiles[0]!.text}\n${print.toString()}` });
  }, 120_000);
  afterAll(async () => {
    await browser?.close();
  });

  async function inBrowser(bytes: Uint8Array, maxPixels?: number): Promise<BrowserResult> {
    return browser.page.evaluate(
      async ({ base64, maxPixels }) => {
        const bytes = Uint8Array.from(atob(base64), (c) => c.charCodeAt(0));
        const w = window as unknown as {
          imageLoader: { loadImageRasterBrowser: (b: Uint8Array, o: object) => Promise<{ width: number; height: number; scale: number; data: Uint8ClampedArray }> };
          print: (d: Uint8ClampedArray) => number;
        };
        const notes: string[] = [];
        const options = { ...(maxPixels ? { limits: { maxBytes: 50 * 1024 * 1024, maxPixels } } : {}), name: 'scan.jpg', onNote: (n: string) => notes.push(n) };
        const image = await w.imageLoader.loadImageRasterBrowser(bytes, options);
        return { width: image.width, height: image.height, scale: image.scale, print: w.print(image.data), notes };
      },
      { base64: Buffer.from(bytes).toString('base64'), maxPixels },
    );
  }

  it('the committed sample scans decode to the same pixels as in Node', async () => {
    for (const name of ['us-iso-black-scan.jpg', 'si-panels-colour-scan.jpg']) {
      const bytes = new Uint8Array(readFileSync(join(ROOT, 'samples', 'sheets', name)));
      const node = await loadImageRasterNode(bytes);
      const web = await inBrowser(bytes);
      expect([web.width, web.height, web.scale]).toEqual([node.width, node.height, 1]);
      expect(web.print, `${name}: the browser's pixels differ from Node's`).toBe(print(node.data));
      expect(web.notes).toEqual([]);
    }
  }, 120_000);

  it('a page over the working limit is read at the same reduced size as in Node, with the same sentence', async () => {
    const canvas = createCanvas(2000, 1500);
    const ctx = canvas.getContext('2d');
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, 2000, 1500);
    ctx.fillStyle = '#000000';
    ctx.fillRect(0, 701, 2000, 2);
    const bytes = new Uint8Array(canvas.toBuffer('image/jpeg', 92));
    const limits = { maxBytes: 50 * 1024 * 1024, maxPixels: 1_000_000 };
    const nodeNotes: string[] = [];
    const node = await loadImageRasterNode(bytes, { limits, name: 'scan.jpg', onNote: (n) => nodeNotes.push(n) });
    const web = await inBrowser(bytes, limits.maxPixels);
    expect([web.width, web.height, web.scale]).toEqual([node.width, node.height, node.scale]);
    expect([web.width, web.height]).toEqual([1000, 750]);
    expect(web.notes).toEqual(nodeNotes);
    expect(web.notes[0]).toMatch(/read at 1\/2 of its resolution/);
    const sheet = await loadImageSheetNode(bytes, { limits });
    expect([sheet.width, sheet.height]).toEqual([2000, 1500]);
  }, 120_000);
});
