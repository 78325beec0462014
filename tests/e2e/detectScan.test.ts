/**
 * Acceptance of the automatic take-off in the workbench (issue 14) on a scan: an INVENTED
 * four-panel, four-diameter sheet of the independent random bed (seed 20, scanned at 300 dpi,
 * turned, blurred, noised, JPEG; scripts/detectSheets/scanBed.ts) goes from the dropped file to
 * a saved curve set, the detector's questions answered, in counted actions (each click, typed
 * field or file chosen is one; at most 18 on a scan). The tick labels are read in the sheet
 * worker by tesseract.js, loaded from the workbench's own server (dist/ocr/), never from a CDN:
 * the page is offline here, every request that leaves the server's origin fails the test.
 *
 * The saved curve set must equal the headless `pumpscribe takeoff --detect` of the same scan
 * with the same answer, within the scan tolerance (0.5 % of span). What the detector misses on
 * this scan is written to artifacts/e2e/detect-scan/figures.json and held by the expected
 * failure at the end, which names the gap to the acceptance (every curve, at most one
 * question); it turns into a failure to fix the test once the detector closes the gap.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import type { CurveSet } from '../../src/model/curveset.ts';
import { draftParts, waitMessage as waitFor } from './detectFlow.ts';
import { ARTIFACTS, ROOT, saveBoth, settle, User, workbenchForFile } from './harness.ts';
import { compareCurveSets } from './compare.ts';
import { scanFor, SCAN_CURVE_PERCENT, SCAN_EFFICIENCY_POINTS } from '../../scripts/detectSheets/scanBed.ts';
import { minimalTakeoff } from '../../scripts/detectSheets/vectorSheet.ts';
import { sheetGeometry, truthOf } from '../../scripts/randomSheets/randomSheet.ts';
import { scoreReplay } from '../../scripts/randomSheets/score.ts';

const dir = join(ARTIFACTS, 'detect-scan');
const SEED = 20;
const live = workbenchForFile(dir);

/** The acceptance's count of actions on a scan. */
const MAX_ACTIONS = 18;

const waitMessage = (user: User, pattern: RegExp, timeout = 300_000) => waitFor(user, pattern, timeout);

/** Waits until the detector has run `count` times since the test began to watch the store. */
async function runEnded(user: User, count: number): Promise<void> {
  await user.page.waitForFunction((n) => (window as unknown as { runsEnded: number }).runsEnded >= n, count, { timeout: 300_000, polling: 200 });
}

function headless(takeoff: string, name: string, flags: string[] = []): { set: CurveSet; stderr: string } {
  const out = join(dir, `headless-${name}.curveset.json`);
  let stderr = '';
  try {
    execFileSync(process.execPath, [join(ROOT, 'bin', 'pumpscribe.mjs'), 'takeoff', takeoff, ...flags, '-o', out, '--quiet'], { cwd: ROOT, stdio: 'pipe' });
  } catch (error) {
    const e = error as { status?: number; stderr?: Buffer };
    if (e.status !== 1) throw error; // 1 = checks found failures, or questions are open; the file is still written
    stderr = e.stderr?.toString() ?? '';
  }
  return { set: parseCurveSetJson(readFileSync(out, 'utf8')), stderr };
}

/** What the flow found, for the expected failure below. */
let outcome: { drawn: number; withinTolerance: number; missed: string[]; asked: number } | null = null;

