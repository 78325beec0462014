/** `pumpscribe scale <set> --speed <rpm>`: the curve set at another speed, by the affinity laws. */
import type { Command } from 'commander';
import { scaleCurveSetToSpeed } from '../../fit/affinity.ts';
import { makeFinding, sortFindings } from '../../fit/checks/finding.ts';
import { stringifyCurveSet } from '../../model/curvesetIO.ts';
import { EXIT_FAILED_CHECKS, EXIT_OK, runCommand } from '../errors.ts';
import { emitReport, positiveOption, readCurveSet, writeTextAtomic } from '../io.ts';
import { recheck } from './check.ts';
import { formatReport, reportJson } from '../report.ts';

export function register(program: Command): void {
  program
    .command('scale')
    .description('convert a curve set to another speed by the affinity laws (e.g. 60 Hz to 50 Hz)')
    .argument('<set>', 'curve set (*.curveset.json; "-" for standard input)')
    .requiredOption('--speed <rpm>', 'new speed, rpm')
    .requiredOption('-o, --output <file>', 'curve set to write ("-" for standard output)')
    .option('-q, --quiet', 'print nothing but errors')
    .option('--json', 'print the report (figures, findings) as JSON')
    .action((file: string, o: ScaleOptions) => runCommand(() => scale(file, o)));
}

/** The speed law is close to exact within ±20 % of speed (Karassik, Pump Handbook). */
const SPEED_RANGE = 0.2;

interface ScaleOptions {
  speed: string;
  output: string;
  quiet?: boolean;
  json?: boolean;
}

function scale(file: string, o: ScaleOptions): number {
  const speed = positiveOption(o.speed, '--speed') as number;
  const source = readCurveSet(file);
  const scaled = scaleCurveSetToSpeed(source, speed);
  const ratio = speed / source.speed_rpm;
  const note = `scaled from ${source.speed_rpm} rpm to ${speed} rpm by the affinity laws (Q ∝ n, H ∝ n², P ∝ n³)`;
  scaled.provenance = { ...scaled.provenance, notes: [...(scaled.provenance.notes ?? []), note] };
  let set = recheck({ ...scaled, findings: source.findings.filter((f) => f.code.startsWith('fit.')) });
  if (Math.abs(ratio - 1) > SPEED_RANGE) {
    set = {
      ...set,
      findings: sortFindings([
        ...set.findings,
        makeFinding({
          code: 'affinity.speed-range',
          severity: 'warn',
          message: `The speed changes by ${((ratio - 1) * 100).toFixed(0)} %; the affinity laws are close to exact only within ±20 % of speed. Ask the manufacturer for curves at ${speed} rpm.`,
          method: 'Affinity law for speed (Karassik, Pump Handbook)',
          figures: { speed_ratio: ratio },
        }),
      ]),
    };
  }
  writeTextAtomic(o.output, stringifyCurveSet(set));
  emitReport(o, () => reportJson(set, o.output), () => `${formatReport(set)}Wrote ${o.output === '-' ? 'the curve set to standard output' : o.output}\n`);
  return set.findings.some((f) => f.severity === 'fail') ? EXIT_FAILED_CHECKS : EXIT_OK;
}
