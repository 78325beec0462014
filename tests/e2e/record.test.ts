/**
 * The selection record from the workbench: open an invented vector sheet with its take-off file,
 * type a duty and add an option, switch the study on the sheet on and off, download the record on
 * A4 and on US Letter. Each is a PDF that pdf.js opens without warnings, whose text holds the
 * duty flow, the head and the motor rating shown on screen, with the pages and headings of the
 * record `pumpscribe report` writes (both come from src/record). The time from the click to the
 * saved file is printed, with the time the page reports for making it (target under 3 s;
 * asserted loosely, as the machines are shared).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ARTIFACTS, User, workbenchForFile } from './harness.ts';
import { openSampleStudy } from './studyFlow.ts';
import { PAPER } from '../../src/record/recordPdf.ts';
import { oneLine, pdfText } from '../record/recordText.ts';

const dir = join(ARTIFACTS, 'record');
const live = workbenchForFile(dir);

describe('the selection record in the workbench', () => {
  it('downloads the record after a take-off and a study', async () => {
    const page = live.browser.page;
    const user = new User(page, dir);
    await openSampleStudy(page, user, live.server.url);
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
    // Time from the click to the saved file, as the engineer waits for it (the first record also
    // loads the record code and pdf-lib on demand). Asserted loosely: the machine is shared.
    const t0 = Date.now();
    const [download] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), user.click(page.locator('#record-a4'), 'download the selection record')]);
    const file = join(dir, download.suggestedFilename());
    await download.saveAs(file);
    const clickToFile = Date.now() - t0;
    await page.waitForFunction(() => /selection record/.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 30_000 });
    const message = (await page.locator('#message').textContent()) ?? '';
    const inApp = Number(/made in (\d+) ms/.exec(message)?.[1] ?? Number.NaN);
    console.log(`record in the browser (A4, first): ${clickToFile} ms from the click to the saved file; ${message.trim()} (target under 3000 ms)`);
    expect(Number.isFinite(inApp), message).toBe(true);
    expect(inApp).toBeLessThan(10_000);
    expect(clickToFile).toBeLessThan(20_000);
    expect(download.suggestedFilename()).toMatch(/\.record\.pdf$/);
    await user.screenshot('record-downloaded');
    const bytes = new Uint8Array(readFileSync(file));
    expect(new TextDecoder().decode(bytes.slice(0, 5))).toBe('%PDF-');
    const got = await pdfText(bytes);
    expect(got.warnings).toEqual([]);
    const text = oneLine(got.pageText.join('\n'));
    for (const figure of shown) expect(text, figure).toContain(figure.trim());
    // The same record as the command line writes: the same pages under the same headings, the caution on each.
    for (const heading of ['The sheet with the study drawn on it', 'Study and ranking', 'Family chart with the system curves', 'Findings', 'NPSH and motor', 'Provenance']) expect(text).toContain(heading);
    expect(got.pageText.every((p) => oneLine(p).includes('a licensed professional approves'))).toBe(true);
    for (const size of got.sizes) expect(size.map(Math.round)).toEqual(PAPER.a4.map(Math.round));
    // A second record, on US Letter.
    await page.evaluate(() => {
      const m = document.querySelector('#message');
      if (m) m.textContent = '';
    });
    const t1 = Date.now();
    const [letter] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), user.click(page.locator('#record-letter'), 'download the record on US Letter')]);
    const letterFile = join(dir, `letter-${letter.suggestedFilename()}`);
    await letter.saveAs(letterFile);
    const letterMs = Date.now() - t1;
    await page.waitForFunction(() => /selection record/.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 30_000 });
    console.log(`record in the browser (US Letter, second): ${letterMs} ms from the click to the saved file; ${((await page.locator('#message').textContent()) ?? '').trim()}`);
    expect(letterMs).toBeLessThan(20_000);
    const letterText = await pdfText(new Uint8Array(readFileSync(letterFile)));
    expect(letterText.warnings).toEqual([]);
    for (const size of letterText.sizes) expect(size).toEqual([...PAPER.letter]);
  }, 600_000);
});
