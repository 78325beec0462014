/**
 * What the library asks of a curve set before it keeps it, and the findings summary it keeps with
 * every revision:
 * - its display units are units Pumpscribe knows (a set in unknown units cannot be shown honestly);
 * - it has at least one fitted head curve (without one, no duty search can ever find it);
 * - it has no `fail` finding, unless the caller says so explicitly (`--accept-failing`,
 *   `?accept_failing=true`); such a set is then marked, and ranked after sound sets by duty search.
 * The findings are those stored in the set together with the checks run again here, so a set
 * whose findings were stripped by hand is still judged by its curves.
 */
import type { CurveSet, Finding } from '../model/curveset.ts';
import { runChecks } from '../fit/checks/index.ts';
import { parseUnit, type QuantityKind } from '../units/index.ts';
import { LibraryError } from './errors.ts';

export interface FindingsSummary {
  fail_count: number;
  warn_count: number;
  /** Distinct codes of the `fail` findings, sorted. */
  fail_codes: string[];
}

const UNIT_KINDS: Array<[keyof CurveSet['display_units'], QuantityKind]> = [
  ['flow', 'flow'],
  ['head', 'head'],
  ['npsh', 'head'],
  ['power', 'power'],
  ['diameter', 'diameter'],
];

/** Refuses (one sentence, code `unsound-set`) a set in unknown units or without a fitted head curve. */
export function checkSound(set: CurveSet, what = 'The curve set'): void {
  for (const [field, kind] of UNIT_KINDS) {
    const token = set.display_units[field];
    try {
      parseUnit(kind, token);
    } catch {
      throw new LibraryError(
        `${what} gives its ${field} unit as "${String(token).slice(0, 40)}", which is not a unit Pumpscribe knows; fix display_units (for example "m3/h", "gpm", "m", "ft", "kW", "hp", "mm", "in") and save again.`,
        'invalid',
        'unsound-set',
      );
    }
  }
  if (!set.members.some((m) => m.curves.head?.fit)) {
    throw new LibraryError(`${what} has no fitted head curve, so no duty could ever be checked against it; capture and fit at least one head curve before saving it to the library.`, 'invalid', 'unsound-set');
  }
}

/** Stored findings and the checks run again, counted once per finding id. */
export function summarizeFindings(set: CurveSet): FindingsSummary {
  const byId = new Map<string, Finding>();
  for (const f of set.findings) byId.set(f.id, f);
  let rerun: Finding[] = [];
  try {
    rerun = runChecks(set).findings;
  } catch {
    // A check that cannot run on this set leaves the stored findings to speak for it.
    rerun = [];
  }
  for (const f of rerun) if (!byId.has(f.id) || severityRank(f.severity) > severityRank(byId.get(f.id)!.severity)) byId.set(f.id, f);
  let fail = 0;
  let warn = 0;
  const codes = new Set<string>();
  for (const f of byId.values()) {
    if (f.severity === 'fail') {
      fail += 1;
      codes.add(f.code);
    } else if (f.severity === 'warn') warn += 1;
  }
  return { fail_count: fail, warn_count: warn, fail_codes: [...codes].sort() };
}

function severityRank(s: Finding['severity']): number {
  return s === 'fail' ? 2 : s === 'warn' ? 1 : 0;
}

/** Refuses a set with `fail` findings unless accepted explicitly (code `failing-set`). */
export function checkFailing(summary: FindingsSummary, acceptFailing: boolean, what = 'The curve set', how = 'add --accept-failing (command line) or ?accept_failing=true (HTTP)'): void {
  if (summary.fail_count === 0 || acceptFailing) return;
  throw new LibraryError(
    `${what} has ${summary.fail_count} failing check${summary.fail_count === 1 ? '' : 's'} (${summary.fail_codes.join(', ')}); fix the take-off, or ${how} to keep it marked as failing.`,
    'invalid',
    'failing-set',
  );
}
