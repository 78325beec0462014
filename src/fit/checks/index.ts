/**
 * All checks of a curve set. Each check returns findings; none throws for what it finds.
 * To add a check: write a function `(set, display) => Finding[]` in its own file, give
 * its findings a stable `code`, justify its thresholds in a comment, and list it here.
 */
import type { CurveSet, Finding } from '../../model/curveset.ts';
import { checkCurveSetLimits } from '../../model/limits.ts';
import { affinityFindings } from './affinityCheck.ts';
import { completenessFindings } from './completeness.ts';
import { pointAgreementFindings } from './pointAgreement.ts';
import { displayFor } from './display.ts';
import { sortFindings } from './finding.ts';
import { plausibilityFindings } from './plausibility.ts';
import { powerFindings } from './powerCheck.ts';
import { familyFigures, speedFindings } from './speedFigures.ts';

export function runChecks(set: Omit<CurveSet, 'findings'>): { findings: Finding[]; figures: NonNullable<CurveSet['figures']> } {
  // A set beyond the size limits is refused before any check walks it (model/limits.ts).
  checkCurveSetLimits(set);
  const show = displayFor(set.display_units);
  const figures = familyFigures(set);
  const findings = [
    ...completenessFindings(set, show),
    ...pointAgreementFindings(set, show),
    ...plausibilityFindings(set, show),
    ...affinityFindings(set, show),
    ...powerFindings(set, show),
    ...speedFindings(set, figures, show),
  ];
  return { findings: sortFindings(findings), figures };
}

export { displayFor } from './display.ts';
export { makeFinding, sortFindings, worstSeverity } from './finding.ts';
