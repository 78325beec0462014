/**
 * No silent misses: after capture, each trace is held against the others of its take-off, so
 * that a line lost in a bunch, a trace that stops far short of its line's end, a diameter
 * missing a quantity the sheet draws, or an iso-line that meets a head curve more often than
 * a level can, is said in a finding that names the trace and what to do. A trace that cannot
 * be trusted gives a `fail`, so `check` and `takeoff` exit 1.
 *
 * Pure. Flows arrive in SI (m³/s), so traces of panels with different flow units compare.
 */
import type { Quantity, Severity } from '../model/curveset.ts';

export interface AuditedTrace {
  id: string;
  /** "efficiency at diameter 370 on panel "eff"", for messages. */
  describe: string;
  quantity: Quantity;
  diameter?: number | undefined;
  /** Speed in rpm, for a trace of a speed family (one impeller drawn at several speeds) instead of a diameter. */
  speed?: number | undefined;
  iso?: number | undefined;
  /** How it was captured; only raster traces (followed lines) are held to coverage. */
  how: string;
  /** Flows of the captured points, m³/s, in order along the trace. */
  flows: readonly number[];
  /** Length of the trace and of the stretches not seen (bridged or skipped), sheet units. */
  length: number;
  lostLength: number;
  /** Guides that had no line of the traced colour near them. */
  refusedGuides: number;
  /** The panel's flow axis as its anchors span it, m³/s. */
  axisFlow?: readonly [number, number] | undefined;
  /** Values of the captured points (panel unit) and the span of the panel's value axis, for the smoothness check. */
  values?: readonly number[] | undefined;
  valueSpan?: number | undefined;
  /** The panel it was read on: values of traces on different panels do not compare. */
  panel?: string | undefined;
}

export interface AuditFinding {
  code: string;
  severity: Severity;
  trace?: string;
  message: string;
  figures?: Record<string, number>;
}

/**
 * Share of a trace's length that may go unseen before the trace is not trusted (common
 * practice for reading curves: a tenth of a curve bridged by guesswork can move a fit near
 * its end by more than the 1 % of span the take-off promises).
 */
export const LOST_SHARE_FAIL = 0.1;
/** A trace ending before this share of the end its neighbours imply is cut short (affinity: Q ∝ D). */
export const END_SHORT_SHARE = 0.85;
/**
 * An NPSHr trace ending before this share of its own head trace's end flow is cut short: an
 * NPSHr curve is drawn to the end of its diameter's head curve (common practice). Closer than
 * END_SHORT_SHARE, since the bar is one curve of the same member, not the family scaled; set on
 * the random bed (seeds 1–200, scripts/randomSheets), where it newly flags one wrong trace that
 * had no finding (NPSHr ending at 0.89 of its head's end) and no sound one.
 */
export const NPSHR_HEAD_END_SHARE = 0.95;
/**
 * An NPSHr trace starting later than this share of its own head trace's end flow is reported:
 * makers draw NPSHr from zero flow or from the low end of the allowable operating region, within
 * the first third or so of the flow axis (common practice). When every NPSHr line of a sheet
 * fades at low flow alike, the family comparison (START_LATE_SHARE) sees nothing, and the
 * curve set would silently extrapolate the lost stretch. A warning, not a fail: a sheet may
 * draw NPSHr from mid-range only.
 */
export const NPSHR_START_SHARE = 0.45;
/** A power trace starting later than its own head trace by more than this share of the head trace's end flow lost its low-flow stretch. */
export const START_BEHIND_HEAD = 0.1;
/** A curve starting later than its neighbours by more than this share of its end flow is cut at its start. */
export const START_LATE_SHARE = 0.15;
/**
 * Least share of its panel's flow axis a pump curve spans (common practice: a sheet's flow axis
 * is chosen for its curves, and even an NPSHr curve of the smallest impeller spans about half
 * of it). A followed line spanning less was lost, whatever its neighbours did.
 */
export const AXIS_SHARE_MIN = 0.3;
/**
 * Largest departure of a followed line from the parabola through its neighbours, % of the
 * value axis span. Drawn pump curves are smooth: locally a parabola follows them to a few
 * hundredths of a per cent (common practice); a step onto another line departs by half the
 * step. The bar sits at the 1 % of span a reading may be off before it is wrong, so that a
 * change of lines big enough to matter is caught and the scatter of a scan is not.
 */
export const SMOOTH_PERCENT = 1;
/**
 * A followed line that keeps one value, within LEVEL_PERCENT of the value span, over more than
 * LEVEL_SHARE of the flow axis ran along a grid line: near its peak a head or efficiency curve
 * stays within that band over a few per cent of the axis only (common practice; a parabola
 * through a peak falls by a quarter of its curvature times the square of the stretch).
 */
