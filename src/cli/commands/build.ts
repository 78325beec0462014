/** `pumpscribe build <points.csv>`: fit, check and write a curve set from a points table. */
import type { Command } from 'commander';
import { basename } from 'node:path';
import { createHash } from 'node:crypto';
import { buildCurveSet, type MemberInput } from '../../fit/build.ts';
import { readPointsTable } from '../../model/pointsTable.ts';
import { stringifyCurveSet } from '../../model/curvesetIO.ts';
import type { CurvePoint, Quantity } from '../../model/curveset.ts';
import { canonicalUnits, parseUnit, presetNamed, SG_REFERENCE_DENSITY, toSI } from '../../units/index.ts';
import { EXIT_FAILED_CHECKS, EXIT_OK, InputError, runCommand } from '../errors.ts';
import { emitReport, positiveOption, readText, writeTextAtomic } from '../io.ts';
import { formatReport, reportJson } from '../report.ts';
import { minFlowLimit } from '../../fit/speedFamilyLimits.ts';

interface BuildOptions {
  output: string;
  units?: string;
  speed?: string;
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
  json?: boolean;
}

export function register(program: Command): void {
  program
    .command('build')
    .description('fit, check and write a curve set from a points table (quantity,diameter,flow,value, or the columns "export --format csv" writes)')
    .argument('<points.csv>', 'points table ("-" for standard input); "," ";" or tab, decimal comma with ";" or tab')
    .requiredOption('-o, --output <file>', 'curve set to write (*.curveset.json; "-" for standard output)')
    .option('--speed <rpm>', 'rated speed of the sheet, rpm (default: "# speed [rpm]" of the table\'s header block)')
    .option('--units <system>', 'unit system of the table: si or us (needed unless the header gives every unit, like "flow [gpm]")')
    .option('--flow <unit>', 'flow unit (gpm, m3/h, L/s, L/min, m3/s)')
    .option('--head <unit>', 'head unit (ft, m)')
    .option('--power <unit>', 'power unit (hp, kW, W)')
    .option('--npsh <unit>', 'NPSHr unit (ft, m)')
    .option('--diameter <unit>', 'impeller diameter unit (in, mm)')
    .option('--sg <number>', 'specific gravity of the liquid the sheet is drawn for (default: the header block, else 1)')
    .option('--name <text>', 'pump name (default: "# pump" of the header block)')
    .option('--maker <text>', 'maker, as free text')
    .option('--model <text>', 'model, as free text')
    .option('-q, --quiet', 'print nothing but errors')
    .option('--json', 'print the report (figures, findings) as JSON')
    .action((file: string, options: BuildOptions) => runCommand(() => build(file, options)));
}

/** A number from the header block, where a decimal comma may have been used. */
function metaNumber(value: string | undefined): number | undefined {
  if (value === undefined) return undefined;
  const v = Number(value.replace(',', '.'));
  return Number.isFinite(v) && v > 0 ? v : undefined;
}

