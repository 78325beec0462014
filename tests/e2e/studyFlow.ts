/**
 * The steps the study and record browser tests share: open the invented si-panels-black sheet with
 * its take-off file, go to the review, and type one duty with its suction site and pipe runs.
 */
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { ROOT, type User } from './harness.ts';

export async function openSampleStudy(page: Page, user: User, url: string): Promise<void> {
  await page.goto(url);
  const sheets = join(ROOT, 'samples', 'sheets');
  await user.chooseFiles(page.locator('#sheet-file'), [join(sheets, 'si-panels-black.pdf'), join(sheets, 'si-panels-black.takeoff.json')], 'sheet and its take-off file');
  await page.waitForFunction(() => /^Opened /.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 120_000 });
  await page.click('#step-review');
  await page.waitForSelector('.family-chart', { timeout: 120_000 });
  // The invented IX-150 family (330 mm, 1480 rpm): 250 m³/h against 30–34 m static, 10 in discharge.
  const fields: Record<string, string> = {
    'duty-flow': '250', 'duty-static': '30', 'duty-static-high': '34', 'duty-temperature': '30', 'duty-suction-static': '1',
    'duty-suction-diameter': '202.7', 'duty-suction-length': '20', 'duty-suction-k': '1', 'duty-discharge-diameter': '254.5', 'duty-discharge-length': '300', 'duty-discharge-k': '6.5',
  };
  for (const [id, value] of Object.entries(fields)) await user.type(page.locator(`#${id}`), value, id);
  await page.waitForSelector('.study-results table.study-table tbody tr', { timeout: 60_000 });
}
