/** Step 5: download the take-off file, the curve set and the CSV table; save to the library. */
import { saveStep as body } from '../views/saveStep.ts';
import { STEP_TITLES } from '../views/words.ts';
import type { StepDefinition } from './step.ts';

export const saveStep: StepDefinition<'save'> = {
  id: 'save',
  title: STEP_TITLES.save,
  summary: ({ derived }) => (derived.takeoff ? 'ready to download' : 'nothing to save yet'),
  body,
  tool: () => 'pick',
  layers: { anchors: false, traces: true, fits: true },
  chart: true,
};
