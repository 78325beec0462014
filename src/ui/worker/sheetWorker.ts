/**
 * The sheet worker: opens the sheet, draws pages and regions, runs the tracers and the automatic
 * take-off (on scans with the browser's character reader, src/digitize/loaders/ocrBrowser.ts), so
 * that the page stays responsive while it works. Requests are answered in order.
 */
/// <reference lib="webworker" />
import type { WorkerCall, WorkerReply, Progress } from './rpc.ts';
import type { AnchorProposal, Request, Requests } from './protocol.ts';
import { proposePanels } from '../../digitize/autoCalibrate.ts';
import { openSheetSource, type SheetSource } from './sheetSource.ts';
import { openPageSession, sha256Hex, type PageSession } from './pageSession.ts';
import { captureOnPage } from './captureOnPage.ts';
import { snapToRaster, snapToStraights } from '../geometry/snap.ts';
import { replayTakeoff } from '../../digitize/takeoff.ts';
import { DETECTOR, detectSheet, detectTakeoff, givenValues } from '../../digitize/detect/detect.ts';
import { RASTER_DETECTOR, ScanDetectRefused } from '../../digitize/detect/rasterDetect.ts';
import { textReaderBrowser, type BrowserTextReader } from '../../digitize/loaders/ocrBrowser.ts';
import { parseTakeoffToDetect, TakeoffError } from '../../model/takeoff.ts';

declare const self: DedicatedWorkerGlobalScope;

let source: SheetSource | null = null;
let opened: { bytes: Uint8Array; name: string; sha256: string } | null = null;
let session: PageSession | null = null;
let proposals: Promise<AnchorProposal[]> | null = null;
/** The character reader of scans, started on the first scan detected and kept (its files come from the page's own server). */
let reader: { base: string; reader: BrowserTextReader } | null = null;

/** The reader whose files lie under `base`, with its start told as progress of the running request. */
function readerAt(base: string, progress: (p: Progress) => void): BrowserTextReader {
  if (reader?.base !== base) {
    void reader?.reader.close();
    reader = { base, reader: textReaderBrowser({ base, onStart: (fraction, what) => startProgress.current?.({ fraction: null, label: `Finding panels and curves: starting the text reader (${what}${fraction > 0 && fraction < 1 ? ` ${Math.round(fraction * 100)} %` : ''})` }) }) };
  }
  startProgress.current = progress;
  return reader.reader;
}
const startProgress: { current: ((p: Progress) => void) | null } = { current: null };

function requireSource(): SheetSource {
  if (!source) throw new Error('No sheet is open in the worker.');
  return source;
}

function requireSession(): PageSession {
  if (!session) throw new Error('No page has been read for the take-off yet.');
  return session;
}

type Handler<K extends keyof Requests> = (args: Requests[K]['args'], progress: (p: Progress) => void) => Promise<{ result: Requests[K]['result']; transfer?: Transferable[] }>;

