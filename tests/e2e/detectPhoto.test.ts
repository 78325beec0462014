/**
 * The automatic take-off in the workbench on a hand-held photo (issue 14: panels found on
 * photos too, through the projective calibration): an INVENTED two-panel, three-diameter sheet
 * of the independent random bed (seed 8, photographed at an angle: keystone, turn, uneven light,
 * blur, JPEG; scripts/detectSheets/scanBed.ts) goes from the dropped file to a saved curve set
 * in counted actions. The page is squared from its own lines in the sheet worker, each panel is
 * calibrated projectively from its tick labels, and the saved curve set equals the headless
 * `pumpscribe takeoff --detect` of the same photo and lies within the photo acceptance of the
 * exact truth (1 % of span), or is flagged.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { convert, parseUnit } from '../../src/units/index.ts';
import { draftParts, waitMessage } from './detectFlow.ts';
import { ARTIFACTS, ROOT, saveBoth, settle, User, workbenchForFile } from './harness.ts';
import { compareCurveSets } from './compare.ts';
import { curveTolerance, scanFor } from '../../scripts/detectSheets/scanBed.ts';
import { minimalTakeoff } from '../../scripts/detectSheets/vectorSheet.ts';
import { sheetGeometry, truthOf } from '../../scripts/randomSheets/randomSheet.ts';
import { scoreReplay } from '../../scripts/randomSheets/score.ts';

const dir = join(ARTIFACTS, 'detect-photo');
const SEED = 8;
const live = workbenchForFile(dir);

describe('finding panels and curves on a photo taken at an angle', () => {
  it('takes the photo from drop to saved curve set, the page squared and the panels calibrated projectively, equal to the headless --detect', async () => {
    const { plan, shot } = sheetGeometry(SEED, 'photo');
    expect(shot.keystone).toBeGreaterThan(0.01);
    const { jpeg } = await scanFor(SEED, 'photo');
    const name = `random-${SEED}-photo.jpg`;
    const file = join(dir, name);
    writeFileSync(file, jpeg);

    const page = live.browser.page;
    const user = new User(page, dir);
    await page.goto(live.server.url);
    await page.waitForSelector('#sheet-file', { state: 'attached' });
    await user.chooseFiles(page.locator('#sheet-file'), [file], name);
    await waitMessage(user, /^Loaded /, 120_000);
    await settle(page);
    await user.click(page.locator('#detect-run'), 'find panels and curves');
    const said = await waitMessage(user, /^Found |^Nothing could be named yet|failed|could not be loaded/, 300_000);
    expect(said).toMatch(new RegExp(`^Found ${plan.panels.length} panels and ${plan.lines.length} curves`));
    await settle(page);
    await user.screenshot('1-found');
    const found = await draftParts(user);
    expect(found.panels.map((p) => p.quantity).sort()).toEqual(plan.panels.map((p) => p.quantity).sort());
    // The record takes the units the sheet prints (its labels in inches here, not the workbench's starting mm).
    const draftUnit = await page.evaluate(() => (window as unknown as { pumpscribe: () => { store: { draft: { units: { diameter: string } } } } }).pumpscribe().store.draft.units.diameter);
    const sheetUnit = plan.family.units === 'us' ? 'in' : 'mm';
    expect(draftUnit).toBe(sheetUnit);
    if (sheetUnit === 'in') expect(said).toMatch(/Units taken from the sheet: flow gpm, head ft, .*diameter in\./);
    const named = found.traces.filter((t) => t.quantity === 'head').map((t) => t.diameter as number).sort((a, b) => b - a);
    const drawn = plan.family.diameters.map((d) => convert(d, parseUnit('diameter', sheetUnit), parseUnit('diameter', draftUnit))).sort((a, b) => b - a);
    expect(named).toHaveLength(drawn.length);
    named.forEach((d, i) => expect(Math.abs(d - (drawn[i] as number))).toBeLessThanOrEqual(0.05));

    const files = await saveBoth(user, page, dir, 300_000);
    await user.screenshot('2-saved');
    writeFileSync(join(dir, 'actions.txt'), `${user.log.join('\n')}\n`);
    expect(user.actions).toBeLessThanOrEqual(18);

    // Each panel's calibration is projective: the photo's perspective is in the anchors.
    const fromBrowser = parseCurveSetJson(readFileSync(files.curveset as string, 'utf8'));
    const calibrations = (fromBrowser.provenance.notes ?? []).filter((n) => /calibration, residual/.test(n));
    expect(calibrations).toHaveLength(plan.panels.length);
    for (const note of calibrations) expect(note).toMatch(/projective calibration/);
    expect(parseTakeoff(JSON.parse(readFileSync(files.takeoff as string, 'utf8'))).detected?.by).toMatch(/scans/);

    // The same code headless: `--detect` on the photo from the minimal take-off.
    const minimal = join(dir, 'minimal.takeoff.json');
    writeFileSync(minimal, JSON.stringify({ format: 'pumpscribe.takeoff', version: 1, ...minimalTakeoff(plan, name) }));
    const out = join(dir, 'headless.curveset.json');
    try {
      execFileSync(process.execPath, [join(ROOT, 'bin', 'pumpscribe.mjs'), 'takeoff', minimal, '--detect', '-o', out, '--quiet'], { cwd: ROOT, stdio: 'pipe' });
    } catch (error) {
      if ((error as { status?: number }).status !== 1) throw error; // 1: checks found failures; the file is written
    }
    const gaps = compareCurveSets(fromBrowser, parseCurveSetJson(readFileSync(out, 'utf8')));
    expect(gaps.length).toBe(fromBrowser.members.reduce((n, m) => n + Object.keys(m.curves).length, 0));
    expect(Math.max(...gaps.map((g) => Math.max(g.percentOfSpan, g.domainPercent)))).toBeLessThanOrEqual(0.05);

    // Against the exact truth: within the photo acceptance, or flagged.
    const tol = curveTolerance('photo');
    const scores = scoreReplay(plan.family, truthOf(plan), fromBrowser).filter((s) => s.source !== 'iso');
    writeFileSync(join(dir, 'figures.json'), `${JSON.stringify({ seed: SEED, actions: user.actions, log: user.log, scores: scores.map((s) => ({ id: s.id, error: s.error, flagged: s.flagged })) }, null, 2)}\n`);
    expect(scores).toHaveLength(plan.lines.length);
    for (const s of scores) {
      const limit = s.quantity === 'efficiency' ? tol.points : tol.percent;
      if (!s.flagged) expect(s.error, `${s.id} is off by ${s.error} and no finding names it`).toBeLessThanOrEqual(limit);
    }
  });
});
