/**
 * `pumpscribe duty <set> --flow Q --head H [...]`: the duty check of one curve set — system
 * curve, operating points, trim to duty, parallel and variable speed, NPSH margin, motor and
 * energy. Inputs are in the chosen unit system (--units si|us); the report uses the same.
 * Exit 0 ok, 1 when the duty cannot be met or the NPSH margin fails, 2 for unusable input.
 */
import type { Command } from 'commander';
import { dutyCheck } from '../../duty/dutyCheck.ts';
import { readDutyInput, setUnitSystem, type DutyField } from '../../duty/dutyInput.ts';
import { dutyReportView } from '../../duty/reportView.ts';
import { dutyReportText } from '../../duty/reportText.ts';
import { NPSH_APPLICATIONS } from '../../duty/npshMargin.ts';
import { SERVICES } from '../../duty/cautions.ts';
import { presetNamed } from '../../units/index.ts';
import { EXIT_FAILED_CHECKS, EXIT_OK, runCommand } from '../errors.ts';
import { readCurveSet } from '../io.ts';

interface DutyOptions {
  flow: string;
  head: string;
  static?: string;
  systemPoints?: string;
  systemExponent?: string;
  units?: string;
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
    .requiredOption('--flow <Q>', 'duty flow (in the report’s units: the curve set’s own unless --units is given); the total of all pumps in parallel')
    .requiredOption('--head <H>', 'duty head (m or ft)')
    .option('--static <H0>', 'static head of the system (m or ft); the system curve is H0 + k·Q² through the duty point (default 0)')
    .option('--system-points <list>', 'system curve from a table instead, "Q:H,Q:H,…", fitted with H = Hs + k·Q^n')
    .option('--system-exponent <n>', 'hold the system-curve exponent n (default 2 through a duty point, fitted for a table)')
    .option('--units <system>', 'unit system of inputs and report: si or us (default: the curve set’s own units)')
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
  const set = readCurveSet(file);
  const system = o.units === undefined ? setUnitSystem(set.display_units) : presetNamed(o.units);
  const { input, notes } = readDutyInput(
    {
      flow: o.flow, head: o.head, static: o.static, system_points: o.systemPoints, system_exponent: o.systemExponent, density: o.density,
      parallel: o.parallel, at_diameter: o.atDiameter, variable_speed: o.variableSpeed === true, elevation: o.elevation, site_pressure: o.sitePressure,
      temperature: o.temperature, vapour_pressure: o.vapourPressure, suction_static: o.suctionStatic, suction_loss: o.suctionLoss,
      application: o.application, service: o.service, motor: o.motor, hours: o.hours, tariff: o.tariff, motor_efficiency: o.motorEfficiency, drive_efficiency: o.driveEfficiency,
    },
    system,
    FLAG_NAMES,
  );
  const report = dutyCheck(set, input);
  report.warnings.push(...notes);
  const view = dutyReportView(report, system, { file, pump: set.pump.name });
  process.stdout.write(o.json ? `${JSON.stringify(view, null, 2)}\n` : dutyReportText(view));
  return report.problems.length ? EXIT_FAILED_CHECKS : EXIT_OK;
}

const FLAG_NAMES: Partial<Record<DutyField, string>> = {
  flow: '--flow', head: '--head', static: '--static', system_points: '--system-points', system_exponent: '--system-exponent', density: '--density',
  parallel: '--parallel', at_diameter: '--at-diameter', elevation: '--elevation', site_pressure: '--site-pressure', temperature: '--temperature',
  vapour_pressure: '--vapour-pressure', suction_static: '--suction-static', suction_loss: '--suction-loss', application: '--application', service: '--service',
  motor: '--motor', hours: '--hours', tariff: '--tariff', motor_efficiency: '--motor-efficiency', drive_efficiency: '--drive-efficiency',
};