export const LEVEL_PERCENT = 0.1;
export const LEVEL_SHARE = 0.2;

const range = (t: AuditedTrace): [number, number] => [Math.min(...t.flows), Math.max(...t.flows)];

/** The family member a curve trace is drawn for: its diameter, or its speed on a speed family. */
function memberOf(t: AuditedTrace): { kind: 'diameter' | 'speed'; value: number } | undefined {
  if (t.diameter !== undefined) return { kind: 'diameter', value: t.diameter };
  if (t.speed !== undefined) return { kind: 'speed', value: t.speed };
  return undefined;
}

/** A member's diameter or speed, for traces known to have one; Q scales with either. */
const memberValue = (t: AuditedTrace): number => memberOf(t)?.value as number;

export function auditTraces(traces: readonly AuditedTrace[], flowText: (q: number) => string): AuditFinding[] {
  const out: AuditFinding[] = [];
  const curves = traces.filter((t) => t.iso === undefined && t.diameter !== undefined && t.flows.length >= 2);
  // A speed family's traces get the same per-trace checks; their coverage is compared within
  // the speed family, scaled by speed (Q ∝ n, as Q ∝ D for a diameter family).
  const speedCurves = traces.filter((t) => t.iso === undefined && t.diameter === undefined && t.speed !== undefined && t.flows.length >= 2);

  for (const [family, t] of [...curves.map((t) => [curves, t] as const), ...speedCurves.map((t) => [speedCurves, t] as const)]) {
    if (t.how !== 'raster') continue;
    const share = t.length > 0 ? t.lostLength / t.length : 0;
    if (share > LOST_SHARE_FAIL || t.refusedGuides > 0) {
      const why = t.refusedGuides > 0 ? `${t.refusedGuides} of its guides found no line of its colour near them` : `${Math.round(100 * share)} % of its length was not seen and was bridged`;
      out.push({
        code: 'takeoff.trace-untrusted',
        severity: 'fail',
        trace: t.id,
        message: `Trace ${t.id} (${t.describe}) cannot be trusted: ${why}. Add a guide where this line stands alone on each side of the stretch, or give its points.`,
        figures: { lost_share: share, refused_guides: t.refusedGuides },
      });
      continue;
    }
    const rough = roughness(t);
    if (rough !== undefined && rough.percent > SMOOTH_PERCENT) {
      out.push({
        code: 'takeoff.trace-jump',
        severity: 'fail',
        trace: t.id,
        message: `Trace ${t.id} (${t.describe}) leaves a smooth curve by ${rough.percent.toFixed(1)} % of the axis span near ${flowText(rough.at)}; it probably changed to another line where lines cross or run together. Add a guide on this line on each side of that place, where it stands alone.`,
        figures: { percent_of_span: rough.percent, at_flow: rough.at },
      });
      continue;
    }
    const level = levelStretch(t);
    if (level && t.axisFlow && level.share >= LEVEL_SHARE) {
      out.push({
        code: 'takeoff.trace-level',
        severity: 'fail',
        trace: t.id,
        message: `Trace ${t.id} (${t.describe}) runs level from ${flowText(level.from)} to ${flowText(level.to)}, ${Math.round(100 * level.share)} % of its panel's flow axis, as a grid line does and a drawn pump curve does not; it probably followed a grid line. Add a guide near the end of this line where it stands alone.`,
        figures: { axis_share: level.share },
      });
      continue;
    }
    // Coverage against the traces of the same quantity (scaled by diameter, Q ∝ D) and the
    // traces of the same diameter: a followed line that stops early was lost or cut at a label.
    const [q0, q1] = range(t);
    const d = memberValue(t);
    const same = family.filter((o) => o !== t && o.quantity === t.quantity);
    // An NPSHr curve is drawn to the end of its diameter's head curve (common practice), but
    // the head curve need not be drawn as far as an NPSHr curve drawn for the whole family.
    const mine = family.filter((o) => o !== t && memberValue(o) === d && (t.quantity === 'npshr' ? o.quantity === 'head' : o.quantity !== 'npshr'));
    // The farthest neighbour sets the bar: when several lines were lost alike, a median would
    // excuse them all, and a flag too many costs a look, a miss costs a wrong number.
    const ends = [...same.map((o) => (range(o)[1] * d) / memberValue(o)), ...mine.map((o) => range(o)[1])];
    const expectedEnd = ends.length > 0 ? Math.max(...ends) : q1;
    const starts = same.map((o) => range(o)[0] / range(o)[1]);
    const expectedStart = starts.length > 0 ? Math.min(...starts) : q0 / q1;
    const short = q1 < END_SHORT_SHARE * expectedEnd;
    // An NPSHr trace held against its own head trace, closer than against the family.
    // The head traces of the same member, and how far they run.
    const ownHeads = mine.filter((o) => o.quantity === 'head');
    const ownHeadEnd = Math.max(0, ...ownHeads.map((o) => range(o)[1]));
    const headEnd = t.quantity === 'npshr' ? ownHeadEnd : 0;
    const shortOfHead = !short && headEnd > 0 && q1 < NPSHR_HEAD_END_SHARE * headEnd;
    const late = q0 / q1 > expectedStart + START_LATE_SHARE;
    const axis = t.axisFlow ? Math.abs(t.axisFlow[1] - t.axisFlow[0]) : 0;
    if (axis > 0 && q1 - q0 < AXIS_SHARE_MIN * axis) {
      out.push({
        code: 'takeoff.trace-short',
        severity: 'fail',
        trace: t.id,
        message: `Trace ${t.id} (${t.describe}) covers flows ${flowText(q0)} to ${flowText(q1)}, only ${Math.round((100 * (q1 - q0)) / axis)} % of its panel's flow axis; the line was probably lost where it runs together with others, at a label or in a gap. Add a guide near each end of this line where it stands alone, or give its points.`,
        figures: { flow_from: q0, flow_to: q1, axis_share: (q1 - q0) / axis },
      });
      continue;
    }
    if (shortOfHead && !late && !(axis > 0 && q1 - q0 < AXIS_SHARE_MIN * axis)) {
      out.push({
        code: 'takeoff.trace-short',
        severity: 'fail',
        trace: t.id,
        message: `Trace ${t.id} (${t.describe}) ends at ${flowText(q1)}, while the head trace of the same ${t.diameter !== undefined ? 'diameter' : 'speed'} runs to ${flowText(headEnd)}, and an NPSHr curve is drawn to the end of its head curve; the line was probably lost in a gap or where it runs together with others. Add a guide near the end of this line, or give its points; if the sheet itself stops it there, give its points to confirm.`,
        figures: { flow_from: q0, flow_to: q1, expected_to: headEnd },
      });
      continue;
    }
    if (short || late) {
      const where = short && late ? 'at both ends' : short ? 'at its high-flow end' : 'at its low-flow end';
      out.push({
        code: 'takeoff.trace-short',
        severity: 'fail',
        trace: t.id,
        message: `Trace ${t.id} (${t.describe}) covers flows ${flowText(q0)} to ${flowText(q1)}, short of its line ${where} (its neighbours suggest ${flowText(Math.max(0, expectedStart * expectedEnd))} to ${flowText(expectedEnd)}); the line was probably lost where it runs together with others or at a label. Add a guide near each end of this line where it stands alone, or give its points.`,
        figures: { flow_from: q0, flow_to: q1, expected_to: expectedEnd },
      });
      continue;
    }
    if (t.quantity === 'npshr' && headEnd > 0 && q0 > NPSHR_START_SHARE * headEnd) {
      out.push({
        code: 'takeoff.npshr-start-late',
        severity: 'warn',
        trace: t.id,
        message: `Trace ${t.id} (${t.describe}) starts at ${flowText(q0)}, ${Math.round((100 * q0) / headEnd)} % of the way to the end of the head trace of the same ${t.diameter !== undefined ? 'diameter' : 'speed'} (${flowText(headEnd)}), while an NPSHr curve is usually drawn from zero flow or from the low end of the allowable operating region; below that flow its NPSHr is extrapolated. If the sheet's line starts lower, add a guide near its low-flow end; if the sheet starts it there, give its points to confirm.`,
        figures: { flow_from: q0, head_to: headEnd },
      });
    }
    // Power is drawn from shut-off, as its head curve is (common practice: the shut-off power is
    // read for the motor and for starting): a power trace starting well after its own head trace
    // starts lost its low-flow stretch. Efficiency is not held to it: sheets often start their
    // efficiency curves part way along the flow axis (the committed sample scans do).
    if (t.quantity === 'power' && ownHeads.length > 0) {
      const headFrom = Math.min(...ownHeads.map((o) => range(o)[0]));
      if (q0 > headFrom + START_BEHIND_HEAD * ownHeadEnd) {
        out.push({
          code: 'takeoff.power-start-late',
          severity: 'warn',
          trace: t.id,
          message: `Trace ${t.id} (${t.describe}) starts at ${flowText(q0)}, while the head trace of the same ${t.diameter !== undefined ? 'diameter' : 'speed'} starts at ${flowText(headFrom)}, and a power curve is drawn from shut-off as its head curve is; below that flow it is extrapolated. Add a guide near the low-flow end of this line, or give its points; if the sheet starts it there, give its points to confirm.`,
          figures: { flow_from: q0, head_from: headFrom },
        });
      }
    }
    const reach = familyReach(t, family);
    if (reach) {
      out.push({
        code: 'takeoff.trace-reach',
        severity: 'fail',
        trace: t.id,
        message: `Trace ${t.id} (${t.describe}) covers flows ${flowText(q0)} to ${flowText(q1)}, while ${reach.why} suggests ${reach.late ? `a start near ${flowText(reach.from)}` : `an end near ${flowText(reach.to)}`}; the line was probably lost ${reach.late ? 'at its low-flow end' : 'at its high-flow end'}, where it runs together with others or at a label. Add a guide near that end of this line where it stands alone, or give its points.`,
        figures: { flow_from: q0, flow_to: q1, expected_from: reach.from, expected_to: reach.to },
      });
    }
  }

  // An iso-line bridged over more than the same share of its length: its crossings there are guesses.
  for (const t of traces) {
    if (t.iso === undefined || t.how !== 'raster' || t.flows.length < 2) continue;
    const share = t.length > 0 ? t.lostLength / t.length : 0;
    if (!(share > LOST_SHARE_FAIL) && t.refusedGuides === 0) continue;
    const why = t.refusedGuides > 0 ? `${t.refusedGuides} of its guides found no line of its colour near them` : `${Math.round(100 * share)} % of its length was not seen and was bridged`;
    out.push({
      code: 'takeoff.trace-untrusted',
      severity: 'fail',
      trace: t.id,
      message: `Iso-trace ${t.id} (${t.describe}) cannot be trusted: ${why}, so where it crosses the head curves there is a guess. Add a guide on the iso-line between each pair of head curves, where it stands alone, or give its points.`,
      figures: { lost_share: share, refused_guides: t.refusedGuides },
    });
  }

  out.push(...auditNeighbours(curves, flowText));
  // A speed family's curves are held to the same rule: Q ∝ n, H ∝ n², P ∝ n³ order them as
  // Q ∝ D, H ∝ D², P ∝ D³ order a diameter family's, and its efficiency and NPSHr curves may
  // bunch and part the same way (one family per sheet, so the two kinds never meet here).
  out.push(...auditNeighbours(traces.filter((t) => t.iso === undefined && t.diameter === undefined && t.speed !== undefined && t.flows.length >= 2), flowText));
  out.push(...auditPeaks(curves), ...auditPeaks(speedCurves));

  // A member (diameter, or speed on a speed family) with a head trace but without a quantity
  // that other members have.
  const isoGiven = traces.some((t) => t.iso !== undefined && t.quantity === 'efficiency');
  for (const family of [curves, speedCurves]) out.push(...auditMissingQuantities(family, isoGiven));
  return out;
}

