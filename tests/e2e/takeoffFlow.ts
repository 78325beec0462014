/**
 * One complete take-off in the browser, done the way an engineer does it, from a sample sheet
 * and the positions its generator recorded (where the plot corners are, where each curve runs).
 * The driver clicks and types only what the screen asks for and counts every action.
 */
import { copyFileSync, existsSync, readFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import type { Page } from 'playwright-core';
import { settle, User } from './harness.ts';
import { efficiency, head, npshr, power, type Family } from '../../scripts/sheets/family.ts';

interface SampleAnchor { at: [number, number]; x?: number; y?: number }
interface SamplePanel { id: string; anchors: SampleAnchor[] }
interface SampleTrace { id?: string; panel: string; quantity: 'head' | 'efficiency' | 'power' | 'npshr'; diameter?: number; iso?: number; guides?: [number, number][] }
interface TruthIso { id: string; iso: number; crossings: { drawn_diameter: number; flow: number; head: number }[] }
interface TruthCurve { id: string; panel: string; quantity: SampleTrace['quantity']; diameter: number; drawn_diameter: number; factor: number; flow_range: [number, number] }
export interface Sample {
  sheetPath: string;
  truth: { family: Family; curves: TruthCurve[]; isos: TruthIso[]; panels: { id: string; y: { min: number; max: number } }[] } | null;
  takeoff: { pump: { speed_rpm: number }; units: Record<string, string>; panels: SamplePanel[]; traces: SampleTrace[] };
}

export function loadSample(takeoffPath: string): Sample {
  const takeoff = JSON.parse(readFileSync(takeoffPath, 'utf8')) as Sample['takeoff'] & { sheet: string };
  const truthPath = takeoffPath.replace(/\.takeoff\.json$/, '.truth.json');
  const truth = existsSync(truthPath) ? (JSON.parse(readFileSync(truthPath, 'utf8')) as Sample['truth']) : null;
  return { sheetPath: join(dirname(takeoffPath), takeoff.sheet), takeoff, truth };
}

const VALUE: Record<SampleTrace['quantity'], (f: Family, d: number, q: number) => number> = { head, efficiency, power, npshr };

/**
 * Where an engineer looking through the magnifier would click on a curve: exactly on it (the
 * sheet's true curve, through the panel calibration just set), at the flow where it runs
 * farthest from the other curves of its panel.
 */
async function onTheLine(page: Page, sample: Sample, t: SampleTrace, within: [number, number] = [0.1, 0.9]): Promise<{ g: [number, number]; d: number } | null> {
  const truth = sample.truth;
  if (t.iso !== undefined) return onTheIsoLine(page, sample, t);
  const curve = truth?.curves.find((c) => c.panel === t.panel && c.quantity === t.quantity && c.diameter === t.diameter);
  if (!truth || !curve) return null;
  const neighbours = truth.curves.filter((c) => c.panel === t.panel && c !== curve);
  const panelId = await state<string>(page, `wb.store.draft.panels.find(p => p.plots === ${JSON.stringify(t.quantity)})?.id`);
  const data = (c: TruthCurve, q: number): [number, number] => [q, c.factor * VALUE[c.quantity](truth.family, c.drawn_diameter, q)];
  const [q0, q1] = curve.flow_range;
  const flows = Array.from({ length: 25 }, (_, i) => q0 + (q1 - q0) * (within[0] + (within[1] - within[0]) * (i / 24)));
  const ask = flows.map((q) => [data(curve, q), ...neighbours.filter((n) => q >= n.flow_range[0] && q <= n.flow_range[1]).map((n) => data(n, q))]);
  const sheet = await page.evaluate(({ id, ask }) => {
    const wb = (window as unknown as { pumpscribe: () => { derived: { calibrations: Map<string, { ok: boolean; calibration: { toSheet(d: [number, number]): [number, number] } }> } } }).pumpscribe();
    const cal = wb.derived.calibrations.get(id);
    if (!cal?.ok) return null;
    return ask.map((row) => row.map((d) => { const p = cal.calibration.toSheet(d); return [p[0], p[1]] as [number, number]; }));
  }, { id: panelId, ask });
  if (!sheet) return null;
  let best: { g: [number, number]; d: number } | null = null;
  for (const row of sheet) {
    const [g, ...others] = row as [[number, number], ...[number, number][]];
    const d = others.reduce((m, o) => Math.min(m, Math.hypot(o[0] - g[0], o[1] - g[1])), Infinity);
    if (!best || d > best.d) best = { g, d };
  }
  return best;
}

const PANEL_PLOTS: Record<string, string> = { head: 'head', efficiency: 'efficiency', power: 'power', npsh: 'npshr', npshr: 'npshr' };
const PLOTS_BUTTON: Record<string, string> = { head: 'Head', efficiency: 'Efficiency', power: 'Power', npshr: 'NPSHr' };

async function state<T>(page: Page, read: string): Promise<T> {
  return page.evaluate((code) => {
    const wb = (window as unknown as { pumpscribe: () => unknown }).pumpscribe();
    return new Function('wb', `return (${code});`)(wb);
  }, read) as Promise<T>;
}

async function waitMessage(page: Page, pattern: RegExp, timeout = 60_000): Promise<string> {
  await page.waitForFunction((src) => new RegExp(src).test(document.querySelector('#message')?.textContent ?? ''), pattern.source, { timeout, polling: 100 });
  return (await page.textContent('#message')) ?? '';
}

/** The plot corners of a sample panel: the anchors at the smallest and largest values. */
function corners(panel: SamplePanel): { topLeft: [number, number]; bottomRight: [number, number]; values: { x0: number; x1: number; y0: number; y1: number } } {
  const xs = panel.anchors.map((a) => a.x ?? 0);
  const ys = panel.anchors.map((a) => a.y ?? 0);
  const x0 = Math.min(...xs);
  const x1 = Math.max(...xs);
  const y0 = Math.min(...ys);
  const y1 = Math.max(...ys);
  const find = (x: number, y: number) => panel.anchors.find((a) => a.x === x && a.y === y)?.at;
  const tl = find(x0, y1);
  const br = find(x1, y0);
  if (!tl || !br) throw new Error(`Sample panel ${panel.id} has no anchors at its corners.`);
  return { topLeft: tl, bottomRight: br, values: { x0, x1, y0, y1 } };
}

export interface FlowResult {
  actions: number;
  log: string[];
  screenshots: string[];
  downloads: { takeoff: string; curveset: string; csv: string };
  findings: string[];
  longTasks: { start: number; duration: number }[];
  traceWindow: [number, number];
}

/** Runs the five steps on a sample; returns what was counted and where the files went. */
export interface FlowOptions {
  reloadMidway?: (user: User) => Promise<void>;
  /**
   * How curves are clicked on a scan: 'guides' places the sample's own guides (one click, then
   * Shift-click each further one); 'line' clicks once exactly on the true line. Vector sheets
   * are always clicked once on the line.
   */
  scanClicks?: 'guides' | 'line';
  /** Values for the duty check of the review, by field id, filled after the export. */
  duty?: Record<string, string>;
}

export async function runTakeoff(page: Page, url: string, sample: Sample, artifacts: string, options: FlowOptions = {}): Promise<FlowResult> {
  const user = new User(page, artifacts);
  const shots: string[] = [];
  await page.goto(url);
  await page.waitForSelector('#sheet-file', { state: 'attached' });
  shots.push(await user.screenshot('start'));

  // 1. Load the sheet.
  await user.chooseFiles(page.locator('#sheet-file'), [sample.sheetPath], basename(sample.sheetPath));
  await waitMessage(page, /^Loaded /);
  await settle(page);
  const units = sample.takeoff.units;
  const drawnIn = await state<Record<string, string>>(page, 'wb.store.draft.units');
  shots.push(await user.screenshot('1-sheet-loaded'));

  const vector = await state<boolean>(page, "wb.sheet && wb.sheet.loadedKind === 'vector-pdf'");

  // 2. Set the axes, panel by panel.
  if (!(await page.locator('#step-axes-body').isVisible())) await user.click(page.locator('#step-axes'), 'step 2');
  if (units.flow === 'gpm' && drawnIn.flow !== 'gpm') {
    await user.click(page.getByRole('button', { name: /^US \(/ }), 'units on the sheet: US');
  }
  for (const [i, panel] of sample.takeoff.panels.entries()) {
    const plots = PANEL_PLOTS[panel.id] ?? 'head';
    const framePlots = await state<string>(page, 'wb.store.session.framePlots');
    const drawing = await state<boolean>(page, 'wb.store.session.drawingFrame');
    // On a vector sheet the title beside the frame names the panel; on a scan, choose it.
    if (!drawing || (!vector && framePlots !== plots)) {
      await user.click(page.getByRole('group', { name: 'What the new panel plots' }).getByRole('button', { name: PLOTS_BUTTON[plots] as string, exact: true }), `new ${plots} panel`);
    }
    const c = corners(panel);
    const before = await state<number>(page, 'wb.store.draft.panels.length');
    await user.dragSheet(c.topLeft, c.bottomRight, `frame of the ${plots} panel`);
    await page.waitForFunction((n) => (window as unknown as { pumpscribe: () => { store: { draft: { panels: unknown[] } } } }).pumpscribe().store.draft.panels.length > n, before, { timeout: 20_000 });
    const id = await state<string>(page, 'wb.store.draft.panels[wb.store.draft.panels.length - 1].id');
    const made = await state<string>(page, 'wb.store.draft.panels[wb.store.draft.panels.length - 1].plots');
    if (made !== plots) await user.click(page.locator(`#${id}-plots`), 'panel plots select').then(() => page.selectOption(`#${id}-plots`, plots));
    const proposal = page.locator(`#use-proposal-${id}`);
    // On a vector page the anchors read from the text are offered a moment after the frame is drawn.
    if (vector) await proposal.waitFor({ state: 'visible', timeout: 20_000 }).catch(() => undefined);
    else await page.waitForTimeout(200);
    if (await proposal.isVisible()) {
      await user.click(proposal, `use the proposed anchors of the ${plots} panel`);
    } else {
      // Type the values of the corner anchors that are still blank.
      const anchors = await state<{ label?: string; x?: number; y?: number }[]>(page, `wb.store.draft.panels.find(p => p.id === ${JSON.stringify(id)}).anchors`);
      const want: Record<string, number> = { 'x left': c.values.x0, 'x right': c.values.x1, 'y bottom': c.values.y0, 'y top': c.values.y1 };
      for (const [k, a] of anchors.entries()) {
        if (a.x !== undefined || a.y !== undefined) continue;
        const value = want[a.label ?? ''];
        if (value === undefined) continue;
        await user.type(page.locator(`#anchor-${id}-${k}`), String(value), `${plots} panel ${a.label}`);
      }
    }
    await settle(page);
    const ok = await state<boolean>(page, `!!wb.derived.calibrations.get(${JSON.stringify(id)})?.ok`);
    if (!ok) throw new Error(`The ${plots} panel did not calibrate: ${await state<string>(page, `wb.derived.calibrations.get(${JSON.stringify(id)})?.reason`)}`);
    if (i === 0) shots.push(await user.screenshot('2-axes-first-panel'));
  }
  shots.push(await user.screenshot('2-axes-set'));

  // 3. Trace the curves.
  await user.click(page.locator('#step-trace'), 'step 3');
  if ((await state<number>(page, 'wb.store.draft.pump.speed_rpm')) !== sample.takeoff.pump.speed_rpm) {
    await user.type(page.locator('#pump-speed'), String(sample.takeoff.pump.speed_rpm), 'speed');
  }
  const diameters = sample.takeoff.traces.flatMap((t) => (t.diameter !== undefined ? [t.diameter] : []));
  const wanted = [...new Set(diameters)].sort((a, b) => b - a);
  if ((await page.inputValue('#diameters')).trim().split(/\s+/).map(Number).join() !== wanted.join()) {
    await user.type(page.locator('#diameters'), wanted.join(' '), 'diameters');
  }
  const t0 = await page.evaluate(() => performance.now());
  const order: SampleTrace['quantity'][] = ['head', 'efficiency', 'power', 'npshr'];
  const traces = [...sample.takeoff.traces].sort((a, b) => order.indexOf(a.quantity) - order.indexOf(b.quantity) || (a.iso ?? 0) - (b.iso ?? 0) || (b.diameter ?? 0) - (a.diameter ?? 0));
  let reloaded = false;
  let zoomedIn = false;
  for (const [n, t] of traces.entries()) {
    const target = await state<{ quantity: string; lines: string; diameter?: number; iso?: number }>(page, 'wb.store.session.target');
    const panelPlots = PANEL_PLOTS[t.panel] ?? t.panel;
    if (t.iso !== undefined) {
      if (target.lines !== 'iso' || target.quantity !== t.quantity) await user.click(page.getByRole('group', { name: 'Quantity to trace next' }).getByRole('button', { name: PLOTS_BUTTON[t.quantity] as string, exact: true }), `trace ${t.quantity} next`);
      if ((await state<{ iso?: number }>(page, 'wb.store.session.target')).iso !== t.iso) await user.type(page.locator('#iso-value'), String(t.iso), 'value of the iso-line');
    } else {
      const sameQuantity = target.quantity === t.quantity || panelPlots === t.quantity;
      if (!sameQuantity) await user.click(page.getByRole('group', { name: 'Quantity to trace next' }).getByRole('button', { name: PLOTS_BUTTON[t.quantity] as string, exact: true }), `trace ${t.quantity} next`);
      const now = await state<{ quantity: string; diameter?: number }>(page, 'wb.store.session.target');
      // A click in another panel switches to its quantity by itself; only a wrong diameter needs a click.
      const willBe = now.quantity === t.quantity ? now.diameter : await state<number | undefined>(page, `wb.store.draft.diameters.find(d => !wb.store.draft.traces.some(x => x.quantity === ${JSON.stringify(t.quantity)} && x.iso === undefined && x.diameter === d))`);
      if (willBe !== t.diameter) await user.click(page.getByRole('group', { name: 'Diameter to trace next' }).getByRole('button', { name: new RegExp(`^${t.diameter} `) }), `diameter ${t.diameter}`);
    }
    // On a vector sheet one click on the line captures it exactly: click where it runs clear of
    // the lines already traced. On a scan, place the guides the sample's author placed (one
    // click, then Shift-click for each further guide), so the tracer is steadied as intended.
    const sampleGuides = t.guides ?? [];
    const once = vector || options.scanClicks === 'line';
    const clear = once ? ((await onTheLine(page, sample, t)) ?? (await clearestGuide(page, sampleGuides))) : await clearestGuide(page, sampleGuides);
    if (!clear) continue;
    const guide = clear.g;
    const zoom = await state<number>(page, 'wb.canvas.currentView.zoom');
    // Traced lines catch a click within 4 screen pixels: closer than twice that, zoom in first.
    if ((await distanceToTraced(page, guide)) * zoom < 8) {
      await user.zoomAt(guide, `near ${t.quantity} ${t.diameter ?? t.iso}`);
      zoomedIn = true;
    } else if (zoomedIn) {
      await user.click(page.getByRole('button', { name: 'Fit the page (0)' }), 'fit the page again');
      zoomedIn = false;
    }
    const count = await state<number>(page, 'wb.store.draft.traces.length');
    await user.clickSheet(guide, `${t.quantity} ${t.diameter ?? `${t.iso} line`}`);
    await page.waitForFunction((k) => (window as unknown as { pumpscribe: () => { store: { draft: { traces: unknown[] }; session: { busy: boolean } } } }).pumpscribe().store.draft.traces.length > k || (document.querySelector('#message.error') !== null), count, { timeout: 60_000 }).catch(async (error: Error) => {
      await user.screenshot('failed');
      throw new Error(`No trace appeared after clicking ${t.id ?? t.quantity} at ${guide.join(', ')}; the status line said "${await page.textContent('#message')}" (${error.message})`);
    });
    const error = await page.$eval('#message', (el) => (el.classList.contains('error') ? el.textContent : null));
    if (error) throw new Error(`Tracing ${t.id ?? t.quantity} failed: ${error}`);
    await settle(page);
    if (!once) {
      const more = sampleGuides.filter((x) => x !== guide);
      if (more.length && zoomedIn) {
        // The other guides may lie outside the zoomed view: the whole page again first.
        await user.click(page.getByRole('button', { name: 'Fit the page (0)' }), 'fit the page again');
        zoomedIn = false;
      }
      for (const g of more) {
        await user.clickSheet(g, `another guide on ${t.quantity} ${t.diameter ?? t.iso}`, { shift: true });
        await settle(page);
      }
    }
    if (n === 0) shots.push(await user.screenshot('3-first-trace'));
    if (!reloaded && options.reloadMidway && n === Math.floor(traces.length / 2)) {
      reloaded = true;
      await options.reloadMidway(user);
    }
  }
  const t1 = await page.evaluate(() => performance.now());
  shots.push(await user.screenshot('3-traced'));

  // 4. Review.
  await user.click(page.locator('#step-review'), 'step 4');
  await settle(page);
  await page.waitForSelector('.family-chart', { timeout: 60_000 }).catch(async () => {
    await user.screenshot('failed');
    throw new Error(`The review shows no family chart: ${await state<string>(page, 'wb.derived.problem')}`);
  });
  shots.push(await user.screenshot('4-review'));
  const findings = await page.locator('.findings .finding-text').allTextContents();
  const linked = page.locator('.findings button.finding-text').first();
  if (await linked.count()) {
    await user.click(linked, 'a finding, to see its trace');
    const picked = await state<string | null>(page, 'wb.store.session.highlightedTrace');
    if (!picked) throw new Error('Clicking a finding did not pick out its trace on the sheet.');
    shots.push(await user.screenshot('4-finding-picked'));
  }

  // 5. Save.
  await user.click(page.locator('#step-save'), 'step 5');
  const files: Record<string, string> = {};
  for (const [key, id] of [['takeoff', '#download-takeoff'], ['curveset', '#download-curveset'], ['csv', '#download-csv']] as const) {
    const [download] = await Promise.all([page.waitForEvent('download'), user.click(page.locator(id), `download ${key}`)]);
    const file = join(artifacts, download.suggestedFilename());
    await download.saveAs(file);
    files[key] = file;
  }
  shots.push(await user.screenshot('5-saved'));
  // The take-off file refers to its sheet by name: keep a copy beside it, as the engineer would.
  const sheetCopy = join(artifacts, basename(sample.sheetPath));
  if (!existsSync(sheetCopy)) copyFileSync(sample.sheetPath, sheetCopy);
  // After the capture: a duty on the family chart (not counted; the take-off is complete).
  if (options.duty) {
    await page.click('#step-review');
    for (const [id, value] of Object.entries(options.duty)) {
      if (id === 'duty-service') await page.selectOption(`#${id}`, value);
      else {
        await page.fill(`#${id}`, value);
        await page.press(`#${id}`, 'Enter');
      }
    }
    await page.waitForSelector('.duty-results', { timeout: 30_000 });
    await page.waitForSelector('.family-chart .system-curve', { timeout: 30_000 });
    shots.push(await user.screenshot('6-duty'));
  }
  const longTasks = await page.evaluate(() => (window as unknown as { __longTasks: { start: number; duration: number }[] }).__longTasks);
  return { actions: user.actions, log: user.log, screenshots: shots, downloads: files as FlowResult['downloads'], findings, longTasks, traceWindow: [t0, t1] };
}

/** A point on an iso-line halfway between two of its crossings with head curves, clear of traced lines. */
async function onTheIsoLine(page: Page, sample: Sample, t: SampleTrace): Promise<{ g: [number, number]; d: number } | null> {
  const iso = sample.truth?.isos.find((i) => i.id === t.id);
  if (!iso || iso.crossings.length < 2) return null;
  const mids: [number, number][] = [];
  // Between a crossing and the nearest crossing (in flow) on the next head curve, the line runs
  // nearly straight; across a closing loop it does not, so those pairs are not used.
  const diameters = [...new Set(iso.crossings.map((c) => c.drawn_diameter))].sort((x, y) => y - x);
  for (const a of iso.crossings) {
    const next = diameters[diameters.indexOf(a.drawn_diameter) + 1];
    const b = iso.crossings.filter((c) => c.drawn_diameter === next).sort((x, y) => Math.abs(x.flow - a.flow) - Math.abs(y.flow - a.flow))[0];
    if (b) mids.push([(a.flow + b.flow) / 2, (a.head + b.head) / 2]);
  }
  if (mids.length === 0) return null;
  const panelId = await state<string>(page, `wb.store.draft.panels.find(p => p.plots === 'head')?.id`);
  const points = await page.evaluate(({ id, mids }) => {
    const wb = (window as unknown as { pumpscribe: () => { derived: { calibrations: Map<string, { ok: boolean; calibration: { toSheet(d: [number, number]): [number, number] } }> } } }).pumpscribe();
    const cal = wb.derived.calibrations.get(id);
    return cal?.ok ? mids.map((m) => { const p = cal.calibration.toSheet(m); return [p[0], p[1]] as [number, number]; }) : null;
  }, { id: panelId, mids });
  return points ? clearestGuide(page, points) : null;
}

/** Distance from a sheet point to the nearest traced line (its polyline, not only its points). */
async function distanceToTraced(page: Page, at: [number, number]): Promise<number> {
  return page.evaluate(([x, y]) => {
    const wb = (window as unknown as { pumpscribe: () => { store: { draft: { traces: { points?: [number, number][]; captured?: [number, number][] }[] } } } }).pumpscribe();
    let best = Infinity;
    for (const t of wb.store.draft.traces) {
      const pts = t.points ?? t.captured ?? [];
      for (let i = 0; i + 1 < pts.length; i++) {
        const [ax, ay] = pts[i] as [number, number];
        const [bx, by] = pts[i + 1] as [number, number];
        const dx = bx - ax;
        const dy = by - ay;
        const len2 = dx * dx + dy * dy;
        const k = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((x - ax) * dx + (y - ay) * dy) / len2));
        best = Math.min(best, Math.hypot(x - (ax + k * dx), y - (ay + k * dy)));
      }
    }
    return best;
  }, at);
}

/** The guide farthest from every point already captured (a click away from crossings). */
async function clearestGuide(page: Page, guides: [number, number][]): Promise<{ g: [number, number]; d: number } | null> {
  if (guides.length === 0) return null;
  const taken = await state<[number, number][]>(page, 'wb.store.draft.traces.flatMap(t => t.points ?? t.captured ?? [])');
  let best: { g: [number, number]; d: number } | null = null;
  for (const g of guides) {
    const d = taken.reduce((m, p) => Math.min(m, Math.hypot(p[0] - g[0], p[1] - g[1])), Infinity);
    if (!best || d > best.d) best = { g, d };
  }
  return best;
}
