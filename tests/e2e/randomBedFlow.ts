/**
 * The steps the photo and iso-scan browser tests share: draw one sheet of the independent random
 * bed (scripts/randomSheets: an INVENTED family, SVG through a scanner or a hand-held camera),
 * open it in the workbench with the hurried take-off the bed made for it (guides at random
 * places, on crossings for iso-lines), let the workbench trace it, download the curve set, and
 * hold it against a headless replay of the same take-off and against the bed's exact truth.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, beforeEach } from 'vitest';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import type { CurveSet } from '../../src/model/curveset.ts';
import type { RandomSheet } from '../../scripts/randomSheets/randomSheet.ts';
import { makeRandomSheetApart } from '../../scripts/randomSheets/sheetApart.ts';
import { scoreReplay, type CurveScore } from '../../scripts/randomSheets/score.ts';
import { compareCurveSets, type CurveGap } from './compare.ts';
import { cleanDir, openBrowser, ROOT, settle, startServer, User, type Browser, type Server } from './harness.ts';

export interface BedRun {
  sheet: RandomSheet;
  workbench: CurveSet;
  headless: CurveSet;
  gaps: CurveGap[];
  scores: CurveScore[];
  findings: string[];
}

/**
 * One server for the file and a fresh browser for each test, with the artifacts folder emptied
 * first: call at the top of a test file, then run sheets through `run`.
 */
export function bedSession(dir: string): { run(seed: number, kind: 'scan' | 'photo', artifacts: string): Promise<BedRun> } {
  let server: Server | undefined;
  let browser: Browser | undefined;
  beforeAll(async () => {
    cleanDir(dir);
    server = await startServer();
  });
  beforeEach(async () => {
    browser = await openBrowser();
  });
  afterEach(async () => {
    await browser?.close();
  });
  afterAll(async () => {
    await server?.stop();
  });
  return {
    run: (seed, kind, artifacts) => {
      if (!server || !browser) throw new Error('The browser session has not started; call bedSession at the top of the test file.');
      return runBedSheet(browser.page, server.url, seed, kind, artifacts);
    },
  };
}

export async function runBedSheet(page: Page, url: string, seed: number, kind: 'scan' | 'photo', artifacts: string): Promise<BedRun> {
  // Drawn in a child process: a rare native crash while drawing must not end this test file.
  const sheet = makeRandomSheetApart(seed, kind);
  const user = new User(page, artifacts);
  const jpeg = join(artifacts, `random-${seed}.jpg`);
  const takeoff = join(artifacts, `random-${seed}.takeoff.json`);
  writeFileSync(jpeg, sheet.jpeg);
  writeFileSync(takeoff, `${JSON.stringify(sheet.takeoff, null, 2)}\n`);

  await page.goto(url);
  await page.waitForSelector('#sheet-file', { state: 'attached' });
  await user.chooseFiles(page.locator('#sheet-file'), [jpeg, takeoff], 'the sheet and its take-off file');
  await page.waitForFunction(() => /^Opened /.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 180_000 });
  await settle(page);
  await user.click(page.locator('#step-review'), 'step 4');
  await settle(page);
  await page.waitForSelector('.family-chart', { timeout: 120_000 });
  await user.screenshot('review');
  const findings = await page.locator('.findings .finding-text').allTextContents();

  await user.click(page.locator('#step-save'), 'step 5');
  const [download] = await Promise.all([page.waitForEvent('download'), user.click(page.locator('#download-curveset'), 'download the curve set')]);
  const saved = join(artifacts, 'workbench.curveset.json');
  await download.saveAs(saved);
  const workbench = parseCurveSetJson(readFileSync(saved, 'utf8'));

  const headlessPath = join(artifacts, 'headless.curveset.json');
  try {
    execFileSync(process.execPath, [join(ROOT, 'bin', 'pumpscribe.mjs'), 'takeoff', takeoff, '-o', headlessPath, '--quiet'], { cwd: ROOT, stdio: 'pipe' });
  } catch (error) {
    if ((error as { status?: number }).status !== 1) throw error; // 1 = checks found failures; the file is still written
  }
  const headless = parseCurveSetJson(readFileSync(headlessPath, 'utf8'));
  const gaps = compareCurveSets(workbench, headless);
  const scores = scoreReplay(sheet.plan.family, sheet.truth, workbench);
  writeFileSync(join(artifacts, 'figures.json'), `${JSON.stringify({ seed, kind, shot: { keystone: sheet.shot.keystone, rotationDeg: sheet.shot.rotationDeg, quality: sheet.shot.quality }, scores, gaps, findings, actions: user.log }, null, 2)}\n`);
  return { sheet, workbench, headless, gaps, scores, findings };
}
