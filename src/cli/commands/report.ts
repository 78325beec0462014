/**
 * `pumpscribe report --takeoff <file> --study <file> -o record.pdf [--paper a4|letter]`: the
 * selection record. Replays the take-off (the sheet, its calibrations, the curve set), runs the
 * study, draws the study on the sheet and writes the record PDF. Options whose curve set is of
 * another pump are listed but not drawn on the sheet.
 * Exit 0 when an option passes, 1 when none does or a curve set has a `fail` finding, 2 for unusable input.
 */
import type { Command } from 'commander';
import { renameSync, statSync, writeFileSync } from 'node:fs';
import { basename, dirname, isAbsolute, resolve } from 'node:path';
import { readFileSync } from 'node:fs';
import { ZodError } from 'zod';
import { loadSheetFileNode } from '../../digitize/loaders/sheetNode.ts';
import { replayTakeoff } from '../../digitize/takeoff.ts';
import { parseTakeoff, TakeoffError } from '../../model/takeoff.ts';
import { parseStudy } from '../../model/study.ts';
import { failingFindings } from '../../duty/trust.ts';
import { runStudy } from '../../study/runStudy.ts';
import { makeRecord, samePump } from '../../record/makeRecord.ts';
import { PAPER, type Paper } from '../../record/recordPdf.ts';
import { describeZodError, EXIT_FAILED_CHECKS, EXIT_OK, InputError, runCommand } from '../errors.ts';
import { curveSetsBeside, isStdio, readText } from '../io.ts';

interface ReportOptions {
  takeoff: string;
  study: string;
  output: string;
  paper: string;
  quiet?: boolean;
}

export function register(program: Command): void {
  program
    .command('report')
    .description('write the selection record: the study drawn on the maker\'s sheet, the ranked table, the family chart, findings, NPSH and motor, provenance (PDF)')
    .requiredOption('--takeoff <file>', 'take-off file of the sheet (*.takeoff.json)')
    .requiredOption('--study <file>', 'study file (*.study.json); curve-set paths inside it are relative to it')
    .requiredOption('-o, --output <file>', 'record to write (*.pdf; "-" for standard output)')
    .option('--paper <size>', 'paper size: a4 or letter', 'a4')
    .option('-q, --quiet', 'print nothing but errors')
    .action((o: ReportOptions) => runCommand(() => report(o)));
}

function readJson(file: string, what: string): unknown {
  const text = readText(file, what);
  try {
    return JSON.parse(text.replace(/^\uFEFF/, ''));
  } catch (error) {
    throw new InputError(`The ${what} "${file}" is not valid JSON (${(error as Error).message.replace(/\.$/, '')}); fix it in a text editor.`);
  }
}

async function report(o: ReportOptions): Promise<number> {
  if (!(o.paper in PAPER)) throw new InputError(`--paper must be "a4" or "letter", not "${o.paper}".`);
  if (isStdio(o.takeoff) || isStdio(o.study)) throw new InputError('report reads the take-off and the study from files (their sheet and curve-set paths are relative to them); give both by path.');
  let takeoff;
  try {
    takeoff = parseTakeoff(readJson(o.takeoff, 'take-off file'));
  } catch (error) {
    if (error instanceof ZodError) throw new InputError(describeZodError(error, `The take-off file "${o.takeoff}"`));
    throw error;
  }
  let study;
  try {
    study = parseStudy(readJson(o.study, 'study file'));
  } catch (error) {
    if (error instanceof ZodError) throw new InputError(describeZodError(error, `The study file "${o.study}"`));
    throw error;
  }
  const sheetPath = isAbsolute(takeoff.sheet) ? takeoff.sheet : resolve(dirname(o.takeoff), takeoff.sheet);
  const sheet = await loadSheetFileNode(sheetPath, { page: takeoff.page });
  try {
    const replay = await replayTakeoff(takeoff, sheet, { takeoffName: basename(o.takeoff), sheetFile: basename(sheetPath) });
    const sets = curveSetsBeside(o.study);
    const load = (path: string) => sets.load(path);
    const result = runStudy(study, load);
    const onSheet = (r: { option: { curveset: string } }) => samePump(load(r.option.curveset), replay.curveSet);
    if (!result.ranked.some(onSheet)) {
      throw new TakeoffError(`No option of the study uses the pump of this take-off ("${replay.curveSet.pump.name}"); point the study's "curveset" at the curve set replayed from this take-off.`);
    }
    const { pdf, overlay } = await makeRecord({
      takeoff,
      takeoffName: basename(o.takeoff),
      takeoffDate: statSync(o.takeoff).mtime.toISOString(),
      sheet: { bytes: new Uint8Array(readFileSync(sheetPath)), name: basename(sheetPath), sha256: sheet.sha256, page: sheet.page, width: sheet.width, height: sheet.height },
      calibrations: replay.calibrations,
      curveSet: replay.curveSet,
      result,
      studyFile: basename(o.study),
      onSheet,
      paper: o.paper as Paper,
      created: new Date().toISOString(),
    });
    if (isStdio(o.output)) process.stdout.write(pdf);
    else {
      const tmp = `${o.output}.${process.pid}.tmp`;
      writeFileSync(tmp, pdf);
      renameSync(tmp, o.output);
    }
    if (!o.quiet && !isStdio(o.output)) {
      for (const n of overlay.notes) process.stderr.write(`note: ${n}\n`);
      process.stderr.write(`Wrote ${o.output} (${result.ranked.length} options, ${overlay.panels.length} panels, ${o.paper}).\n`);
    }
    const setFails = [...sets.loaded(), replay.curveSet].some((s) => failingFindings(s) !== undefined);
    const noneOk = result.ranked.every((r) => r.findings.some((f) => f.severity === 'fail'));
    return setFails || noneOk ? EXIT_FAILED_CHECKS : EXIT_OK;
  } finally {
    await sheet.close();
  }
}
