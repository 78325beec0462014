/** `pumpscribe build <points.csv>`: fit, check and write a curve set from a points table. */
import type { Command } from 'commander';
import { basename } from 'node:path';
import { createHash } from 'node:crypto';
import { buildCurveSet, type MemberInput } from '../../fit/build.ts';
import { parsePointsTable } from '../../model/pointsTable.ts';
import { stringifyCurveSet } from '../../model/curvesetIO.ts';
import type { CurvePoint, Quantity } from '../../model/curveset.ts';
import { canonicalUnits, parseUnit, presetNamed, SG_REFERENCE_DENSITY, toSI } from '../../units/index.ts';
import { EXIT_FAILED_CHECKS, EXIT_OK, InputError, runCommand } from '../errors.ts';
import { positiveOption, readText, writeTextAtomic } from '../io.ts';
import { formatReport } from '../report.ts';

interface BuildOptions {
  output: string;
  units: string;
  speed: string;
  flow?: string;
  head?: string;
  power?: string;
  npsh?: string;
  diameter?: string;
  sg?: string;
  name?: string;
  maker?: string;
  model?: string;
  quiet?: boolean;
}

export function register(program: Command): void {
  program
    .command('build')
    .description('fit, check and write a curve set from a points table (quantity,diameter,flow,value; efficiency in %)')
    .argument('<points.csv>', 'points table')
    .requiredOption('-o, --output <file>', 'curve set to write (*.curveset.json)')
    .requiredOption('--speed <rpm>', 'rated speed of the sheet, rpm')
    .option('--units <system>', 'unit system of the table: si or us', 'us')
    .option('--flow <unit>', 'flow unit (gpm, m3/h, L/s, L/min, m3/s)')
    .option('--head <unit>', 'head unit (ft, m)')
    .option('--power <unit>', 'power unit (hp, kW, W)')
    .option('--npsh <unit>', 'NPSHr unit (ft, m)')
    .option('--diameter <unit>', 'impeller diameter unit (in, mm)')
    .option('--sg <number>', 'specific gravity of the liquid the sheet is drawn for', '1')
    .option('--name <text>', 'pump name', 'Unnamed pump')
    .option('--maker <text>', 'maker, as free text')
    .option('--model <text>', 'model, as free text')
    .option('-q, --quiet', 'print nothing but errors')
    .action((file: string, options: BuildOptions) => runCommand(() => build(file, options)));
}

function build(file: string, o: BuildOptions): number {
  const speed = positiveOption(o.speed, '--speed') as number;
  const sg = positiveOption(o.sg, '--sg') as number;
  const preset = presetNamed(o.units);
  const system = canonicalUnits({
    ...preset,
    flow: o.flow ?? preset.flow,
    head: o.head ?? preset.head,
    power: o.power ?? preset.power,
    npsh: o.npsh ?? preset.npsh,
    diameter: o.diameter ?? preset.diameter,
  });
  const text = readText(file, 'points table');
  const rows = parsePointsTable(text, `The points table "${file}"`);
  const units: Record<Quantity, ReturnType<typeof parseUnit>> = {
    head: parseUnit('head', system.head),
    npshr: parseUnit('head', system.npsh),
    power: parseUnit('power', system.power),
    efficiency: parseUnit('efficiency', '%'),
  };
  const flowUnit = parseUnit('flow', system.flow);
  const diameterUnit = parseUnit('diameter', system.diameter);

  const byDiameter = new Map<number, MemberInput>();
  for (const row of rows) {
    if (row.quantity === 'efficiency' && row.value > 100) throw new InputError(`Line ${row.line}: efficiency ${row.value} is above 100; efficiency is given in %.`);
    const key = row.diameter;
    const member = byDiameter.get(key) ?? { diameter_m: toSI(row.diameter, diameterUnit), points: {} };
    byDiameter.set(key, member);
    const list = (member.points[row.quantity] ??= []);
    list.push([toSI(row.flow, flowUnit), toSI(row.value, units[row.quantity])] as CurvePoint);
    ((member.sources ??= {})[row.quantity] ??= []).push({ text: `line ${row.line}` }); // names a point the fit misses
  }

  // From a points table, a curve too short to fit is unusable input, not a finding.
  for (const [label, member] of byDiameter) {
    for (const [quantity, points] of Object.entries(member.points)) {
      const flows = new Set(points.map((p) => p[0])).size;
      if (flows < 3) throw new InputError(`The ${label} ${diameterUnit.label} ${quantity} curve has ${flows} distinct flow${flows === 1 ? '' : 's'}; at least 3 are needed for a fit. Add points to it in "${file}".`);
    }
  }

  const set = buildCurveSet({
    pump: { name: o.name ?? 'Unnamed pump', ...(o.maker ? { maker: o.maker } : {}), ...(o.model ? { model: o.model } : {}) },
    speed_rpm: speed,
    family: 'diameter',
    fluid: { name: sg === 1 ? 'water' : `liquid of SG ${sg}`, density_kg_m3: sg * SG_REFERENCE_DENSITY, specific_gravity: sg },
    display_units: { flow: system.flow, head: system.head, npsh: system.npsh, power: system.power, diameter: system.diameter },
    provenance: { points_file: basename(file), notes: [`points table sha256 ${createHash('sha256').update(text).digest('hex')}`] },
    members: [...byDiameter.values()],
  });
  writeTextAtomic(o.output, stringifyCurveSet(set));
  if (!o.quiet) process.stdout.write(`${formatReport(set)}Wrote ${o.output}\n`);
  return set.findings.some((f) => f.severity === 'fail') ? EXIT_FAILED_CHECKS : EXIT_OK;
}
