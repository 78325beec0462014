/**
 * The library's duty rule on top of the duty engine's `meetDuty`: a pump qualifies with one of
 * its captured diameters, or with a trim between its smallest and largest captured diameters
 * that stays within the usual trim limit (Lobanoff & Ross: about 80 % of full, 90 % for high
 * specific speed). A variable-speed family qualifies inside the ±20 % speed band where the
 * affinity law is close to exact. Trims beyond those are left to a deliberate duty check.
 */
import { meetDuty } from '../duty/meetDuty.ts';
import type { CurveSet } from '../model/curveset.ts';
import type { Duty, DutyAnswer, DutyMatcher } from './dutySearch.ts';

const SAME_DIAMETER = 1e-6;

const EXTRAPOLATED_WORDS: Record<string, string> = {
  head: 'the duty flow lies outside the head curve as captured',
  efficiency: 'efficiency is read beyond its captured range',
  power: 'power is read beyond its captured range',
  npshr: 'NPSHr is read beyond its captured range (check the NPSH margin with care)',
};

export const libraryMatcher: DutyMatcher = (set: CurveSet, duty: Duty): DutyAnswer | null => {
  const match = meetDuty(set, { flow_m3s: duty.flow_m3s, head_m: duty.head_m, ...(duty.static_head_m === undefined ? {} : { static_head_m: duty.static_head_m }) });
  if (match.status !== 'meets' || !match.point) return null;
  if (match.method === 'trim' && (match.trim_extrapolated || match.below_trim_limit)) return null;
  if (match.method === 'speed' && match.outside_affinity_band) return null;
  if (match.point.extrapolated.includes('head')) return null;

  const diameter = match.diameter_m ?? null;
  const captured = set.members.some((m) => m.diameter_m !== undefined && diameter !== null && Math.abs(m.diameter_m - diameter) <= SAME_DIAMETER * diameter);
  const p = match.point;
  const answer: DutyAnswer = {
    method: match.method,
    diameter_m: diameter,
    trimmed: match.method === 'trim' && !captured,
    speed_rpm: match.speed_rpm ?? set.speed_rpm,
    por_position: p.por_position,
    message: match.message,
    warnings: p.extrapolated.map((q) => EXTRAPOLATED_WORDS[q] ?? `${q} is extrapolated`),
  };
  if (p.efficiency !== undefined) answer.efficiency = p.efficiency;
  if (p.power_W !== undefined) answer.power_W = p.power_W;
  if (p.npshr_m !== undefined) answer.npshr_m = p.npshr_m;
  if (p.flow_to_bep !== undefined) answer.flow_to_bep = p.flow_to_bep;
  return answer;
};
