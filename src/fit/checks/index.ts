/**
 * All checks of a curve set. Each check returns findings; none throws for what it finds.
 * To add a check: write a function `(set, display) => Finding[]` in its own file, give
 * its findings a stable `code`, justify its thresholds in a comment, and list it here.
 */
import type { CurveSet, Finding } from '../../model/curveset.ts';
import { affinityFindings } from './affinityCheck.ts';
import { displayFor } from './display.ts';
import { sortFindings } from './finding.ts';
import { plausibilityFindings } from './plausibility.ts';
import { powerFindings } from './powerCheck.ts';
import { familyFigures, speedFindings } from './speedFigures.ts';

export function runChecks(set: Omit<CurveSet, 'findings'>): { findings: Finding[]; figures: NonNullable<CurveSet['figures']> } {
  const show = displayFor(set.display_units);
  const figures = familyFigures(set);
  const findings = [
    ...plausibilityFindings(set, show),
    ...affinityFindings(set, show),
    ...powerFindings(set, show),
    ...speedFindings(set, figures, show),
  ];
  return { findings: sortFindings(findings), figures };
}

export { displayFor } from './display.ts';
export { makeFinding, sortFindings, worstSeverity } from './finding.ts';