/**
 * A member with a head trace but no trace of a quantity that other members of the same family
 * have: the sheet draws that quantity, so this member's line was probably not traced. Iso-lines
 * give efficiency instead of curves, and many sheets draw one NPSHr curve for the whole family,
 * so a single NPSHr trace is no sign of a miss.
 */
function auditMissingQuantities(family: readonly AuditedTrace[], isoGiven: boolean): AuditFinding[] {
  const out: AuditFinding[] = [];
  const kind = family.length > 0 ? memberOf(family[0] as AuditedTrace)?.kind : undefined;
  if (kind === undefined) return out;
  const heads = new Set(family.filter((t) => t.quantity === 'head').map(memberValue));
  for (const quantity of ['efficiency', 'power', 'npshr'] as const) {
    const having = new Set(family.filter((t) => t.quantity === quantity).map(memberValue));
    if (having.size === 0 || (quantity === 'efficiency' && isoGiven) || (quantity === 'npshr' && having.size === 1)) continue;
    const name = kind === 'speed' ? 'Speed' : 'Diameter';
    const list = [...having].map((v) => (kind === 'speed' ? `${v} rpm` : String(v))).join(', ');
    for (const v of heads) {
      if (having.has(v)) continue;
      out.push({
        code: 'takeoff.quantity-missing',
        severity: 'warn',
        message: `${name} ${kind === 'speed' ? `${v} rpm` : v} has a head trace but no ${quantity} trace, while ${name.toLowerCase()}${having.size === 1 ? '' : 's'} ${list} ha${having.size === 1 ? 's' : 've'} one; trace its ${quantity} line if the sheet draws it.`,
        figures: kind === 'speed' ? { speed_rpm: v } : { diameter: v },
      });
    }
  }
  return out;
}

