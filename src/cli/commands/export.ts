/**
 * `pumpscribe export <set> --format csv|curve-table|json|epanet`: tables, unit-converted views
 * and a network-model fragment. The result goes to standard output unless -o names a file;
 * findings of the export (e.g. a drooping curve written from its peak) go to standard error,
 * or with --json as a JSON report.
 */
import type { Command } from 'commander';
import { curveSetToCsv, curveSetToCurveTable, type CsvOptions } from '../../export/csvTable.ts';
import { curveSetToEpanet, INP_FLOW_UNITS } from '../../export/epanet.ts';
import { curveSetView } from '../../export/jsonView.ts';
import { exportUnits } from '../../export/unitView.ts';
import type { Finding } from '../../model/curveset.ts';
import { toSI, unitChoiceNamed } from '../../units/index.ts';
import { EXIT_FAILED_CHECKS, EXIT_OK, InputError, runCommand } from '../errors.ts';
import { emitReport, positiveOption, readCurveSet, writeTextAtomic } from '../io.ts';
import { formatFindings } from '../report.ts';

interface ExportOptions {
  format: string;
  units?: string;
  points?: string;
  flowStep?: string;
  delimiter?: string;
  decimal?: string;
  meta?: boolean;
  diameter?: string;
  inpUnits?: string;
  fromNode?: string;
  toNode?: string;
  output?: string;
  json?: boolean;
  quiet?: boolean;
}

export function register(program: Command): void {
  program
    .command('export')
    .description('write a curve set as a CSV table, a curve table, JSON in chosen units, or an EPANET fragment (standard output unless -o)')
    .argument('<set>', 'curve set (*.curveset.json; "-" for standard input)')
    .requiredOption('--format <format>', 'csv (a row per flow per diameter), curve-table (a column per quantity and diameter), json, or epanet')
    .option('--units <system>', 'own (the units the set was captured in, the default), si or us')
    .option('--points <n>', 'flows of the shared flow grid (csv, curve-table: round step from zero, default 21; epanet: points per curve, default 21)')
    .option('--flow-step <q>', 'step of the shared flow grid, in the table\'s flow unit (csv, curve-table)')
    .option('--delimiter <c>', 'cell delimiter: "," ";" or tab (csv, curve-table)', ',')
    .option('--decimal <c>', 'decimal mark: "." or "," (csv, curve-table)', '.')
    .option('--no-meta', 'leave out the "#" header block (pump, speed, density, source, empty-cell reason)')
    .option('--diameter <d>', 'epanet: one trim instead of every diameter (in the set\'s diameter unit, or that of --units)')
    .option('--inp-units <word>', `epanet: the model's flow units, ${Object.keys(INP_FLOW_UNITS).join(', ')} (default: from the set's flow unit)`)
    .option('--from-node <id>', 'epanet: suction node of the [PUMPS] line', 'SUCTION')
    .option('--to-node <id>', 'epanet: discharge node of the [PUMPS] line', 'DISCHARGE')
    .option('-o, --output <file>', 'file to write ("-" or none: standard output)')
    .option('--json', 'print the export report (format, file, findings) as JSON')
    .option('-q, --quiet', 'print nothing but errors')
    .action((file: string, options: ExportOptions) => runCommand(() => exportSet(file, options)));
}

function delimiterOption(value: string | undefined): CsvOptions['delimiter'] {
  if (value === undefined || value === ',') return ',';
  if (value === ';') return ';';
  if (value === '\t' || value.toLowerCase() === 'tab' || value === '\\t') return '\t';
  throw new InputError(`The option --delimiter must be ",", ";" or tab, not "${value}".`);
}

function decimalOption(value: string | undefined): CsvOptions['decimal'] {
  if (value === undefined || value === '.') return '.';
  if (value === ',') return ',';
  throw new InputError(`The option --decimal must be "." or ",", not "${value}".`);
}

function wholeOption(value: string | undefined, flag: string): number | undefined {
  const v = positiveOption(value, flag);
  if (v !== undefined && !Number.isInteger(v)) throw new InputError(`The option ${flag} must be a whole number, not "${value}".`);
  return v;
}

function exportSet(file: string, o: ExportOptions): number {
  unitChoiceNamed(o.units); // refuses an unknown word before any file is read
  const set = readCurveSet(file);
  const output = o.output ?? '-';
  const points = wholeOption(o.points, '--points');
  let text: string;
  let findings: Finding[] = [];
  const csv: CsvOptions = {
    ...(o.units ? { system: o.units } : {}),
    ...(points !== undefined ? { points } : {}),
    ...(o.flowStep !== undefined ? { flowStep: positiveOption(o.flowStep, '--flow-step') as number } : {}),
    delimiter: delimiterOption(o.delimiter),
    decimal: decimalOption(o.decimal),
    meta: o.meta !== false,
  };
  if (o.format === 'csv') {
    text = curveSetToCsv(set, csv);
  } else if (o.format === 'curve-table') {
    text = curveSetToCurveTable(set, csv);
  } else if (o.format === 'json') {
    text = `${JSON.stringify(curveSetView(set, o.units), null, 2)}\n`;
  } else if (o.format === 'epanet') {
    const diameter = positiveOption(o.diameter, '--diameter');
    const result = curveSetToEpanet(set, {
      ...(o.inpUnits ? { flowUnits: o.inpUnits } : {}),
      ...(diameter !== undefined ? { diameter_m: toSI(diameter, exportUnits(set, o.units).diameter) } : {}),
      ...(points !== undefined ? { points } : {}),
      ...(o.fromNode ? { fromNode: o.fromNode } : {}),
      ...(o.toNode ? { toNode: o.toNode } : {}),
    });
    text = `${result.text}\n`;
    findings = result.findings;
  } else {
    throw new InputError(`Unknown export format "${o.format}"; use csv, curve-table, json or epanet.`);
  }
  writeTextAtomic(output, text);
  const where = output === '-' ? 'standard output' : output;
  emitReport(
    { ...o, output },
    () => ({ format: o.format, output: where, findings }),
    () => (findings.length ? `${formatFindings(findings).join('\n')}\n` : '') + (output === '-' ? '' : `Wrote ${where}\n`),
  );
  return findings.some((f) => f.severity === 'fail') ? EXIT_FAILED_CHECKS : EXIT_OK;
}
