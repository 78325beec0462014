/**
 * Running the workbench in a real browser: the real server (`pumpscribe start`, which builds
 * dist/ when needed) on a random port with a fresh library, Debian's Chromium driven by
 * playwright-core with a fresh profile, and helpers that act like a user and count the actions.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Locator, type Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';

export const ROOT = join(import.meta.dirname, '..', '..');
export const ARTIFACTS = join(ROOT, 'artifacts', 'e2e');
export const CHROMIUM = process.env.PUMPSCRIBE_CHROMIUM ?? '/usr/bin/chromium';
export const CHROMIUM_FLAGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

export interface Server {
  url: string;
  stop(): Promise<void>;
}

/** Starts `pumpscribe start` on a free port with an empty library in a temporary folder. */
export async function startServer(options: { seed?: boolean } = {}): Promise<Server> {
  const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-e2e-'));
  const args = [join(ROOT, 'bin', 'pumpscribe.mjs'), 'start', '--port', '0', '--library', join(dir, 'library.sqlite'), ...(options.seed ? [] : ['--no-seed'])];
  // Its own process group, so that stopping it also stops whatever it started (the build, workers).
  const child: ChildProcess = spawn(process.execPath, args, { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'], detached: true });
  // Should the test process end without calling stop(), the server's group goes with it.
  const orphanGuard = () => {
    try {
      if (child.pid !== undefined) process.kill(-child.pid, 'SIGKILL');
    } catch {
      // Already gone.
    }
  };
  process.once('exit', orphanGuard);
  let output = '';
  const url = await new Promise<string>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`The server did not start within 240 s:\n${output}`)), 240_000);
    const read = (chunk: Buffer) => {
      output += chunk.toString();
      const m = /serving at (http:\/\/\S+?)\/?\s/.exec(output);
      if (m) {
        clearTimeout(timer);
        resolve(`${m[1]}/`);
      }
    };
    child.stdout?.on('data', read);
    child.stderr?.on('data', read);
    child.on('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`The server stopped (exit ${code}) before serving:\n${output}`));
    });
  }).catch(async (error: unknown) => {
    await stopGroup(child);
    process.off('exit', orphanGuard);
    rmSync(dir, { recursive: true, force: true });
    throw error;
  });
  return {
    url,
    async stop() {
      await stopGroup(child);
      process.off('exit', orphanGuard);
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** True while any process of the group led by `pid` is alive. */
function groupAlive(pid: number): boolean {
  try {
    process.kill(-pid, 0);
    return true;
  } catch {
    return false;
  }
}

/**
 * Stops a process started with `detached: true` and everything in its process group: SIGTERM to
 * the group, up to 5 s for all of it to end, then SIGKILL; waits until none of it is left.
 */
export async function stopGroup(child: ChildProcess): Promise<void> {
  const pid = child.pid;
  if (pid === undefined) return;
  const signal = (name: NodeJS.Signals) => {
    try {
      process.kill(-pid, name);
    } catch {
      // The group is already gone.
    }
  };
  const gone = async (ms: number) => {
    const until = Date.now() + ms;
    while (groupAlive(pid) && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
    return !groupAlive(pid);
  };
  signal('SIGTERM');
  if (await gone(5000)) return;
  signal('SIGKILL');
  if (!(await gone(5000))) throw new Error(`The server's processes (group ${pid}) did not stop after SIGKILL.`);
}

export interface Browser {
  context: BrowserContext;
  page: Page;
  downloads: string;
  close(): Promise<void>;
}

/** A fresh Chromium profile; long tasks on the main thread are recorded from the first script on. */
export async function openBrowser(): Promise<Browser> {
  if (!existsSync(CHROMIUM)) throw new Error(`Chromium was not found at ${CHROMIUM}; install it with "apt-get install -y chromium".`);
  const profile = mkdtempSync(join(tmpdir(), 'pumpscribe-chromium-'));
  const downloads = mkdtempSync(join(tmpdir(), 'pumpscribe-downloads-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: CHROMIUM_FLAGS,
    viewport: { width: 1440, height: 900 },
    acceptDownloads: true,
    downloadsPath: downloads,
  });
  await context.addInitScript(() => {
    const w = window as unknown as { __longTasks: { start: number; duration: number }[] };
    w.__longTasks = [];
    try {
      new PerformanceObserver((list) => {
        for (const e of list.getEntries()) w.__longTasks.push({ start: e.startTime, duration: e.duration });
      }).observe({ type: 'longtask', buffered: true });
    } catch {
      // No long-task timing in this browser: the test will say so.
    }
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    downloads,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
      rmSync(downloads, { recursive: true, force: true });
    },
  };
}

/** Counts what the user does: clicks, drags and typed values each count one. */
export class User {
  actions = 0;
  readonly log: string[] = [];
  private shot = 0;
  private readonly started = Date.now();

  constructor(readonly page: Page, readonly artifacts: string) {
    mkdirSync(artifacts, { recursive: true });
  }

  private count(what: string): void {
    this.actions += 1;
    this.log.push(`${this.actions}. ${what}`);
    if (process.env.PUMPSCRIBE_E2E_VERBOSE) process.stdout.write(`  ${this.actions}. ${what} (${((Date.now() - this.started) / 1000).toFixed(1)} s)\n`);
  }

  async click(target: Locator, what: string): Promise<void> {
    await target.click();
    this.count(`click ${what}`);
  }

  /** Types a value into a field and confirms it with Enter: one action. */
  async type(target: Locator, value: string, what: string): Promise<void> {
    await target.fill(value);
    await target.press('Enter');
    // The field may be gone once its value completed something (a calibrated panel folds up).
    await this.page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    this.count(`type ${what} = ${value}`);
  }

  async chooseFiles(target: Locator, files: string[], what: string): Promise<void> {
    await target.setInputFiles(files);
    this.count(`open ${what}`);
  }

  /** Screen position of a sheet point in the canvas, in page pixels. */
  async screenOf(at: readonly [number, number]): Promise<[number, number]> {
    return this.page.evaluate(([x, y]) => {
      const wb = (window as unknown as { pumpscribe: () => { canvas: { currentView: { zoom: number; offsetX: number; offsetY: number } }; stageElement: HTMLElement } }).pumpscribe();
      const v = wb.canvas.currentView;
      const box = wb.stageElement.getBoundingClientRect();
      return [box.left + x * v.zoom + v.offsetX, box.top + y * v.zoom + v.offsetY] as [number, number];
    }, [at[0], at[1]] as [number, number]);
  }

  async clickSheet(at: readonly [number, number], what: string, modifiers: { shift?: boolean; alt?: boolean } = {}): Promise<void> {
    const [x, y] = await this.screenOf(at);
    const box = await this.page.locator('.stage').boundingBox();
    if (!box || x < box.x || y < box.y || x > box.x + box.width || y > box.y + box.height) {
      throw new Error(`The point ${at.join(', ')} (${what}) is outside the sheet's view; the test must bring it into view first.`);
    }
    await this.page.mouse.move(x - 6, y - 4);
    await this.page.mouse.move(x, y, { steps: 3 });
    if (modifiers.shift) await this.page.keyboard.down('Shift');
    if (modifiers.alt) await this.page.keyboard.down('Alt');
    await this.page.mouse.down();
    await this.page.mouse.up();
    if (modifiers.alt) await this.page.keyboard.up('Alt');
    if (modifiers.shift) await this.page.keyboard.up('Shift');
    this.count(`click on the sheet: ${what}`);
  }

  async press(key: string, what: string): Promise<void> {
    await this.page.keyboard.press(key);
    this.count(`press ${key}: ${what}`);
  }

  /** Zooms in about a sheet point with the mouse wheel, as one would to click between close lines. */
  async zoomAt(at: readonly [number, number], what: string): Promise<void> {
    const [x, y] = await this.screenOf(at);
    await this.page.mouse.move(x, y);
    await this.page.mouse.wheel(0, -500);
    await this.page.waitForTimeout(200);
    this.count(`zoom in (wheel) ${what}`);
  }

  async dragSheet(from: readonly [number, number], to: readonly [number, number], what: string): Promise<void> {
    const [x0, y0] = await this.screenOf(from);
    const [x1, y1] = await this.screenOf(to);
    await this.page.mouse.move(x0, y0, { steps: 2 });
    await this.page.waitForTimeout(150); // let the snap answer arrive, as a hand would pause
    await this.page.mouse.down();
    await this.page.mouse.move((x0 + x1) / 2, (y0 + y1) / 2, { steps: 4 });
    await this.page.mouse.move(x1, y1, { steps: 4 });
    await this.page.waitForTimeout(150);
    await this.page.mouse.move(x1 + 0.2, y1, { steps: 1 });
    await this.page.mouse.up();
    this.count(`drag on the sheet: ${what}`);
  }

  async screenshot(name: string): Promise<string> {
    this.shot += 1;
    const file = join(this.artifacts, `${String(this.shot).padStart(2, '0')}-${name}.png`);
    await this.page.screenshot({ path: file });
    return file;
  }
}

/** Waits until the worker is idle and the review has caught up with the last edit. */
export async function settle(page: Page): Promise<void> {
  await page.waitForFunction(() => {
    const wb = (window as unknown as { pumpscribe: () => { store: { session: { busy: boolean; progress: unknown } }; derived: { computing: boolean } } | null }).pumpscribe();
    return !!wb && !wb.store.session.busy && wb.store.session.progress === null && !wb.derived.computing;
  }, null, { timeout: 120_000, polling: 100 });
  await page.waitForTimeout(350);
  await page.waitForFunction(() => {
    const wb = (window as unknown as { pumpscribe: () => { derived: { computing: boolean } } | null }).pumpscribe();
    return !!wb && !wb.derived.computing;
  }, null, { timeout: 120_000, polling: 100 });
}

export function cleanDir(dir: string): void {
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
}

/**
 * The workbench server and Chromium for one test file: started once before its tests (after
 * emptying `dir`, where its screenshots go) and ended after them, server and browser alike.
 */
export function workbenchForFile(dir: string, timeoutMs = 600_000): { readonly server: Server; readonly browser: Browser } {
  let server: Server | undefined;
  let browser: Browser | undefined;
  beforeAll(async () => {
    cleanDir(dir);
    server = await startServer();
    browser = await openBrowser();
  }, timeoutMs);
  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });
  return {
    get server() {
      if (!server) throw new Error('The workbench server is not started yet.');
      return server;
    },
    get browser() {
      if (!browser) throw new Error('The browser is not open yet.');
      return browser;
    },
  };
}

/**
 * Step 5 and the two downloads, as a user does them (three counted actions): the curve set and
 * the take-off file, each saved into `dir`. Returns their paths by kind.
 */
export async function saveBoth(user: User, page: Page, dir: string, timeoutMs: number): Promise<{ curveset: string; takeoff: string }> {
  await user.click(page.locator('#step-save'), 'step 5');
  const files: Record<string, string> = {};
  for (const [key, id] of [['curveset', '#download-curveset'], ['takeoff', '#download-takeoff']] as const) {
    await page.locator(id).waitFor({ state: 'visible' });
    await page.waitForFunction((sel) => !(document.querySelector(sel) as HTMLButtonElement | null)?.disabled, id, { timeout: timeoutMs });
    const [download] = await Promise.all([page.waitForEvent('download'), user.click(page.locator(id), `download ${key}`)]);
    const saved = join(dir, download.suggestedFilename());
    await download.saveAs(saved);
    files[key] = saved;
  }
  return { curveset: files.curveset as string, takeoff: files.takeoff as string };
}
