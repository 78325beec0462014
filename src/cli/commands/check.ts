/** `pumpscribe check <set>`: re-runs every check on a curve set and prints the findings. */
import type { Command } from 'commander';
import { runChecks } from '../../fit/checks/index.ts';
import { sortFindings } from '../../fit/checks/finding.ts';
import type { CurveSet } from '../../model/curveset.ts';
import { EXIT_FAILED_CHECKS, EXIT_OK, runCommand } from '../errors.ts';
import { readCurveSet } from '../io.ts';
import { CAUTION, formatFindings } from '../report.ts';

export function register(program: Command): void {
  program
    .command('check')
    .description('check a curve set (affinity, power consistency, plausibility) and print the findings; exit 1 on any fail')
    .argument('<set>', 'curve set (*.curveset.json)')
    .option('--json', 'print the findings as JSON')
    .action((file: string, options: { json?: boolean }) => runCommand(() => check(file, options)));
}

/**
 * Fit findings come from the build and take-off findings from the replay (the points and the
 * sheet are gone by now), so both are kept: an untrusted trace stays a fail; the rest are recomputed.
 */
export function recheck(set: CurveSet): CurveSet {
  const { findings, figures } = runChecks(set);
  const fromBuild = set.findings.filter((f) => f.code.startsWith('fit.') || f.code.startsWith('takeoff.'));
  return { ...set, figures, findings: sortFindings([...fromBuild, ...findings]) };
}

function check(file: string, options: { json?: boolean }): number {
  const set = recheck(readCurveSet(file));
  const failed = set.findings.some((f) => f.severity === 'fail');
  if (options.json) {
    process.stdout.write(`${JSON.stringify({ file, passed: !failed, figures: set.figures, findings: set.findings }, null, 2)}\n`);
  } else {
    const counts = (['fail', 'warn', 'note'] as const).map((s) => `${set.findings.filter((f) => f.severity === s).length} ${s}`).join(', ');
    process.stdout.write(`${set.pump.name}: ${failed ? 'FAILED' : 'passed'} (${counts})\n${formatFindings(set.findings).join('\n')}\n\n${CAUTION}\n`);
  }
  return failed ? EXIT_FAILED_CHECKS : EXIT_OK;
}
