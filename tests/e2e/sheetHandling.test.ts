/**
 * The workbench's handling of sheets and edits in a real browser: a page picked from the
 * pictures of a two-page PDF, a sheet dropped on the window, a bad file refused without
 * losing captured points, undo and redo from the keyboard, and a sharp drawing when zoomed in.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { createCanvas } from '@napi-rs/canvas';
import { PDFDocument, StandardFonts } from 'pdf-lib';
import { describe, expect, it } from 'vitest';
import { ARTIFACTS, settle, User, workbenchForFile } from './harness.ts';
import { vectorSample } from './samples.ts';
import { loadSample } from './takeoffFlow.ts';

const dir = join(ARTIFACTS, 'handling');
const live = workbenchForFile(dir);

type Wb = {
  store: { draft: { sheet: { page: number; name: string } | null; traces: unknown[]; panels: unknown[] }; session: { step: string } };
  canvas: { currentView: { zoom: number } };
  sheet: { thumbnails: Map<number, string> } | null;
};
const wb = <T>(read: (w: Wb) => T) => live.browser.page.evaluate((code) => new Function('w', `return (${code})(w);`)((window as unknown as { pumpscribe: () => Wb }).pumpscribe()), read.toString()) as Promise<T>;

describe('sheets and edits in the browser', () => {
  it('offers the pages of a PDF as pictures and reads the one picked', async () => {
    const sample = loadSample(vectorSample());
    const source = await PDFDocument.load(readFileSync(sample.sheetPath));
    const two = await PDFDocument.create();
    const cover = two.addPage([595, 842]);
    cover.drawText('Invented cover page, no curves here', { x: 72, y: 760, size: 16, font: await two.embedFont(StandardFonts.Helvetica) });
    const [copied] = await two.copyPages(source, [0]);
    two.addPage(copied!);
    const file = join(dir, 'invented-two-pages.pdf');
    writeFileSync(file, await two.save());

    const page = live.browser.page;
    const user = new User(page, dir);
    await page.goto(live.server.url);
    await page.setInputFiles('#sheet-file', file);
    await page.waitForFunction(() => document.querySelectorAll('.thumb img').length === 2, null, { timeout: 60_000 });
    await user.screenshot('pages-offered');
    expect(await wb((w) => w.store.session.step)).toBe('load');
    await page.getByRole('button', { name: 'Page 2' }).click();
    await page.waitForFunction(() => /^Loaded /.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 60_000 });
    expect(await wb((w) => [w.store.draft.sheet?.page, w.store.session.step])).toEqual([2, 'axes']);
  });

  it('says so when a big scan is read at a reduced resolution', async () => {
    // An invented blank 42-megapixel page: over the 40-megapixel working limit, so it is read at 1/2.
    const canvas = createCanvas(7000, 6000);
    const ctx = canvas.getContext('2d');
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, 7000, 6000);
    ctx.fillStyle = '#000000';
    ctx.fillRect(500, 3000, 6000, 4);
    const file = join(dir, 'invented-big-scan.jpg');
    writeFileSync(file, canvas.toBuffer('image/jpeg', 80));
    const page = live.browser.page;
    await page.goto(live.server.url);
    await page.setInputFiles('#sheet-file', file);
    await page.waitForFunction(() => /^Loaded /.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 120_000 });
    const message = await page.locator('#message').textContent();
    expect(message).toMatch(/7000 × 6000 pixels \(42\.0 megapixels\), over the working limit, so it was read at 1\/2 of its resolution/);
  }, 180_000);

  it('opens a sheet dropped on the window', async () => {
    const page = live.browser.page;
    const sample = loadSample(vectorSample());
    const bytes = readFileSync(sample.sheetPath).toString('base64');
    await page.evaluate(({ bytes, name }) => {
      const data = Uint8Array.from(atob(bytes), (c) => c.charCodeAt(0));
      const transfer = new DataTransfer();
      transfer.items.add(new File([data], name, { type: 'application/pdf' }));
      document.body.dispatchEvent(new DragEvent('dragover', { dataTransfer: transfer, bubbles: true, cancelable: true }));
      document.body.dispatchEvent(new DragEvent('drop', { dataTransfer: transfer, bubbles: true, cancelable: true }));
    }, { bytes, name: 'dropped.pdf' });
    await page.waitForFunction(() => /^Loaded dropped\.pdf/.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 60_000 });
    expect(await wb((w) => w.store.draft.sheet?.name)).toBe('dropped.pdf');
  });

  it('refuses a bad file with a sentence and keeps every captured point; undo and redo work from the keyboard', async () => {
    const page = live.browser.page;
    const user = new User(page, dir);
    const sample = loadSample(vectorSample());
    const head = sample.takeoff.panels.find((p) => p.id === 'head')!;
    const xs = head.anchors.map((a) => a.x ?? 0);
    const ys = head.anchors.map((a) => a.y ?? 0);
    const tl = head.anchors.find((a) => a.x === Math.min(...xs) && a.y === Math.max(...ys))!.at;
    const br = head.anchors.find((a) => a.x === Math.max(...xs) && a.y === Math.min(...ys))!.at;
    await user.dragSheet(tl, br, 'head frame');
    await page.waitForSelector('[id^="use-proposal-"]', { timeout: 30_000 });
    await page.click('[id^="use-proposal-"]');
    await settle(page);
    await page.click('#step-trace');
    const guide = sample.takeoff.traces.find((t) => t.quantity === 'head')!.guides![1]!;
    await user.clickSheet(guide, 'a head curve');
    await page.waitForFunction(() => (window as unknown as { pumpscribe: () => Wb }).pumpscribe().store.draft.traces.length === 1, null, { timeout: 30_000 });
    const before = await wb((w) => JSON.stringify(w.store.draft));

    const bad = join(dir, 'not-a-sheet.pdf');
    writeFileSync(bad, 'This is not a PDF at all.');
    await page.click('#step-load');
    await page.setInputFiles('#sheet-file', bad);
    await page.waitForSelector('#message.error', { timeout: 30_000 });
    expect(await page.textContent('#message')).toMatch(/Nothing on the workbench was changed\.$/);
    expect(await wb((w) => JSON.stringify(w.store.draft))).toBe(before);
    await user.screenshot('bad-file-refused');

    await page.click('#step-trace');
    await page.locator('.stage').focus();
    await page.keyboard.press('Control+z');
    expect(await wb((w) => w.store.draft.traces.length)).toBe(0);
    await page.keyboard.press('Control+Shift+z');
    expect(await wb((w) => w.store.draft.traces.length)).toBe(1);
    expect(await wb((w) => JSON.stringify(w.store.draft))).toBe(before);
  });

  it('draws the visible part of a PDF sharply when zoomed in past the page drawing', async () => {
    const page = live.browser.page;
    const user = new User(page, dir);
    await page.locator('.stage').focus();
    for (let i = 0; i < 8; i++) await page.keyboard.press('+');
    await page.waitForFunction(() => {
      const c = (window as unknown as { pumpscribe: () => { canvas: { sharp: unknown } } }).pumpscribe().canvas;
      return c.sharp !== null;
    }, null, { timeout: 30_000 });
    expect(await wb((w) => w.canvas.currentView.zoom)).toBeGreaterThan(4.2);
    await user.screenshot('zoomed-sharp');
  });
});
