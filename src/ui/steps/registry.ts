/**
 * The steps of the workbench, in the engineer's order. A new step is one file exporting its
 * StepDefinition plus one line here; the list of steps, the number keys, the tool on the sheet,
 * the layers drawn and the autosave all follow this list.
 */
import { loadStep } from './load.ts';
import { axesStep } from './axes.ts';
import { traceStep } from './trace.ts';
import { reviewStep } from './review.ts';
import { saveStep } from './save.ts';
import type { StepDefinition } from './step.ts';

export const STEP_DEFINITIONS = [
  loadStep,
  axesStep,
  traceStep,
  reviewStep,
  saveStep,
] as const;

/** The id of a step, from the list above. */
export type Step = (typeof STEP_DEFINITIONS)[number]['id'];

export function isStep(id: unknown): id is Step {
  return STEP_DEFINITIONS.some((s) => s.id === id);
}

export function stepDefinition(id: Step): StepDefinition<Step> {
  return STEP_DEFINITIONS.find((s) => s.id === id) as StepDefinition<Step>;
}
