/**
 * Documents in the browser: two pumps saved in one session make two library entries (and the
 * entry survives a reload); a take-off file opened and downloaded again comes back field for
 * field; two tabs on two sheets, with edits and reloads in both, lose nothing; deleting a trace
 * and tracing again files the new trace under the diameter chosen.
 */
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { copyFileSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { ARTIFACTS, openBrowser, ROOT, settle, User, workbenchForFile } from './harness.ts';
import { scanSample, vectorSample } from './samples.ts';
import { loadSample } from './takeoffFlow.ts';

const dir = join(ARTIFACTS, 'documents');
const live = workbenchForFile(dir);

interface Wb {
  store: {
    doc: { id: string; library: { id: string; revision: number } | null };
    draft: { pump: { name: string; speed_rpm: number }; traces: { id: string; quantity: string; diameter?: number }[]; sheet: { name: string } | null };
    session: { target: { quantity: string; diameter?: number }; step: string; unitSystem: string };
  };
  autosave: { flush(): Promise<void> };
}
function wb<T>(page: Page, read: (w: Wb) => T): Promise<T> {
  return page.evaluate((code) => new Function('w', `return (${code})(w);`)((window as unknown as { pumpscribe: () => Wb }).pumpscribe()), read.toString()) as Promise<T>;
}

async function waitMessage(page: Page, pattern: RegExp, timeout = 120_000): Promise<string> {
  await page.waitForFunction((src) => new RegExp(src).test(document.querySelector('#message')?.textContent ?? ''), pattern.source, { timeout, polling: 100 });
  return (await page.textContent('#message')) ?? '';
}

/** Opens a sheet together with its take-off file, as a user picks both in step 1. */
async function openTakeoff(page: Page, sheet: string, takeoff: string): Promise<void> {
  await page.click('#step-load');
  await page.setInputFiles('#sheet-file', [sheet, takeoff]);
  await waitMessage(page, /^Opened /);
  await settle(page);
}

async function saveToLibrary(page: Page): Promise<{ id: string; revision: number }> {
  await page.click('#step-save');
  const before = await page.evaluate(() => document.querySelector('.library-state')?.textContent ?? '');
  await page.click('#save-library');
  await page.waitForFunction((b) => {
    const t = document.querySelector('.library-state')?.textContent ?? '';
    return t !== b && /Saved to the library as|Not saved/.test(t);
  }, before, { timeout: 60_000 });
  const text = (await page.textContent('.library-state')) ?? '';
  const m = /as (\S+), revision (\d+)/.exec(text);
  if (!m) throw new Error(`The library save failed: ${text}`);
  return { id: m[1] as string, revision: Number(m[2]) };
}

async function reloadAndRestore(page: Page): Promise<void> {
  await wb(page, (w) => w.autosave.flush());
  await page.reload();
  await page.waitForSelector('#restore-yes', { timeout: 30_000 });
  await page.click('#restore-yes');
  await waitMessage(page, /^Restored /);
  await settle(page);
}

/** What must survive: the record and the document's identity. */
const snapshot = (page: Page) => wb(page, (w) => JSON.stringify({ doc: w.store.doc, draft: w.store.draft }));

async function downloadTakeoff(page: Page, name: string): Promise<unknown> {
  await page.click('#step-save');
  const [download] = await Promise.all([page.waitForEvent('download'), page.click('#download-takeoff')]);
  const file = join(dir, name);
  await download.saveAs(file);
  return JSON.parse(readFileSync(file, 'utf8'));
}

describe('documents in the workbench', () => {
  it('two pumps saved in one session make two entries, and a reload keeps the entry of its document', async () => {
    const page = live.browser.page;
    const user = new User(page, join(dir, 'library'));
    await page.goto(live.server.url);
    const first = loadSample(vectorSample());
    await openTakeoff(page, first.sheetPath, vectorSample());
    const a = await saveToLibrary(page);
    expect(a.revision).toBe(1);
    await user.screenshot('first-pump-saved');

    const second = loadSample(scanSample());
    await openTakeoff(page, second.sheetPath, scanSample());
    expect(await wb(page, (w) => w.store.doc.library)).toBeNull();
    const b = await saveToLibrary(page);
    expect(b.id).not.toBe(a.id);
    expect(b.revision).toBe(1);
    await user.screenshot('second-pump-saved');

    const entries = await page.evaluate(async () => ((await (await fetch('api/curvesets')).json()) as { entries: { id: string }[] }).entries.map((e) => e.id));
    expect(entries.sort()).toEqual([a.id, b.id].sort());

    // After a reload the document still knows its entry: saving again adds revision 2 to it.
    await reloadAndRestore(page);
    expect(await wb(page, (w) => w.store.doc.library)).toEqual(b);
    const again = await saveToLibrary(page);
    expect(again).toEqual({ id: b.id, revision: 2 });
    await user.screenshot('second-pump-revision-2');
    const revisions = await page.evaluate(async (id) => ((await (await fetch(`api/curvesets/${id}/revisions`)).json()) as { revisions: unknown[] }).revisions.length, a.id);
    expect(revisions).toBe(1);

    // Someone else saves revision 3 of the entry meanwhile: this document's save (If-Match "2") is
    // refused with one sentence, nothing is stored, the work stays, and a new entry is offered.
    const other = await page.evaluate(async (id) => {
      const body = await (await fetch(`api/curvesets/${id}`)).text();
      const r = await fetch(`api/curvesets/${id}`, { method: 'PUT', headers: { 'content-type': 'application/json', 'if-match': '"2"' }, body });
      return ((await r.json()) as { revision: number }).revision;
    }, b.id);
    expect(other).toBe(3);
    const draftBefore = await wb(page, (w) => JSON.stringify(w.store.draft));
    await page.click('#save-library');
    await page.waitForSelector('.library-state.failed', { timeout: 30_000 });
    const refusal = (await page.textContent('.library-state')) ?? '';
    expect(refusal).toMatch(new RegExp(`^Not saved to the library: entry ${b.id} .*nothing was stored; your work is still here`));
    expect(refusal.match(/[.!?](\s|$)/g)).toHaveLength(1);
    expect(await wb(page, (w) => JSON.stringify(w.store.draft))).toBe(draftBefore);
    await user.screenshot('stale-save-refused');
    const stored = await page.evaluate(async (id) => ((await (await fetch(`api/curvesets/${id}/revisions`)).json()) as { revisions: unknown[] }).revisions.length, b.id);
    expect(stored).toBe(3);
    await page.click('#save-library-new');
    await page.waitForFunction(() => /Saved to the library as/.test(document.querySelector('.library-state')?.textContent ?? ''), null, { timeout: 30_000 });
    const c = await wb(page, (w) => w.store.doc.library);
    expect(c?.revision).toBe(1);
    expect([a.id, b.id]).not.toContain(c?.id);
  });

  it('a take-off file opened and downloaded again comes back field for field', async () => {
    const page = live.browser.page;
    const user = new User(page, join(dir, 'record'));
    // An invented US take-off using the fields the workbench has no screen for: pump details,
    // a trace's extent and capture method, and no power unit (the power panel names hp itself).
    const sample = loadSample(vectorSample());
    const raw = JSON.parse(readFileSync(vectorSample(), 'utf8'));
    raw.pump = { ...raw.pump, maker: 'Invented Pump Works (not a real maker)', model: 'IX', size: '6x4-13', type: 'end suction', stages: 1, suction: 'double' };
    delete raw.units.power;
    raw.panels = raw.panels.map((p: { id: string }) => (p.id === 'power' ? { ...p, units: { y: 'hp' } } : p));
    raw.traces[0] = { ...raw.traces[0], method: 'vector', extent: 'line' };
    raw.traces[2] = { ...raw.traces[2], method: 'vector' };
    raw.notes = ['Invented for the browser test: no real product or data.'];
    const sheet = join(dir, raw.sheet);
    copyFileSync(sample.sheetPath, sheet);
    const guidesOnly = join(dir, 'invented-rich.takeoff.json');
    writeFileSync(guidesOnly, `${JSON.stringify(raw, null, 2)}\n`);
    // The same take-off with its captured points, as `pumpscribe takeoff --save-points` writes it.
    const withPoints = join(dir, 'invented-rich-points.takeoff.json');
    writeFileSync(withPoints, `${JSON.stringify(raw, null, 2)}\n`);
    try {
      execFileSync(process.execPath, [join(ROOT, 'bin', 'pumpscribe.mjs'), 'takeoff', withPoints, '-o', join(dir, 'rich.curveset.json'), '--save-points', '--quiet'], { cwd: ROOT, stdio: 'pipe' });
    } catch (error) {
      if ((error as { status?: number }).status !== 1) throw error; // 1 = checks found failures
    }
    const saved = JSON.parse(readFileSync(withPoints, 'utf8'));
    expect(saved.traces[0].captured.length).toBeGreaterThan(2);

    await openTakeoff(page, sheet, withPoints);
    await user.screenshot('rich-takeoff-opened');
    // The sheet's own units on screen: US, not SI.
    expect(await wb(page, (w) => w.store.session.unitSystem)).toBe('us');
    const back = await downloadTakeoff(page, 'rich-points-back.takeoff.json');
    expect(parseTakeoff(back)).toEqual(parseTakeoff(saved));

    // Opened with guides only, the file comes back with every field as it was, plus the points
    // the workbench captured from its guides.
    await openTakeoff(page, sheet, guidesOnly);
    const back2 = (await downloadTakeoff(page, 'rich-guides-back.takeoff.json')) as { traces: Record<string, unknown>[] };
    for (const t of back2.traces) {
      expect(Array.isArray(t.captured)).toBe(true);
      delete t.captured;
    }
    expect(parseTakeoff(back2)).toEqual(parseTakeoff(raw));
    await user.screenshot('rich-takeoff-downloaded');
  });

  it('two tabs on two sheets, with edits and reloads in both, lose nothing', async () => {
    const { context } = live.browser;
    const tabA = await context.newPage();
    const tabB = await context.newPage();
    const userA = new User(tabA, join(dir, 'tabs-a'));
    const userB = new User(tabB, join(dir, 'tabs-b'));
    await tabA.goto(live.server.url);
    await tabB.goto(live.server.url);
    // Each tab may be offered a kept take-off; both start afresh with a sheet of their own.
    for (const tab of [tabA, tabB]) if (await tab.locator('#restore-no').count()) await tab.click('#restore-no');
    const a = loadSample(vectorSample());
    const b = loadSample(scanSample());
    await openTakeoff(tabA, a.sheetPath, vectorSample());
    await openTakeoff(tabB, b.sheetPath, scanSample());
    const ids = [await wb(tabA, (w) => w.store.doc.id), await wb(tabB, (w) => w.store.doc.id)];
    expect(ids[0]).not.toBe(ids[1]);

    // Edits in both, interleaved.
    const rename = async (tab: Page, name: string) => {
      await tab.click('#step-load');
      await tab.fill('#pump-name', name);
      await tab.press('#pump-name', 'Enter');
      await tab.waitForFunction((n) => (window as unknown as { pumpscribe: () => Wb }).pumpscribe().store.draft.pump.name === n, name);
    };
    const deleteFirstTrace = async (tab: Page) => {
      const count = await wb(tab, (w) => w.store.draft.traces.length);
      await tab.click('#step-trace');
      await tab.locator('.trace-row .icon.danger').first().click();
      await tab.waitForFunction((c) => (window as unknown as { pumpscribe: () => Wb }).pumpscribe().store.draft.traces.length === c - 1, count);
      await settle(tab);
    };
    await rename(tabA, 'Invented pump of tab A');
    await rename(tabB, 'Invented pump of tab B');
    await deleteFirstTrace(tabA);
    await deleteFirstTrace(tabB);
    const beforeA = await snapshot(tabA);
    const beforeB = await snapshot(tabB);

    // Reload A, then B: each is offered its own document, with every edit.
    await reloadAndRestore(tabA);
    await userA.screenshot('tab-a-restored');
    expect(await snapshot(tabA)).toBe(beforeA);
    await reloadAndRestore(tabB);
    await userB.screenshot('tab-b-restored');
    expect(await snapshot(tabB)).toBe(beforeB);

    // More edits after the reloads, then reload both again: still nothing lost on either side.
    await rename(tabB, 'Invented pump of tab B, edited after a reload');
    await deleteFirstTrace(tabA);
    const afterA = await snapshot(tabA);
    const afterB = await snapshot(tabB);
    await reloadAndRestore(tabB);
    await reloadAndRestore(tabA);
    expect(await snapshot(tabA)).toBe(afterA);
    expect(await snapshot(tabB)).toBe(afterB);
    expect(JSON.parse(afterA).doc.id).toBe(ids[0]);
    expect(JSON.parse(afterB).doc.id).toBe(ids[1]);

    // A third tab is offered neither of the two open documents.
    const tabC = await context.newPage();
    await tabC.goto(live.server.url);
    await tabC.waitForFunction(() => !!(window as unknown as { pumpscribe: () => Wb | null }).pumpscribe());
    // Take-offs not open in any tab are kept in this browser (from the tests above): one is offered.
    await tabC.waitForSelector('.restore', { timeout: 30_000 });
    const offered = await tabC.evaluate(() => document.querySelector('.restore')?.getAttribute('data-document') ?? null);
    expect(ids).not.toContain(offered);
    // Nor among the other kept take-offs it lists; it lists the ones no tab has open.
    const listed = await tabC.evaluate(() => [...document.querySelectorAll('.kept-others [data-document]')].map((e) => e.getAttribute('data-document')));
    for (const id of ids) expect(listed).not.toContain(id);
    expect(listed.length).toBeGreaterThan(0);
    await new User(tabC, join(dir, 'tabs-c')).screenshot('third-tab-offer');
    await tabC.close();
    await tabA.close();
    await tabB.close();
  });

  it('deleting a trace and tracing again files the new trace under the diameter chosen', async () => {
    const page = await live.browser.context.newPage();
    const user = new User(page, join(dir, 'retrace'));
    await page.goto(live.server.url);
    if (await page.locator('#restore-no').count()) await page.click('#restore-no');
    const sample = loadSample(vectorSample());
    await openTakeoff(page, sample.sheetPath, vectorSample());
    await page.click('#step-trace');
    await settle(page);
    // Delete the head curve of the second diameter: the next click re-does it, not the one after.
    const victim = sample.takeoff.traces.find((t) => t.quantity === 'head' && t.diameter === 12)!;
    await page.getByRole('button', { name: `Delete head 12 in`, exact: true }).click();
    await settle(page);
    expect(await wb(page, (w) => w.store.session.target)).toMatchObject({ quantity: 'head', lines: 'curve', diameter: 12 });
    await user.screenshot('deleted-head-12');
    await page.locator('.stage').focus();
    await page.click('[data-key="d-12"]');
    await user.clickSheet(victim.guides![1]!, 'the head curve of 12 in again');
    await waitMessage(page, /^Traced head 12 in/);
    await settle(page);
    const heads = await wb(page, (w) => w.store.draft.traces.filter((t) => t.quantity === 'head').map((t) => t.diameter).sort());
    expect(heads).toEqual([10, 11, 12, 13]);
    expect(await page.locator('.shared-curve').count()).toBe(0);
    await user.screenshot('re-traced-head-12');
    await page.close();
  });

  it('a take-off kept in the one slot of the earlier autosave is offered after the upgrade, as a document of its own', async () => {
    const fresh = await openBrowser();
    try {
      const page = fresh.page;
      const sample = loadSample(vectorSample());
      const bytes = readFileSync(sample.sheetPath);
      const sha = createHash('sha256').update(bytes).digest('hex');
      const head = sample.takeoff.panels.find((p) => p.id === 'head')!;
      const xs = head.anchors.map((a) => a.at[0]);
      const ys = head.anchors.map((a) => a.at[1]);
      // The version 1 record: one slot, the older draft shape (the sheet without its path).
      const v1 = {
        format: 'pumpscribe.autosave', version: 1, savedAt: '2026-01-02T03:04:05.000Z', step: 'trace', sheetKey: sha,
        target: { quantity: 'head', lines: 'diameter', diameter: 12 },
        draft: {
          sheet: { name: 'us-iso-colour.pdf', sha256: sha, kind: 'pdf', mime: 'application/pdf', page: 1, pageCount: 1, width: 612, height: 792 },
          pump: { name: 'Invented pump kept by the old autosave', speed_rpm: 1780, specific_gravity: 1 },
          units: { flow: 'gpm', head: 'ft', power: 'hp', npsh: 'ft', diameter: 'in' },
          diameters: [13, 12, 11, 10],
          panels: [{ id: 'head', plots: 'head', frame: [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)], anchors: head.anchors, x_scale: 'linear', y_scale: 'linear', units: { x: 'gpm', y: 'ft' } }],
          traces: sample.takeoff.traces.filter((t) => t.quantity === 'head' && t.diameter === 13).map((t) => ({ ...t, method: 'auto' })),
          notes: [],
        },
      };
      // The library page does not open the workbench's storage, so the old database can be laid down first.
      await page.goto(`${live.server.url}#/library`);
      await page.evaluate(async ({ v1, b64, sha }) => {
        const data = Uint8Array.from(atob(b64), (c) => c.charCodeAt(0));
        await new Promise<void>((resolve, reject) => {
          const req = indexedDB.open('pumpscribe-workbench', 1);
          req.onupgradeneeded = () => {
            req.result.createObjectStore('drafts');
            req.result.createObjectStore('sheets', { keyPath: 'key' });
          };
          req.onerror = () => reject(req.error);
          req.onsuccess = () => {
            const db = req.result;
            const tx = db.transaction(['drafts', 'sheets'], 'readwrite');
            tx.objectStore('drafts').put(v1, 'current');
            tx.objectStore('sheets').put({ key: sha, name: 'us-iso-colour.pdf', mime: 'application/pdf', bytes: data.buffer });
            tx.oncomplete = () => { db.close(); resolve(); };
            tx.onerror = () => reject(tx.error);
          };
        });
      }, { v1, b64: bytes.toString('base64'), sha });
      await page.goto(`${live.server.url}#/`);
      await page.reload();
      await page.waitForSelector('#restore-yes', { timeout: 30_000 });
      await page.click('#restore-yes');
      await waitMessage(page, /^Restored /);
      await settle(page);
      const restored = await wb(page, (w) => ({ doc: w.store.doc, pump: w.store.draft.pump.name, traces: w.store.draft.traces.length, sheet: w.store.draft.sheet, step: w.store.session.step }));
      expect(restored.pump).toBe('Invented pump kept by the old autosave');
      expect(restored.traces).toBe(1);
      expect(restored.step).toBe('trace');
      expect(restored.doc.library).toBeNull();
      expect(restored.doc.id.length).toBeGreaterThan(8);
      expect((restored.sheet as unknown as { path: string }).path).toBe('us-iso-colour.pdf');
      await new User(page, join(dir, 'migrated')).screenshot('restored-from-version-1');
    } finally {
      await fresh.close();
    }
  });
});
