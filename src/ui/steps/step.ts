/**
 * One step of the workbench, as the frame around it needs to know it: its title, the line under
 * the title, its panel, the pointer tool that acts on the sheet while it is open, what opening it
 * sets up, and which layers the sheet shows. A new step is one file exporting a StepDefinition
 * plus one line in `registry.ts`.
 */
import type { Bench } from '../app/bench.ts';
import type { Draft } from '../store/draft.ts';
import type { Session } from '../store/store.ts';

/** The pointer tools a step can put on the sheet. */
export type ToolName = 'frame' | 'anchor' | 'trace' | 'pick';

export interface StepDefinition<Id extends string = string> {
  readonly id: Id;
  readonly title: string;
  /** One line under the title in the list of steps. */
  summary(bench: Bench): string;
  /** The step's panel in the side bar. */
  body(bench: Bench): HTMLElement;
  /** The pointer tool acting on the sheet while the step is open; null for none. */
  tool(draft: Draft, session: Session): ToolName | null;
  /** What the status line says the next click does, when the step has no tool. */
  hint?(bench: Bench): string;
  /** Screen state set when the step is opened. */
  enter?(draft: Draft, session: Session): Partial<Session>;
  /** Which layers the sheet shows while the step is open. */
  readonly layers: { readonly anchors: boolean; readonly traces: boolean; readonly fits: boolean };
  /** True when the family chart is shown beside the sheet. */
  readonly chart: boolean;
}
