/**
 * Is every quantity where it belongs? A stray diameter from a mistyped row, or a curve set
 * without any head curve, is otherwise silent:
 * - `set.no-head` (fail): no member has a head curve. Head against flow is what every duty,
 *   affinity and power check starts from; without it the set describes no pump.
 * - `member.no-head` (fail): a member has curves but no head curve while others do. A sheet
 *   draws each impeller's head curve and, at most, its power, efficiency and NPSHr; a diameter
 *   with power or NPSHr alone is almost always a diameter typed wrong in one row.
 * - `member.single-quantity` (note): a member with a head curve only while the others have
 *   more (common on sheets for trimmed impellers; said so the engineer can confirm it).
 * - `member.missing-quantity` (warn): a quantity that every other member (at least two) has
 *   but this one lacks: the curve's rows were probably given another diameter.
 */
import type { CurveSet, Finding, Member, Quantity } from '../../model/curveset.ts';
import { QUANTITIES, QUANTITY_WORDS } from '../../model/curveset.ts';
import type { Display } from './display.ts';
import { makeFinding } from './finding.ts';

const NAMES = QUANTITY_WORDS;
const METHOD = 'Each impeller of a sheet has a head curve, and the curves drawn for one impeller are drawn for its neighbours (common practice)';

const has = (m: Member, q: Quantity) => (m.curves[q]?.points.length ?? 0) > 0 || m.curves[q]?.fit !== undefined;
const held = (m: Member) => QUANTITIES.filter((q) => has(m, q));

function listed(items: readonly string[]): string {
  return items.length <= 1 ? (items[0] ?? '') : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

export function completenessFindings(set: Pick<CurveSet, 'members' | 'family'>, show: Display): Finding[] {
  const out: Finding[] = [];
  const what = set.family === 'speed' ? 'speed' : 'diameter';
  const withHead = set.members.filter((m) => has(m, 'head'));
  if (withHead.length === 0) {
    const present = QUANTITIES.filter((q) => set.members.some((m) => has(m, q))).map((q) => NAMES[q]);
    out.push(
      makeFinding({
        code: 'set.no-head',
        severity: 'fail',
        message: `The curve set has no head curve${present.length ? `, only ${listed(present)}` : ''}; a pump is described by its head against flow. Add the head points (quantity "head") of each ${what}, or check the quantity of each row or trace.`,
        method: METHOD,
        figures: { members: set.members.length },
      }),
    );
    return out;
  }
  const others = (m: Member) => set.members.filter((o) => o !== m);
  const sizes = listed(withHead.map((m) => show.member(m)));
  for (const m of set.members) {
    const mine = held(m);
    if (mine.length === 0) continue;
    if (!mine.includes('head')) {
      out.push(
        makeFinding({
          code: 'member.no-head',
          severity: 'fail',
          member: m,
          message: `The ${show.member(m)} ${what} has only ${listed(mine.map((q) => `a ${NAMES[q]} curve`))} and no head curve, while ${sizes} have one; it is probably a ${what} mistyped in those rows or traces. Correct the ${what}, or add its head curve.`,
          method: METHOD,
          figures: { quantities: mine.length },
        }),
      );
      continue;
    }
    const rest = others(m).filter((o) => has(o, 'head'));
    if (rest.length < 2) continue;
    const missing = QUANTITIES.filter((q) => !mine.includes(q) && rest.every((o) => has(o, q)));
    for (const q of missing) {
      out.push(
        makeFinding({
          code: 'member.missing-quantity',
          severity: 'warn',
          member: m,
          quantity: q,
          message: `The ${show.member(m)} ${what} has no ${NAMES[q]} curve, while all ${rest.length} other ${what}s have one; if its ${NAMES[q]} rows or trace were given another ${what}, correct them.`,
          method: METHOD,
          figures: { others_with_it: rest.length },
        }),
      );
    }
    if (mine.length === 1 && missing.length === 0 && rest.some((o) => held(o).length > 1)) {
      out.push(
        makeFinding({
          code: 'member.single-quantity',
          severity: 'note',
          member: m,
          quantity: 'head',
          message: `The ${show.member(m)} ${what} has a head curve only; its efficiency, power and NPSHr are not known from this set.`,
          method: METHOD,
        }),
      );
    }
  }
  return out;
}