describe('finding panels and curves on a scan', () => {
  it(`takes a four-panel, four-diameter 300-dpi scan from drop to saved curve set in at most ${MAX_ACTIONS} actions, the tick labels read offline in the worker, equal to the headless --detect`, async () => {
    const { plan } = sheetGeometry(SEED, 'scan');
    expect(plan.dpi).toBe(300);
    expect(plan.panels).toHaveLength(4);
    expect(plan.family.diameters).toHaveLength(4);
    const { jpeg } = await scanFor(SEED);
    const file = join(dir, `random-${SEED}.jpg`);
    writeFileSync(file, jpeg);
    const diameters = [...plan.family.diameters].sort((a, b) => b - a);

    const page = live.browser.page;
    // Offline: nothing may be fetched from anywhere but the workbench's own server.
    const origin = new URL(live.server.url).origin;
    const outside: string[] = [];
    await page.context().route('**/*', (route) => {
      const url = route.request().url();
      if (url.startsWith(origin) || url.startsWith('blob:') || url.startsWith('data:')) return route.continue();
      outside.push(url);
      return route.abort();
    });
    const ocrFiles: string[] = [];
    page.context().on('request', (r) => {
      if (r.url().startsWith(`${origin}/ocr/`)) ocrFiles.push(r.url().slice(origin.length));
    });
    const user = new User(page, dir);
    await page.goto(live.server.url);
    await page.waitForSelector('#sheet-file', { state: 'attached' });

    // 1. The scan is opened; the workbench offers to find the panels and curves.
    await user.chooseFiles(page.locator('#sheet-file'), [file], `random-${SEED}.jpg`);
    expect(await waitMessage(user, /^Loaded /, 120_000)).toMatch(/Find panels and curves/);
    await settle(page);
    await page.locator('#detect-run').waitFor({ state: 'visible' });
    expect(await page.locator('#detect-run').isDisabled()).toBe(false);
    await user.screenshot('1-loaded');

    // 2. One click: panels, tick labels (read in the worker) and curves, with progress shown.
    await page.evaluate(() => {
      const w = window as unknown as { seenProgress: string[]; runsEnded: number; pumpscribe: () => { store: { session: { busy: boolean; progress: { label: string } | null }; subscribe(l: () => void): void } } };
      w.seenProgress = [];
      w.runsEnded = 0;
      const store = w.pumpscribe().store;
      let busy = store.session.busy;
      store.subscribe(() => {
        const label = store.session.progress?.label;
        if (label && !w.seenProgress.includes(label)) w.seenProgress.push(label);
        // A run of the detector ends when the workbench stops being busy.
        if (busy && !store.session.busy) w.runsEnded += 1;
        busy = store.session.busy;
      });
    });
    const t0 = Date.now();
    await user.click(page.locator('#detect-run'), 'find panels and curves');
    await runEnded(user, 1);
    let said = await waitMessage(user, /^Found |^Nothing could be named yet|failed|could not be loaded/);
    const firstRunMs = Date.now() - t0;
    const progress = await page.evaluate(() => (window as unknown as { seenProgress: string[] }).seenProgress);
    expect(said).not.toMatch(/failed|could not be loaded/);
    expect(progress).toContain('Finding panels and curves: reading the tick labels');
    expect(progress.some((l) => /starting the text reader/.test(l))).toBe(true);
    // Once started, the reader's own messages no longer stand in for the detector's steps.
    expect(progress.indexOf('Finding panels and curves: calibrating the panels')).toBeGreaterThan(Math.max(...progress.map((l, i) => (/starting the text reader/.test(l) ? i : -1))));
    await settle(page);
    await user.screenshot('2-found');

    // 3. The questions, one at a time: the diameters are answered once (the scan's small labels are often not read).
    const log: { question: string; answered: string | null }[] = [];
    /** Time of each run after an answer (the reader already started), ms. */
    const answeredRunMs: number[] = [];
    for (let guard = 0; guard < 6; guard++) {
      const visible = await page.locator('#detect-question-text').isVisible().catch(() => false);
      if (!visible) break;
      const question = (await page.textContent('#detect-question-text')) ?? '';
      if (!/diameters/.test(question) || !/give the diameters|names no impeller diameters|could not all be named/.test(question)) {
        log.push({ question, answered: null });
        break; // what is left asks for tracing by hand: the engineer saves what was found and reads the questions
      }
      const runs = await page.evaluate(() => (window as unknown as { runsEnded: number }).runsEnded);
      const a0 = Date.now();
      await user.type(page.locator('#detect-answer'), diameters.join(' '), 'impeller diameters');
      await runEnded(user, runs + 1);
      answeredRunMs.push(Date.now() - a0);
      said = await waitMessage(user, /^Found |failed|^Nothing could be named yet/);
      log.push({ question, answered: diameters.join(' ') });
      await settle(page);
    }
    expect(said).toMatch(/^Found 4 panels and \d+ curves/);
    // A question that asks for tracing by hand offers no field to type in.
    const left = log.find((q) => q.answered === null);
    if (left && /by hand/.test(left.question)) expect(await page.locator('#detect-answer').count()).toBe(0);
    const found = await draftParts(user);
    expect(found.panels.map((p) => p.quantity).sort()).toEqual(['efficiency', 'head', 'npshr', 'power']);
    for (const part of [...found.panels, ...found.traces]) {
      expect(part.origin).toBe('detected');
      expect(part.confidence).toBeGreaterThan(0);
    }
    expect(new Set(found.traces.filter((t) => t.quantity === 'head').map((t) => t.diameter))).toEqual(new Set(diameters));
    await user.screenshot('3-answered');

    // The pump's speed is read from the scan's title by the same character reader: the status line
    // says so, and step 5 has no warning that the speed is only the starting value.
    const rated = (minimalTakeoff(plan, `random-${SEED}.jpg`).pump as { speed_rpm: number }).speed_rpm;
    expect(await page.textContent('#message')).toMatch(new RegExp(`The pump's speed, ${rated} rpm, was read from the sheet`));
    await page.locator('#step-save').click(); // a look by the test, not counted
    await settle(page);
    expect(await page.locator('#speed-not-given').count()).toBe(0);
    expect(await page.evaluate(() => (window as unknown as { pumpscribe: () => { store: { draft: { pump: { speed_rpm: number }; speedGiven: boolean } } } }).pumpscribe().store.draft)).toMatchObject({ pump: { speed_rpm: rated }, speedGiven: true });

    // 4. Save: the curve set and the take-off file.
    const files = await saveBoth(user, page, dir, 300_000);
    expect(await page.locator('#speed-not-given').count()).toBe(0);
    await user.screenshot('4-saved');
    writeFileSync(join(dir, 'actions.txt'), `${user.log.join('\n')}\n`);
    expect(user.actions).toBeLessThanOrEqual(MAX_ACTIONS);
    // The reader's files came from the server itself, and nothing left it.
    expect(outside).toEqual([]);
    expect(ocrFiles.some((f) => f.endsWith('/ocr/eng/eng.traineddata.gz'))).toBe(true);
    expect(ocrFiles.some((f) => f.startsWith('/ocr/core/tesseract-core'))).toBe(true);

    // The take-off file records what was found and the answer given.
    const savedTakeoff = parseTakeoff(JSON.parse(readFileSync(files.takeoff as string, 'utf8')));
    expect(savedTakeoff.detected?.by).toMatch(/scans/);
    // The diameters are recorded when they were asked for and given; labels read name the curves without them.
    if (log.some((q) => q.answered !== null)) expect(savedTakeoff.diameters).toEqual(diameters);

    // The curve set equals the headless take-off: of the file just saved, and `--detect` on the scan with the same answer.
    const fromBrowser = parseCurveSetJson(readFileSync(files.curveset as string, 'utf8'));
    expect(fromBrowser.speed_rpm).toBe(rated);
    const minimal = join(dir, 'minimal.takeoff.json');
    writeFileSync(minimal, JSON.stringify({ format: 'pumpscribe.takeoff', version: 1, ...minimalTakeoff(plan, `random-${SEED}.jpg`), diameters }));
    const replayed = headless(files.takeoff as string, 'saved');
    const detected = headless(minimal, 'detected', ['--detect']);
    const worstOf = (gaps: ReturnType<typeof compareCurveSets>) => Math.max(...gaps.map((g) => Math.max(g.percentOfSpan, g.domainPercent)));
    const replayGaps = compareCurveSets(fromBrowser, replayed.set);
    const detectGaps = compareCurveSets(fromBrowser, detected.set);

    // Against the bed's exact truth, at 15–95 % of each drawn curve's flow range (iso-lines are not drawn on this sheet's head panel as curves).
    const scores = scoreReplay(plan.family, truthOf(plan), fromBrowser).filter((s) => s.source !== 'iso');
    const tolerance = (q: string) => (q === 'efficiency' ? SCAN_EFFICIENCY_POINTS : SCAN_CURVE_PERCENT);
    const missed = scores.filter((s) => !Number.isFinite(s.error)).map((s) => s.id);
    const within = scores.filter((s) => s.error <= tolerance(s.quantity));
    const beyond = scores.filter((s) => Number.isFinite(s.error) && s.error > tolerance(s.quantity));
    const questions = (await draftParts(user)).questions ?? [];
    // Questions put to the engineer on this sheet: those answered, and those still open at the save.
    const asked = log.filter((q) => q.answered !== null).length + questions.length;
    outcome = { drawn: scores.length, withinTolerance: within.length, missed, asked };
    writeFileSync(join(dir, 'figures.json'), `${JSON.stringify({
      seed: SEED, actions: user.actions, log: user.log, questions: log, openQuestions: questions, asked, firstRunMs, answeredRunMs, progress,
      ocrFiles: [...new Set(ocrFiles)],
      worstAgainstSavedReplay: worstOf(replayGaps), worstAgainstHeadlessDetect: worstOf(detectGaps), detectGaps,
      headlessQuestions: detected.stderr,
      truth: { drawn: scores.length, within: within.length, missed, beyond: beyond.map((s) => ({ id: s.id, error: s.error, flagged: s.flagged })) },
      scores: scores.map((s) => ({ id: s.id, error: s.error, flagged: s.flagged })),
    }, null, 2)}\n`);

    expect(replayGaps.length).toBe(fromBrowser.members.reduce((n, m) => n + Object.keys(m.curves).length, 0));
    expect(worstOf(replayGaps)).toBeLessThanOrEqual(SCAN_CURVE_PERCENT);
    expect(detectGaps.length).toBe(replayGaps.length);
    expect(worstOf(detectGaps)).toBeLessThanOrEqual(SCAN_CURVE_PERCENT);
    // No silent miss: a drawn curve missing from the saved set leaves a question open in the document.
    if (missed.length > 0) expect(questions.length).toBeGreaterThan(0);
    // A found curve beyond tolerance carries a flag (a finding of the replay, or a low confidence).
    for (const s of beyond) expect({ id: s.id, flagged: s.flagged }).toEqual({ id: s.id, flagged: true });
  });

  it('says in one sentence when the text reader cannot be loaded, and the scan is read by hand', async () => {
    const page = live.browser.page;
    const origin = new URL(live.server.url).origin;
    // The server's reader files are gone (a build without them, a proxy in the way).
    await page.context().route(`${origin}/ocr/**`, (route) => route.fulfill({ status: 404, body: 'gone' }));
    const user = new User(page, join(dir, 'no-reader'));
    await page.goto(live.server.url); // a new page: a new sheet worker, no reader started yet
    await page.waitForSelector('#sheet-file', { state: 'attached' });
    await user.chooseFiles(page.locator('#sheet-file'), [join(dir, `random-${SEED}.jpg`)], `random-${SEED}.jpg`);
    await waitMessage(user, /^Loaded /, 120_000);
    await settle(page);
    await user.click(page.locator('#detect-run'), 'find panels and curves');
    const said = await waitMessage(user, /could not be loaded|^Found |failed|^Nothing could be named/, 180_000);
    expect(said).toBe('The text reader for scans could not be loaded from this server (worker.min.js answered 404), so panels and curves are not found on this scan; draw the panel frames and trace the curves by hand.');
    const parts = await draftParts(user);
    expect(parts.panels).toEqual([]);
    expect(parts.traces).toEqual([]);
    expect(parts.questions).toBeNull();
    // The engineer goes on by hand: the button is there again and the frame tool of step 2 works as before.
    expect(await page.locator('#detect-run').isDisabled()).toBe(false);
    await user.screenshot('no-reader');
    await page.context().unroute(`${origin}/ocr/**`);
  });

  // The gap to issue 14's acceptance on this scan: the flow above saves what was found, but the
  // detector does not yet find every drawn curve with at most one question. When it does, this
  // expected failure fails: turn it into a plain test.
  it.fails('finds every drawn curve of the scan within tolerance with at most one question (issue 14 acceptance; not met yet, see figures.json)', () => {
    if (!outcome) throw new Error('The flow above did not finish.');
    expect(outcome.withinTolerance).toBe(outcome.drawn);
    expect(outcome.asked).toBeLessThanOrEqual(1);
  });
});
