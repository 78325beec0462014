/**
 * The speed at which a variable-speed pump meets the duty on the system curve.
 *
 * By the speed affinity law the curve at speed ratio r = n/n0 is H_r(Q) = r²·H(Q/r). The wanted
 * speed is the one whose curve crosses the system curve at the duty flow:
 *   r²·H(Q_d/r) = H_sys(Q_d).
 * The law is close to exact within ±20 % of speed (Karassik, Pump Handbook; Lobanoff & Ross);
 * further away the result is flagged. With a large static head the efficiency does NOT follow
 * the duty along an affinity parabola, which is why the efficiency is read at the new point.
 */
import { pumpCurveAtSpeed, type PumpCurve } from './pumpCurve.ts';
import { figuresAt, type PointFigures } from './operatingPoint.ts';
import { systemHead, type SystemCurve } from './systemCurve.ts';
import { bisect } from './solve.ts';

/** Speed ratios the search covers, and the band where the affinity law is close to exact. */
export const SPEED_SEARCH_RATIOS = [0.2, 1.5] as const;
export const SPEED_AFFINITY_BAND = [0.8, 1.2] as const;

export type SpeedResult =
  | {
      status: 'ok';
      speed_rpm: number;
      /** n / n_rated. */
      ratio: number;
      point: PointFigures;
      /** True when the ratio lies outside ±20 % of the curve's speed. */
      outside_affinity_band: boolean;
    }
  | { status: 'not-reachable'; reason: 'too-much-head' | 'too-little-head' | 'off-curve'; message: string };

/**
 * @param curve      pump curve at its rated speed
 * @param system     system curve; the duty flow must lie on it
 * @param flow_m3s   duty flow Q_d [m³/s], > 0
 */
export function speedToDuty(curve: PumpCurve, system: SystemCurve, flow_m3s: number): SpeedResult {
  const target = systemHead(system, flow_m3s);
  const gap = (r: number) => r * r * curve.head(flow_m3s / r) - target;
  const [rLo, rHi] = SPEED_SEARCH_RATIOS;
  // The scaled curve must cover the duty flow: Q_d/r inside the head domain.
  const lo = Math.max(rLo, flow_m3s / curve.domain[1]);
  const hi = curve.domain[0] > 0 ? Math.min(rHi, flow_m3s / curve.domain[0]) : rHi;
  if (!(lo < hi)) {
    return { status: 'not-reachable', reason: 'off-curve', message: `${curve.label}: no speed between ${rLo * 100} % and ${rHi * 100} % of rated puts the duty flow on the curve.` };
  }
  const gLo = gap(lo);
  const gHi = gap(hi);
  if (gLo > 0) {
    return { status: 'not-reachable', reason: 'too-much-head', message: `${curve.label}: even at ${Math.round(lo * 100)} % speed the pump gives more head than the system needs at the duty flow.` };
  }
  if (gHi < 0) {
    return { status: 'not-reachable', reason: 'too-little-head', message: `${curve.label}: even at ${Math.round(hi * 100)} % speed the pump cannot reach the system head at the duty flow.` };
  }
  const r = gLo === 0 ? lo : bisect(gap, lo, hi, gLo);
  const speed = curve.speed_rpm * r;
  const scaled = pumpCurveAtSpeed(curve, speed);
  return {
    status: 'ok',
    speed_rpm: speed,
    ratio: r,
    point: figuresAt(scaled, flow_m3s),
    outside_affinity_band: r < SPEED_AFFINITY_BAND[0] || r > SPEED_AFFINITY_BAND[1],
  };
}
