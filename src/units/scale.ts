/**
 * The one chart scale: maps a domain value (flow, head … in display units) to a range value
 * (pixels) and back. A log scale is the linear core plus a transform (log10) and its
 * untransform (10^x), so both share `invert`, which is the exact inverse of the mapping up to
 * rounding. Edge cases have a defined answer:
 * - a degenerate domain (d0 = d1) maps every value to the middle of the range, and `invert`
 *   gives d0 back;
 * - a degenerate range (r0 = r1) inverts every value to the middle of the domain;
 * - a log scale needs a domain of one sign, without zero (a programmer error otherwise).
 * Tick values are round numbers: 1, 2 or 5 times a power of ten.
 */

export type ScaleKind = 'linear' | 'log';

export interface Scale {
  readonly kind: ScaleKind;
  readonly domain: readonly [number, number];
  readonly range: readonly [number, number];
  /** Domain value → range value. */
  map(value: number): number;
  /** Range value → domain value; `invert(map(x)) = x` up to rounding. */
  invert(value: number): number;
  /** Round values inside the domain, about `count` of them (log: powers of ten, with 2 and 5 when there is room). */
  ticks(count?: number): number[];
}

/** A refused scale construction: a bug in the caller (user input is checked before it reaches a chart). */
export class ScaleError extends Error {
  override name = 'ScaleError';
}

function checkPair(pair: readonly [number, number], what: string): void {
  if (!Number.isFinite(pair[0]) || !Number.isFinite(pair[1])) throw new ScaleError(`A scale ${what} needs two finite numbers, not [${pair[0]}, ${pair[1]}].`);
}

/** The linear core on already-transformed values. */
function core(d0: number, d1: number, r0: number, r1: number) {
  const dSpan = d1 - d0;
  const rSpan = r1 - r0;
  return {
    map: (t: number) => (dSpan === 0 ? (r0 + r1) / 2 : r0 + ((t - d0) / dSpan) * rSpan),
    invert: (r: number) => (dSpan === 0 ? d0 : rSpan === 0 ? (d0 + d1) / 2 : d0 + ((r - r0) / rSpan) * dSpan),
  };
}

export function scaleLinear(domain: readonly [number, number], range: readonly [number, number]): Scale {
  checkPair(domain, 'domain');
  checkPair(range, 'range');
  const c = core(domain[0], domain[1], range[0], range[1]);
  return {
    kind: 'linear',
    domain: [domain[0], domain[1]],
    range: [range[0], range[1]],
    map: c.map,
    invert: c.invert,
    ticks: (count = 5) => linearTicks(domain[0], domain[1], count),
  };
}

export function scaleLog(domain: readonly [number, number], range: readonly [number, number]): Scale {
  checkPair(domain, 'domain');
  checkPair(range, 'range');
  const [a, b] = domain;
  if (a === 0 || b === 0 || Math.sign(a) !== Math.sign(b)) throw new ScaleError(`A log scale needs a domain of one sign without zero, not [${a}, ${b}].`);
  const sign = Math.sign(a);
  const transform = (v: number) => Math.log10(sign * v);
  const untransform = (t: number) => sign * 10 ** t;
  const c = core(transform(a), transform(b), range[0], range[1]);
  return {
    kind: 'log',
    domain: [a, b],
    range: [range[0], range[1]],
    map: (v) => c.map(transform(v)),
    invert: (r) => untransform(c.invert(r)),
    ticks: (count = 5) => logTicks(Math.min(sign * a, sign * b), Math.max(sign * a, sign * b), count).map((t) => sign * t).sort((x, y) => x - y),
  };
}

export function scaleOf(kind: ScaleKind, domain: readonly [number, number], range: readonly [number, number]): Scale {
  return kind === 'log' ? scaleLog(domain, range) : scaleLinear(domain, range);
}

/** A round step (1, 2 or 5 × 10^k) that cuts `span` into about `count` parts; 1 for an empty or odd span. */
export function niceStep(span: number, count: number): number {
  if (!(span > 0) || !Number.isFinite(span)) return 1;
  const raw = span / Math.max(1, count);
  const power = 10 ** Math.floor(Math.log10(raw));
  const scaled = raw / power;
  const factor = scaled <= 1 ? 1 : scaled <= 2 ? 2 : scaled <= 5 ? 5 : 10;
  return factor * power;
}

const clean = (v: number, step: number) => (Math.abs(v) < step * 1e-9 ? 0 : Number(v.toPrecision(12)));

/** Round values from lo to hi in steps of `step` (both multiples of it). */
function stepsBetween(lo: number, hi: number, step: number): number[] {
  const out: number[] = [];
  const first = Math.round(lo / step);
  const last = Math.round(hi / step);
  for (let k = first; k <= last; k++) out.push(clean(k * step, step));
  return out;
}

/** Round tick values inside [min, max] (either order). A degenerate domain gives its one value. */
export function linearTicks(min: number, max: number, count = 5): number[] {
  const lo = Math.min(min, max);
  const hi = Math.max(min, max);
  if (!(hi > lo)) return Number.isFinite(lo) ? [lo] : [];
  const step = niceStep(hi - lo, count);
  return stepsBetween(Math.ceil(lo / step - 1e-9) * step, Math.floor(hi / step + 1e-9) * step, step);
}

/** Log ticks inside [lo, hi] (0 < lo ≤ hi): each power of ten, with 2 and 5 times it when the decades are few. */
function logTicks(lo: number, hi: number, count: number): number[] {
  const first = Math.floor(Math.log10(lo));
  const last = Math.ceil(Math.log10(hi));
  const multiples = last - first <= Math.max(1, count) / 2 ? [1, 2, 5] : [1];
  const out: number[] = [];
  for (let e = first; e <= last; e++) {
    for (const m of multiples) {
      const v = Number((m * 10 ** e).toPrecision(12));
      if (v >= lo * (1 - 1e-12) && v <= hi * (1 + 1e-12)) out.push(v);
    }
  }
  return out;
}

/**
 * An axis for a chart: the span [min, max] widened to whole round steps, with its ticks.
 * A degenerate span (max ≤ min) is first widened by 10 % of |min| each way (by 1 when min is 0).
 */
export function niceTicks(min: number, max: number, count = 5): { ticks: number[]; lo: number; hi: number } {
  if (!Number.isFinite(min) || !Number.isFinite(max)) throw new ScaleError(`A chart axis needs a finite span, not ${min} to ${max}.`);
  if (!(max > min)) {
    const pad = Math.abs(min) * 0.1 || 1;
    return niceTicks(min - pad, max + pad, count);
  }
  const step = niceStep(max - min, count);
  const lo = Math.floor(min / step + 1e-9) * step;
  const hi = Math.ceil(max / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let v = lo; v <= hi + step * 1e-6; v += step) ticks.push(clean(v, step));
  return { ticks, lo, hi };
}

/** A linear scale over a nice axis: the domain widened to round steps, its ticks, mapped onto `range`. */
export function niceLinearScale(min: number, max: number, range: readonly [number, number], count = 5): Scale & { readonly tickValues: number[] } {
  const axis = niceTicks(min, max, count);
  return { ...scaleLinear([axis.lo, axis.hi], range), tickValues: axis.ticks };
}
