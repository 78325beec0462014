/**
 * `pumpscribe takeoff <file.takeoff.json> -o <out.curveset.json>`: load the sheet, calibrate
 * the panels, capture every trace, fit, check and write the curve set.
 * `--save-points` writes the captured points back into the take-off file (field `captured` of
 * each trace, sheet coordinates) with the sheet's SHA-256, so the capture can be audited and replayed.
 */
import type { Command } from 'commander';
import { basename, dirname, isAbsolute, resolve } from 'node:path';
import { ZodError } from 'zod';
import type { TraceOutcome } from '../../digitize/takeoff.ts';
import { loadSheetFileNode } from '../../digitize/loaders/sheetNode.ts';
import { parseTakeoff, parseTakeoffToDetect, TakeoffError, TAKEOFF_FORMAT, TAKEOFF_VERSION, type Takeoff } from '../../model/takeoff.ts';
import { stringifyCurveSet } from '../../model/curvesetIO.ts';
import { describeZodError, EXIT_FAILED_CHECKS, EXIT_OK, InputError, runCommand } from '../errors.ts';
import { emitReport, isStdio, progressLine, readText, writeTextAtomic } from '../io.ts';
import { formatReport, reportJson } from '../report.ts';

interface TakeoffOptions {
  output: string;
  savePoints?: boolean;
  useCaptured?: boolean;
  quiet?: boolean;
  json?: boolean;
  detect?: boolean;
  fullResolution?: boolean;
}

export function register(program: Command): void {
  program
    .command('takeoff')
    .description('replay a take-off file: load the sheet, calibrate, capture every trace, fit, check and write the curve set')
    .argument('<file.takeoff.json>', 'take-off file ("-" for standard input; the sheet path is then relative to the working folder)')
    .requiredOption('-o, --output <file>', 'curve set to write (*.curveset.json; "-" for standard output)')
    .option('--save-points', 'write the captured points back into the take-off file (field "captured" of each trace)')
    .option('--use-captured', 'use the points saved in the take-off file instead of capturing again')
    .option('-q, --quiet', 'print nothing but errors')
    .option('--json', 'print the report (traces, figures, findings) as JSON')
    .option('--detect', 'find the panels and curves on the sheet: a vector PDF, or a scan (image or scanned PDF page, tick labels and curve labels read offline; give "diameters" when the sheet prints none); the file needs only sheet, page, pump.speed_rpm and units; what is doubtful is asked, not guessed; with --save-points the completed take-off is written back')
    .option('--full-resolution', "where the page was read at a reduced resolution on load (an image over the 40-megapixel working limit), re-trace each raster trace on the file's own pixels of its panel; a re-trace that does not agree with the working trace is not used, and its note says so")
    .action((file: string, options: TakeoffOptions) => runCommand(() => takeoff(file, options)));
}

