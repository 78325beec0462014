/**
 * Acceptance on scans (the committed 200-dpi sample, and the same sheet scanned at 300 dpi): calibrate each panel by typing the axis values,
 * trace the four head, efficiency and power curves and NPSHr, read the findings, export.
 * The exported curve set must match a headless `pumpscribe takeoff` of the saved take-off file
 * within 0.05 % of span, and no main-thread task may last longer than 200 ms while tracing.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { ARTIFACTS, cleanDir, openBrowser, ROOT, startServer, type Browser, type Server } from './harness.ts';
import { compareCurveSets } from './compare.ts';
import { loadSample, runTakeoff, type FlowOptions } from './takeoffFlow.ts';
import { scan300, scanSample } from './samples.ts';

const dir = join(ARTIFACTS, 'scan');
let server: Server;
let browser: Browser;

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

async function takeoffOf(takeoffPath: string, artifacts: string, options: FlowOptions = {}) {
  const sample = loadSample(takeoffPath);
  const result = await runTakeoff(browser.page, server.url, sample, artifacts, options);
  writeFileSync(join(artifacts, 'actions.txt'), `${result.log.join('\n')}\n`);
  const headless = join(artifacts, 'headless.curveset.json');
  try {
    execFileSync(process.execPath, [join(ROOT, 'bin', 'pumpscribe.mjs'), 'takeoff', result.downloads.takeoff, '-o', headless, '--quiet'], { cwd: ROOT, stdio: 'pipe' });
  } catch (error) {
    if ((error as { status?: number }).status !== 1) throw error; // 1 = checks found failures; the file is still written
  }
  const gaps = compareCurveSets(parseCurveSetJson(readFileSync(result.downloads.curveset, 'utf8')), parseCurveSetJson(readFileSync(headless, 'utf8')));
  const worst = Math.max(...gaps.map((g) => Math.max(g.percentOfSpan, g.domainPercent)));
  return { result, gaps, worst };
}

describe('the take-off workbench on scans', () => {
  it('captures the committed sample scan and exports what the headless replay gives', async () => {
    const artifacts = join(dir, 'sample');
    const { result, gaps, worst } = await takeoffOf(scanSample(), artifacts);
    writeFileSync(join(artifacts, 'figures.json'), `${JSON.stringify({ actions: result.actions, worstMatchPercentOfSpan: worst, gaps, findings: result.findings }, null, 2)}\n`);
    expect(result.findings.length).toBeGreaterThan(0);
    expect(gaps.length).toBeGreaterThanOrEqual(13);
    expect(worst).toBeLessThanOrEqual(0.05);
  });

  it('never blocks the page for more than 200 ms while tracing a 300-dpi scan', async () => {
    const artifacts = join(dir, '300dpi');
    const generated = mkdtempSync(join(tmpdir(), 'pumpscribe-300dpi-'));
    const { result, gaps, worst } = await takeoffOf(await scan300(generated), artifacts, { scanClicks: 'line' });
    rmSync(generated, { recursive: true, force: true });
    // Long tasks on the main thread while tracing (PerformanceObserver 'longtask').
    const [t0, t1] = result.traceWindow;
    const during = result.longTasks.filter((t) => t.start + t.duration >= t0 && t.start <= t1);
    const longest = Math.max(0, ...during.map((t) => t.duration));

    writeFileSync(join(artifacts, 'figures.json'), `${JSON.stringify({ actions: result.actions, longestTaskMs: longest, longTasks: during, worstMatchPercentOfSpan: worst, gaps, findings: result.findings }, null, 2)}\n`);

    expect(result.findings.length).toBeGreaterThan(0);
    expect(longest).toBeLessThanOrEqual(200);
    expect(gaps.length).toBeGreaterThanOrEqual(13);
    expect(worst).toBeLessThanOrEqual(0.05);
  });
});
