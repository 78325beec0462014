/** `pumpscribe export <set> --format csv|json`: tables and unit-converted views. */
import type { Command } from 'commander';
import { curveSetToCsv } from '../../export/csvTable.ts';
import { curveSetView } from '../../export/jsonView.ts';
import { presetNamed } from '../../units/index.ts';
import { EXIT_OK, InputError, runCommand } from '../errors.ts';
import { readCurveSet, writeTextAtomic } from '../io.ts';

interface ExportOptions {
  format: string;
  units?: string;
  points: string;
  output?: string;
}

export function register(program: Command): void {
  program
    .command('export')
    .description('write a curve set as a CSV table or as JSON in chosen units (stdout unless -o)')
    .argument('<set>', 'curve set (*.curveset.json)')
    .requiredOption('--format <format>', 'csv or json')
    .option('--units <system>', 'si or us (default: the units the set was captured in)')
    .option('--points <n>', 'flows per curve in the CSV table', '21')
    .option('-o, --output <file>', 'file to write')
    .action((file: string, options: ExportOptions) => runCommand(() => exportSet(file, options)));
}

function exportSet(file: string, o: ExportOptions): number {
  if (o.units) presetNamed(o.units);
  const set = readCurveSet(file);
  let text: string;
  if (o.format === 'csv') {
    const points = Number(o.points);
    text = curveSetToCsv(set, { system: o.units, points });
  } else if (o.format === 'json') {
    text = `${JSON.stringify(curveSetView(set, o.units), null, 2)}\n`;
  } else {
    throw new InputError(`Unknown export format "${o.format}"; use csv or json.`);
  }
  if (o.output) writeTextAtomic(o.output, text);
  else process.stdout.write(text);
  return EXIT_OK;
}
