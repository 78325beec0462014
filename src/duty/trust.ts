/**
 * Trust carried through: a curve set whose own checks found a `fail` must not flow into a duty
 * check or a study unmarked. The fails are named so the headline can say which.
 */
import type { CurveSet } from '../model/curveset.ts';

/** One sentence naming the failing findings of a curve set, or undefined when it has none. */
export function failingFindings(set: Pick<CurveSet, 'findings'>): string | undefined {
  const fails = set.findings.filter((f) => f.severity === 'fail');
  if (fails.length === 0) return undefined;
  const names = fails.slice(0, 3).map((f) => f.id);
  const more = fails.length > 3 ? ` and ${fails.length - 3} more` : '';
  return `The curve set has failing findings (${names.join(', ')}${more}); fix the take-off or the curves before relying on this check.`;
}
