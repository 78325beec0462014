/**
 * The automatic take-off of an iso-line scan in the workbench, its levels answered: an INVENTED
 * sheet of the independent random bed (seed 23: a 180-dpi scan, five iso-lines 40 … 60 % on the
 * head panel, labels printed on three of them, two read). The detector names the two lines whose
 * labels it reads and asks for the rest; the engineer types every level drawn once, and the
 * unlabelled lines take theirs by order, proposed unsure (a line the finder missed would shift
 * the order), as the headless `takeoff --detect` does with `iso_levels` in the take-off file.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { waitMessage } from './detectFlow.ts';
import { ARTIFACTS, settle, User, workbenchForFile } from './harness.ts';
import { detectBedScan, scanFor } from '../../scripts/detectSheets/scanBed.ts';
import { sheetGeometry } from '../../scripts/randomSheets/randomSheet.ts';

const dir = join(ARTIFACTS, 'detect-scan-iso');
const SEED = 23;
const live = workbenchForFile(dir);

type IsoTrace = { id: string; iso?: number; confidence?: number; origin?: string };

/** The draft's iso traces and open questions. */
async function isoParts(user: User): Promise<{ iso: IsoTrace[]; questions: string[] }> {
  return user.page.evaluate(() => {
    const d = (window as unknown as { pumpscribe: () => { store: { draft: { traces: IsoTrace[]; detected?: { questions: string[] } } } } }).pumpscribe().store.draft;
    return { iso: d.traces.filter((t) => t.iso !== undefined).map((t) => ({ id: t.id, iso: t.iso, confidence: t.confidence, origin: t.origin })), questions: d.detected ? [...d.detected.questions] : [] };
  });
}

/** Waits until the detector has run `count` times since the test began to watch the store. */
async function runEnded(user: User, count: number): Promise<void> {
  await user.page.waitForFunction((n) => (window as unknown as { runsEnded: number }).runsEnded >= n, count, { timeout: 300_000, polling: 200 });
}

describe('answering the iso levels of a scan in the workbench', () => {
  it('seed 23: the levels typed once name the unlabelled iso-lines by order, unsure, as the headless --detect with iso_levels does', async () => {
    const { plan } = sheetGeometry(SEED, 'scan');
    const levels = [...new Set(plan.lines.filter((l) => l.iso !== undefined).map((l) => l.iso as number))].sort((a, b) => a - b);
    expect(levels).toEqual([40, 45, 50, 55, 60]);
    const { jpeg } = await scanFor(SEED);
    const file = join(dir, `random-${SEED}.jpg`);
    writeFileSync(file, jpeg);

    const page = live.browser.page;
    const user = new User(page, dir);
    await page.goto(live.server.url);
    await page.waitForSelector('#sheet-file', { state: 'attached' });
    await user.chooseFiles(page.locator('#sheet-file'), [file], `random-${SEED}.jpg`);
    await waitMessage(user, /^Loaded /, 120_000);
    await settle(page);
    await page.locator('#detect-run').waitFor({ state: 'visible' });
    await page.evaluate(() => {
      const w = window as unknown as { runsEnded: number; pumpscribe: () => { store: { session: { busy: boolean }; subscribe(l: () => void): void } } };
      w.runsEnded = 0;
      const store = w.pumpscribe().store;
      let busy = store.session.busy;
      store.subscribe(() => {
        if (busy && !store.session.busy) w.runsEnded += 1;
        busy = store.session.busy;
      });
    });
    await user.click(page.locator('#detect-run'), 'find panels and curves');
    await runEnded(user, 1);
    await settle(page);
    const before = await isoParts(user);
    // Two labels read name two lines; the other three are left out, and the question offers the list.
    expect(before.iso.length).toBeLessThan(levels.length);
    expect(before.questions.join(' ')).toMatch(/give every efficiency level drawn as iso-lines/);
    await user.screenshot('1-found');

    // The question that takes the levels: shown one at a time, skipped until it comes.
    for (let guard = 0; guard < 6; guard++) {
      const field = (await page.locator('label[for="detect-answer"]').textContent().catch(() => null)) ?? '';
      if (/Efficiency levels drawn/.test(field)) break;
      await page.locator('#detect-skip').click(); // reading the questions, not counted
      await settle(page);
    }
    expect(await page.locator('label[for="detect-answer"]').textContent()).toMatch(/Efficiency levels drawn/);
    await user.type(page.locator('#detect-answer'), levels.join(' '), 'iso levels');
    await runEnded(user, 2);
    await settle(page);
    await user.screenshot('2-answered');
    // The status line counts what was found in one plain list.
    expect(await page.textContent('#message')).toMatch(/^Found 3 panels, \d+ curves and 5 iso-lines\./);

    const after = await isoParts(user);
    expect(after.iso.map((t) => t.iso).sort((a, b) => (a as number) - (b as number))).toEqual(levels);
    // The levels read stay as read; those taken by order are unsure, and the open question names them.
    const byOrder = after.iso.filter((t) => !before.iso.some((b) => b.iso === t.iso));
    expect(byOrder.length).toBe(levels.length - before.iso.length);
    for (const t of byOrder) {
      expect(t.origin).toBe('detected');
      expect(t.confidence).toBeLessThan(0.5);
      expect(after.questions.join(' ')).toContain(`"${t.id}"`);
    }
    // The same as the headless detector with the same answer.
    const { found, sheet } = await detectBedScan(SEED, { iso_levels: levels });
    await sheet.close();
    const headless = found.takeoff.traces.filter((t) => t.iso !== undefined).map((t) => t.iso as number).sort((a, b) => a - b);
    expect(headless).toEqual(levels);
    writeFileSync(join(dir, 'figures.json'), `${JSON.stringify({ seed: SEED, before: before.iso, after: after.iso, questions: after.questions, actions: user.log }, null, 2)}\n`);
  });
});
