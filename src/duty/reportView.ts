/**
 * The duty report in display units, as plain JSON-ready data: what `pumpscribe duty --json`
 * prints and what a screen shows. Flow, head, NPSH, power and diameter in the chosen system's
 * units, efficiency and ratios in %, pressure and temperature in the system's units.
 */
import { displayOf, fromSI, parseUnit, type UnitSystem } from '../units/index.ts';
import type { DutyCheckReport } from './dutyCheck.ts';
import type { PointFigures } from './operatingPoint.ts';

export const DUTY_REPORT_FORMAT = 'pumpscribe.duty';
export const DUTY_REPORT_VERSION = 1;

type Num = number | null;

/** An operating point's figures in display units; nulls where a figure is not available. */
export interface FiguresView {
  flow: Num;
  head: Num;
  /** % */
  efficiency: Num;
  power: Num;
  npshr: Num;
  por_position: PointFigures['por_position'] | null;
  /** Q / Q_BEP in %. */
  flow_to_bep: Num;
  extrapolated: PointFigures['extrapolated'];
}

const NO_FIGURES: FiguresView = { flow: null, head: null, efficiency: null, power: null, npshr: null, por_position: null, flow_to_bep: null, extrapolated: [] };

export function dutyReportView(report: DutyCheckReport, units: UnitSystem, source: { file: string; pump: string }) {
  const flowU = parseUnit('flow', units.flow);
  const headU = parseUnit('head', units.head);
  const npshU = parseUnit('head', units.npsh);
  const powerU = parseUnit('power', units.power);
  const diaU = parseUnit('diameter', units.diameter);
  const flow = (v: number | undefined): Num => (v === undefined ? null : fromSI(v, flowU));
  const head = (v: number | undefined): Num => (v === undefined ? null : fromSI(v, headU));
  const npsh = (v: number | undefined): Num => (v === undefined ? null : fromSI(v, npshU));
  const power = (v: number | undefined): Num => (v === undefined ? null : fromSI(v, powerU));
  const diameter = (v: number | undefined): Num => (v === undefined ? null : fromSI(v, diaU));
  const pct = (v: number | undefined): Num => (v === undefined ? null : v * 100);
  const figures = (f: PointFigures | undefined): FiguresView =>
    f
      ? {
          flow: flow(f.flow_m3s),
          head: head(f.head_m),
          efficiency: pct(f.efficiency),
          power: power(f.power_W),
          npshr: npsh(f.npshr_m),
          por_position: f.por_position,
          flow_to_bep: pct(f.flow_to_bep),
          extrapolated: f.extrapolated,
        }
      : NO_FIGURES;
  const sys = report.system;
  const t = report.trim;
  return {
    format: DUTY_REPORT_FORMAT,
    version: DUTY_REPORT_VERSION,
    curve_set: source,
    units: { ...units, efficiency: '%' },
    result: report.problems.length ? 'fail' : 'ok',
    headline: report.headline,
    duty: { flow: flow(report.duty.flow_m3s), head: head(report.duty.head_m), parallel_count: report.parallel_count, per_pump_flow: flow(report.duty.per_pump_flow_m3s) },
    system_curve: {
      equation: 'H = Hs + k·Q^n',
      static_head: head(sys.static_head_m),
      // k in display units: H[head unit] = Hs + k·(Q[flow unit])^n
      k: (sys.k * flowU.factor ** sys.exponent) / headU.factor,
      exponent: sys.exponent,
      k_si: sys.k,
      basis: sys.basis,
      fit: sys.fit ? { rms: head(sys.fit.rms_m), max_residual: head(sys.fit.max_residual_m), points: sys.fit.points } : null,
    },
    operating_points: report.operating_points.map((op) => ({
      kind: op.kind,
      diameter: diameter(op.diameter_m),
      label: op.label,
      status: op.result.status,
      ...(op.result.status === 'ok' ? figures(op.result.point) : NO_FIGURES),
      crossings: op.result.status === 'ok' ? op.result.crossings : 0,
      message: op.result.status === 'ok' ? null : op.result.message,
      per_pump: report.parallel_count > 1 && op.per_pump ? figures(op.per_pump) : null,
    })),
    trim: {
      status: t.status,
      message: t.message,
      method: t.method,
      diameter: diameter(t.diameter_m),
      full_diameter: diameter(t.full_diameter_m),
      diameter_ratio: pct(t.trim_ratio),
      estimate_diameter: diameter(t.estimate?.diameter_m),
      trim_limit: pct(t.trim_limit_ratio),
      below_trim_limit: t.below_trim_limit ?? null,
      below_smallest_captured: t.trim_extrapolated ?? null,
      speed: t.speed_rpm ?? null,
      ...figures(t.point),
      operating_point: report.trim_operating_point
        ? {
            status: report.trim_operating_point.status,
            message: report.trim_operating_point.status === 'ok' ? null : report.trim_operating_point.message,
            ...(report.trim_operating_point.status === 'ok' ? figures(report.trim_operating_point.point) : NO_FIGURES),
          }
        : null,
    },
    parallel: report.parallel
      ? {
          count: report.parallel.count,
          combined: { status: report.parallel.combined.status, message: report.parallel.combined.status === 'ok' ? null : report.parallel.combined.message, ...(report.parallel.combined.status === 'ok' ? figures(report.parallel.combined.point) : NO_FIGURES) },
          per_pump: report.parallel.per_pump ? figures(report.parallel.per_pump) : null,
          one_pump_alone: { status: report.parallel.single.status, message: report.parallel.single.status === 'ok' ? null : report.parallel.single.message, ...(report.parallel.single.status === 'ok' ? figures(report.parallel.single.point) : NO_FIGURES) },
        }
      : null,
    speed: report.speed
      ? report.speed.status === 'ok'
        ? { status: 'ok', message: null, speed: report.speed.speed_rpm, ratio: pct(report.speed.ratio), outside_affinity_band: report.speed.outside_affinity_band, ...figures(report.speed.point) }
        : { status: report.speed.status, message: report.speed.message, speed: null, ratio: null, outside_affinity_band: null, ...NO_FIGURES }
      : null,
    npsh: report.npsh
      ? {
          site: {
            surface_pressure: displayOf('pressure', report.npsh.site.surface_pressure_Pa, units.pressure),
            vapour_pressure: displayOf('pressure', report.npsh.site.vapour_pressure_Pa, units.pressure),
            temperature: displayOf('temperature', report.npsh.site.temperature_K, units.temperature),
            density_kg_m3: report.npsh.site.density_kg_m3,
            suction_static: npsh(report.npsh.site.suction_static_m),
            suction_loss_at_duty: npsh(report.npsh.site.suction_loss_m),
            pressure_basis: report.npsh.site.pressure_basis,
            liquid_basis: report.npsh.site.liquid_basis,
            velocity_head: 'NPSHa is total head above vapour pressure counted from the still liquid surface; the suction velocity head is inside it and not added separately. The hand method from the flange (p/ρg + v²/2g − p_v/ρg) adds v²/2g back to a flange pressure head that already lost it, so both give the same NPSHa.',
          },
          rule: { application: report.npsh.rule.application, ratio: report.npsh.rule.ratio, min_margin: npsh(report.npsh.rule.min_margin_m), nss_us: report.npsh.rule.nss_us ?? null, basis: report.npsh.rule.basis },
          points: report.npsh.points.map((p) => ({
            where: p.where,
            flow: flow(p.flow_m3s),
            npsha: npsh(p.available.npsha_m),
            pressure_head: npsh(p.available.pressure_head_m),
            npshr: npsh(p.judgement?.npsh3_m),
            margin: npsh(p.judgement?.margin_m),
            margin_ratio: p.judgement?.ratio ?? null,
            required_npsha: npsh(p.judgement?.required_npsha_m),
            verdict: p.judgement?.verdict ?? 'no-npsh3',
            npshr_extrapolated: p.npshr_extrapolated,
            message: p.judgement?.message ?? null,
          })),
          npsh3_basis: report.npsh.npsh3_basis,
          velocity_head_check: report.npsh.velocity_head ?? null,
          range: report.npsh.range
            ? {
                from_flow: flow(report.npsh.range.range_m3s[0]),
                to_flow: flow(report.npsh.range.range_m3s[1]),
                run_out_basis: report.npsh.range.run_out_basis,
                worst_flow: flow(report.npsh.range.worst.flow_m3s),
                worst_npsha: npsh(report.npsh.range.worst.available.npsha_m),
                worst_npshr: npsh(report.npsh.range.worst.judgement.npsh3_m),
                worst_margin_ratio: report.npsh.range.worst.judgement.ratio,
                worst_verdict: report.npsh.range.worst.judgement.verdict,
                cavitation_from_flow: flow(report.npsh.range.cavitation_from_m3s),
                max_eye_elevation: npsh(report.npsh.range.max_eye_elevation_m),
                npshr_extrapolated: report.npsh.range.npsh3_extrapolated,
              }
            : null,
          caution: report.npsh.caution,
        }
      : null,
    motor: report.motor
      ? {
          standard: report.motor.standard,
          rating: report.motor.selection.rating?.label ?? null,
          rating_power: power(report.motor.selection.rating?.rated_W),
          sizing_power: power(report.motor.selection.sizing_power_W),
          sizing_flow: flow(report.motor.peak_flow_m3s),
          duty_power: power(report.motor.selection.duty_power_W),
          load_at_duty: pct(report.motor.selection.load_at_duty),
          load_at_sizing: pct(report.motor.selection.load_at_sizing),
          service_factor: report.motor.selection.service_factor ?? null,
          notes: report.motor.selection.notes,
          caution: report.motor.caution,
        }
      : null,
    energy: report.energy
      ? {
          pumps: report.energy.pumps,
          shaft_power: power(report.energy.shaft_power_W),
          input_power: power(report.energy.input_power_W),
          hours_per_year: report.energy.hours_per_year,
          motor_efficiency: pct(report.energy.motor_efficiency),
          energy_kWh_per_year: report.energy.energy_kWh,
          cost_per_year: report.energy.cost ?? null,
        }
      : null,
    problems: report.problems,
    warnings: report.warnings,
    cautions: report.cautions,
  };
}

export type DutyReportView = ReturnType<typeof dutyReportView>;
