/**
 * A sheet of one INVENTED impeller at four speeds (scripts/randomSheets/speedSheet.ts, printed
 * to PDF by Chromium) taken off in the workbench from drop to saved curve set: the sheet is
 * dropped on the window, the four panels' axes are set, the sheet is declared a family of
 * speeds typed in % of the rated speed, and every curve is clicked once. The review labels each
 * curve by its speed (fitted overlay, residuals, figures, family chart, CSV), the duty study
 * offers variable speed and no trim, and a duty between two drawn speeds runs at the speed the
 * command line's `duty` finds on the downloaded curve set (within 0.5 %) and at the exact
 * invented family's speed (within 0.5 %), with NPSH3 at that speed, its caution and the motor.
 * A reload brings every captured point back; a record kept by the version 2 workbench (the
 * target of a speed in `diameter`) loads too.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { toFlat, type PanelPlan, type Pt } from '../../scripts/randomSheets/plan.ts';
import { drawnRangeAtSpeed, exactAtSpeed, makeSpeedSheet, type SpeedSheet } from '../../scripts/randomSheets/speedSheet.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import type { Quantity } from '../../src/model/curveset.ts';
import { ARTIFACTS, openBrowser, ROOT, settle, User, workbenchForFile } from './harness.ts';

const dir = join(ARTIFACTS, 'speed-sheet');
const live = workbenchForFile(dir);

/** PDF points are 0.75 of the plan's flat pixels (the vector plan is drawn at 96 dpi). */
const toSheet = (p: Pt): [number, number] => [0.75 * p[0], 0.75 * p[1]];
const QUANTITIES: Quantity[] = ['head', 'efficiency', 'power', 'npshr'];
const BUTTON: Record<Quantity, string> = { head: 'Head', efficiency: 'Efficiency', power: 'Power', npshr: 'NPSHr' };
/** Where along its drawn points each curve is clicked: where it runs clear of its neighbours. */
const CLICK_AT: Record<Quantity, number> = { head: 0.9, efficiency: 0.5, power: 0.9, npshr: 0.01 };

let sheet: SpeedSheet;
let pdfPath: string;

async function state<T>(page: Page, read: string): Promise<T> {
  return page.evaluate((code) => new Function('wb', `return (${code});`)((window as unknown as { pumpscribe: () => unknown }).pumpscribe()), read) as Promise<T>;
}

async function dropSheet(page: Page, path: string, name: string): Promise<void> {
  await page.evaluate(({ b64, name }) => {
    const data = Uint8Array.from(atob(b64), (c) => c.charCodeAt(0));
    const transfer = new DataTransfer();
    transfer.items.add(new File([data], name, { type: 'application/pdf' }));
    document.body.dispatchEvent(new DragEvent('dragover', { dataTransfer: transfer, bubbles: true, cancelable: true }));
    document.body.dispatchEvent(new DragEvent('drop', { dataTransfer: transfer, bubbles: true, cancelable: true }));
  }, { b64: readFileSync(path).toString('base64'), name });
}

/** Draws a panel's frame corner to corner and takes the anchors the text proposes (or types them). */
async function setPanel(page: Page, user: User, plan: PanelPlan): Promise<void> {
  const q = plan.quantity as Quantity;
  if (!(await state<boolean>(page, 'wb.store.session.drawingFrame')) || (await state<string>(page, 'wb.store.session.framePlots')) !== q) {
    await user.click(page.getByRole('group', { name: 'What the new panel plots' }).getByRole('button', { name: BUTTON[q], exact: true }), `new ${q} panel`);
  }
  const count = await state<number>(page, 'wb.store.draft.panels.length');
  await user.dragSheet(toSheet(toFlat(plan, plan.x.min, plan.y.max)), toSheet(toFlat(plan, plan.x.max, plan.y.min)), `frame of the ${q} panel`);
  await page.waitForFunction((k) => (window as unknown as { pumpscribe: () => { store: { draft: { panels: unknown[] } } } }).pumpscribe().store.draft.panels.length > k, count, { timeout: 20_000 });
  const id = await state<string>(page, `wb.store.draft.panels[${count}].id`);
  expect(await state<string>(page, `wb.store.draft.panels[${count}].plots`)).toBe(q);
  const proposal = page.locator(`#use-proposal-${id}`);
  await proposal.waitFor({ state: 'visible', timeout: 20_000 }).catch(() => undefined);
  if (await proposal.isVisible()) await user.click(proposal, `use the proposed anchors of the ${q} panel`);
  else {
    const anchors = await state<{ label?: string; x?: number; y?: number }[]>(page, `wb.store.draft.panels[${count}].anchors`);
    const want: Record<string, number> = { 'x left': plan.x.min, 'x right': plan.x.max, 'y bottom': plan.y.min, 'y top': plan.y.max };
    for (const [k, a] of anchors.entries()) if (a.x === undefined && a.y === undefined && want[a.label ?? ''] !== undefined) await user.type(page.locator(`#anchor-${id}-${k}`), String(want[a.label ?? '']), `${q} panel ${a.label}`);
  }
  await settle(page);
  expect(await state<boolean>(page, `!!wb.derived.calibrations.get(${JSON.stringify(id)})?.ok`), `${q} panel calibrated`).toBe(true);
}

