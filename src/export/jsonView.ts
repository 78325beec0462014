/**
 * The curve set converted to chosen units, for readers who want numbers they can use
 * directly. Not a curve set (that stays SI); a separate, versioned view:
 *   fit: y[unit] = Σ coefficients[i] · (Q[flow unit] / flow_scale)^i
 */
import type { Curve, CurveSet, Member, Quantity } from '../model/curveset.ts';
import type { Unit } from '../units/index.ts';
import { fromSI } from '../units/index.ts';
import { exportUnits, unitOf, type ExportUnits } from './unitView.ts';

export const VIEW_FORMAT = 'pumpscribe.curveset-view';
export const VIEW_VERSION = 1;

const lin = (v: number, unit: Unit) => fromSI(v, unit);

function curveView(curve: Curve, u: ExportUnits, quantity: Quantity) {
  const yu = unitOf(u, quantity);
  const out: Record<string, unknown> = { points: curve.points.map(([q, y]) => [lin(q, u.flow), lin(y, yu)]) };
  if (curve.fit) {
    const f = curve.fit;
    out.fit = {
      kind: f.kind,
      equation: `${quantity} [${yu.token}] = Σ c_i · (Q [${u.flow.token}] / flow_scale)^i`,
      flow_scale: lin(f.flow_scale, u.flow),
      coefficients: f.coefficients.map((c) => c / yu.factor),
      domain: [lin(f.domain[0], u.flow), lin(f.domain[1], u.flow)],
      degree: f.degree,
      through_origin: f.through_origin,
      rms: f.rms / yu.factor,
      max_residual: f.max_residual / yu.factor,
      reason: f.reason,
    };
  }
  return out;
}

function memberView(m: Member, u: ExportUnits) {
  const curves: Record<string, unknown> = {};
  for (const q of ['head', 'efficiency', 'power', 'npshr'] as const) {
    const c = m.curves[q];
    if (c) curves[q] = curveView(c, u, q);
  }
  const d = m.derived;
  return {
    ...(m.diameter_m !== undefined ? { diameter: lin(m.diameter_m, u.diameter) } : {}),
    speed_rpm: m.speed_rpm,
    ...(m.label ? { label: m.label } : {}),
    curves,
    derived: {
      ...(d.shutoff_head_m !== undefined ? { shutoff_head: lin(d.shutoff_head_m, u.head) } : {}),
      ...(d.bep ? { bep: { flow: lin(d.bep.flow_m3s, u.flow), head: lin(d.bep.head_m, u.head), efficiency: d.bep.efficiency * 100 } } : {}),
      ...(d.end_of_curve_m3s !== undefined ? { end_of_curve_flow: lin(d.end_of_curve_m3s, u.flow) } : {}),
      ...(d.por ? { por: { min_flow: lin(d.por.min_m3s, u.flow), max_flow: lin(d.por.max_m3s, u.flow), basis: d.por.basis } } : {}),
    },
  };
}

export function curveSetView(set: CurveSet, system?: string) {
  const u = exportUnits(set, system);
  return {
    format: VIEW_FORMAT,
    version: VIEW_VERSION,
    units: { flow: u.flow.token, head: u.head.token, npsh: u.npsh.token, power: u.power.token, diameter: u.diameter.token, efficiency: '%' },
    pump: set.pump,
    speed_rpm: set.speed_rpm,
    family: set.family,
    fluid: set.fluid,
    provenance: set.provenance,
    members: set.members.map((m) => memberView(m, u)),
    figures: set.figures ?? {},
    findings: set.findings,
  };
}
