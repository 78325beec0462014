/**
 * The duty card of a revision: the few numbers a duty search needs to bound, without the duty
 * engine, how a diameter family meets a duty. Written beside each entry's latest revision when it
 * is saved (and filled in for older rows by the schema 3 backfill), a few hundred bytes.
 *
 * It holds, per captured diameter (largest first), the fitted head, efficiency and power curves as
 * plain coefficients. From them `cardBound` works out, at the duty flow Q and head H:
 *
 * 1. the impeller diameter D* whose trimmed curve passes through the duty, to a relative width of
 *    about 1e-7. The trimmed curve is the duty engine's (fit/affinity.ts `memberAtDiameter`): between
 *    two captured diameters D_L < D < D_U, with w = (D − D_L)/(D_U − D_L),
 *      H_D(Q) = w·(D/D_U)²·H_U(Q·D_U/D) + (1 − w)·(D/D_L)²·H_L(Q·D_L/D),
 *    and beyond the captured range the nearest member scaled alone. The engine (duty/trim.ts) looks
 *    for D* by bisection between min(D_smallest, 0.7·D_full) and D_full and, like it, this assumes
 *    that head rises with diameter at the duty flow; the card checks that on a grid of diameters and
 *    gives no bound (the search then evaluates the set) when it does not;
 * 2. an upper bound on the efficiency and a lower bound on the power of that trim at Q: the blend
 *    above is linear in w, so on [D1, D2] ∋ D*, η ≤ max over w ∈ {w1, w2} of w·max η_U + (1 − w)·max η_L,
 *    each maximum taken over the flows Q·D_U/D, Q·D_L/D for D in [D1, D2]; power alike (P ∝ D³);
 * 3. whether the set surely cannot meet the duty: the duty lies above the full curve or below the
 *    search range, needs a trim below the smallest captured diameter, or lies outside the trimmed
 *    head curve's flow range (the library's matcher refuses all of these, matcher.ts), each with a
 *    margin far wider than round-off.
 * So the search runs the duty engine only on the sets whose bound can still enter the ranking, and
 * the ranking stays that of the engine run on every set (tests/library/dutyCard.test.ts).
 * Speed families and sets the card cannot describe get no card; the search then reads their search
 * copy and screens them as before (dutyBounds.ts).
 * Pure: a function of the curve set alone. SI: m³/s, m, W, efficiency as a fraction.
 */
import type { CurveSet, PolynomialFit } from '../model/curveset.ts';
import { membersByDiameter } from '../fit/affinity.ts';
import { STANDARD_GRAVITY } from '../units/constants.ts';
import { TRIM_SEARCH_FLOOR } from '../duty/meetDuty.ts';
import { extremaOn } from './dutyBounds.ts';

/** A fitted polynomial, compact: [flow_scale, domain_lo, domain_hi, c0, c1, …]. */
export type CardFit = number[];
/** One captured diameter: [diameter_m, head, efficiency or null, power or null]. */
export type CardMember = [number, CardFit, CardFit | null, CardFit | null];

export interface DutyCard {
  /** Format of the card; a search ignores a card of another version. */
  v: 1;
  /** Captured diameters, largest first. */
  m: CardMember[];
  /** Density of the curve set's fluid, kg/m³ (power from head and efficiency). */
  rho: number;
}

export const DUTY_CARD_VERSION = 1;

export interface CardBound {
  /** True when no trim of this set can meet the duty as the library's matcher asks. */
  reject: boolean;
  /** Largest efficiency (fraction) the trim meeting the duty can have; -1 without an efficiency curve; Infinity when unknown. */
  efficiencyBound: number;
  /** Smallest shaft power (W) it can need; 0 when unknown, Infinity when it has no power figure at all. */
  powerBound: number;
}

const UNKNOWN: CardBound = { reject: false, efficiencyBound: Infinity, powerBound: 0 };
const REJECT: CardBound = { reject: true, efficiencyBound: -Infinity, powerBound: Infinity };
/** Efficiency of a set without an efficiency curve (the search ranks it as -1). */
const NO_EFFICIENCY = -1;
/** Head tolerance, relative to the duty head: far above round-off, far below any real difference. */
const HEAD_TOLERANCE = 1e-9;
/** Relative widening of the bracket around D*, tried in turn. */
const WIDENINGS = [1e-7, 1e-5, 1e-3];
/** Grid points per diameter span on which head must rise with diameter. */
const MONOTONE_SAMPLES = 6;
/** Margins on the bounds: absolute and relative. */
const MARGIN = 1e-6;

