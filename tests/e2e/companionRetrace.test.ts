/**
 * A head curve traced after the same impeller's efficiency curve, in the workbench, on an
 * INVENTED random-bed scan (scripts/randomSheets, seed 105, guides where each line stands alone):
 * the 12 in efficiency curve runs among the others of its colour family, and traced before its
 * head curve it has no head colour to lean on. Once the head curve is traced, the efficiency curve
 * is traced again with the head curve's colour, and its points are then the ones the headless
 * replay of the same take-off gives it, so the workbench's curve set and `pumpscribe takeoff` agree.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { applyH } from '../../scripts/randomSheets/camera.ts';
import { makeRandomSheet, withCarefulGuides } from '../../scripts/randomSheets/randomSheet.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { loadImageRasterNode } from '../../src/digitize/loaders/imageNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { distanceToLine } from '../digitize/fixtures/bedTrace.ts';
import { ARTIFACTS, settle, User, workbenchForFile } from './harness.ts';

const dir = join(ARTIFACTS, 'companion-retrace');
const live = workbenchForFile(dir);

interface Wb {
  store: { draft: { traces: { id: string; captured?: [number, number][]; points?: [number, number][] }[] } };
}
function wb<T>(page: Page, read: (w: Wb) => T): Promise<T> {
  return page.evaluate((code) => new Function('w', `return (${code})(w);`)((window as unknown as { pumpscribe: () => Wb }).pumpscribe()), read.toString()) as Promise<T>;
}
const pointsOf = (page: Page, id: string) => page.evaluate((id) => {
  const t = (window as unknown as { pumpscribe: () => Wb }).pumpscribe().store.draft.traces.find((x) => x.id === id);
  return t?.points ?? t?.captured ?? [];
}, id);

describe('a head curve traced after its efficiency curve', () => {
  it('traces the efficiency curve again with the head curve\'s colour, as the replay does', async () => {
    const s = await makeRandomSheet(105, 'scan');
    const full = withCarefulGuides(s.takeoff, 105, 'scan');
    const head = full.traces.find((t) => t.id === 'head-12')!;
    const sheetPath = join(dir, full.sheet);
    writeFileSync(sheetPath, s.jpeg);
    const withoutHead = join(dir, 'without-head.takeoff.json');
    writeFileSync(withoutHead, JSON.stringify({ ...full, traces: full.traces.filter((t) => t.id !== 'head-12') }, null, 2));

    // What the headless replay of the whole take-off gives the efficiency curve.
    const raster = await loadImageRasterNode(s.jpeg);
    const replay = await replayTakeoff(parseTakeoff(full), imageSheet(raster, '0'.repeat(64), () => raster));
    const replayed = replay.traces.find((t) => t.id === 'efficiency-12')!.points.map((p) => [p[0], p[1]] as [number, number]);
    const drawn = s.plan.lines.find((l) => l.id === 'efficiency-12')!.points.map((p) => applyH(s.shot.h, p));
    const width = s.plan.lines.find((l) => l.id === 'efficiency-12')!.style.width;
    const off = (points: readonly (readonly [number, number])[]) => points.filter((p) => distanceToLine(drawn, p) > Math.max(2, width)).length / Math.max(1, points.length);

    const page = live.browser.page;
    const user = new User(page, dir);
    await page.goto(live.server.url);
    await page.click('#step-load');
    await page.setInputFiles('#sheet-file', [sheetPath, withoutHead]);
    await page.waitForFunction(() => /^Opened /.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 120_000 });
    await page.waitForFunction(() => ((window as unknown as { pumpscribe: () => Wb }).pumpscribe().store.draft.traces.find((t) => t.id === 'efficiency-12')?.captured?.length ?? 0) > 1, null, { timeout: 120_000 });
    await settle(page);
    const before = await pointsOf(page, 'efficiency-12');
    // Without its head curve the efficiency trace leaves its line for the bunch.
    expect(off(before)).toBeGreaterThan(0.2);

    await page.click('#step-trace');
    await settle(page);
    await page.locator('.stage').focus();
    await page.click('[data-key="d-12"]');
    await user.clickSheet(head.guides![0]!, 'the head curve of 12 in');
    await page.waitForFunction(() => /Traced again with the head curve's colour/.test(document.querySelector('#message')?.textContent ?? ''), null, { timeout: 60_000 });
    for (const g of head.guides!.slice(1)) {
      await user.clickSheet(g, 'a further guide on the head curve of 12 in', { shift: true });
      await settle(page);
    }
    // The efficiency curve is traced again after each capture of the head curve (its message says
    // so when the points change); the last, with all the head curve's guides, is the replay's.
    const replayedJson = JSON.stringify(replayed.map((p) => [Math.round(p[0] * 100), Math.round(p[1] * 100)]));
    await page.waitForFunction((want) => {
      const t = (window as unknown as { pumpscribe: () => Wb }).pumpscribe().store.draft.traces.find((x) => x.id === 'efficiency-12');
      return JSON.stringify((t?.captured ?? []).map((p) => [Math.round(p[0] * 100), Math.round(p[1] * 100)])) === want;
    }, replayedJson, { timeout: 60_000 }).catch(() => undefined);
    const headGuides = await wb(page, (w) => (w.store.draft.traces.find((t) => (t as { quantity?: string }).quantity === 'head' && (t as { diameter?: number }).diameter === 12) as { guides?: unknown } | undefined)?.guides);
    expect(headGuides).toHaveLength(head.guides!.length);
    const after = await pointsOf(page, 'efficiency-12');
    await user.screenshot('efficiency-traced-again');
    expect(off(after)).toBeLessThan(0.05);
    // The points the replay gives the same take-off (the worker and Node read the JPEG alike).
    expect(after.length).toBe(replayed.length);
    after.forEach((p, i) => expect(Math.hypot(p[0] - replayed[i]![0], p[1] - replayed[i]![1])).toBeLessThan(0.01));
  }, 300_000);
});
