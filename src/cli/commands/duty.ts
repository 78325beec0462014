/**
 * `pumpscribe duty <set> --flow Q --head H [...]`: the duty check of one curve set — system
 * curve, operating points, trim to duty, parallel and variable speed, NPSH margin, motor and
 * energy. Inputs are in the chosen unit system (--units si|us); the report uses the same.
 * Exit 0 ok, 1 when the duty cannot be met or the NPSH margin fails, 2 for unusable input.
 */
import type { Command } from 'commander';
import { dutyCheck, type DutyCheckInput } from '../../duty/dutyCheck.ts';
import { dutyReportView } from '../../duty/reportView.ts';
import { dutyReportText } from '../../duty/reportText.ts';
import { NPSH_APPLICATIONS, type NpshApplication } from '../../duty/npshMargin.ts';
import { SERVICES, type Service } from '../../duty/cautions.ts';
import type { SiteInput } from '../../duty/site.ts';
import { presetNamed, toSI, resolveUnits, parseUnit } from '../../units/index.ts';
import { EXIT_FAILED_CHECKS, EXIT_OK, InputError, runCommand } from '../errors.ts';
import { readCurveSet } from '../io.ts';

interface DutyOptions {
  flow: string;
  head: string;
  static?: string;
  systemPoints?: string;
  systemExponent?: string;
  units: string;
  json?: boolean;
  density?: string;
  parallel?: string;
  atDiameter?: string;
  variableSpeed?: boolean;
  elevation?: string;
  sitePressure?: string;
  temperature?: string;
  vapourPressure?: string;
  suctionStatic?: string;
  suctionLoss?: string;
  application: string;
  motor?: string;
  hours?: string;
  tariff?: string;
  motorEfficiency?: string;
  driveEfficiency?: string;
  service: string;
}

export function register(program: Command): void {
  program
    .command('duty')
    .description('check a curve set against a duty point: operating points, trim, NPSH margin, motor and energy')
    .argument('<set>', 'curve set (*.curveset.json)')
    .requiredOption('--flow <Q>', 'duty flow (m³/h with --units si, gpm with --units us); the total of all pumps in parallel')
    .requiredOption('--head <H>', 'duty head (m or ft)')
    .option('--static <H0>', 'static head of the system (m or ft); the system curve is H0 + k·Q² through the duty point (default 0)')
    .option('--system-points <list>', 'system curve from a table instead, "Q:H,Q:H,…", fitted with H = Hs + k·Q^n')
    .option('--system-exponent <n>', 'hold the system-curve exponent n (default 2 through a duty point, fitted for a table)')
    .option('--units <system>', 'unit system of inputs and report: si or us', 'si')
    .option('--json', 'print the report as JSON')
    .option('--density <kg/m3>', 'density of the pumped liquid, kg/m³ (default the curve set’s liquid, or water at --temperature)')
    .option('--at-diameter <list>', 'also give operating points for these trims, "D,D,…" (mm or in)')
    .option('--parallel <n>', 'identical pumps running in parallel (default 1)')
    .option('--variable-speed', 'also find the speed that meets the duty with the full impeller')
    .option('--elevation <z>', 'site elevation (m or ft) for the standard-atmosphere pressure')
    .option('--site-pressure <p>', 'absolute pressure on the liquid surface instead (kPa or psi)')
    .option('--temperature <t>', 'liquid temperature (°C or °F; default 20 °C / 68 °F)')
    .option('--vapour-pressure <p>', 'vapour pressure of a liquid other than water (kPa or psi)')
    .option('--suction-static <z>', 'liquid surface above the impeller eye (m or ft; negative for a suction lift)')
    .option('--suction-loss <h>', 'suction losses at the duty flow per pump (m or ft), entrance loss included')
    .option('--application <kind>', `NPSH margin guidance (ANSI/HI 9.6.1): ${NPSH_APPLICATIONS.join(', ')}`, 'general')
    .option('--motor <list>', 'motor ratings: nema or iec (default nema with --units us, iec with si)')
    .option('--hours <h>', 'running hours per year, for the energy estimate')
    .option('--tariff <price>', 'electricity price per kWh, for the cost estimate')
    .option('--motor-efficiency <pct>', 'motor efficiency in % (needed with --hours)')
    .option('--drive-efficiency <pct>', 'variable-speed drive efficiency in % (default none)')
    .option('--service <kind>', `duty service: ${SERVICES.join(', ')} (fire, potable and hazardous duties add code cautions)`, 'general')
    .action((file: string, o: DutyOptions) => runCommand(() => duty(file, o)));
}

