/** Step 4: the fitted curves over the sheet, residuals, findings, figures and the duty view. */
import { reviewStep as body } from '../views/reviewStep.ts';
import { STEP_TITLES } from '../views/words.ts';
import type { StepDefinition } from './step.ts';

export const reviewStep: StepDefinition<'review'> = {
  id: 'review',
  title: STEP_TITLES.review,
  summary: ({ derived: d }) => {
    if (!d.curveSet) return d.computing ? 'fitting…' : 'nothing to review yet';
    const fails = d.curveSet.findings.filter((f) => f.severity === 'fail').length;
    const warns = d.curveSet.findings.filter((f) => f.severity === 'warn').length;
    return `${d.curveSet.members.length} ${d.curveSet.family === 'speed' ? 'speeds' : 'diameters'}, ${fails} failing, ${warns} to check`;
  },
  body,
  tool: () => 'pick',
  // A trace picked out from a finding stays picked out in the review.
  enter: (_draft, session) => ({ highlightedTrace: session.highlightedTrace }),
  layers: { anchors: false, traces: true, fits: true },
  chart: true,
};