const handlers: { [K in keyof Requests]: Handler<K> } = {
  async open(args, progress) {
    progress({ fraction: null, label: `Opening ${args.name}` });
    const bytes = new Uint8Array(args.bytes);
    const next = await openSheetSource(bytes, args.mime, args.name);
    source?.close();
    await session?.close().catch(() => undefined);
    session = null;
    source = next;
    opened = { bytes, name: args.name, sha256: await sha256Hex(bytes) };
    return { result: { kind: next.kind, pages: [...next.pages], sha256: opened.sha256 } };
  },
  async render(args) {
    const bitmap = await requireSource().render(args.page, args.scale, args.rect);
    return { result: { bitmap, scale: args.scale, rect: args.rect }, transfer: [bitmap] };
  },
  async thumbnail(args) {
    const s = requireSource();
    const size = s.pages[args.page - 1];
    if (!size) throw new Error(`The sheet has no page ${args.page}.`);
    const scale = args.size / Math.max(size.width, size.height);
    const bitmap = await s.render(args.page, scale, [0, 0, size.width, size.height]);
    return { result: { bitmap }, transfer: [bitmap] };
  },
  async prepare(args, progress) {
    const s = requireSource();
    if (!opened) throw new Error('No sheet is open in the worker.');
    progress({ fraction: 0.1, label: `Reading page ${args.page}` });
    await session?.close().catch(() => undefined);
    session = null;
    const next = await openPageSession(opened.bytes, s.kind, args.page, opened.name, opened.sha256);
    session = next;
    proposals = null;
    progress({ fraction: 0.5, label: 'Reading the drawn lines and text' });
    const [paths, texts] = await Promise.all([next.sheet.paths(), next.sheet.text()]);
    if (next.sheet.kind === 'vector-pdf') await next.lines();
    else {
      progress({ fraction: 0.7, label: 'Reading the picture' });
      await next.raster();
    }
    return { result: { kind: next.sheet.kind, width: next.sheet.width, height: next.sheet.height, texts: texts.length, strokes: paths.length, notes: next.notes } };
  },
  async capture(args, progress) {
    return { result: await captureOnPage(requireSession(), args, progress) };
  },
  async snap(args) {
    const s = requireSession();
    if (s.sheet.kind === 'vector-pdf') return { result: snapToStraights(await s.straights(), args.at, args.radius) };
    return { result: snapToRaster(await s.raster(), args.at, args.radius) };
  },
  async words() {
    const text = await requireSession().sheet.text();
    return { result: text.map((t) => ({ text: t.text, at: [t.at[0], t.at[1]] as const, size: t.size, width: t.width, angle: t.angle })) };
  },
  async propose() {
    const s = requireSession();
    if (s.sheet.kind !== 'vector-pdf') return { result: [] };
    proposals ??= Promise.all([s.sheet.text(), s.sheet.paths()]).then(([text, paths]) =>
      proposePanels(text, paths).map((p) => ({
        frame: p.frame,
        anchors: p.anchors.map((a) => ({ at: [a.at[0], a.at[1]] as [number, number], ...(a.x !== undefined ? { x: a.x } : {}), ...(a.y !== undefined ? { y: a.y } : {}) })),
        xScale: p.xScale,
        yScale: p.yScale,
        residual: p.calibration.maxPercentOfSpan,
      })),
    );
    return { result: await proposals };
  },
  async detect(args, progress) {
    const s = requireSession();
    progress({ fraction: 0.02, label: 'Finding panels and curves: reading the page' });
    const input = parseTakeoffToDetect(args.document);
    const scan = s.sheet.kind !== 'vector-pdf';
    const [text, paths] = scan ? [[], []] : await Promise.all([s.sheet.text(), s.sheet.paths()]);
    if (!scan) progress({ fraction: 0.3, label: `Finding panels and curves: ${paths.length} strokes, ${text.length} words` });
    try {
      // A scan is read by the same detector as in Node, with the browser's character reader; its progress goes to the status line.
      // On a scan the picture rendered for detection is the one kept for tracing (replaySheet caches it).
      const found = await detectTakeoff(input, args.document, scan ? s.replaySheet : s.sheet, scan
        ? { reader: readerAt(args.ocr, progress), progress: (fraction, what) => progress({ fraction: 0.1 + 0.85 * fraction, label: `Finding panels and curves: ${what}` }) }
        : {});
      progress({ fraction: 0.97, label: 'Finding panels and curves: labelling' });
      return { result: { panels: found.takeoff.panels, traces: found.takeoff.traces, questions: found.questions, by: scan ? RASTER_DETECTOR : DETECTOR, refused: null, ...(found.speedRead ? { speedRead: found.speedRead } : {}), sheetUnits: found.sheetUnits } };
    } catch (error) {
      // Nothing could be named: the questions still say what the detector needs to know.
      if (error instanceof ScanDetectRefused) return { result: { panels: [], traces: [], questions: [...error.questions], by: RASTER_DETECTOR, refused: error.message } };
      if (!(error instanceof TakeoffError) || scan) throw error;
      const { questions } = detectSheet(text, paths, givenValues(input), input.iso_levels, input.pump.speed_rpm);
      return { result: { panels: [], traces: [], questions, by: DETECTOR, refused: error.message } };
    } finally {
      startProgress.current = null;
    }
  },
  async replay(args, progress) {
    progress({ fraction: null, label: 'Fitting and checking the curves' });
    // Every trace is captured again from its guides, exactly as the headless replay does, so
    // that the curve set on screen is the one `pumpscribe takeoff` gives for the saved file.
    const result = await replayTakeoff(args.takeoff, requireSession().replaySheet, { sheetFile: args.sheetFile, takeoffName: args.takeoffName });
    return { result: { curveSet: result.curveSet, traces: result.traces.map((t) => ({ id: t.id, how: t.how, notes: t.notes })), traceMembers: result.traceMembers, crossings: result.crossings } };
  },
};

self.onmessage = async (event: MessageEvent<WorkerCall<Request>>) => {
  const { id, request } = event.data;
  const post = (reply: WorkerReply<unknown>, transfer: Transferable[] = []) => self.postMessage(reply, transfer);
  try {
    const handler = handlers[request.op] as Handler<typeof request.op>;
    const { result, transfer } = await handler(request.args as never, (progress) => post({ id, kind: 'progress', progress }));
    post({ id, kind: 'result', result }, transfer ?? []);
  } catch (error) {
    const e = error instanceof Error ? error : new Error(String(error));
    post({ id, kind: 'error', name: e.name, message: e.message });
  }
};
