/**
 * The selection record in Chromium's own PDF viewer (PDFium behind the built-in viewer), headless:
 * the records of the invented vector sample (A4) and the invented scan sample (US Letter) are
 * served from a local HTTP server as application/pdf.
 *
 * 1. Opened as a page, the record is shown in the viewer, not downloaded: the viewer reports the
 *    document loaded, with as many pages as pdf.js counts and the paper's proportions, and the
 *    record's title in its toolbar. The viewer's state is read from its own page (the pdf-viewer
 *    element); should a Chromium update rename what is read, the test fails and says so.
 * 2. Embedded in a page with <embed>, the record is driven through the messages Chromium's viewer
 *    answers to its embedder ("selectAll", "getSelectedText"): everything is selected as a user
 *    would with Ctrl+A, and the selected text holds every figure the record shows.
 */
import { createServer, type Server as HttpServer } from 'node:http';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Frame, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeRecord } from '../../src/record/makeRecord.ts';
import { PAPER, type Paper } from '../../src/record/recordPdf.ts';
import { oneLine, pdfText, shownFigures } from '../record/recordText.ts';
import { recordInput, sample } from '../record/samples.ts';
import { ARTIFACTS, cleanDir, openBrowser, type Browser } from './harness.ts';

const dir = join(ARTIFACTS, 'recordViewer');
/** Where Chromium's built-in PDF viewer lives (its fixed component id). */
const VIEWER = 'chrome-extension://mhjfbmdgcfjbbpaeojofohoefgiehjai/';

interface Served {
  name: string;
  paper: Paper;
  pdf: Uint8Array;
  figures: string[];
  title: string;
}

const records = new Map<string, Served>();
let http: HttpServer;
let base = '';
let browser: Browser;

async function made(name: string, paper: Paper): Promise<Served> {
  const s = await sample(name);
  const { pdf, overlay } = await makeRecord(recordInput(name, s, paper, 'record-viewer.study.json', '2026-01-01T00:00:00.000Z'));
  writeFileSync(join(dir, `${name}.${paper}.pdf`), pdf);
  return { name, paper, pdf, figures: shownFigures(s.result, overlay), title: `Selection record: ${s.result.study.name}` };
}

