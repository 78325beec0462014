/**
 * Acceptance on a scan (a 300-dpi picture): calibrate each panel by typing the axis values,
 * trace the four head, efficiency and power curves and NPSHr, read the findings, export.
 * The exported curve set must match a headless `pumpscribe takeoff` of the saved take-off file
 * within 0.05 % of span, and no main-thread task may last longer than 200 ms while tracing.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { ARTIFACTS, cleanDir, openBrowser, ROOT, startServer, type Browser, type Server } from './harness.ts';
import { compareCurveSets } from './compare.ts';
import { loadSample, runTakeoff } from './takeoffFlow.ts';
import { scanSample } from './samples.ts';

const dir = join(ARTIFACTS, 'scan');
let server: Server;
let browser: Browser;

beforeAll(async () => {
  cleanDir(dir);
  server = await startServer();
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

describe('the take-off workbench on a 300-dpi scan', () => {
  it('captures the family without freezing the page and exports what the headless replay gives', async () => {
    const sample = loadSample(scanSample());
    const result = await runTakeoff(browser.page, server.url, sample, dir);
    writeFileSync(join(dir, 'actions.txt'), `${result.log.join('\n')}\n`);

    // Long tasks on the main thread while tracing (PerformanceObserver 'longtask').
    const [t0, t1] = result.traceWindow;
    const during = result.longTasks.filter((t) => t.start + t.duration >= t0 && t.start <= t1);
    const longest = Math.max(0, ...during.map((t) => t.duration));

    const headless = join(dir, 'headless.curveset.json');
    try {
      execFileSync(process.execPath, [join(ROOT, 'bin', 'pumpscribe.mjs'), 'takeoff', result.downloads.takeoff, '-o', headless, '--quiet'], { cwd: ROOT, stdio: 'pipe' });
    } catch (error) {
      if ((error as { status?: number }).status !== 1) throw error; // 1 = checks found failures; the file is still written
    }
    const gaps = compareCurveSets(parseCurveSetJson(readFileSync(result.downloads.curveset, 'utf8')), parseCurveSetJson(readFileSync(headless, 'utf8')));
    const worst = Math.max(...gaps.map((g) => Math.max(g.percentOfSpan, g.domainPercent)));
    writeFileSync(join(dir, 'figures.json'), `${JSON.stringify({ actions: result.actions, longestTaskMs: longest, longTasks: during, worstMatchPercentOfSpan: worst, gaps, findings: result.findings }, null, 2)}\n`);

    expect(result.findings.length).toBeGreaterThan(0);
    expect(longest).toBeLessThanOrEqual(200);
    expect(gaps.length).toBeGreaterThanOrEqual(13);
    expect(worst).toBeLessThanOrEqual(0.05);
  });
});