/**
 * Reach of a trace against the whole family, scaled by diameter (affinity: Q ∝ D), for the
 * cases the checks above miss because every trace of a quantity was lost alike:
 * - an efficiency or power curve is drawn to the end flow of its head curve (common practice),
 *   so the farthest head trace of any diameter, scaled to this one, sets where it should end;
 * - a curve starts no later than the earliest start of its quantity in the family, scaled to
 *   this diameter (the start/end ratio above is blind when the ends were lost too).
 * The bars are looser than END_SHORT_SHARE and START_LATE_SHARE, since they reach across
 * diameters and quantities: set on the random bed (seeds 1–200), where they newly flag 2 of
 * 549 sound unflagged curves; a sheet may stop an efficiency curve a little before the head
 * curve's end, and NPSHr curves of a family often share a start flow rather than scale.
 */
export const REACH_END_SHARE = 0.75;
export const REACH_START_SHARE = 0.2;

function familyReach(t: AuditedTrace, curves: readonly AuditedTrace[]): { why: string; late: boolean; from: number; to: number } | undefined {
  if (t.how !== 'raster') return undefined;
  const [q0, q1] = range(t);
  const d = memberValue(t);
  const member = t.diameter !== undefined ? 'diameter' : 'speed';
  if (t.quantity === 'efficiency' || t.quantity === 'power') {
    let best: AuditedTrace | undefined;
    let end = 0;
    for (const o of curves) {
      if (o.quantity !== 'head' || o.how !== 'raster') continue;
      const e = (range(o)[1] * d) / memberValue(o);
      if (e > end) {
        end = e;
        best = o;
      }
    }
    if (best && q1 < REACH_END_SHARE * end) return { why: `the head trace ${best.id} (${best.describe}), scaled to this ${member},`, late: false, from: q0, to: end };
  }
  let first: AuditedTrace | undefined;
  let start = Infinity;
  for (const o of curves) {
    if (o === t || o.quantity !== t.quantity || o.how !== 'raster') continue;
    const s = (range(o)[0] * d) / memberValue(o);
    if (s < start) {
      start = s;
      first = o;
    }
  }
  if (first && q0 > start + REACH_START_SHARE * q1) return { why: `the trace ${first.id} (${first.describe}), scaled to this ${member},`, late: true, from: start, to: q1 };
  return undefined;
}