beforeAll(async () => {
  cleanDir(dir);
  for (const [name, paper] of [['si-panels-black', 'a4'], ['si-panels-colour-scan', 'letter']] as const) records.set(name, await made(name, paper));
  // A control: a file that starts like a PDF and is not one. The viewer must say it failed.
  records.set('damaged', { name: 'damaged', paper: 'a4', pdf: new TextEncoder().encode(`%PDF-1.7\n${'not a PDF body '.repeat(200)}\n%%EOF\n`), figures: [], title: '' });
  http = createServer((req, res) => {
    const url = req.url ?? '/';
    const pdf = /^\/([\w-]+)\.pdf$/.exec(url);
    const embed = /^\/embed\/([\w-]+)$/.exec(url);
    const r = records.get(pdf?.[1] ?? embed?.[1] ?? '');
    if (pdf && r) {
      res.writeHead(200, { 'Content-Type': 'application/pdf', 'Content-Length': r.pdf.length, 'Cache-Control': 'no-store' });
      res.end(r.pdf);
    } else if (embed && r) {
      // The page listens before the embed exists, so the viewer's first message is not missed.
      res.writeHead(200, { 'Content-Type': 'text/html; charset=utf-8' });
      res.end(`<!doctype html><html><head><title>record</title><script>window.__viewer = []; addEventListener('message', (e) => window.__viewer.push(e.data));</script></head>
<body style="margin:0"><embed id="record" src="/${r.name}.pdf" type="application/pdf" style="width:900px;height:1100px"></body></html>`);
    } else {
      res.writeHead(url === '/favicon.ico' ? 204 : 404);
      res.end();
    }
  });
  await new Promise<void>((resolve) => http.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(http.address() as { port: number }).port}`;
  browser = await openBrowser();
}, 300_000);

afterAll(async () => {
  await browser?.close();
  await new Promise<void>((resolve) => (http ? http.close(() => resolve()) : resolve()));
});

/** Opens a served file as a page and waits until Chromium's viewer has finished with it (or 60 s pass). */
async function openInViewer(page: Page, name: string): Promise<ViewerState | null> {
  const response = await page.goto(`${base}/${name}.pdf`);
  expect(response?.headers()['content-type']).toBe('application/pdf');
  let state: ViewerState | null = null;
  const until = Date.now() + 60_000;
  while (Date.now() < until) {
    const frame = page.frames().find((f) => f.url().startsWith(VIEWER));
    if (frame) {
      state = await viewerState(frame).catch(() => null);
      if (state && state.loadState !== 'loading' && state.loadState !== null && (state.loadState !== 'success' || state.pages.length > 0)) break;
    }
    await page.waitForTimeout(200);
  }
  return state;
}

/** Console errors and page errors of a page, as text. */
function problems(page: Page): string[] {
  const out: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error' || m.type() === 'warning') out.push(`${m.type()}: ${m.text()}`);
  });
  page.on('pageerror', (e) => out.push(`page error: ${e.message}`));
  return out;
}

interface ViewerState {
  found: boolean;
  loadState: string | null;
  pages: { width: number; height: number }[];
  title: string;
}

/** What the viewer's own page says about the document (read inside the viewer's frame). */
async function viewerState(frame: Frame): Promise<ViewerState> {
  return frame.evaluate(`(() => {
    const v = document.querySelector('pdf-viewer');
    if (!v) return { found: false, loadState: null, pages: [], title: '' };
    const dims = v.documentDimensions;
    const toolbar = v.shadowRoot && v.shadowRoot.querySelector('viewer-toolbar');
    const title = toolbar && toolbar.shadowRoot ? toolbar.shadowRoot.textContent.replace(/\\s+/g, ' ') : '';
    return { found: true, loadState: v.loadState_ === undefined ? null : String(v.loadState_), pages: dims && dims.pageDimensions ? dims.pageDimensions.map((p) => ({ width: p.width, height: p.height })) : [], title };
  })()`);
}

describe.each([
  ['si-panels-black', 'a4'],
  ['si-panels-colour-scan', 'letter'],
])("record of %s (%s) in Chromium's PDF viewer", (name, paper) => {
  it('is shown in the viewer, not downloaded: loaded, every page there, in the paper\u2019s proportions, titled', async () => {
    const r = records.get(name) as Served;
    const page = await browser.context.newPage();
    const said = problems(page);
    let downloaded = '';
    page.on('download', (d) => (downloaded = d.suggestedFilename()));
    try {
      const state = await openInViewer(page, name);
      expect(downloaded, 'Chromium downloaded the record instead of showing it').toBe('');
      expect(state, `Chromium's PDF viewer (${VIEWER}) did not open the record; frames: ${page.frames().map((f) => f.url()).join(', ')}`).not.toBeNull();
      if (!state) return;
      expect(state.found, 'the viewer page has no <pdf-viewer> element: Chromium changed its viewer; update this test').toBe(true);
      expect(state.loadState, 'the viewer did not report the document loaded').toBe('success');
      const pdfjs = await pdfText(r.pdf);
      expect(state.pages.length).toBe(pdfjs.pages);
      const [pw, ph] = PAPER[r.paper];
      // The viewer lays pages out in CSS pixels with a thin border: proportions, not sizes, within 1 %.
      for (const p of state.pages) expect(Math.abs(p.width / p.height - pw / ph) / (pw / ph)).toBeLessThan(0.01);
      expect(state.title).toContain(r.title);
      await page.screenshot({ path: join(dir, `${name}.${paper}.viewer.png`) });
      expect(said).toEqual([]);
      console.log(`Chromium's viewer: ${name} (${paper}) loaded, ${state.pages.length} pages of ${state.pages[0]?.width} × ${state.pages[0]?.height} px`);
    } finally {
      await page.close();
    }
  }, 180_000);

  it('lets the whole text be selected, and the selection holds every figure the record shows', async () => {
    const r = records.get(name) as Served;
    const page = await browser.context.newPage();
    const said = problems(page);
    try {
      await page.goto(`${base}/embed/${name}`);
      // The viewer learns who embeds it from the first message it gets; until the document is
      // loaded it may not be listening yet, so the greeting is repeated until it answers.
      await page.waitForFunction(() => {
        const w = window as unknown as { __viewer: { type?: string }[] };
        if (w.__viewer.some((m) => m?.type === 'documentLoaded')) return true;
        (document.getElementById('record') as unknown as { postMessage(m: unknown): void }).postMessage({ type: 'initialize' });
        return false;
      }, null, { timeout: 60_000, polling: 500 });
      const loaded = await page.evaluate(() => (window as unknown as { __viewer: { type?: string; load_state?: string }[] }).__viewer.find((m) => m?.type === 'documentLoaded'));
      expect(loaded?.load_state).toBe('success');
      const selected = await page.evaluate(`new Promise((resolve, reject) => {
        const embed = document.getElementById('record');
        const timer = setTimeout(() => reject(new Error('the viewer did not answer getSelectedText within 30 s')), 30000);
        addEventListener('message', (e) => {
          if (e.data && e.data.type === 'getSelectedTextReply') { clearTimeout(timer); resolve(e.data.selectedText); }
        });
        embed.postMessage({ type: 'selectAll' });
        setTimeout(() => embed.postMessage({ type: 'getSelectedText' }), 300);
      })`);
      expect(typeof selected).toBe('string');
      const text = oneLine(selected as string);
      writeFileSync(join(dir, `${name}.${paper}.selected.txt`), selected as string);
      expect(r.figures.length).toBeGreaterThan(30);
      for (const figure of r.figures) expect(text, `selected text: ${figure}`).toContain(figure);
      expect(text).toContain('a licensed professional approves');
      expect(said).toEqual([]);
      console.log(`Chromium's viewer: ${name} (${paper}) selected ${text.length} characters; all ${r.figures.length} figures found`);
    } finally {
      await page.close();
    }
  }, 180_000);
});

it("reports a damaged file as not loaded (the viewer's check can fail)", async () => {
  const page = await browser.context.newPage();
  try {
    const state = await openInViewer(page, 'damaged');
    expect(state?.found).toBe(true);
    expect(state?.loadState).toBe('failed');
  } finally {
    await page.close();
  }
}, 180_000);
