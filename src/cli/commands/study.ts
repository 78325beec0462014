/**
 * `pumpscribe study <file.study.json> [--json]`: the duty study — every option of the study file
 * worked out (operating points at both static heads, efficiency, power, motor, NPSH margin at the
 * duty and at run-out, allowable eye elevation, energy, cost, life-cycle cost) and ranked.
 * Exit 0 when an option passes, 1 when none does or a curve set carries a `fail` finding,
 * 2 for unusable input (one sentence on stderr).
 */
import type { Command } from 'commander';
import { ZodError } from 'zod';
import { parseStudy } from '../../model/study.ts';
import { describeZodError } from '../../model/errors.ts';
import { runStudy } from '../../study/runStudy.ts';
import { studyUnitSystem } from '../../study/resolve.ts';
import { studyText, studyView } from '../../study/view.ts';
import { failingFindings } from '../../duty/trust.ts';
import { EXIT_FAILED_CHECKS, EXIT_OK, InputError, runCommand } from '../errors.ts';
import { curveSetsBeside, readText } from '../io.ts';

export function register(program: Command): void {
  program
    .command('study')
    .description('compare pump-and-pipe options for a duty: operating points, NPSH margin, motor, energy and life-cycle cost, ranked')
    .argument('<file>', 'study file (*.study.json); curve-set paths inside it are relative to it')
    .option('--json', 'print the result as JSON')
    .action((file: string, o: { json?: boolean }) => runCommand(() => study(file, o)));
}

function study(file: string, o: { json?: boolean }): number {
  let raw: unknown;
  try {
    raw = JSON.parse(readText(file, 'study file'));
  } catch (error) {
    if (error instanceof SyntaxError) throw new InputError(`The study file "${file}" is not valid JSON (${error.message}); fix the syntax.`);
    throw error;
  }
  let parsed;
  try {
    parsed = parseStudy(raw);
  } catch (error) {
    if (error instanceof ZodError) throw new InputError(describeZodError(error, `The study file "${file}"`));
    throw error;
  }
  const sets = curveSetsBeside(file);
  const load = (path: string) => sets.load(path);
  const result = runStudy(parsed, load);
  const view = studyView(result, studyUnitSystem(parsed), { file });
  process.stdout.write(o.json ? `${JSON.stringify(view, null, 2)}\n` : studyText(view));
  const setFails = sets.loaded().some((s) => failingFindings(s) !== undefined);
  return setFails || view.result === 'fail' ? EXIT_FAILED_CHECKS : EXIT_OK;
}