/**
 * Largest departure of each point from the parabola fitted to its neighbours within ±6 % of
 * the trace's flow range, % of the value span, and where. Local, so that the shape of a sound
 * curve (steep near its end) does not count; a step onto another line does.
 */
function roughness(t: AuditedTrace): { percent: number; at: number } | undefined {
  if (!t.values || !t.valueSpan || t.values.length !== t.flows.length || t.flows.length < 12) return undefined;
  const order = t.flows.map((_, i) => i).sort((i, j) => (t.flows[i] as number) - (t.flows[j] as number));
  const qs = order.map((i) => t.flows[i] as number);
  const vs = order.map((i) => (t.values as readonly number[])[i] as number);
  const half = 0.06 * ((qs[qs.length - 1] as number) - (qs[0] as number));
  if (!(half > 0)) return undefined;
  let worst = 0;
  let at = qs[0] as number;
  let lo = 0;
  let hi = 0;
  for (let i = 0; i < qs.length; i++) {
    const q = qs[i] as number;
    while ((qs[lo] as number) < q - half) lo++;
    while (hi + 1 < qs.length && (qs[hi + 1] as number) <= q + half) hi++;
    // Least-squares parabola through the neighbours (x centred on the point, scaled by the
    // window), by its 3 × 3 normal equations; its value at the point is the constant term.
    let n = 0;
    let left = 0;
    let right = 0;
    const m = [0, 0, 0, 0, 0, 0, 0, 0];
    for (let k = lo; k <= hi; k++) {
      if (k === i) continue;
      const x = ((qs[k] as number) - q) / half;
      if (x < 0) left++;
      else if (x > 0) right++;
      const y = vs[k] as number;
      n++;
      m[1]! += x;
      m[2]! += x * x;
      m[3]! += x * x * x;
      m[4]! += x * x * x * x;
      m[5]! += y;
      m[6]! += x * y;
      m[7]! += x * x * y;
    }
    // Judged only with neighbours on both sides: at a trace's ends a one-sided parabola extrapolates noise.
    if (n < 6 || left < 3 || right < 3) continue;
    const [, s1, s2, s3, s4, y0, y1, y2] = m as [number, number, number, number, number, number, number, number];
    const det = n * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
    if (!(Math.abs(det) > 1e-12)) continue;
    const a = (y0 * (s2 * s4 - s3 * s3) - s1 * (y1 * s4 - s3 * y2) + s2 * (y1 * s3 - s2 * y2)) / det;
    const d = Math.abs((vs[i] as number) - a);
    if (d > worst) {
      worst = d;
      at = q;
    }
  }
  return { percent: (100 * worst) / t.valueSpan, at };
}

