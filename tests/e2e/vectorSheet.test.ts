/**
 * Acceptance on a vector sheet: calibrate each panel, trace four head curves, the efficiency
 * lines, the power curves and NPSHr, read the findings, export; the exported curve set must
 * match a headless `pumpscribe takeoff` of the saved take-off file within 0.05 % of span.
 * Midway the page is reloaded, and every captured point must come back.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { ARTIFACTS, cleanDir, openBrowser, ROOT, startServer, User, type Browser, type Server } from './harness.ts';
import { compareCurveSets } from './compare.ts';
import { loadSample, runTakeoff } from './takeoffFlow.ts';
import { vectorSample } from './samples.ts';

const dir = join(ARTIFACTS, 'vector');
let server: Server;
let browser: Browser;

beforeAll(async () => {
  cleanDir(dir);
  // The invented demo curve sets seed the library, so that there is something to compare with.
  server = await startServer({ seed: true });
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

describe('the take-off workbench on a vector sheet', () => {
  it('captures a four-diameter family in at most 40 actions, restores it after a reload, and exports what the headless replay gives', async () => {
    const sample = loadSample(vectorSample());
    let restored: { before: string; after: string } | null = null;
    const reloadMidway = async (user: User) => {
      const page = user.page;
      const read = () => page.evaluate(() => JSON.stringify((window as unknown as { pumpscribe: () => { store: { draft: { traces: unknown[]; panels: unknown[] } } } }).pumpscribe().store.draft.traces));
      const before = await read();
      await page.evaluate(() => (window as unknown as { pumpscribe: () => { autosave: { flush(): Promise<void> } } }).pumpscribe().autosave.flush());
      await page.reload();
      await page.waitForSelector('#restore-yes', { timeout: 30_000 });
      await user.screenshot('3-restore-offered');
      // Not counted: reloading is not part of a capture.
      await page.click('#restore-yes');
      await page.waitForFunction(() => /^Restored /.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 60_000 });
      restored = { before, after: await read() };
      await user.screenshot('3-restored');
    };
    const duty = { 'duty-flow': '250', 'duty-head': '45', 'duty-static': '12', 'duty-service': 'fire', 'duty-temperature': '20', 'duty-suction-static': '2', 'duty-suction-loss': '0.5' };
    const result = await runTakeoff(browser.page, server.url, sample, dir, { reloadMidway, duty });
    // The duty view says to follow the governing code for a fire duty.
    expect(await browser.page.locator('.duty-results').textContent()).toMatch(/Fire-protection duty: follow the governing fire code/);
    writeFileSync(join(dir, 'actions.txt'), `${result.log.join('\n')}\n`);

    // Reloading in mid-capture restored every point (exact equality of the records).
    expect(restored).not.toBeNull();
    expect(restored!.after).toBe(restored!.before);

    // The action budget of the issue.
    expect(result.actions).toBeLessThanOrEqual(40);
    expect(result.findings.length).toBeGreaterThan(0);

    // The headless replay of the saved take-off file gives the same curve set (0.05 % of span).
    const headless = join(dir, 'headless.curveset.json');
    try {
      execFileSync(process.execPath, [join(ROOT, 'bin', 'pumpscribe.mjs'), 'takeoff', result.downloads.takeoff, '-o', headless, '--quiet'], { cwd: ROOT, stdio: 'pipe' });
    } catch (error) {
      const status = (error as { status?: number }).status;
      if (status !== 1) throw error; // 1 = checks found failures; the file is still written
    }
    const fromBrowser = parseCurveSetJson(readFileSync(result.downloads.curveset, 'utf8'));
    const fromCli = parseCurveSetJson(readFileSync(headless, 'utf8'));
    const gaps = compareCurveSets(fromBrowser, fromCli);
    const worst = Math.max(...gaps.map((g) => Math.max(g.percentOfSpan, g.domainPercent)));
    writeFileSync(join(dir, 'figures.json'), `${JSON.stringify({ actions: result.actions, worstMatchPercentOfSpan: worst, gaps, findings: result.findings }, null, 2)}\n`);
    expect(gaps.length).toBeGreaterThanOrEqual(13);
    expect(worst).toBeLessThanOrEqual(0.05);
  });

  it('saves the curve set to the library, lists it, shows its revisions and compares it with others at a duty', async () => {
    const page = browser.page;
    const user = new User(page, join(dir, 'library'));
    await page.click('#step-save');
    await page.click('#save-library');
    await page.waitForFunction(() => /Saved to the library as/.test(document.querySelector('.library-state')?.textContent ?? ''), null, { timeout: 30_000 });
    await page.click('#save-library'); // a second save adds a revision
    await page.waitForFunction(() => /revision 2/.test(document.querySelector('.library-state')?.textContent ?? ''), null, { timeout: 30_000 });
    const id = /as (\S+), revision/.exec((await page.textContent('.library-state')) ?? '')?.[1] as string;
    await page.goto(`${server.url}#/library?flow=250&head=45&units=si`);
    await page.waitForSelector('table.entries tbody tr');
    await user.screenshot('library-list');
    expect(await page.locator('table.entries tbody tr').count()).toBeGreaterThanOrEqual(2);
    await page.goto(`${server.url}#/library/${encodeURIComponent(id)}`);
    await page.waitForSelector('.revisions li');
    expect(await page.locator('.revisions li').count()).toBe(2);
    await user.screenshot('library-entry');
    const others = await page.evaluate(async () => ((await (await fetch('api/curvesets')).json()) as { entries: { id: string }[] }).entries.map((e) => e.id));
    await page.goto(`${server.url}#/compare?ids=${others.map(encodeURIComponent).join(',')}&units=si&flow=250&head=45`);
    await page.waitForSelector('table.compare tbody tr');
    expect(await page.locator('table.compare tbody tr').count()).toBe(others.length);
    expect(await page.locator('.compare-chart .op-point').count()).toBe(1);
    await user.screenshot('compare');
  });
});