async function takeoff(file: string, o: TakeoffOptions): Promise<number> {
  const text = readText(file, 'take-off file');
  let raw: unknown;
  try {
    raw = JSON.parse(text.replace(/^\uFEFF/, '')); // editors on some systems save a byte-order mark
  } catch (error) {
    throw new TakeoffError(`The take-off file "${file}" is not valid JSON (${(error as Error).message.replace(/\.$/, '')}); fix it in a text editor.`);
  }
  let parsed;
  try {
    parsed = o.detect ? parseTakeoffToDetect(raw) : parseTakeoff(raw);
  } catch (error) {
    if (error instanceof ZodError) throw new InputError(describeZodError(error, `The take-off file "${file}"`));
    throw error;
  }
  if (o.savePoints && isStdio(file)) throw new InputError('--save-points writes into the take-off file, which cannot be standard input; give the take-off file by its path.');
  const sheetPath = isAbsolute(parsed.sheet) ? parsed.sheet : resolve(isStdio(file) ? '.' : dirname(file), parsed.sheet);
  const progress = progressLine(!o.quiet && !o.json && process.stderr.isTTY === true && !process.env.CI);
  progress.step(`loading ${basename(sheetPath)}`);
  const notes: string[] = [];
  // The sheet is read and decoded (a JPEG on the decoder's own thread) while the take-off code loads: both at once.
  const [sheet, { replayTakeoff }] = await Promise.all([
    loadSheetFileNode(sheetPath, { page: parsed.page, onNote: (sentence) => notes.push(sentence) }),
    import('../../digitize/takeoff.ts'),
  ]);
  let ocr: typeof import('../../digitize/loaders/ocrNode.ts') | null = null;
  try {
    // Scans: tick labels and titles read by tesseract.js (src/digitize/loaders/ocrNode.ts), loaded only here.
    ocr = o.detect && sheet.kind !== 'vector-pdf' ? await import('../../digitize/loaders/ocrNode.ts') : null;
    const detected = o.detect ? await (await import('../../digitize/detect/detect.ts')).detectTakeoff(parsed, raw as Record<string, unknown>, sheet, { reader: ocr?.textReaderNode(), progress: (_, what) => progress.step(what) }) : null; // automatic take-off (src/digitize/detect), loaded only with --detect
    if (detected) [parsed, raw] = [detected.takeoff, detected.document];
    // A scan that prints a speed other than the file's pump.speed_rpm asks (the affinity checks and specific speed rest on it).
    if (detected?.speedRead) {
      const { speedDisagrees, speedMismatchSentence } = await import('../../digitize/detect/sheetSpeed.ts');
      if (speedDisagrees(detected.speedRead.rpm, parsed.pump.speed_rpm)) detected.questions.push(speedMismatchSentence(detected.speedRead, parsed.pump.speed_rpm));
    }
    for (const q of detected?.questions ?? []) process.stderr.write(`Question: ${q}\n`);
    // The questions are the detector's, shared with the workbench; how to answer them here is said once.
    if (detected && detected.questions.length > 0) process.stderr.write('To answer: give the values asked for in the take-off file ("diameters", "speeds" or "iso_levels"), or the panels and traces by hand, and run the take-off with --detect again.\n');
    parsed = parsed as Takeoff;
    progress.step(`capturing ${parsed.traces.length} trace${parsed.traces.length === 1 ? '' : 's'}, fitting and checking`);
    const result = await replayTakeoff(parsed, sheet, { takeoffName: isStdio(file) ? 'standard input' : basename(file), sheetFile: basename(sheetPath), useCaptured: o.useCaptured ?? false, fullResolution: o.fullResolution ?? false });
    progress.done();
    writeTextAtomic(o.output, stringifyCurveSet(result.curveSet));
    if (o.savePoints) writeTextAtomic(file, withCapturedPoints(raw as Record<string, unknown>, result.traces, sheet.sha256));
    const traces = result.traces.map((t) => ({ id: t.id, points: t.points.length, how: t.fromFile ? 'saved' : t.how, notes: t.notes }));
    emitReport(
      o,
      () => reportJson(result.curveSet, o.output, { sheet: { file: basename(sheetPath), kind: sheet.kind, sha256: sheet.sha256, ...(notes.length ? { notes } : {}) }, traces }),
      () => {
        const summary = traces.map((t) => `${t.id}: ${t.points} points (${t.how})`).join(', ');
        const target = isStdio(o.output) ? 'the curve set to standard output' : o.output;
        const read = notes.map((n) => `Note: ${n}\n`).join('');
        return `${formatReport(result.curveSet)}${read}Traces — ${summary}\nWrote ${target}${o.savePoints ? ` and the captured points into ${file}` : ''}\n`;
      },
    );
    return result.curveSet.findings.some((f) => f.severity === 'fail') || (detected?.questions.length ?? 0) > 0 ? EXIT_FAILED_CHECKS : EXIT_OK;
  } finally {
    progress.done();
    await ocr?.closeTextReaderNode();
    await sheet.close();
  }
}

/** The take-off document as the user wrote it, with each trace's captured points and the sheet's hash added. */
export function withCapturedPoints(raw: Record<string, unknown>, traces: readonly TraceOutcome[], sha256: string): string {
  const doc: Record<string, unknown> = { format: TAKEOFF_FORMAT, version: TAKEOFF_VERSION, ...raw, sheet_sha256: sha256 };
  const list = Array.isArray(raw.traces) ? (raw.traces as Record<string, unknown>[]) : [];
  doc.traces = list.map((trace, i) => {
    const outcome = traces.find((t) => t.index === i);
    if (!outcome) return trace;
    // 1e-4 sheet units (about 35 nm on paper) keeps the file readable and loses nothing that matters.
    const by = outcome.how === 'saved' ? {} : { captured_by: outcome.how };
    return { ...trace, captured: outcome.points.map((p) => [round4(p[0]), round4(p[1])]), ...by };
  });
  return `${JSON.stringify(doc, null, 2)}\n`;
}

function round4(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}