export interface IsoCount {
  trace: string;
  describe: string;
  level: number;
  perHead: ReadonlyMap<number, number>;
}

/**
 * Crossings of iso-lines with head curves: at most two per level and head curve (an iso-line
 * of efficiency is a closed or U-shaped contour). More means the trace followed another
 * line; a head curve that no iso level reaches gets no efficiency from them.
 */
export function auditIsoCrossings(counts: readonly IsoCount[], headDiameters: readonly number[]): AuditFinding[] {
  const out: AuditFinding[] = [];
  const byLevel = new Map<number, Map<number, number>>();
  for (const c of counts) {
    const level = byLevel.get(c.level) ?? new Map<number, number>();
    for (const [d, n] of c.perHead) level.set(d, (level.get(d) ?? 0) + n);
    byLevel.set(c.level, level);
  }
  for (const [level, perHead] of byLevel) {
    for (const [d, n] of perHead) {
      if (n <= 2) continue;
      const traces = counts.filter((c) => c.level === level).map((c) => c.trace);
      // A single trace meeting a head curve more than twice adds none of those crossings (takeoff.ts).
      const dropped = counts.filter((c) => c.level === level && (c.perHead.get(d) ?? 0) > 2).map((c) => c.trace);
      out.push({
        code: 'takeoff.iso-crossings',
        severity: 'fail',
        ...(traces.length === 1 ? { trace: traces[0] as string } : {}),
        message: `The iso-line${traces.length === 1 ? '' : 's'} ${traces.join(', ')} of level ${level} meet${traces.length === 1 ? 's' : ''} the head trace of diameter ${d} ${n} times, where one level can meet a head curve at most twice; the trace probably followed another line${dropped.length > 0 ? `; the crossings of ${dropped.join(', ')} with it are left out of the efficiency points` : ''}. Place its guides where the iso-line stands alone, between the head curves, rather than on the crossings.`,
        figures: { crossings: n },
      });
    }
  }
  // A level meets a smaller and a larger head curve but not the one between them: an iso-line
  // runs across the head curves in order, so that crossing was lost (the head trace stops
  // short, or the iso trace does).
  for (const [level, perHead] of byLevel) {
    const met = [...perHead].filter(([, n]) => n > 0).map(([d]) => d);
    if (met.length < 2) continue;
    const lo = Math.min(...met);
    const hi = Math.max(...met);
    for (const d of headDiameters) {
      if (!(d > lo && d < hi) || (perHead.get(d) ?? 0) > 0) continue;
      const traces = counts.filter((c) => c.level === level).map((c) => c.trace);
      out.push({
        code: 'takeoff.iso-gap',
        severity: 'warn',
        ...(traces.length === 1 ? { trace: traces[0] as string } : {}),
        message: `The iso-line${traces.length === 1 ? '' : 's'} ${traces.join(', ')} of level ${level} meet${traces.length === 1 ? 's' : ''} the head traces of diameters ${lo} and ${hi} but not that of diameter ${d} between them, so diameter ${d} lacks that point of efficiency. Check that the head trace of diameter ${d} runs as far as the iso-line, and add a guide on the iso-line next to that head curve.`,
        figures: { level, diameter: d },
      });
    }
  }
  if (counts.length > 0) {
    for (const d of headDiameters) {
      if ([...byLevel.values()].some((m) => (m.get(d) ?? 0) > 0)) continue;
      out.push({
        code: 'takeoff.iso-none-for-diameter',
        severity: 'warn',
        message: `No iso-line meets the head trace of diameter ${d}, so it gets no efficiency from them; extend the iso traces to that head curve or trace its efficiency.`,
      });
    }
  }
  return out;
}

/**
 * Share of the value axis within which two traces of different diameters count as lying on one
 * line, and by which a larger impeller's trace may fall below a smaller one's before the order
 * is broken (% of span; about two line widths on a printed chart, common practice).
 */