function packFit(fit: PolynomialFit | undefined): CardFit | null {
  if (!fit) return null;
  return [fit.flow_scale, fit.domain[0], fit.domain[1], ...fit.coefficients];
}

/** The card of a curve set, or null for a speed family or a set the card cannot describe. */
export function dutyCardOf(set: CurveSet): DutyCard | null {
  if (set.family === 'speed') return null;
  const sorted = membersByDiameter(set);
  if (sorted.length === 0) return null;
  const m: CardMember[] = [];
  for (let i = 0; i < sorted.length; i++) {
    const member = sorted[i]!;
    const d = member.diameter_m as number;
    const head = packFit(member.curves.head?.fit);
    if (!head || !(d > 0) || (i > 0 && !(d < m[i - 1]![0]))) return null;
    m.push([d, head, packFit(member.curves.efficiency?.fit), packFit(member.curves.power?.fit)]);
  }
  return { v: DUTY_CARD_VERSION, m, rho: set.fluid.density_kg_m3 };
}

/**
 * The stored form of a card: little-endian float64 numbers, read back without parsing text:
 * [version, density, member count, then per member: diameter, and for head, efficiency and power
 * the length of its CardFit (0 when absent) followed by its numbers].
 */
export function encodeDutyCard(card: DutyCard): Uint8Array {
  const out: number[] = [card.v, card.rho, card.m.length];
  for (const [d, head, eta, power] of card.m) {
    out.push(d);
    for (const fit of [head, eta, power]) {
      out.push(fit ? fit.length : 0);
      if (fit) out.push(...fit);
    }
  }
  const bytes = new Uint8Array(out.length * 8);
  const view = new DataView(bytes.buffer);
  out.forEach((x, i) => view.setFloat64(i * 8, x, true));
  return bytes;
}

/** Reads a stored card; null for a missing, damaged or other-version one (the search then screens the search copy). */
export function decodeDutyCard(bytes: Uint8Array | null | undefined): DutyCard | null {
  if (!bytes || bytes.length < 24 || bytes.length % 8 !== 0) return null;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const n = bytes.length / 8;
  const at = (i: number) => view.getFloat64(i * 8, true);
  if (at(0) !== DUTY_CARD_VERSION) return null;
  const count = at(2);
  if (!Number.isInteger(count) || count < 1 || count > 1000) return null;
  const m: CardMember[] = [];
  let i = 3;
  const fit = (): CardFit | null | undefined => {
    if (i >= n) return undefined;
    const len = at(i++);
    if (len === 0) return null;
    if (!Number.isInteger(len) || len < 4 || i + len > n) return undefined;
    const f: CardFit = [];
    for (let k = 0; k < len; k++) f.push(at(i++));
    return f;
  };
  for (let k = 0; k < count; k++) {
    if (i >= n) return null;
    const d = at(i++);
    const head = fit();
    const eta = fit();
    const power = fit();
    if (!head || eta === undefined || power === undefined) return null;
    m.push([d, head, eta, power]);
  }
  return i === n ? { v: DUTY_CARD_VERSION, m, rho: at(1) } : null;
}

function value(fit: CardFit, q: number): number {
  const t = q / (fit[0] as number);
  let y = 0;
  for (let i = fit.length - 1; i >= 3; i--) y = y * t + (fit[i] as number);
  return y;
}

function extrema(fit: CardFit, a: number, b: number): { min: number; max: number } {
  return extremaOn({ flow_scale: fit[0] as number, coefficients: fit.slice(3) } as PolynomialFit, a, b);
}

/** The piece of the trim law that holds at diameter d: one member scaled, or a pair blended. */
interface Piece {
  upper: CardMember;
  lower: CardMember | null;
}

