/**
 * Limits on the size of inputs, so that a runaway file is refused with a sentence instead of
 * exhausting memory or time. Each limit sits far beyond any real performance sheet:
 *
 * - MAX_POINTS_PER_CURVE = 20 000. A hand take-off has 5–40 points per curve; a vector
 *   capture 100–300 (the committed sample sheets: 68–234); a raster trace at most one point
 *   per pixel column, about 4 800 across a full page width at 600 dpi. 20 000 is four times that.
 * - MAX_POINTS_PER_SET = 100 000. Sixteen diameters × four quantities × 1 500 points; the
 *   samples hold about 2 500.
 * - MAX_TABLE_ROWS = 100 000. A points table holds one curve set, so the same bound; a typed
 *   table has a few hundred rows.
 * - MAX_MEMBERS = 100. A sheet shows 3–8 impeller diameters (a variable-speed family 10–20
 *   speeds); 100 is five times the largest, and keeps the family checks (each member against
 *   its neighbours) well under a second.
 */
import { UserError } from './errors.ts';

export const MAX_POINTS_PER_CURVE = 20_000;
export const MAX_POINTS_PER_SET = 100_000;
export const MAX_TABLE_ROWS = 100_000;
export const MAX_MEMBERS = 100;

/**
 * Largest magnitude of a captured value, SI, far beyond any pump: the largest pumps move about
 * 60 m³/s, the highest-head ones about 5 000 m (multistage boiler feed), the most powerful draw
 * about 100 MW, and NPSHr stays below 100 m. A value beyond these is a slip (a unit, an
 * exponent, a column) and, squared in a fit, could overflow to Infinity.
 */
export const MAX_MAGNITUDE_SI = { flow: 1e3, head: 1e5, npshr: 1e4, power: 1e10, efficiency: 10 } as const;

export class LimitError extends UserError {
  override name = 'LimitError';
  constructor(message: string) {
    super(message, 'too-large');
  }
}

/** "100 000" (thin spaces would not survive every terminal; a plain space groups the digits). */
function grouped(n: number): string {
  return String(n).replace(/\B(?=(\d{3})+(?!\d))/g, ' ');
}

export function tooManyRows(what: string): LimitError {
  return new LimitError(`${what} has more than ${grouped(MAX_TABLE_ROWS)} rows, the limit for one curve set (a sheet needs a few hundred); thin the points or split the table by pump.`);
}

interface Sized {
  diameter_m?: number | undefined;
  speed_rpm?: number | undefined;
  points: Partial<Record<string, readonly unknown[] | undefined>>;
}

/**
 * Refuses a family with more members or points than the limits above. `what` names the
 * input in the sentence ("The curve set", "The take-off").
 */
export function checkSizeLimits(members: readonly Sized[], what: string, nameMember?: (m: Sized) => string): void {
  if (members.length > MAX_MEMBERS) {
    throw new LimitError(`${what} has ${grouped(members.length)} diameters or speeds, more than the limit of ${grouped(MAX_MEMBERS)} (a sheet shows up to about 20); split it into several curve sets.`);
  }
  let total = 0;
  for (const m of members) {
    for (const [quantity, points] of Object.entries(m.points)) {
      const n = points?.length ?? 0;
      total += n;
      if (n > MAX_POINTS_PER_CURVE) {
        const who = nameMember?.(m) ?? (m.diameter_m !== undefined ? `diameter ${Number((m.diameter_m * 1000).toPrecision(6))} mm` : `speed ${m.speed_rpm} rpm`);
        throw new LimitError(`${what} has ${grouped(n)} ${quantity} points for ${who}, more than the limit of ${grouped(MAX_POINTS_PER_CURVE)} per curve (a traced curve needs a few hundred); thin the points.`);
      }
    }
  }
  if (total > MAX_POINTS_PER_SET) {
    throw new LimitError(`${what} has ${grouped(total)} points in all, more than the limit of ${grouped(MAX_POINTS_PER_SET)} for one curve set (a sheet needs a few thousand at most); thin the points.`);
  }
}

/** The build input: members with their points per quantity. */
export function checkBuildLimits(members: readonly Sized[], what = 'The input', nameMember?: (m: Sized) => string): void {
  checkSizeLimits(members, what, nameMember);
}

/** A curve set as read: members with `curves[quantity].points`. */
export function checkCurveSetLimits(set: { members: readonly { diameter_m?: number | undefined; speed_rpm?: number | undefined; curves: Partial<Record<string, { points: readonly unknown[] } | undefined>> }[] }, what = 'The curve set'): void {
  checkSizeLimits(
    set.members.map((m) => ({
      diameter_m: m.diameter_m,
      speed_rpm: m.speed_rpm,
      points: Object.fromEntries(Object.entries(m.curves).map(([q, c]) => [q, c?.points])),
    })),
    what,
  );
}

/**
 * Refuses one trace or captured line with more points than a curve may hold; call it as
 * each trace is captured, before anything walks the points. `what` names the trace.
 */
export function checkTracePoints(count: number, what: string): void {
  if (count > MAX_POINTS_PER_CURVE) {
    throw new LimitError(`${what} has ${grouped(count)} points, more than the limit of ${grouped(MAX_POINTS_PER_CURVE)} per trace (a traced curve needs a few hundred); thin its points or give it guides instead.`);
  }
}

/** Refuses a take-off whose traces hold more points in all than one curve set may. */
export function checkTotalPoints(count: number, what: string): void {
  if (count > MAX_POINTS_PER_SET) {
    throw new LimitError(`${what} has ${grouped(count)} points in all, more than the limit of ${grouped(MAX_POINTS_PER_SET)} for one curve set (a sheet needs a few thousand at most); thin the points.`);
  }
}

/**
 * The same limits on a curve-set document before it is validated, so that a runaway file is
 * refused before the schema walks every point. Anything not shaped like a curve set passes
 * through untouched: validation names it.
 */
export function checkCurveSetDocumentLimits(doc: unknown, what = 'The curve set'): void {
  const members = (doc as { members?: unknown } | null)?.members;
  if (!Array.isArray(members)) return;
  checkSizeLimits(
    members.map((m: unknown) => {
      const member = (m ?? {}) as { diameter_m?: unknown; speed_rpm?: unknown; curves?: unknown };
      const curves = member.curves && typeof member.curves === 'object' ? (member.curves as Record<string, unknown>) : {};
      const points: Record<string, readonly unknown[]> = {};
      for (const [q, c] of Object.entries(curves)) {
        const list = (c as { points?: unknown } | null)?.points;
        if (Array.isArray(list)) points[q] = list;
      }
      return {
        diameter_m: typeof member.diameter_m === 'number' ? member.diameter_m : undefined,
        speed_rpm: typeof member.speed_rpm === 'number' ? member.speed_rpm : undefined,
        points,
      };
    }),
    what,
  );
}