export const COINCIDE_PERCENT = 0.3;
export const ORDER_PERCENT = 1;
/** Least share of the panel's flow axis over which coinciding or out-of-order traces are said. */
export const NEIGHBOUR_SHARE = 0.08;
/**
 * Efficiency and NPSHr traces of different diameters lying on one line over more than this share
 * of the flows both span, and over more than BUNCH_AXIS_SHARE of the axis, follow one drawn line
 * (common practice: such curves may run together near shut-off and part well before mid-range).
 */
export const BUNCH_COMMON_SHARE = 0.6;
export const BUNCH_AXIS_SHARE = 0.2;

/**
 * Head and power traces of one panel, held against each other: at any flow a larger impeller
 * gives more head and takes more power (affinity: H ∝ D², P ∝ D³ at corresponding flows, and
 * the curves fall with flow), so two traces of different diameters neither lie on one line nor
 * swap places. Where they do over a stretch, at least one followed another line; both are
 * named, since either may be the one that left. Efficiency and NPSHr curves of a family may
 * bunch or cross, so they are not held to order; but two of them that lie on one line over most
 * of the flows both span (BUNCH_COMMON_SHARE) and over a good part of the axis (BUNCH_AXIS_SHARE)
 * are one drawn line traced twice: a bunch parts within the first third or so of the flow range.
 */
function auditNeighbours(curves: readonly AuditedTrace[], flowText: (q: number) => string): AuditFinding[] {
  const out: AuditFinding[] = [];
  const said = new Set<string>();
  const usable = curves.filter((t) => t.iso === undefined && memberOf(t) !== undefined && t.how === 'raster' && t.values && t.valueSpan && t.values.length === t.flows.length && t.axisFlow);
  for (const a of usable) {
    for (const b of usable) {
      const [ka, kb] = [memberOf(a), memberOf(b)];
      if (a === b || a.quantity !== b.quantity || a.panel !== b.panel || !ka || !kb || ka.kind !== kb.kind || !(ka.value > kb.value)) continue;
      const span = a.valueSpan as number;
      const axis = Math.abs((a.axisFlow as readonly [number, number])[1] - (a.axisFlow as readonly [number, number])[0]);
      const [a0, a1] = range(a);
      const [b0, b1] = range(b);
      const lo = Math.max(a0, b0);
      const hi = Math.min(a1, b1);
      if (!(hi - lo > NEIGHBOUR_SHARE * axis)) continue;
      const va = valueAt(a);
      const vb = valueAt(b);
      const n = 60;
      let together = 0;
      let swapped = 0;
      let where = lo;
      for (let i = 0; i <= n; i++) {
        const q = lo + ((hi - lo) * i) / n;
        const d = (100 * (va(q) - vb(q))) / span;
        if (Math.abs(d) < COINCIDE_PERCENT) together++;
        else if (d < -ORDER_PERCENT) {
          swapped++;
          where = q;
        }
      }
      const share = (hi - lo) / n / axis;
      const ordered = a.quantity === 'head' || a.quantity === 'power';
      const what = ordered
        ? together * share >= NEIGHBOUR_SHARE ? 'lie on one line' : swapped * share >= NEIGHBOUR_SHARE ? 'swap places' : undefined
        : together / (n + 1) >= BUNCH_COMMON_SHARE && together * share >= BUNCH_AXIS_SHARE ? 'lie on one line' : undefined;
      if (!what) continue;
      for (const t of [a, b]) {
        if (said.has(t.id)) continue;
        said.add(t.id);
        const other = t === a ? b : a;
        out.push({
          code: 'takeoff.trace-neighbour',
          severity: 'fail',
          trace: t.id,
          message: ordered
            ? `Trace ${t.id} (${t.describe}) and trace ${other.id} (${other.describe}) ${what} over ${Math.round(100 * (what === 'lie on one line' ? together : swapped) * share)} % of the flow axis${what === 'swap places' ? ` (near ${flowText(where)})` : ''}, where ${ka.kind === 'speed' ? `a faster speed's ${t.quantity} lies above a slower one's` : `a larger impeller's ${t.quantity} lies above a smaller one's`} everywhere; one of them followed the other's line. Add guides on each line where it stands alone, near both of its ends.`
            : `Trace ${t.id} (${t.describe}) and trace ${other.id} (${other.describe}) lie on one line over ${Math.round(100 * together * share)} % of the flow axis, far past where curves of a family run together; one of them followed the other's line. Add guides on each line where it stands alone, near both of its ends.`,
          figures: {
            share_of_axis: (what === 'lie on one line' ? together : swapped) * share,
            // A speed family's traces are named by their speeds (the describe text says them too).
            ...(ka.kind === 'speed' ? { speed_rpm: (t === a ? ka : kb).value, other_speed_rpm: (t === a ? kb : ka).value } : {}),
          },
        });
      }
    }
  }
  return out;
}

