/**
 * What the workbench hands a capture besides its guides, as the headless replay hands it in
 * (`replayTakeoff`): the panel's frame, the other traces' guides (`siblingGuides`) and the same
 * impeller's head trace (`companionGuidesOf`). One rule for every capture the workbench asks of
 * the worker: a trace captured again, a new trace (by the curve it is for), a loaded file's traces.
 */
import { companionGuidesOf } from '../../digitize/companions.ts';
import { siblingGuides } from '../../digitize/vectorChoice.ts';
import type { TraceSpec } from '../store/actions/traces.ts';
import { frameOfPanel, type Draft } from '../store/draft.ts';
import type { CaptureRequest } from '../worker/protocol.ts';

export function captureContext(draft: Pick<Draft, 'panels' | 'traces'>, panel: string | undefined, traceId?: string, curve?: TraceSpec): Pick<CaptureRequest, 'frame' | 'siblings' | 'companions'> {
  const { traces } = draft;
  const pairs = (lists: readonly (readonly (readonly [number, number])[])[]) => lists.map((g) => g.map((p): [number, number] => [p[0], p[1]]));
  const siblings = pairs(siblingGuides(traces.filter((t) => t.id !== traceId)));
  const index = traces.findIndex((t) => t.id === traceId);
  const companions = pairs(index >= 0 ? companionGuidesOf(traces, index) : curve ? companionGuidesOf([...traces, curve], traces.length) : []);
  return { ...frameOfPanel(draft.panels, panel), siblings, companions };
}
