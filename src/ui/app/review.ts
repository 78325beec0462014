/**
 * What the review shows beside the curve set: each trace's residuals against its fitted
 * curve, and the fitted curves drawn back onto the sheet through each panel's calibration.
 * Pure: curve set, take-off and calibrations in; numbers and sheet polylines out.
 */
import type { Calibration } from '../../digitize/calibration.ts';
import type { IsoCrossing } from '../../digitize/isoCrossings.ts';
import { resolveTakeoffUnits, traceUnits } from '../../digitize/takeoffUnits.ts';
import { evaluateUnchecked, inDomain, linspace } from '../../fit/polynomial.ts';
import type { CurveSet, Member, PolynomialFit, Quantity } from '../../model/curveset.ts';
import type { SheetXY, Takeoff, Trace } from '../../model/takeoff.ts';
import { fromSI, toSI, type Unit } from '../../units/index.ts';
import type { FitLine } from '../canvas/overlay.ts';
import { pointsOf, type Draft } from '../store/draft.ts';
import { curveLabelText } from '../views/words.ts';

export interface TraceResidual {
  traceId: string;
  /** Root-mean-square and largest residual, in the unit of the trace's values. */
  rms: number;
  max: number;
  unit: Unit;
  /** Largest residual in % of the fitted curve's range of values. */
  percentOfSpan: number;
  points: number;
}

/** The link the replay made from trace id to curve-set members (src/digitize/takeoff.ts, `traceMembers`). */
export type TraceMembers = ReadonlyMap<string, readonly number[]>;

/** The traces whose points went into member `index` of the curve set (the inverse of `traceMembers`). */
export function tracesOfMember(traceMembers: TraceMembers, index: number): string[] {
  return [...traceMembers].filter(([, members]) => members.includes(index)).map(([id]) => id);
}

/** The member a curve trace's points went into, as the replay linked them. */
function memberOf(set: CurveSet, traceMembers: TraceMembers, traceId: string): Member | undefined {
  const index = traceMembers.get(traceId)?.[0];
  return index === undefined ? undefined : set.members[index];
}

function valueSpan(fit: PolynomialFit): number {
  const ys = linspace(fit.domain[0], fit.domain[1], 41).map((q) => evaluateUnchecked(fit, q));
  return Math.max(...ys) - Math.min(...ys) || Math.max(...ys.map(Math.abs)) || 1;
}

function summarise(traceId: string, residualsSI: number[], unit: Unit, fit: PolynomialFit): TraceResidual | null {
  if (residualsSI.length === 0) return null;
  const rmsSI = Math.sqrt(residualsSI.reduce((s, r) => s + r * r, 0) / residualsSI.length);
  const maxSI = Math.max(...residualsSI.map(Math.abs));
  return { traceId, rms: rmsSI / unit.factor, max: maxSI / unit.factor, unit, percentOfSpan: (100 * maxSI) / valueSpan(fit), points: residualsSI.length };
}

/** The replay's iso crossings: iso-trace id → where it met each head curve (`ReplayResult.crossings`, key: diameter or speed as the take-off writes it). */
export type TraceCrossings = ReadonlyMap<string, readonly IsoCrossing<number>[]>;

/**
 * Residuals of every trace that has a fitted curve, keyed by trace id. An iso-trace's residuals
 * are taken at the crossings the replay found (`crossings`), with the replay's tolerances, so
 * that the workbench and the CLI agree on them; an iso-trace the replay gave no crossings has none.
 */