/** The trace's value at a flow, by linear interpolation along its points sorted by flow. */
function valueAt(t: AuditedTrace): (q: number) => number {
  const order = t.flows.map((_, i) => i).sort((i, j) => (t.flows[i] as number) - (t.flows[j] as number));
  const qs = order.map((i) => t.flows[i] as number);
  const vs = order.map((i) => (t.values as readonly number[])[i] as number);
  return (q) => {
    let lo = 0;
    let hi = qs.length - 1;
    if (q <= (qs[0] as number)) return vs[0] as number;
    if (q >= (qs[hi] as number)) return vs[hi] as number;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if ((qs[mid] as number) <= q) lo = mid;
      else hi = mid;
    }
    const q0 = qs[lo] as number;
    const q1 = qs[hi] as number;
    const w = q1 > q0 ? (q - q0) / (q1 - q0) : 0;
    return (vs[lo] as number) * (1 - w) + (vs[hi] as number) * w;
  };
}

/** The longest stretch of flows over which the trace keeps one value within LEVEL_PERCENT of its span, as a share of the flow axis. */
function levelStretch(t: AuditedTrace): { from: number; to: number; share: number } | undefined {
  if (!t.values || !t.valueSpan || !t.axisFlow || t.values.length !== t.flows.length || t.flows.length < 6) return undefined;
  const axis = Math.abs(t.axisFlow[1] - t.axisFlow[0]);
  if (!(axis > 0)) return undefined;
  const order = t.flows.map((_, i) => i).sort((i, j) => (t.flows[i] as number) - (t.flows[j] as number));
  const qs = order.map((i) => t.flows[i] as number);
  const vs = order.map((i) => (t.values as readonly number[])[i] as number);
  const band = (LEVEL_PERCENT / 100) * t.valueSpan;
  let best: { from: number; to: number; share: number } | undefined;
  for (let i = 0; i < qs.length; i++) {
    let lo = vs[i] as number;
    let hi = lo;
    let j = i;
    while (j + 1 < qs.length) {
      const v = vs[j + 1] as number;
      if (Math.max(hi, v) - Math.min(lo, v) > band) break;
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
      j++;
    }
    const share = ((qs[j] as number) - (qs[i] as number)) / axis;
    if (!best || share > best.share) best = { from: qs[i] as number, to: qs[j] as number, share };
  }
  return best;
}

/** How far a smaller impeller's best efficiency may stand above a larger one's, % of the value span. */
export const PEAK_ORDER_PERCENT = 1.5;

/**
 * Efficiency traces of one panel, held against each other by their peaks: a trimmed impeller
 * reaches at most the best efficiency of the larger one (affinity keeps efficiency about equal
 * at corresponding points, and trimming loses a little; common practice). A smaller impeller's
 * trace peaking clearly higher followed another line or lost its own near the peak. On a speed
 * family the same holds between speeds: a slower speed keeps about the best efficiency of a
 * faster one and loses a little to friction (common practice), never gains clearly over it.
 * `curves` holds one family: diameters, or speeds.
 */
function auditPeaks(curves: readonly AuditedTrace[]): AuditFinding[] {
  const out: AuditFinding[] = [];
  const usable = curves.filter((t) => t.quantity === 'efficiency' && t.how === 'raster' && t.values && t.valueSpan && t.values.length > 0);
  const said = new Set<string>();
  for (const a of usable) {
    for (const b of usable) {
      if (a.panel !== b.panel || !(memberValue(a) > memberValue(b))) continue;
      const peakA = Math.max(...(a.values as readonly number[]));
      const peakB = Math.max(...(b.values as readonly number[]));
      const over = (100 * (peakB - peakA)) / (a.valueSpan as number);
      if (!(over > PEAK_ORDER_PERCENT)) continue;
      for (const t of [a, b]) {
        if (said.has(t.id)) continue;
        said.add(t.id);
        out.push({
          code: 'takeoff.trace-peaks',
          severity: 'warn',
          trace: t.id,
          message: `The efficiency trace ${b.id} (${b.describe}) peaks ${over.toFixed(1)} % of the axis span above trace ${a.id} (${a.describe}), while ${memberOf(a)?.kind === 'speed' ? 'a slower speed reaches at most the faster one\'s' : 'a trimmed impeller reaches at most the larger one\'s'} best efficiency; one of them left its line near the peak. Check both traces and add guides near their peaks where each line stands alone.`,
          figures: { over_percent_of_span: over },
        });
      }
    }
  }
  return out;
}