function build(file: string, o: BuildOptions): number {
  const preset = o.units !== undefined ? presetNamed(o.units) : undefined;
  const where = file === '-' ? 'on standard input' : `"${file}"`;
  const text = readText(file, 'points table');
  const table = readPointsTable(text, `The points table ${where}`);
  const rows = table.rows;

  const bySpeed = table.family === 'speed';
  // A speed family is rated at its fastest drawn speed unless told otherwise.
  const fastest = bySpeed ? Math.max(...rows.map((r) => r.speed ?? 0)) : undefined;
  const speed = positiveOption(o.speed, '--speed') ?? metaNumber(table.meta['speed [rpm]'] ?? table.meta.speed) ?? fastest;
  if (speed === undefined) throw new InputError(`Give the rated speed with --speed <rpm>; the points table ${where} does not state it.`);
  const sg = positiveOption(o.sg, '--sg') ?? metaNumber(table.meta['specific gravity']) ?? 1;

  // Units: a flag, else the table's header, else the chosen system. No silent default.
  const present = new Set(rows.map((r) => r.quantity));
  const pick = (flag: string | undefined, header: string | undefined, fromPreset: string | undefined) => flag ?? header ?? fromPreset;
  const chosen = {
    flow: pick(o.flow, table.units.flow, preset?.flow),
    diameter: pick(o.diameter, table.units.diameter, preset?.diameter),
    head: pick(o.head, table.units.head, preset?.head),
    npsh: pick(o.npsh, table.units.npshr, preset?.npsh),
    power: pick(o.power, table.units.power, preset?.power),
  };
  const needed: Array<[keyof typeof chosen, boolean]> = [
    ['flow', true],
    ['diameter', !bySpeed],
    ['head', present.has('head')],
    ['npsh', present.has('npshr')],
    ['power', present.has('power')],
  ];
  const missing = needed.filter(([k, need]) => need && chosen[k] === undefined).map(([k]) => (k === 'npsh' ? 'npshr' : k));
  if (missing.length) {
    throw new InputError(`The points table ${where} gives no unit for ${missing.join(', ')}; write units in its header (like "flow [gpm]") or give --units us or --units si.`);
  }
  if (table.units.efficiency !== undefined && table.units.efficiency.trim() !== '%') {
    throw new InputError(`The efficiency column of the points table ${where} is in "${table.units.efficiency}"; give efficiency in %.`);
  }
  const base = preset ?? presetNamed(chosen.head === 'm' || chosen.flow?.startsWith('m3') ? 'si' : 'us');
  const system = canonicalUnits({
    ...base,
    flow: chosen.flow ?? base.flow,
    head: chosen.head ?? chosen.npsh ?? base.head,
    power: chosen.power ?? base.power,
    npsh: chosen.npsh ?? chosen.head ?? base.npsh,
    diameter: chosen.diameter ?? base.diameter,
  });
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
    const key = (bySpeed ? row.speed : row.diameter) as number;
    const member = byDiameter.get(key) ?? (bySpeed ? { speed_rpm: key, points: {} } : { diameter_m: toSI(key, diameterUnit), points: {} });
    byDiameter.set(key, member);
    const list = (member.points[row.quantity] ??= []);
    list.push([toSI(row.flow, flowUnit), toSI(row.value, units[row.quantity])] as CurvePoint);
    ((member.sources ??= {})[row.quantity] ??= []).push({ text: `line ${row.line}` }); // names a point the fit misses
  }

  // From a points table, a curve too short to fit is unusable input, not a finding.
  for (const [label, member] of byDiameter) {
    for (const [quantity, points] of Object.entries(member.points)) {
      const flows = new Set(points.map((p) => p[0])).size;
      if (flows < 3) throw new InputError(`The ${label} ${bySpeed ? 'rpm' : diameterUnit.label} ${quantity} curve has ${flows} distinct flow${flows === 1 ? '' : 's'}; at least 3 are needed for a fit. Add points to it in ${where}.`);
    }
  }

  const name = o.name ?? table.meta.pump ?? 'Unnamed pump';
  const maker = o.maker ?? table.meta.maker;
  const model = o.model ?? table.meta.model;
  const set = buildCurveSet({
    pump: { name, ...(maker ? { maker } : {}), ...(model ? { model } : {}) },
    speed_rpm: speed,
    family: bySpeed ? 'speed' : 'diameter',
    fluid: { name: sg === 1 ? 'water' : `liquid of SG ${sg}`, density_kg_m3: sg * SG_REFERENCE_DENSITY, specific_gravity: sg },
    display_units: { flow: system.flow, head: system.head, npsh: system.npsh, power: system.power, diameter: system.diameter },
    provenance: { points_file: file === '-' ? 'standard input' : basename(file), notes: [`points table sha256 ${createHash('sha256').update(text).digest('hex')}`] },
    members: [...byDiameter.values()],
  });
  // A minimum continuous flow stated in the header block ("# minimum flow [gpm]: 120") is kept with the set.
  const minFlowKey = Object.keys(table.meta).find((k) => /^minimum flow\b/.test(k));
  const minFlowValue = minFlowKey ? metaNumber(table.meta[minFlowKey]) : undefined;
  if (minFlowKey && minFlowValue === undefined) throw new InputError(`The "${minFlowKey}" line of the points table ${where} is not a positive number; give the minimum continuous flow as a number.`);
  const limits = minFlowValue !== undefined ? minFlowLimit(toSI(minFlowValue, parseUnit('flow', /\[(.*)\]/.exec(minFlowKey as string)?.[1] ?? system.flow)), undefined) : undefined;
  if (limits) set.limits = limits;
  writeTextAtomic(o.output, stringifyCurveSet(set));
  emitReport(o, () => reportJson(set, o.output), () => `${formatReport(set)}Wrote ${o.output === '-' ? 'the curve set to standard output' : o.output}\n`);
  return set.findings.some((f) => f.severity === 'fail') ? EXIT_FAILED_CHECKS : EXIT_OK;
}
