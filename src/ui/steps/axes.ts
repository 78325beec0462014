/** Step 2: draw each panel's frame and place its anchors. */
import { axesStep as body } from '../views/axesStep.ts';
import { STEP_TITLES } from '../views/words.ts';
import type { StepDefinition } from './step.ts';

export const axesStep: StepDefinition<'axes'> = {
  id: 'axes',
  title: STEP_TITLES.axes,
  summary: ({ store, derived }) => {
    const { panels } = store.draft;
    if (panels.length === 0) return 'no panels yet';
    const ok = panels.filter((p) => derived.calibrations.get(p.id)?.ok).length;
    return `${panels.length} panel${panels.length === 1 ? '' : 's'}, ${ok} calibrated`;
  },
  body,
  tool: (draft, session) => (session.drawingFrame || draft.panels.length === 0 || !session.activePanel ? 'frame' : 'anchor'),
  enter: (draft, session) => (!session.activePanel && draft.panels.length === 0 ? { drawingFrame: true } : {}),
  layers: { anchors: true, traces: true, fits: false },
  chart: false,
};
