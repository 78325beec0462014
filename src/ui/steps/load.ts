/** Step 1: open a sheet (or a take-off file with its sheet), pick the page, name the pump. */
import { loadStep as body } from '../views/loadStep.ts';
import { STEP_TITLES } from '../views/words.ts';
import type { StepDefinition } from './step.ts';

export const loadStep: StepDefinition<'load'> = {
  id: 'load',
  title: STEP_TITLES.load,
  summary: ({ store }) => (store.draft.sheet ? `${store.draft.sheet.name}, page ${store.draft.sheet.page}` : 'no sheet yet'),
  body,
  tool: () => null,
  hint: ({ sheet }) => (sheet && sheet.pages.length > 1 ? 'Click a page picture to choose the page, or go on to “Set the axes”.' : 'Go on to “Set the axes” (press 2).'),
  layers: { anchors: false, traces: false, fits: false },
  chart: false,
};
