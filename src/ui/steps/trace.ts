/** Step 3: trace the curves. */
import { familyLabels, pointsOf } from '../store/draft.ts';
import { targetFor } from '../store/target.ts';
import { traceStep as body } from '../views/traceStep.ts';
import { STEP_TITLES } from '../views/words.ts';
import type { StepDefinition } from './step.ts';

export const traceStep: StepDefinition<'trace'> = {
  id: 'trace',
  title: STEP_TITLES.trace,
  summary: ({ store }) => {
    const { traces } = store.draft;
    if (traces.length === 0) return 'no traces yet';
    const points = traces.reduce((s, t) => s + pointsOf(t).length, 0);
    // Found raster traces keep only their guides (the points are captured when the curves are fitted): "0 points" would read as nothing traced.
    return points > 0 ? `${traces.length} traces, ${points} points` : `${traces.length} trace${traces.length === 1 ? '' : 's'} from guides`;
  },
  body,
  tool: () => 'trace',
  // The pending target stays as it was, unless no panel plots it, or its diameter (or speed) is
  // gone or is not the kind of label this sheet's curves carry.
  enter: (draft, session) => {
    const t = session.target;
    const drawn = draft.panels.some((p) => p.plots === t.quantity) || (t.lines === 'iso' && draft.panels.some((p) => p.plots === 'head'));
    if (!drawn) return { target: targetFor(draft, draft.panels[0]?.plots ?? 'head') };
    const label = draft.family === 'speed' ? t.speed : t.diameter;
    if (t.lines === 'curve' && (label === undefined || !familyLabels(draft).includes(label))) return { target: targetFor(draft, t.quantity) };
    return {};
  },
  layers: { anchors: false, traces: true, fits: false },
  chart: false,
};