function pieceAt(m: CardMember[], d: number): Piece {
  const largest = m[0] as CardMember;
  const smallest = m[m.length - 1] as CardMember;
  if (d >= largest[0]) return { upper: largest, lower: null };
  if (d <= smallest[0]) return { upper: smallest, lower: null };
  let i = 0;
  while ((m[i + 1] as CardMember)[0] > d) i++;
  const lower = m[i + 1] as CardMember;
  if (lower[0] === d) return { upper: lower, lower: null };
  return { upper: m[i] as CardMember, lower };
}

/** Head of the trimmed curve at diameter d and flow q (the engine's blend, fit/affinity.ts). */
function headAt(m: CardMember[], d: number, q: number): number {
  const p = pieceAt(m, d);
  const rU = d / p.upper[0];
  const hU = rU * rU * value(p.upper[1], q / rU);
  if (!p.lower) return hU;
  const rL = d / p.lower[0];
  const w = (d - p.lower[0]) / (p.upper[0] - p.lower[0]);
  return w * hU + (1 - w) * rL * rL * value(p.lower[1], q / rL);
}

/** The trimmed head curve's flow range at diameter d (overlap of the two scaled ranges). */
function domainAt(m: CardMember[], d: number): [number, number] {
  const p = pieceAt(m, d);
  const rU = d / p.upper[0];
  let lo = (p.upper[1][1] as number) * rU;
  let hi = (p.upper[1][2] as number) * rU;
  if (p.lower) {
    const rL = d / p.lower[0];
    lo = Math.max(lo, (p.lower[1][1] as number) * rL);
    hi = Math.min(hi, (p.lower[1][2] as number) * rL);
  }
  return [lo, Math.max(lo, hi)];
}

/**
 * Bounds of the trim meeting (q, h) for a card (see the file comment). Never rejects a set the
 * matcher would accept, and never bounds below the efficiency (above the power) the engine finds,
 * as long as head rises with diameter at the duty flow, which it checks.
 */
export function cardBound(card: DutyCard, q: number, h: number): CardBound {
  const m = card.m;
  const full = (m[0] as CardMember)[0];
  const smallest = (m[m.length - 1] as CardMember)[0];
  const floor = Math.min(smallest, TRIM_SEARCH_FLOOR * full);
  const tol = HEAD_TOLERANCE * h;
  const gap = (d: number) => headAt(m, d, q) - h;
  const gFull = gap(full);
  const gFloor = gap(floor);
  if (!Number.isFinite(gFull) || !Number.isFinite(gFloor)) return UNKNOWN;
  if (gFull < -tol || gFloor > tol) return REJECT;

  // Head must rise with diameter over the search range, or the bracket below proves nothing.
  const stops = [floor, ...m.map((x) => x[0]).filter((d) => d > floor).reverse()];
  let last = gFloor;
  for (let s = 0; s + 1 < stops.length; s++) {
    const a = stops[s] as number;
    const b = stops[s + 1] as number;
    for (let k = 1; k <= MONOTONE_SAMPLES; k++) {
      const g = gap(a + ((b - a) * k) / MONOTONE_SAMPLES);
      if (!(g >= last - tol)) return UNKNOWN;
      last = g;
    }
  }

  // Bisection in this arithmetic, then a bracket [d1, d2] whose ends are clearly below and above.
  let lo = floor;
  let hi = full;
  for (let k = 0; k < 80 && hi - lo > 1e-13 * full; k++) {
    const mid = 0.5 * (lo + hi);
    if (gap(mid) < 0) lo = mid;
    else hi = mid;
  }
  let d1 = Number.NaN;
  let d2 = Number.NaN;
  for (const widen of WIDENINGS) {
    const a = Math.max(floor, lo - widen * full);
    const b = Math.min(full, hi + widen * full);
    if ((a === floor || gap(a) < -tol) && (b === full || gap(b) > tol)) {
      d1 = a;
      d2 = b;
      break;
    }
  }
  if (!Number.isFinite(d1)) return UNKNOWN;

  // Split [d1, d2] where the trim law changes piece (at captured diameters).
  const cuts = [d1, ...m.map((x) => x[0]).filter((d) => d > d1 && d < d2).reverse(), d2];
  let eta = -Infinity;
  let power = Infinity;
  let possible = false;
  for (let i = 0; i + 1 < cuts.length; i++) {
    const x1 = cuts[i] as number;
    const x2 = cuts[i + 1] as number;
    // A trim below the smallest captured diameter is an extrapolation the matcher refuses.
    if (x2 < smallest * (1 - 1e-9) * (1 - 1e-7)) continue;
    // The duty flow outside the trimmed head curve's range: refused too (head extrapolated).
    const [loA, hiA] = domainAt(m, x1);
    const [loB, hiB] = domainAt(m, x2);
    const hiMax = Math.max(hiA, hiB);
    const slack = 1e-6 * Math.max(Math.abs(hiMax), 1e-12);
    if (q > hiMax + slack || q < Math.min(loA, loB) - slack) continue;
    possible = true;
    const b = pieceBound(card, pieceAt(m, 0.5 * (x1 + x2)), x1, x2, q, h);
    if (b.eta > eta) eta = b.eta;
    if (b.power < power) power = b.power;
  }
  if (!possible) return REJECT;
  if (!Number.isFinite(eta) && eta !== -Infinity) return UNKNOWN;
  const efficiencyBound = eta === -Infinity || eta === NO_EFFICIENCY ? NO_EFFICIENCY : eta + MARGIN + MARGIN * Math.abs(eta);
  const powerBound = Number.isNaN(power) ? 0 : power === Infinity ? Infinity : Math.max(0, power - MARGIN * Math.abs(power));
  return { reject: false, efficiencyBound, powerBound };
}

