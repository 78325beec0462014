/**
 * The duty study in the workbench: open an invented vector sheet with its take-off file, type a
 * duty, the suction site and the pipe runs, add an option with one click, and read the NPSH
 * margin, the motor and the allowable eye elevation beside the cautions; the family chart shows
 * the system curves and the operating points.
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ARTIFACTS, User, workbenchForFile } from './harness.ts';
import { openSampleStudy } from './studyFlow.ts';

const dir = join(ARTIFACTS, 'study');
const live = workbenchForFile(dir);

describe('the duty study in the review', () => {
  it('shows the margin, the motor and the allowable elevation for each option, added with a click', async () => {
    const page = live.browser.page;
    const user = new User(page, dir);
    await openSampleStudy(page, user, live.server.url);
    expect(await page.locator('.study-table tbody tr').count()).toBe(1);

    await user.click(page.locator('#study-add-option'), 'add an option');
    await page.waitForFunction(() => document.querySelectorAll('.study-table tbody tr').length === 2, null, { timeout: 60_000 });
    await user.screenshot('study-two-options');

    const rows = page.locator('.study-table tbody tr');
    for (let i = 0; i < 2; i++) {
      const row = rows.nth(i);
      expect(await row.locator('td.margin').textContent()).toMatch(/^\d+(\.\d+)?$/);
      expect(await row.locator('td.runout').textContent()).toMatch(/^\d+(\.\d+)?$/);
      expect(await row.locator('td.motor').textContent()).toMatch(/^\d+(\.\d+)? kW$/);
      expect(await row.locator('td.eye').textContent()).toMatch(/^-?\d+(\.\d+)?$/);
    }
    const text = (await page.locator('.study-results').textContent()) ?? '';
    expect(text).toMatch(/wins|passes every check|No option passes/);
    expect(text).toMatch(/NPSH: NPSH3 is the point where head has already dropped 3 %/);
    expect(text).toMatch(/Motor: Motor size is preliminary/);
    // The headline never says the duty is met while an option it recommends fails.
    expect(await page.locator('.study-results .summary').textContent()).not.toMatch(/meets the duty/);
    // System curves and every option's operating points on the family chart.
    await page.waitForSelector('.family-chart .system-curve');
    expect(await page.locator('.family-chart .op-point').count()).toBeGreaterThanOrEqual(3);
  }, 600_000);
});