/** Brings a sheet point into a close view: the whole sheet first, then two wheel steps in about the point. */
async function zoomOn(page: Page, user: User, at: [number, number], what: string): Promise<void> {
  await page.locator('.stage').focus();
  await user.press('0', 'whole sheet in view');
  await user.zoomAt(at, what);
  await user.zoomAt(at, 'further');
}

/** The number of the figure a table cell shows ("1488" → 1488). */
const figure = (text: string | null) => Number((text ?? '').trim());

describe('the workbench on a sheet drawn for one impeller at several speeds', () => {
  it('takes the sheet from drop to a saved curve set labelled by speed, runs a duty between two speeds as the command line does, and keeps the points over a reload', async () => {
    // Seed 5: SI units (m³/h, m, kW), four speeds labelled 100/90/80/70 % of 1750 rpm, efficiency as curves.
    sheet = await makeSpeedSheet(5, { kind: 'vector', efficiencyAs: 'curves' });
    pdfPath = join(dir, 'invented-speed-sheet.pdf');
    writeFileSync(pdfPath, sheet.bytes);
    const family = sheet.family;
    expect(family.labels).toBe('percent');
    expect(family.units).toBe('si');
    const page = live.browser.page;
    const user = new User(page, dir);
    await page.goto(live.server.url);
    await page.waitForSelector('#sheet-file', { state: 'attached' });
    await dropSheet(page, pdfPath, 'invented-speed-sheet.pdf');
    user.actions += 1;
    user.log.push(`${user.actions}. drop the speed sheet on the window`);
    await page.waitForFunction(() => /^Loaded /.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 90_000 }).catch(async (error: Error) => {
      await user.screenshot('failed-load');
      throw new Error(`The sheet did not load; the status line said "${await page.textContent('#message')}" (${error.message})`);
    });
    await settle(page);

    // Step 2: the four panels, each frame dragged corner to corner.
    if (!(await page.locator('#step-axes-body').isVisible())) await user.click(page.locator('#step-axes'), 'step 2');
    for (const q of QUANTITIES) await setPanel(page, user, sheet.plan.panels.find((p) => p.quantity === q) as PanelPlan);
    await user.screenshot('axes-set');

    // Step 3: the sheet is a family of speeds; the speeds typed in % of the rated speed.
    await user.click(page.locator('#step-trace'), 'step 3');
    if ((await state<number>(page, 'wb.store.draft.pump.speed_rpm')) !== family.speed) await user.type(page.locator('#pump-speed'), String(family.speed), 'rated speed');
    await user.click(page.locator('#family-speeds'), 'the curves are drawn for speeds');
    await user.type(page.locator('#speeds'), '100 90 80 70 %', 'speeds in % of rated');
    expect(await state<number[]>(page, 'wb.store.draft.speeds')).toEqual(family.speeds);
    const chips = page.getByRole('group', { name: 'Speed to trace next' });
    await expect.poll(() => chips.textContent(), { timeout: 10_000 }).toMatch(/1750 rpm \(100 %\).*1575 rpm \(90 %\).*1400 rpm \(80 %\).*1225 rpm \(70 %\)/);
    await expect.poll(() => chips.textContent()).not.toMatch(/mm/);
    await user.screenshot('speeds-typed');

    // One click on each curve where it runs clear of the others.
    const extraGuides: string[] = [];
    for (const q of QUANTITIES) {
      for (const n of family.speeds) {
        if (q === 'head') {
          const target = await state<{ lines: string; speed?: number; diameter?: number }>(page, 'wb.store.session.target');
          expect(target, 'the next speed proposed').toEqual({ quantity: 'head', lines: 'curve', speed: n });
        }
        const line = sheet.plan.lines.find((l) => l.id === `${q}-${n}`)!;
        const at = toSheet(line.points[Math.round(CLICK_AT[q] * (line.points.length - 1))]!);
        const count = await state<number>(page, 'wb.store.draft.traces.length');
        // The NPSHr curves run close together: zoom in on the click, as one would, so that it
        // lands on its own curve rather than on a traced neighbour.
        if (q === 'npshr') await zoomOn(page, user, at, `NPSHr ${n} rpm`);
        await user.clickSheet(at, `${q} ${n} rpm`);
        await page.waitForFunction((k) => (window as unknown as { pumpscribe: () => { store: { draft: { traces: unknown[] } } } }).pumpscribe().store.draft.traces.length > k || document.querySelector('#message.error') !== null, count, { timeout: 60_000 });
        await settle(page);
        const made = await state<{ quantity: string; speed?: number; diameter?: number } | undefined>(page, `wb.store.draft.traces[${count}]`);
        expect(made, `${q} ${n} rpm traced (the status line said "${await page.textContent('#message')}")`).toMatchObject({ quantity: q, speed: n });
        expect(made?.diameter).toBeUndefined();
        // A dashed line whose capture stops short of its drawn end gets a second guide at its end
        // (Shift-click adds a guide to the curve just traced), as the status line advises.
        const end = toSheet(line.points[line.points.length - 1]!);
        const reach = () => state<number>(page, `Math.max(...(wb.store.draft.traces[${count}].points ?? wb.store.draft.traces[${count}].captured).map((p) => p[0]))`);
        if ((await reach()) < end[0] - 3) {
          const near = toSheet(line.points[Math.round(0.99 * (line.points.length - 1))]!);
          await zoomOn(page, user, near, `the end of NPSHr ${n} rpm`);
          await user.clickSheet(near, `${q} ${n} rpm: a guide at its end`, { shift: true });
          await settle(page);
          expect(await reach(), `${q} ${n} rpm reaches its last guide`).toBeGreaterThan(near[0] - 3);
          extraGuides.push(`${q} ${n} rpm`);
        }
      }
    }
    const traces = await state<{ id: string; quantity: string; speed?: number; captured?: unknown[]; points?: unknown[] }[]>(page, 'wb.store.draft.traces');
    expect(traces).toHaveLength(16);
    await user.screenshot('traced-npshr-zoomed');
    await page.locator('.stage').focus();
    await user.press('0', 'whole sheet in view');
    await page.mouse.move(5, 5);
    await user.screenshot('traced');

    // Step 4: the review names every curve by its speed.
    await user.click(page.locator('#step-review'), 'step 4');
    await settle(page);
    await page.waitForSelector('.family-chart', { timeout: 60_000 });
    const fits = await state<{ label: string; quantity: string }[]>(page, 'wb.derived.fits.map((f) => ({ label: f.label, quantity: f.quantity }))');
    expect(fits).toHaveLength(16);
    for (const q of QUANTITIES) expect(fits.filter((f) => f.quantity === q).map((f) => f.label)).toEqual(['1750 rpm (100 %)', '1575 rpm (90 %)', '1400 rpm (80 %)', '1225 rpm (70 %)']);
    const residualRows = await page.locator('table.residuals tbody th').allTextContents();
    expect(residualRows).toContain('head 1575 rpm');
    expect(await page.locator('table.residuals tbody td').allTextContents()).not.toContain('not available');
    expect(await page.locator('h4', { hasText: 'Figures per speed' }).count()).toBe(1);
    expect(await page.locator('table.figures:not(.study-table) tbody th').allTextContents()).toEqual(['1750 rpm (100 %)', '1575 rpm (90 %)', '1400 rpm (80 %)', '1225 rpm (70 %)']);
    const legend = await page.locator('.family-chart .plot-head .curve-label').allTextContents();
    expect(legend.sort()).toEqual(['1225 rpm', '1400 rpm', '1575 rpm', '1750 rpm']);
    const chartText = `${await page.locator('.family-chart').getAttribute('aria-label')} ${await page.locator('figure.family figcaption').textContent()} ${(await page.locator('.family-chart text').allTextContents()).join(' ')}`;
    expect(chartText).toMatch(/for 4 speeds/);
    expect(chartText).toMatch(/one impeller drawn at 4 speeds \(rated 1750 rpm\)/);
    expect(chartText).not.toMatch(/\bmm\b|diameters/);
    writeFileSync(join(dir, 'draft.json'), await state<string>(page, 'JSON.stringify(wb.store.draft)'));
    const set0 = await state<{ family: string; findings: { code: string; severity: string; message: string }[] }>(page, 'wb.derived.curveSet');
    expect(set0.family).toBe('speed');
    expect(set0.findings.filter((f) => f.severity === 'fail').map((f) => f.message)).toEqual([]);
    await page.locator('.chart-pane').scrollIntoViewIfNeeded();
    await user.screenshot('review-fitted-overlay-and-chart');

    // The duty study: variable speed offered, never a trim.
    await page.locator('#duty-title').scrollIntoViewIfNeeded();
    expect(await page.locator('#option-0-impeller').textContent()).toBe('the one drawn (no trim on a speed family)');
    expect(await page.locator('#option-0-control').inputValue()).toBe('speed');
    expect(await page.locator('.duty option[value="trim"]').count()).toBe(0);
    expect(await page.locator('#duty-speed-family').textContent()).toMatch(/no impeller trim is offered/);

    // A duty between the drawn 90 % and 80 % curves: the exact family's head at 85 % of rated speed.
    const n85 = 0.85 * family.speed;
    const [qa, qb] = drawnRangeAtSpeed(family, 'head', n85);
    const flow = Number((qa + 0.6 * (qb - qa)).toFixed(1));
    const head = Number(exactAtSpeed(family, 'head', n85, flow).toFixed(2));
    const staticHead = Number((0.4 * head).toFixed(1));
    await user.type(page.locator('#duty-flow'), String(flow), 'duty flow');
    await user.type(page.locator('#duty-head'), String(head), 'duty head');
    await user.type(page.locator('#duty-static'), String(staticHead), 'static head');
    await user.type(page.locator('#duty-suction-static'), '2', 'liquid level above the eye');
    await page.waitForSelector('.study-table', { timeout: 30_000 });
    // The exact speed whose curve passes through the typed duty point, by bisection on the invented family.
    let lo = 0.7 * family.speed;
    let hi = family.speed;
    for (let i = 0; i < 100; i++) {
      const mid = 0.5 * (lo + hi);
      if (exactAtSpeed(family, 'head', mid, flow) < head) lo = mid; else hi = mid;
    }
    const exactSpeed = 0.5 * (lo + hi);
    const row = page.locator('.study-table tbody tr').first();
    const shownSpeed = figure(await row.locator('td.speed').textContent());
    expect(shownSpeed).toBeGreaterThan(1400);
    expect(shownSpeed).toBeLessThan(1575);
    expect(Math.abs(shownSpeed / exactSpeed - 1), `workbench ${shownSpeed} rpm against the exact ${exactSpeed.toFixed(1)} rpm`).toBeLessThan(0.005);
    const sentence = await page.locator('.speed-result').first().textContent();
    expect(sentence).toMatch(/^Variable speed: the pump runs at \d{4} rpm \(\d+(\.\d+)? % of the rated 1750 rpm\) at the highest static head, between the drawn 1400 rpm and 1575 rpm curves\.$/);
    // The family chart draws the head curve at that speed through the operating point, labelled with it.
    expect(await page.locator('.family-chart .plot-head .speed-curve-label').allTextContents()).toEqual([`${shownSpeed} rpm`]);
    const npsh3 = figure(await row.locator('td.npsh3').textContent());
    expect(npsh3).toBeGreaterThan(0);
    expect(await row.locator('td.motor').textContent()).toMatch(/kW/);
    const duty = page.locator('.duty-results');
    expect(await duty.locator('.study-findings').textContent()).toMatch(/NPSH3 at \d+ rpm is the 1575 rpm curve scaled by \(n\/n_drawn\)²/);
    expect((await duty.locator('p.caution').allTextContents()).join(' ')).toMatch(/^NPSH: .*Motor: /);
    const notes = (await duty.locator('p.hint').allTextContents()).join(' ');
    expect(notes).toMatch(/NPSH3 at a speed is read from the drawn curve of the nearest speed at or above it/);
    expect(notes).not.toMatch(/trim/);
    expect(await page.locator('#step-review').textContent()).toMatch(/4 speeds, 0 failing/);
    await duty.scrollIntoViewIfNeeded();
    await user.screenshot('duty-between-two-speeds');

    // Step 5: the files and the library.
    await user.click(page.locator('#step-save'), 'step 5');
    const files: Record<string, string> = {};
    for (const [key, sel] of [['takeoff', '#download-takeoff'], ['curveset', '#download-curveset'], ['csv', '#download-csv']] as const) {
      const [download] = await Promise.all([page.waitForEvent('download'), user.click(page.locator(sel), `download ${key}`)]);
      files[key] = join(dir, download.suggestedFilename());
      await download.saveAs(files[key]);
    }
    await user.click(page.locator('#save-library'), 'save to the library');
    await page.waitForFunction(() => /^Saved to the library as /.test(document.querySelector('#message')?.textContent ?? '') || document.querySelector('#message.error') !== null, null, { timeout: 30_000 });
    expect(await page.textContent('#message')).toMatch(/^Saved to the library as \S+, revision 1\./);
    const entry = /as (\S+), revision/.exec((await page.textContent('#message')) ?? '')![1]!;
    // The library's pages in another tab: the entry is a speed family, compared at the duty by its speed, not by a trim.
    const library = await live.browser.context.newPage();
    try {
      await library.goto(`${live.server.url}#/library`);
      await library.waitForSelector(`tr[data-key="${entry}"]`, { timeout: 30_000 });
      expect(await library.locator(`tr[data-key="${entry}"] td`).nth(2).textContent()).toBe('one impeller drawn at several speeds');
      await library.goto(`${live.server.url}#/compare?ids=${entry}&units=si&flow=${flow}&head=${head}`);
      await library.waitForSelector('table.compare tbody tr', { timeout: 30_000 });
      const cells = await library.locator('table.compare tbody tr td').allTextContents();
      const headers = await library.locator('table.compare thead th').allTextContents();
      const speedCell = Number(cells[headers.indexOf('Speed [rpm]') - 1]);
      expect(speedCell).toBeGreaterThan(1225);
      expect(speedCell).toBeLessThan(1750);
      expect(cells[headers.indexOf('Trim [%]') - 1]).toBe('not available');
      expect(await library.locator('table.compare caption').textContent()).toMatch(/runs at the speed that meets it, without a trim/);
      await new User(library, join(dir, 'library')).screenshot('compare-speed-family');
    } finally {
      await library.close();
    }
    const takeoff = JSON.parse(readFileSync(files.takeoff!, 'utf8')) as { traces: { speed?: number; diameter?: number }[]; pump: { speed_rpm: number } };
    expect(takeoff.pump.speed_rpm).toBe(family.speed);
    expect(takeoff.traces.every((t) => t.speed !== undefined && t.diameter === undefined)).toBe(true);
    const set = parseCurveSetJson(readFileSync(files.curveset!, 'utf8'));
    expect(set.family).toBe('speed');
    expect(set.members.map((m) => m.speed_rpm).sort((a, b) => b - a)).toEqual(family.speeds);
    expect(set.members.every((m) => m.diameter_m === undefined && QUANTITIES.every((q) => m.curves[q]?.fit !== undefined))).toBe(true);
    // The speed-affinity check ran and passed on the four drawn heads.
    expect(set.findings.some((f) => f.code === 'affinity.summary')).toBe(true);
    expect(set.findings.filter((f) => f.code.startsWith('affinity.') && f.severity === 'fail')).toEqual([]);
    const csv = readFileSync(files.csv!, 'utf8');
    const header = csv.split('\n').find((l) => l.startsWith('speed') || l.startsWith('diameter'));
    expect(header).toMatch(/^speed \[rpm\],flow \[m3\/h\]/);
    expect(csv).not.toMatch(/diameter \[/);

    // The command line's duty check on the same curve set, the same duty.
    const cli = spawnSync(process.execPath, [join(ROOT, 'bin', 'pumpscribe.mjs'), 'duty', files.curveset!, '--flow', String(flow), '--head', String(head), '--static', String(staticHead), '--json'], { cwd: ROOT, encoding: 'utf8', timeout: 120_000 });
    expect([0, 1], cli.stderr).toContain(cli.status);
    const report = JSON.parse(cli.stdout) as { trim: { method: string; speed: number | null } };
    expect(report.trim.method).toBe('speed');
    const cliSpeed = report.trim.speed as number;
    expect(Math.abs(shownSpeed / cliSpeed - 1), `workbench ${shownSpeed} rpm against the command line's ${cliSpeed.toFixed(1)} rpm`).toBeLessThan(0.005);
    expect(Math.abs(cliSpeed / exactSpeed - 1)).toBeLessThan(0.005);

    // A reload brings back every trace with every captured point.
    const before = await state<string>(page, 'JSON.stringify(wb.store.draft.traces.map((t) => ({ id: t.id, quantity: t.quantity, speed: t.speed, diameter: t.diameter, points: t.points ?? t.captured })))');
    await state<Promise<void>>(page, 'wb.autosave.flush()');
    await page.reload();
    await page.waitForSelector('#restore-yes', { timeout: 30_000 });
    await user.click(page.locator('#restore-yes'), 'restore the kept work');
    await page.waitForFunction(() => /^Restored /.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 60_000 });
    await settle(page);
    const after = await state<string>(page, 'JSON.stringify(wb.store.draft.traces.map((t) => ({ id: t.id, quantity: t.quantity, speed: t.speed, diameter: t.diameter, points: t.points ?? t.captured })))');
    expect(after).toBe(before);
    expect(await state<string>(page, 'wb.store.draft.family')).toBe('speed');
    const target = await state<{ lines: string; diameter?: number }>(page, 'wb.store.session.target');
    expect(target.diameter).toBeUndefined();
    await user.click(page.locator('#step-review'), 'step 4 after the reload');
    await settle(page);
    expect(await state<number>(page, 'wb.derived.fits.length')).toBe(16);
    await user.screenshot('after-reload');
    writeFileSync(join(dir, 'figures.json'), `${JSON.stringify({ flow, head, staticHead, exactSpeed, shownSpeed, cliSpeed, npsh3, extraGuides, actions: user.actions, log: user.log }, null, 2)}\n`);
  });

  it('restores a speed take-off the version 2 workbench kept, with its speed target and its points', async () => {
    // The record the version 2 workbench kept of this sheet (tests/ui/fixtures), laid down in a fresh profile.
    const v2 = JSON.parse(readFileSync(join(ROOT, 'tests', 'ui', 'fixtures', 'autosave-v2-speed-sheet.json'), 'utf8')) as { sheetKey: string; draft: { traces: { id: string; captured: unknown[] }[] }; target: unknown };
    // Kept half-way: the next click was the 1575 rpm head curve, which version 2 wrote as a diameter.
    const record = { ...v2, target: { quantity: 'head', lines: 'diameter', diameter: 1575 } };
    const fresh = await openBrowser();
    try {
      const page = fresh.page;
      // The library page does not open the workbench's storage, so the old record can be laid down first.
      await page.goto(`${live.server.url}#/library`);
      await page.evaluate(async ({ record, b64 }) => {
        const data = Uint8Array.from(atob(b64), (c) => c.charCodeAt(0));
        await new Promise<void>((resolve, reject) => {
          const req = indexedDB.open('pumpscribe-workbench', 2);
          req.onupgradeneeded = () => {
            req.result.createObjectStore('documents', { keyPath: 'id' });
            req.result.createObjectStore('sheets', { keyPath: 'key' });
          };
          req.onerror = () => reject(req.error);
          req.onsuccess = () => {
            const db = req.result;
            const tx = db.transaction(['documents', 'sheets'], 'readwrite');
            tx.objectStore('documents').put(record);
            // The same invented sheet, printed again (the PDF's bytes differ by its creation date only).
            tx.objectStore('sheets').put({ key: record.sheetKey, name: 'invented-speed-sheet.pdf', mime: 'application/pdf', bytes: data.buffer });
            tx.oncomplete = () => { db.close(); resolve(); };
            tx.onerror = () => reject(tx.error);
          };
        });
      }, { record, b64: readFileSync(pdfPath).toString('base64') });
      await page.goto(`${live.server.url}#/`);
      await page.reload();
      await page.waitForSelector('#restore-yes', { timeout: 30_000 });
      await page.click('#restore-yes');
      await page.waitForFunction(() => /^Restored /.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 60_000 });
      await settle(page);
      const restored = await state<{ family: string; traces: { id: string; speed?: number; captured?: unknown[] }[]; target: unknown }>(page, '({ family: wb.store.draft.family, traces: wb.store.draft.traces, target: wb.store.session.target })');
      expect(restored.family).toBe('speed');
      expect(restored.traces.map((t) => [t.id, t.speed, t.captured])).toEqual(v2.draft.traces.map((t) => [t.id, (t as { speed?: number }).speed, t.captured]));
      expect(restored.target).toEqual({ quantity: 'head', lines: 'curve', speed: 1575 });
      expect(await page.getByRole('group', { name: 'Speed to trace next' }).locator('[aria-pressed="true"]').textContent()).toBe('1575 rpm (90 %) ✓');
      const user = new User(page, join(dir, 'version-2'));
      await user.screenshot('restored-version-2-record');
    } finally {
      await fresh.close();
    }
  });
});