/** Efficiency (upper) and power (lower) bounds of the trims d ∈ [x1, x2], all on one piece of the trim law. */
function pieceBound(card: DutyCard, p: Piece, x1: number, x2: number, q: number, h: number): { eta: number; power: number } {
  // Flows at which a member's curve is read for the trims in [x1, x2]: q·D_member/d.
  const span = (member: CardMember): [number, number] => [(q * member[0]) / x2, (q * member[0]) / x1];
  const cube = (member: CardMember): [number, number] => [(x1 / member[0]) ** 3, (x2 / member[0]) ** 3];
  const maxEta = (member: CardMember) => (member[2] ? extrema(member[2], ...span(member)).max : null);
  const minPower = (member: CardMember) => {
    if (!member[3]) return null;
    const low = extrema(member[3], ...span(member)).min;
    const [c1, c2] = cube(member);
    return low >= 0 ? c1 * low : c2 * low;
  };
  let eta: number | null;
  let power: number | null;
  if (!p.lower) {
    eta = maxEta(p.upper);
    power = minPower(p.upper);
  } else {
    const lower = p.lower;
    const w = (d: number) => (d - lower[0]) / (p.upper[0] - lower[0]);
    const w1 = w(x1);
    const w2 = w(x2);
    // Both fitted: the blend is linear in w, so its extremes over [w1, w2] lie at the ends.
    // One fitted: the engine keeps one of the two curves (affinity.ts), perhaps the unfitted one,
    // so the efficiency is at most the fitted one's (or absent), and the power is not bounded.
    const eu = maxEta(p.upper);
    const el = maxEta(lower);
    eta = eu !== null && el !== null ? Math.max(w1 * eu + (1 - w1) * el, w2 * eu + (1 - w2) * el) : eu ?? el;
    const pu = minPower(p.upper);
    const pl = minPower(lower);
    if (pu !== null && pl !== null) power = Math.min(w1 * pu + (1 - w1) * pl, w2 * pu + (1 - w2) * pl);
    else if (pu !== null || pl !== null) return { eta: eta ?? NO_EFFICIENCY, power: 0 };
    else power = null;
  }
  if (power === null) {
    // No power curve: P = ρ·g·Q·H/η at the duty, where the trimmed curve's head is H.
    power = eta !== null && eta > 0 ? (card.rho * STANDARD_GRAVITY * q * h) / eta : eta === null ? Infinity : 0;
  }
  return { eta: eta ?? NO_EFFICIENCY, power };
}

/** For tests: the head of the trimmed curve at a diameter, as the card computes it. */
export const cardHeadAt = (card: DutyCard, d: number, q: number): number => headAt(card.m, d, q);
