/**
 * The duty index of one curve set: a few boxes in (flow, head, efficiency bound) that the library
 * keeps in an R*Tree, so that a duty search touches only the sets that can meet the duty and, of
 * those, only the ones whose efficiency could still enter the ranking.
 *
 * For a diameter family the flow range of the largest head curve is cut into SLICES slices. On each
 * slice [a, b] the box spans, in head, from the lowest point of the smallest diameter's head curve
 * to the highest point of the largest diameter's head curve (0 when the smallest curve does not
 * cover the slice). These are exactly the duty screen's reject tests (dutyBounds.ts), so a duty
 * outside every box is one the screen would reject. The efficiency bound of a slice is the highest
 * efficiency any member reaches on [a/s, b·s]: a trim between two
 * diameters blends their efficiencies at flows scaled by at most s (fit/affinity.ts), so no trim
 * meeting a duty in the slice can be more efficient (s: the largest ratio of neighbouring diameters,
 * since a trim lies between the two captured diameters that bracket it). A speed family gets one box over its head
 * envelope, its efficiency bound taken over flows widened by the ±20 % speed band.
 * A set without an efficiency curve gets the bound NO_EFFICIENCY, below every real efficiency.
 * Pure: a function of the curve set alone. SI: m³/s, m, efficiency as a fraction.
 */
import type { CurveSet, Member, PolynomialFit } from '../model/curveset.ts';
import { extremaOn } from './dutyBounds.ts';
import type { CurveSetSummary } from './summary.ts';

/** [flow_min, flow_max, head_min, head_max, efficiency_bound] */
export type DutySlice = [number, number, number, number, number];

export const SLICES = 12;
/** Efficiency bound of a set that has no efficiency curve (ranks after every set that has one). */
export const NO_EFFICIENCY = -1;
/** Relative widening of each box, so round-off never drops a pump that meets the duty exactly. */
const SLACK = 1e-4;
/** Safety margin on the efficiency bound (relative, plus an absolute 1e-3). */
const EFFICIENCY_MARGIN = 2e-3;
/** Flow widening for a speed family: the library's ±20 % speed band, with room to spare. */
const SPEED_BAND = 1.3;

type Sized = Member & { diameter_m: number };

function maxEfficiency(members: Member[], a: number, b: number): number {
  let best = NO_EFFICIENCY;
  for (const m of members) {
    const fit: PolynomialFit | undefined = m.curves.efficiency?.fit;
    if (!fit) continue;
    const max = extremaOn(fit, Math.max(0, a), b).max;
    if (Number.isFinite(max) && max > best) best = max;
  }
  return best === NO_EFFICIENCY ? best : best * (1 + EFFICIENCY_MARGIN) + 1e-3;
}

function finite(slice: DutySlice): boolean {
  return slice.every(Number.isFinite) && slice[0] <= slice[1] && slice[2] <= slice[3];
}

export function dutySlices(set: CurveSet, summary: CurveSetSummary): DutySlice[] {
  if (!(summary.flowMinM3s <= summary.flowMaxM3s)) return [];
  const sized = set.members.filter((m): m is Sized => m.diameter_m !== undefined && !!m.curves.head?.fit).sort((x, y) => y.diameter_m - x.diameter_m);
  const envelope = (): DutySlice[] => {
    const slice: DutySlice = [
      summary.flowMinM3s * (1 - 0.05),
      summary.flowMaxM3s * (1 + 0.05),
      summary.headMinM * (1 - 0.05),
      summary.headMaxM * (1 + 0.05),
      maxEfficiency(set.members, summary.flowMinM3s / SPEED_BAND, summary.flowMaxM3s * SPEED_BAND),
    ];
    return finite(slice) ? [slice] : [];
  };
  if (set.family === 'speed' || sized.length === 0) return envelope();
  const full = sized[0] as Sized;
  const small = sized[sized.length - 1] as Sized;
  const fullHead = full.curves.head!.fit!;
  const smallHead = small.curves.head!.fit!;
  // A trim blends the two captured diameters that bracket it, so flows scale by at most the largest
  // ratio of neighbouring diameters (the duty screen's pair).
  let spread = 1;
  for (let i = 0; i + 1 < sized.length; i++) spread = Math.max(spread, (sized[i] as Sized).diameter_m / (sized[i + 1] as Sized).diameter_m);
  const [lo, hi] = fullHead.domain;
  if (!(hi > lo)) return envelope();
  const out: DutySlice[] = [];
  for (let i = 0; i < SLICES; i++) {
    const a = lo + ((hi - lo) * i) / SLICES;
    const b = i === SLICES - 1 ? hi : lo + ((hi - lo) * (i + 1)) / SLICES;
    const top = extremaOn(fullHead, a, b).max;
    const covered = smallHead.domain[0] <= a && b <= smallHead.domain[1];
    const bottom = covered ? extremaOn(smallHead, a, b).min : 0;
    const slice: DutySlice = [
      a - Math.abs(a) * SLACK,
      b + Math.abs(b) * SLACK,
      bottom - Math.abs(bottom) * SLACK,
      top * (1 + SLACK) + 1e-9,
      maxEfficiency(set.members, a / spread, b * spread),
    ];
    if (!finite(slice)) return envelope();
    out.push(slice);
  }
  return out;
}