export function traceResiduals(draft: Draft, takeoff: Takeoff, set: CurveSet, calibrations: ReadonlyMap<string, Calibration>, traceMembers: TraceMembers, crossings: TraceCrossings = new Map()): Map<string, TraceResidual> {
  const units = resolveTakeoffUnits(takeoff);
  const out = new Map<string, TraceResidual>();
  const byId = new Map(draft.traces.map((t) => [t.id, t]));
  for (const trace of takeoff.traces) {
    const id = trace.id as string;
    const cal = calibrations.get(trace.panel);
    const drafted = byId.get(id);
    if (!cal || !drafted) continue;
    const u = traceUnits(takeoff, units, trace);
    if (trace.iso === undefined) {
      const member = curveLabel(trace) !== undefined ? memberOf(set, traceMembers, id) : undefined;
      const fit = member?.curves[trace.quantity]?.fit;
      if (!fit) continue;
      const residuals = pointsOf(drafted)
        .map((p) => cal.toData(p))
        .map((d) => [toSI(d[0], u.flow), toSI(d[1], u.value)] as const)
        .filter(([q]) => inDomain(fit, q))
        .map(([q, y]) => y - evaluateUnchecked(fit, q));
      const r = summarise(id, residuals, u.value, fit);
      if (r) out.set(id, r);
      continue;
    }
    // An iso-trace: where the replay found it crossing each head curve, that curve's fitted
    // efficiency should read the iso value.
    const heads = takeoff.traces.filter((t) => t.panel === trace.panel && t.quantity === 'head' && t.iso === undefined && curveLabel(t) !== undefined);
    const residuals: number[] = [];
    let anyFit: PolynomialFit | undefined;
    for (const c of crossings.get(id) ?? []) {
      const head = heads.find((t) => curveLabel(t) === c.key);
      const member = head ? memberOf(set, traceMembers, head.id as string) : undefined;
      const fit = member?.curves[trace.quantity]?.fit;
      if (!fit) continue;
      anyFit ??= fit;
      const q = toSI(cal.toData(c.at)[0], u.flow);
      if (inDomain(fit, q)) residuals.push(toSI(trace.iso, u.value) - evaluateUnchecked(fit, q));
    }
    if (anyFit) {
      const r = summarise(id, residuals, u.value, anyFit);
      if (r) out.set(id, r);
    }
  }
  return out;
}

/** A curve trace's label: its diameter, or its speed on a sheet of speeds; undefined for iso-lines and limit lines. */
function curveLabel(t: Pick<Trace, 'diameter' | 'speed'>): number | undefined {
  return t.diameter ?? t.speed;
}

/** The fitted curves drawn back onto the panels they were read from, each labelled as the sheet labels it ("250 mm", "1575 rpm (90 %)"). */
export function fitLinesOnSheet(takeoff: Takeoff, set: CurveSet, calibrations: ReadonlyMap<string, Calibration>, traceMembers: TraceMembers): FitLine[] {
  const units = resolveTakeoffUnits(takeoff);
  const lines: FitLine[] = [];
  const groups = new Map<string, Trace[]>();
  for (const t of takeoff.traces) {
    if (t.iso !== undefined || curveLabel(t) === undefined) continue;
    const key = `${t.panel}|${t.quantity}|${t.diameter ?? ''}|${t.speed ?? ''}`;
    groups.set(key, [...(groups.get(key) ?? []), t]);
  }
  for (const traces of groups.values()) {
    const first = traces[0] as Trace;
    const cal = calibrations.get(first.panel);
    const member = traces.map((t) => memberOf(set, traceMembers, t.id as string)).find((m) => m !== undefined);
    const fit = member?.curves[first.quantity as Quantity]?.fit;
    if (!cal || !fit) continue;
    const u = traceUnits(takeoff, units, first);
    const points: SheetXY[] = [];
    for (const q of linspace(fit.domain[0], fit.domain[1], 80)) {
      try {
        const s = cal.toSheet([fromSI(q, u.flow), fromSI(evaluateUnchecked(fit, q), u.value)]);
        points.push([s[0], s[1]]);
      } catch {
        // A value that cannot sit on a log axis is simply not drawn.
      }
    }
    lines.push({ traceIds: traces.map((t) => t.id as string), quantity: first.quantity, points, label: curveLabelText(first, takeoff.units.diameter, first.speed !== undefined ? takeoff.pump.speed_rpm : undefined) });
  }
  return lines;
}
