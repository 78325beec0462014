/**
 * A sheet of one INVENTED impeller at four speeds (scripts/randomSheets/speedSheet.ts, printed
 * to PDF by Chromium) taken off in the workbench: the head panel's axes are set, the sheet is
 * declared a family of speeds, the speeds are typed in % of the rated speed, and the four head
 * curves are clicked; the exported take-off file labels its traces by speed, and the curve set
 * is a speed family whose members carry those speeds.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { toFlat, type PanelPlan, type Pt } from '../../scripts/randomSheets/plan.ts';
import { makeSpeedSheet, type SpeedSheet } from '../../scripts/randomSheets/speedSheet.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { ARTIFACTS, cleanDir, openBrowser, settle, startServer, User, type Browser, type Server } from './harness.ts';

const dir = join(ARTIFACTS, 'speed-sheet');
let server: Server;
let browser: Browser;
let sheet: SpeedSheet;
let pdfPath: string;

/** PDF points are 0.75 of the plan's flat pixels (the vector plan is drawn at 96 dpi). */
const toSheet = (p: Pt): [number, number] => [0.75 * p[0], 0.75 * p[1]];

beforeAll(async () => {
  cleanDir(dir);
  // Seed 5: SI units, four speeds labelled 100/90/80/70 % of 1750 rpm.
  sheet = await makeSpeedSheet(5, { kind: 'vector', efficiencyAs: 'curves' });
  pdfPath = join(dir, 'invented-speed-sheet.pdf');
  writeFileSync(pdfPath, sheet.bytes);
  server = await startServer();
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function state<T>(page: Browser['page'], read: string): Promise<T> {
  return page.evaluate((code) => new Function('wb', `return (${code});`)((window as unknown as { pumpscribe: () => unknown }).pumpscribe()), read) as Promise<T>;
}

describe('the workbench on a sheet drawn for one impeller at several speeds', () => {
  it('asks which kind the sheet is, takes speeds in % of rated, and exports a curve set whose members carry the speeds', async () => {
    const page = browser.page;
    const user = new User(page, dir);
    const family = sheet.family;
    expect(family.labels).toBe('percent');
    await page.goto(server.url);
    await page.waitForSelector('#sheet-file', { state: 'attached' });
    await user.chooseFiles(page.locator('#sheet-file'), [pdfPath], 'the speed sheet');
    await page.waitForFunction(() => /^Loaded /.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 90_000 }).catch(async (error: Error) => {
      await user.screenshot('failed-load');
      throw new Error(`The sheet did not load; the status line said "${await page.textContent('#message')}" (${error.message})`);
    });
    await settle(page);

    // The head panel: frame from corner to corner, then the anchors the text proposes (or typed).
    const head = sheet.plan.panels.find((p) => p.quantity === 'head') as PanelPlan;
    if (!(await page.locator('#step-axes-body').isVisible())) await user.click(page.locator('#step-axes'), 'step 2');
    if (!(await state<boolean>(page, 'wb.store.session.drawingFrame'))) {
      await user.click(page.getByRole('group', { name: 'What the new panel plots' }).getByRole('button', { name: 'Head', exact: true }), 'new head panel');
    }
    await user.dragSheet(toSheet(toFlat(head, head.x.min, head.y.max)), toSheet(toFlat(head, head.x.max, head.y.min)), 'frame of the head panel');
    await page.waitForFunction(() => (window as unknown as { pumpscribe: () => { store: { draft: { panels: unknown[] } } } }).pumpscribe().store.draft.panels.length > 0, null, { timeout: 20_000 });
    const id = await state<string>(page, 'wb.store.draft.panels[0].id');
    const proposal = page.locator(`#use-proposal-${id}`);
    await proposal.waitFor({ state: 'visible', timeout: 20_000 }).catch(() => undefined);
    if (await proposal.isVisible()) await user.click(proposal, 'use the proposed anchors');
    else {
      const anchors = await state<{ label?: string; x?: number; y?: number }[]>(page, `wb.store.draft.panels[0].anchors`);
      const want: Record<string, number> = { 'x left': head.x.min, 'x right': head.x.max, 'y bottom': head.y.min, 'y top': head.y.max };
      for (const [k, a] of anchors.entries()) if (a.x === undefined && a.y === undefined && want[a.label ?? ''] !== undefined) await user.type(page.locator(`#anchor-${id}-${k}`), String(want[a.label ?? '']), `head panel ${a.label}`);
    }
    await settle(page);
    expect(await state<boolean>(page, `!!wb.derived.calibrations.get(${JSON.stringify(id)})?.ok`)).toBe(true);

    // Step 3: the sheet is a family of speeds; the speeds typed in % of the rated speed.
    await user.click(page.locator('#step-trace'), 'step 3');
    if ((await state<number>(page, 'wb.store.draft.pump.speed_rpm')) !== family.speed) await user.type(page.locator('#pump-speed'), String(family.speed), 'rated speed');
    await user.click(page.locator('#family-speeds'), 'the curves are drawn for speeds');
    await user.type(page.locator('#speeds'), '100 90 80 70 %', 'speeds in % of rated');
    expect(await state<number[]>(page, 'wb.store.draft.speeds')).toEqual(family.speeds);
    expect(await page.getByRole('group', { name: 'Speed to trace next' }).textContent()).toMatch(/1575 rpm \(90 %\)/);

    // One click on each head curve where it runs clear of the others (90 % of its drawn flow).
    for (const n of family.speeds) {
      const target = await state<{ diameter?: number }>(page, 'wb.store.session.target');
      expect(target.diameter, 'the next speed proposed').toBe(n);
      const line = sheet.plan.lines.find((l) => l.id === `head-${n}`)!;
      const at = toSheet(line.points[Math.round(0.9 * (line.points.length - 1))]!);
      const count = await state<number>(page, 'wb.store.draft.traces.length');
      await user.clickSheet(at, `head ${n} rpm`);
      await page.waitForFunction((k) => (window as unknown as { pumpscribe: () => { store: { draft: { traces: unknown[] } } } }).pumpscribe().store.draft.traces.length > k || document.querySelector('#message.error') !== null, count, { timeout: 60_000 });
      await settle(page);
    }
    const traces = await state<{ speed?: number; diameter?: number }[]>(page, 'wb.store.draft.traces');
    expect(traces.map((t) => t.speed)).toEqual(family.speeds);
    expect(traces.every((t) => t.diameter === undefined)).toBe(true);
    await user.screenshot('traced');

    // Review, then save the take-off file and the curve set.
    await user.click(page.locator('#step-review'), 'step 4');
    await settle(page);
    await page.waitForSelector('.family-chart', { timeout: 60_000 });
    await user.click(page.locator('#step-save'), 'step 5');
    const files: Record<string, string> = {};
    for (const [key, sel] of [['takeoff', '#download-takeoff'], ['curveset', '#download-curveset']] as const) {
      const [download] = await Promise.all([page.waitForEvent('download'), user.click(page.locator(sel), `download ${key}`)]);
      files[key] = join(dir, download.suggestedFilename());
      await download.saveAs(files[key]);
    }
    const takeoff = JSON.parse(readFileSync(files.takeoff!, 'utf8')) as { traces: { speed?: number; diameter?: number }[]; pump: { speed_rpm: number } };
    expect(takeoff.pump.speed_rpm).toBe(family.speed);
    expect(takeoff.traces.map((t) => t.speed)).toEqual(family.speeds);
    const set = parseCurveSetJson(readFileSync(files.curveset!, 'utf8'));
    expect(set.family).toBe('speed');
    expect(set.members.map((m) => m.speed_rpm)).toEqual(family.speeds);
    expect(set.members.every((m) => m.diameter_m === undefined && m.curves.head?.fit !== undefined)).toBe(true);
    // The speed-affinity check ran and passed on the four drawn heads.
    expect(set.findings.some((f) => f.code === 'affinity.summary')).toBe(true);
    expect(set.findings.filter((f) => f.code.startsWith('affinity.') && f.severity !== 'note')).toEqual([]);
    writeFileSync(join(dir, 'figures.json'), `${JSON.stringify({ actions: user.actions, log: user.log }, null, 2)}\n`);
  });
});
