/**
 * The minimum-continuous-flow limit of a curve set, from a stated flow or a traced line, and
 * the minimum flow that applies at an operating point.
 *
 * A traced line that runs straight up the head panel (flows within 2 % of each other) is a
 * fixed flow; a sloping line — typically drawn across the curves of a speed family, where the
 * minimum flow falls with speed — is kept as [flow, head] points, and the limit at an operating
 * point is the line's flow at that point's head. The 2 % band is about four times the reading
 * accuracy of a printed sheet (common practice), so a hand-traced vertical line counts as one.
 */
import type { CurvePoint, Limits } from '../model/curveset.ts';

/** Flows of a vertical line may spread by this fraction of their mean. */
export const VERTICAL_LINE_SPREAD = 0.02;

/** Limits from a stated minimum flow [m³/s] and/or traced line points ([m³/s, m]); undefined when neither is given. */
export function minFlowLimit(stated_m3s: number | undefined, line: readonly CurvePoint[] | undefined): Limits | undefined {
  if (line && line.length >= 2) {
    const flows = line.map((p) => p[0]);
    const mean = flows.reduce((a, b) => a + b, 0) / flows.length;
    const spread = Math.max(...flows) - Math.min(...flows);
    if (mean > 0 && spread <= VERTICAL_LINE_SPREAD * mean) {
      const sorted = [...flows].sort((a, b) => a - b);
      return { min_flow: { flow_m3s: sorted[sorted.length >> 1] as number, basis: 'minimum-flow line traced on the sheet (vertical: one flow)' } };
    }
    const byHead = [...line].sort((a, b) => a[1] - b[1]).map((p) => [p[0], p[1]] as CurvePoint);
    return { min_flow: { line: byHead, basis: 'minimum-flow line traced on the sheet (the limit at a head is the line\'s flow there)' } };
  }
  if (stated_m3s !== undefined && stated_m3s > 0) return { min_flow: { flow_m3s: stated_m3s, basis: 'minimum continuous flow stated with the sheet' } };
  return undefined;
}

export interface MinFlowAt {
  flow_m3s: number;
  /** The head lies beyond the ends of the traced line: its nearest end was used. */
  beyond_line: boolean;
  basis: string;
}

/**
 * The minimum continuous flow [m³/s] at an operating point of head `head_m` [m]: the fixed flow,
 * or the traced line's flow at that head (linear between its points; its nearest end outside
 * them, flagged). Undefined when the set states no minimum flow.
 */
export function minFlowAt(limits: Limits | undefined, head_m: number): MinFlowAt | undefined {
  const m = limits?.min_flow;
  if (!m) return undefined;
  if (m.line && m.line.length >= 2) {
    const pts = m.line;
    const first = pts[0] as CurvePoint;
    const last = pts[pts.length - 1] as CurvePoint;
    if (head_m <= first[1]) return { flow_m3s: first[0], beyond_line: head_m < first[1], basis: m.basis };
    if (head_m >= last[1]) return { flow_m3s: last[0], beyond_line: head_m > last[1], basis: m.basis };
    for (let i = 1; i < pts.length; i++) {
      const a = pts[i - 1] as CurvePoint;
      const b = pts[i] as CurvePoint;
      if (head_m <= b[1]) {
        const t = b[1] === a[1] ? 0 : (head_m - a[1]) / (b[1] - a[1]);
        return { flow_m3s: a[0] + t * (b[0] - a[0]), beyond_line: false, basis: m.basis };
      }
    }
  }
  if (m.flow_m3s !== undefined) return { flow_m3s: m.flow_m3s, beyond_line: false, basis: m.basis };
  return undefined;
}
