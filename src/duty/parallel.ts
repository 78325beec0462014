/**
 * Identical pumps running in parallel on one system.
 * The combined curve adds flows at equal head (see `parallelPumps`). Each pump's own flow is
 * checked against its POR, and the case of one pump left running alone (the others tripped or
 * stopped) is reported too, because a single pump then runs further out on its curve: more
 * flow, more power, more NPSH3 (common practice).
 */
import { parallelPumps, type PumpCurve } from './pumpCurve.ts';
import { figuresAt, operatingPoint, type OperatingPointResult, type PointFigures } from './operatingPoint.ts';
import type { SystemCurve } from './systemCurve.ts';

export interface ParallelResult {
  count: number;
  /** Operating point of the combination (total flow, combined power). */
  combined: OperatingPointResult;
  /** Each pump's own figures at its share of the flow, when the combination has an operating point. */
  per_pump?: PointFigures;
  /** One pump running alone on the same system. */
  single: OperatingPointResult;
}

export function parallelOperation(curve: PumpCurve, count: number, system: SystemCurve): ParallelResult {
  const combined = operatingPoint(parallelPumps(curve, count), system);
  const single = operatingPoint(curve, system);
  const result: ParallelResult = { count, combined, single };
  if (combined.status === 'ok') result.per_pump = figuresAt(curve, combined.point.flow_m3s / count);
  return result;
}
