/**
 * The selection record from the workbench: open an invented vector sheet with its take-off file,
 * type a duty and add an option, download the record; it is a PDF that pdf.js opens without
 * warnings and whose text holds the duty flow, the head and the motor rating shown on screen.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ARTIFACTS, cleanDir, openBrowser, startServer, User, type Browser, type Server } from './harness.ts';
import { openSampleStudy } from './studyFlow.ts';

const dir = join(ARTIFACTS, 'record');
let server: Server;
let browser: Browser;

beforeAll(async () => {
  cleanDir(dir);
  server = await startServer();
  browser = await openBrowser();
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

describe('the selection record in the workbench', () => {
  it('downloads the record after a take-off and a study', async () => {
    const page = browser.page;
    const user = new User(page, dir);
    await openSampleStudy(page, user, server.url);
    await user.click(page.locator('#study-add-option'), 'add an option');
    await page.waitForFunction(() => document.querySelectorAll('.study-table tbody tr').length === 2, null, { timeout: 60_000 });
    const rows = page.locator('.study-table tbody tr');
    const shown: string[] = [];
    for (let i = 0; i < 2; i++) {
      const cells = rows.nth(i).locator('td');
      shown.push((await cells.nth(1).textContent()) ?? '', (await cells.nth(2).textContent()) ?? '', (await rows.nth(i).locator('td.motor').textContent()) ?? '');
    }
    // The study on the sheet, switched on and off: the sheet's picture changes and comes back.
    const stage = page.locator('.stage');
    const before = await stage.screenshot();
    await user.click(page.locator('#record-overlay'), 'show the study on the sheet');
    await page.waitForTimeout(500);
    const on = await stage.screenshot();
    await user.screenshot('record-overlay-on');
    expect(on.equals(before)).toBe(false);
    await user.click(page.locator('#record-overlay'), 'hide the study on the sheet');
    await page.waitForTimeout(500);
    expect((await stage.screenshot()).equals(before)).toBe(true);
    const t0 = Date.now();
    const [download] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), user.click(page.locator('#record-a4'), 'download the selection record')]);
    const file = join(dir, download.suggestedFilename());
    await download.saveAs(file);
    const message = (await page.locator('#message').textContent()) ?? '';
    console.log(`record in the browser: ${Date.now() - t0} ms from the click to the saved file; ${message}`);
    expect(download.suggestedFilename()).toMatch(/\.record\.pdf$/);
    await user.screenshot('record-downloaded');
    const bytes = new Uint8Array(readFileSync(file));
    expect(new TextDecoder().decode(bytes.slice(0, 5))).toBe('%PDF-');
    const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
    const root = dirname(createRequire(import.meta.url).resolve('pdfjs-dist/package.json'));
    const warnings: string[] = [];
    const log = console.log;
    console.log = (...a: unknown[]) => warnings.push(a.join(' '));
    let text = '';
    try {
      const doc = await pdfjs.getDocument({ data: bytes.slice(), standardFontDataUrl: `${join(root, 'standard_fonts')}/`, verbosity: 1 }).promise;
      for (let i = 1; i <= doc.numPages; i++) {
        const p = await doc.getPage(i);
        await p.getOperatorList();
        text += `${(await p.getTextContent()).items.map((it) => ('str' in it ? it.str : '')).join(' ')}\n`;
      }
      await doc.destroy();
    } finally {
      console.log = log;
    }
    expect(warnings).toEqual([]);
    for (const figure of shown) expect(text, figure).toContain(figure.trim());
    expect(text).toContain('a licensed professional approves');
  }, 600_000);
});