function duty(file: string, o: DutyOptions): number {
  const system = presetNamed(o.units);
  const u = resolveUnits(system);
  const set = readCurveSet(file);
  const flowSI = (v: number) => toSI(v, u.flow);
  const headSI = (v: number) => toSI(v, u.head);
  const input: DutyCheckInput = {
    flow_m3s: flowSI(num(o.flow, '--flow', 'positive')),
    head_m: headSI(num(o.head, '--head', 'positive')),
  };
  if (o.static !== undefined) input.static_head_m = headSI(num(o.static, '--static'));
  if (o.systemPoints !== undefined) input.system_points = parsePoints(o.systemPoints).map(([q, h]) => [flowSI(q), headSI(h)] as const);
  if (o.systemExponent !== undefined) input.system_exponent = num(o.systemExponent, '--system-exponent', 'positive');
  if (o.density !== undefined) input.density_kg_m3 = num(o.density, '--density', 'positive');
  if (o.parallel !== undefined) input.parallel_count = num(o.parallel, '--parallel', 'positive');
  if (o.atDiameter !== undefined) {
    input.extra_diameters_m = o.atDiameter.split(',').map((d) => toSI(num(d, '--at-diameter', 'positive'), u.diameter));
  }
  if (o.variableSpeed) input.variable_speed = true;
  input.application = oneOf(o.application, NPSH_APPLICATIONS, '--application') as NpshApplication;
  input.service = oneOf(o.service, SERVICES, '--service') as Service;
  input.motor_standard = oneOf(o.motor ?? (o.units === 'us' ? 'nema' : 'iec'), ['nema', 'iec'] as const, '--motor') as 'nema' | 'iec';

  const siteGiven = [o.elevation, o.sitePressure, o.temperature, o.vapourPressure, o.suctionStatic, o.suctionLoss].some((v) => v !== undefined);
  let temperatureAssumed = false;
  if (siteGiven) {
    temperatureAssumed = o.temperature === undefined;
    const site: SiteInput = {
      temperature_K: o.temperature === undefined ? 293.15 : toSI(num(o.temperature, '--temperature'), u.temperature),
      suction_static_m: o.suctionStatic === undefined ? 0 : headSI(num(o.suctionStatic, '--suction-static')),
      suction_loss_m: o.suctionLoss === undefined ? 0 : headSI(num(o.suctionLoss, '--suction-loss', 'non-negative')),
    };
    if (o.elevation !== undefined) site.elevation_m = toSI(num(o.elevation, '--elevation'), parseUnit('head', system.head));
    if (o.sitePressure !== undefined) site.site_pressure_Pa = toSI(num(o.sitePressure, '--site-pressure', 'positive'), u.pressure);
    if (o.vapourPressure !== undefined) site.vapour_pressure_Pa = toSI(num(o.vapourPressure, '--vapour-pressure', 'non-negative'), u.pressure);
    if (o.density !== undefined) site.density_kg_m3 = input.density_kg_m3 as number;
    input.site = site;
  }

  if (o.hours !== undefined || o.tariff !== undefined || o.motorEfficiency !== undefined) {
    if (o.hours === undefined || o.motorEfficiency === undefined) throw new InputError('The energy estimate needs both --hours and --motor-efficiency (in %); add the one that is missing.');
    input.energy = {
      hours_per_year: num(o.hours, '--hours', 'non-negative'),
      motor_efficiency: percent(o.motorEfficiency, '--motor-efficiency'),
      ...(o.tariff !== undefined ? { tariff_per_kWh: num(o.tariff, '--tariff', 'non-negative') } : {}),
      ...(o.driveEfficiency !== undefined ? { drive_efficiency: percent(o.driveEfficiency, '--drive-efficiency') } : {}),
    };
  }

  const report = dutyCheck(set, input);
  if (temperatureAssumed) report.warnings.push(`No --temperature given: the liquid is taken at 20 °C for vapour pressure and density.`);
  const view = dutyReportView(report, system, { file, pump: set.pump.name });
  process.stdout.write(o.json ? `${JSON.stringify(view, null, 2)}\n` : dutyReportText(view));
  return report.problems.length ? EXIT_FAILED_CHECKS : EXIT_OK;
}

function num(value: string, flag: string, kind: 'any' | 'positive' | 'non-negative' = 'any'): number {
  const v = Number(value.trim());
  if (value.trim() === '' || !Number.isFinite(v)) throw new InputError(`${flag} must be a number, not "${value}".`);
  if (kind === 'positive' && !(v > 0)) throw new InputError(`${flag} must be greater than zero, not ${value}.`);
  if (kind === 'non-negative' && !(v >= 0)) throw new InputError(`${flag} must be zero or more, not ${value}.`);
  return v;
}

function percent(value: string, flag: string): number {
  const v = num(value, flag, 'positive');
  if (v > 100) throw new InputError(`${flag} is a percentage and must be at most 100, not ${value}.`);
  return v / 100;
}

function oneOf<T extends string>(value: string, allowed: readonly T[], flag: string): T {
  if (!(allowed as readonly string[]).includes(value)) throw new InputError(`${flag} must be one of ${allowed.join(', ')}, not "${value}".`);
  return value as T;
}

function parsePoints(text: string): Array<[number, number]> {
  const pairs = text.split(',').map((p) => p.trim()).filter(Boolean);
  return pairs.map((pair) => {
    const parts = pair.split(':');
    if (parts.length !== 2) throw new InputError(`--system-points takes "Q:H" pairs separated by commas; "${pair}" is not one.`);
    return [num(parts[0] as string, '--system-points flow', 'non-negative'), num(parts[1] as string, '--system-points head')];
  });
}
